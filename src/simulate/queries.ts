/**
 * Questions asked of a trajectory: when a state crosses a level, its extremes, its value at
 * a time, the area under it, and the time spent above or below a level. Everything is found
 * on the solver's dense output, with a root finder or a minimiser, to near machine precision
 * of the interpolant; a jump at a scheduled action is a crossing at the action's time.
 */
import { brentRoot, brentMinimize } from '../numerics/brent.ts';
import { charge } from '../numerics/work-meter.ts';
import { type Trajectory, type Piece, evalPiece, pieceAt, valueAt } from './trajectory.ts';
import type { DenseSegment } from '../numerics/ode/types.ts';


/** Samples per dense segment when looking for sign changes and extremes. */
const SAMPLES = 6;

/**
 * Whether piece k takes part in the window [from, to]. A window holds the values after the
 * actions at `from` and before the actions at `to`: the minimum over a dosing interval is
 * the trough just before the next dose, the maximum the peak just after its own.
 */
function inWindow(tr: Trajectory, k: number, from: number, to: number): boolean {
  const p = tr.pieces[k];
  if (from === to) return pieceAt(tr, from) === k;
  return p.t1 > from && p.t0 < to;
}


export interface Crossing {
  readonly t: number;
  readonly direction: 'up' | 'down';
  /** True when the crossing is a jump at a scheduled action. */
  readonly jump: boolean;
}

function component(p: Piece, i: number, width: number) {
  const out = new Float64Array(width);
  return (t: number) => { evalPiece(p, t, out); return out[i]; };
}

/**
 * Writes piece p at t into out, on segment s directly when t lies in [s.t0, s.t1) strictly
 * inside the piece (s is then the segment `evalPiece` would find), else through `evalPiece`:
 * the same value without the search, for samples taken segment by segment.
 */
function sampleOn(p: Piece, s: DenseSegment, t: number, out: Float64Array): void {
  if (t >= s.t0 && t < s.t1 && t > p.t0 && t < p.t1) s.eval(t, out);
  else evalPiece(p, t, out);
}

// The two scans below keep their running state in plain locals (no closures over numbers,
// no small objects per sample): they run for every question of every run, and a what-if
// loop runs thousands of those.

/** Every crossing of `level` by component i within [from, to], in time order. */
export function crossings(tr: Trajectory, i: number, level: number, from = tr.t0, to = tr.t1): Crossing[] {
  const found: Crossing[] = [];
  const out = new Float64Array(tr.width);
  // the sign of the last sample off the level, and its time
  let lastSign = 0;
  let lastT = from;
  // an action at the run's start (a first dose at t0) is a jump from the state before it
  if (from <= tr.t0) lastSign = Math.sign(tr.start[i] - level);
  for (let k = 0; k < tr.pieces.length; k++) {
    const p = tr.pieces[k];
    if (!inWindow(tr, k, from, to)) continue;
    const a = Math.max(p.t0, from), b = Math.min(p.t1, to);
    // the value at the piece start: after a jump, if the piece starts inside the window
    const jump = p.t0 >= from && p.t0 === a && lastSign !== 0;
    evalPiece(p, a, out);
    const s0 = signAgainst(out[i], level);
    if (s0 !== 0 && lastSign !== 0 && s0 !== lastSign) found.push(crossingIn(component(p, i, tr.width), level, lastT, a, s0, jump));
    if (s0 !== 0) { lastSign = s0; lastT = a; }
    for (const s of p.segments) {
      if (s.t1 <= a || s.t0 >= b) continue;
      const lo = Math.max(s.t0, a), hi = Math.min(s.t1, b);
      charge(SAMPLES);
      for (let j = 1; j <= SAMPLES; j++) {
        const t = lo + ((hi - lo) * j) / SAMPLES;
        sampleOn(p, s, t, out);
        const sj = signAgainst(out[i], level);
        if (sj !== 0 && lastSign !== 0 && sj !== lastSign) found.push(crossingIn(component(p, i, tr.width), level, lastT, t, sj, false));
        if (sj !== 0) { lastSign = sj; lastT = t; }
      }
    }
  }
  return found;
}

function signAgainst(v: number, level: number): number {
  return v > level ? 1 : v < level ? -1 : 0;
}

/** The crossing between the samples at `before` and `t` (at `t` itself for a jump). */
function crossingIn(g: (t: number) => number, level: number, before: number, t: number, sign: number, jump: boolean): Crossing {
  const at = jump ? t : brentRoot((x) => g(x) - level, before, t, { xtol: 0, rtol: 4 * Number.EPSILON }).root;
  return { t: at, direction: sign > 0 ? 'up' : 'down', jump };
}

export interface Extreme {
  readonly t: number;
  readonly value: number;
}

/** The largest (sign 1) or smallest (sign -1) value of component i over [from, to]. */
export function extreme(tr: Trajectory, i: number, sign: 1 | -1, from = tr.t0, to = tr.t1): Extreme | undefined {
  // the best value so far (none while bestT is NaN)
  let bestT = NaN, bestValue = NaN;
  const out = new Float64Array(tr.width);
  for (let k = 0; k < tr.pieces.length; k++) {
    const p = tr.pieces[k];
    if (!inWindow(tr, k, from, to)) continue;
    const g = component(p, i, tr.width);
    const a = Math.max(p.t0, from), b = Math.min(p.t1, to);
    // the piece's two ends, a then b (no array of the two: this runs for every question of every run)
    for (let e = 0; e < 2; e++) {
      const t = e === 0 ? a : b;
      const v = g(t);
      if (Number.isFinite(v) && (Number.isNaN(bestT) || sign * v > sign * bestValue)) { bestT = t; bestValue = v; }
    }
    for (const s of p.segments) {
      if (s.t1 <= a || s.t0 >= b) continue;
      const lo = Math.max(s.t0, a), hi = Math.min(s.t1, b);
      const h = (hi - lo) / SAMPLES;
      let bestJ = 0, bestV = -Infinity;
      charge(SAMPLES + 1);
      for (let j = 0; j <= SAMPLES; j++) {
        sampleOn(p, s, lo + j * h, out);
        const v = sign * out[i];
        if (v > bestV) { bestV = v; bestJ = j; }
      }
      const t = bestJ > 0 && bestJ < SAMPLES
        ? brentMinimize((x) => -sign * g(x), lo + (bestJ - 1) * h, lo + (bestJ + 1) * h, { xtol: 0, rtol: 1e-12 }).x
        : lo + bestJ * h;
      const v = g(t);
      if (Number.isFinite(v) && (Number.isNaN(bestT) || sign * v > sign * bestValue)) { bestT = t; bestValue = v; }
    }
  }
  return Number.isNaN(bestT) ? undefined : { t: bestT, value: bestValue };
}

/** Component i at time t (the value after any action at t, but at the run's end). */
export function valueOfAt(tr: Trajectory, i: number, t: number): number | undefined {
  const out = new Float64Array(tr.width);
  if (!valueAt(tr, t, out)) return undefined;
  return out[i];
}

/** Integral of a state over [from, to] from its quadrature component q (continuous). */
export function integralOver(tr: Trajectory, q: number, from = tr.t0, to = tr.t1): number | undefined {
  const a = valueOfAt(tr, q, from), b = valueOfAt(tr, q, to);
  return a === undefined || b === undefined ? undefined : b - a;
}

/** Total time within [from, to] that component i spends above (sign 1) or below (sign -1) level. */
export function timeBeyond(tr: Trajectory, i: number, level: number, sign: 1 | -1, from = tr.t0, to = tr.t1): number {
  const cs = crossings(tr, i, level, from, to);
  const start = valueOfAt(tr, i, from)!;
  let inside = sign * (start - level) > 0;
  let since = from;
  let total = 0;
  for (const c of cs) {
    const entering = sign > 0 ? c.direction === 'up' : c.direction === 'down';
    if (inside && !entering) total += c.t - since;
    if (!inside && entering) since = c.t;
    inside = entering;
  }
  if (inside) total += to - since;
  return total;
}

