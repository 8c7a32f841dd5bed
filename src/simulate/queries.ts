/**
 * Questions asked of a trajectory: when a state crosses a level, its extremes, its value at
 * a time, the area under it, and the time spent above or below a level. Everything is found
 * on the solver's dense output, with a root finder or a minimiser, to near machine precision
 * of the interpolant; a jump at a scheduled action is a crossing at the action's time.
 */
import { brentRoot, brentMinimize } from '../numerics/brent.ts';
import { type Trajectory, type Piece, evalPiece, pieceAt, valueAt } from './trajectory.ts';


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

/** Every crossing of `level` by component i within [from, to], in time order. */
export function crossings(tr: Trajectory, i: number, level: number, from = tr.t0, to = tr.t1): Crossing[] {
  const found: Crossing[] = [];
  let lastSign = 0;
  let lastT = from;
  const note = (t: number, v: number, g: (t: number) => number, prevT: number, jump: boolean) => {
    const s = v > level ? 1 : v < level ? -1 : 0;
    if (s !== 0 && lastSign !== 0 && s !== lastSign) {
      let at = t;
      if (!jump && g) {
        const r = brentRoot((x) => g(x) - level, prevT, t, { xtol: 0, rtol: 4 * Number.EPSILON });
        at = r.root;
      }
      found.push({ t: at, direction: s > 0 ? 'up' : 'down', jump });
    }
    if (s !== 0) { lastSign = s; lastT = t; }
  };
  // an action at the run's start (a first dose at t0) is a jump from the state before it
  if (from <= tr.t0) lastSign = Math.sign(tr.start[i] - level);
  for (let k = 0; k < tr.pieces.length; k++) {
    const p = tr.pieces[k];
    if (!inWindow(tr, k, from, to)) continue;
    const g = component(p, i, tr.width);
    const a = Math.max(p.t0, from), b = Math.min(p.t1, to);
    // the value at the piece start: after a jump, if the piece starts inside the window
    note(a, g(a), g, lastT, p.t0 >= from && p.t0 === a && lastSign !== 0);
    const ts: number[] = [];
    for (const s of p.segments) {
      if (s.t1 <= a || s.t0 >= b) continue;
      const lo = Math.max(s.t0, a), hi = Math.min(s.t1, b);
      for (let j = 1; j <= SAMPLES; j++) ts.push(lo + ((hi - lo) * j) / SAMPLES);
    }
    for (const t of ts) note(t, g(t), g, lastT, false);
  }
  return found;
}

export interface Extreme {
  readonly t: number;
  readonly value: number;
}

/** The largest (sign 1) or smallest (sign -1) value of component i over [from, to]. */
export function extreme(tr: Trajectory, i: number, sign: 1 | -1, from = tr.t0, to = tr.t1): Extreme | undefined {
  let best: Extreme | undefined;
  const consider = (t: number, v: number) => {
    if (Number.isFinite(v) && (!best || sign * v > sign * best.value)) best = { t, value: v };
  };
  for (let k = 0; k < tr.pieces.length; k++) {
    const p = tr.pieces[k];
    if (!inWindow(tr, k, from, to)) continue;
    const g = component(p, i, tr.width);
    const a = Math.max(p.t0, from), b = Math.min(p.t1, to);
    consider(a, g(a));
    consider(b, g(b));
    for (const s of p.segments) {
      if (s.t1 <= a || s.t0 >= b) continue;
      const lo = Math.max(s.t0, a), hi = Math.min(s.t1, b);
      const h = (hi - lo) / SAMPLES;
      let bestJ = 0, bestV = -Infinity;
      for (let j = 0; j <= SAMPLES; j++) {
        const v = sign * g(lo + j * h);
        if (v > bestV) { bestV = v; bestJ = j; }
      }
      if (bestJ > 0 && bestJ < SAMPLES) {
        const m = brentMinimize((t) => -sign * g(t), lo + (bestJ - 1) * h, lo + (bestJ + 1) * h, { xtol: 0, rtol: 1e-12 });
        consider(m.x, g(m.x));
      } else {
        consider(lo + bestJ * h, g(lo + bestJ * h));
      }
    }
  }
  return best;
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

