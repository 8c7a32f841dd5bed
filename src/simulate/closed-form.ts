/**
 * Closed forms for laws that are linear in their state with constant coefficients,
 * y' = a + b y (no t, no other state): y(t) = y* + (y0 - y*) e^{b t} with y* = -a / b
 * (first-order kinetics, common practice). Used to report the time constant and half-life
 * beside the numeric run, and the numeric error against the exact solution.
 */
import type { Trajectory } from './trajectory.ts';
import { evalPiece } from './trajectory.ts';

export interface Linear {
  readonly a: number;
  readonly b: number;
}

/** Relative size below which the law counts as exactly linear. */
const LINEAR_TOLERANCE = 1e-9;
/** Relative size of the constant term below which it is rounding (about 4500 ulps). */
const ROUNDING_TOLERANCE = 1e-12;

/**
 * a and b when f is affine in y around y0 (checked at several points spread over `scale`),
 * else undefined.
 */
export function linearCoefficients(f: (y: number) => number, y0: number, scale: number): Linear | undefined {
  const s = Math.max(Math.abs(scale), Math.abs(y0), 1e-300);
  const ys = [y0 - s, y0 - 0.37 * s, y0, y0 + 0.61 * s, y0 + 1.9 * s];
  const fs = ys.map(f);
  if (!fs.every(Number.isFinite)) return undefined;
  const b = (fs[4] - fs[0]) / (ys[4] - ys[0]);
  const a = fs[2] - b * ys[2];
  const size = Math.max(...fs.map(Math.abs), Math.abs(b) * s, 1e-300);
  for (let i = 0; i < ys.length; i++) if (Math.abs(fs[i] - (a + b * ys[i])) > LINEAR_TOLERANCE * size) return undefined;
  // a is a difference of numbers of the law's size: what is left of a law with no constant
  // term (y' = -k y) is rounding, a few ulps of that size, and would read as an equilibrium
  // of 5e-15 instead of 0. No source term that small can be told from rounding here.
  return { a: Math.abs(a) <= ROUNDING_TOLERANCE * size ? 0 : a, b };
}

/** Two laws with the same coefficients, to the relative size below which a law counts as linear. */
function sameLinear(p: Linear, q: Linear): boolean {
  const close = (x: number, y: number) => Math.abs(x - y) <= LINEAR_TOLERANCE * Math.max(Math.abs(x), Math.abs(y));
  return close(p.a, q.a) && close(p.b, q.b);
}

/** A stretch of a run over which one law holds: pieces `first` to `last` (the run stops at every action), and the law. */
export interface LinearStretch {
  readonly first: number;
  readonly last: number;
  readonly law: Linear;
}

/**
 * The run's pieces grouped into stretches of one law: consecutive pieces whose coefficients
 * are the same (a dose between them changes the state, not the law) make one stretch; a `set`
 * of a parameter the law reads, or an infusion starting or stopping, begins another.
 */
export function linearStretches(laws: readonly Linear[]): LinearStretch[] {
  const out: LinearStretch[] = [];
  laws.forEach((law, k) => {
    const open = out[out.length - 1];
    if (open && sameLinear(open.law, law)) out[out.length - 1] = { ...open, last: k };
    else out.push({ first: k, last: k, law });
  });
  return out;
}

/** The exact value at time dt into a piece that starts at y0 with y' = a + b y. */
function exactAfter(law: Linear, y0: number, dt: number): number {
  if (law.b === 0) return y0 + law.a * dt;
  const star = -law.a / law.b;
  return star + (y0 - star) * Math.exp(law.b * dt);
}

export interface ClosedFormCheck {
  /** Largest |numeric - exact| over step points and step midpoints. */
  readonly maxError: number;
  /** The same in tolerance units: |error| / (atol + rtol |exact|), largest over the points. */
  readonly maxErrorInTolerances: number;
}

/**
 * Compares component i of a trajectory with the exact piecewise solution. `lawOf(piece)`
 * gives the coefficients in force on each piece (parameters and infusions change them);
 * jumps between pieces are carried over exactly.
 */
export function compareWithExact(tr: Trajectory, i: number, lawOf: (k: number) => Linear, rtol: number, atol: number): ClosedFormCheck {
  let maxError = 0, maxTol = 0;
  let exactStart = tr.pieces[0]?.y0[i] ?? 0;
  const out = new Float64Array(tr.width);
  tr.pieces.forEach((p, k) => {
    if (k > 0) exactStart += p.y0[i] - tr.pieces[k - 1].y1[i];
    const law = lawOf(k);
    const check = (t: number) => {
      evalPiece(p, t, out);
      const exact = exactAfter(law, exactStart, t - p.t0);
      const err = Math.abs(out[i] - exact);
      maxError = Math.max(maxError, err);
      maxTol = Math.max(maxTol, err / (atol + rtol * Math.abs(exact)));
    };
    for (const s of p.segments) {
      check(s.t0);
      check((s.t0 + s.t1) / 2);
    }
    check(p.t1);
    exactStart = exactAfter(law, exactStart, p.t1 - p.t0);
  });
  return { maxError, maxErrorInTolerances: maxTol };
}
