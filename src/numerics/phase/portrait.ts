/**
 * The numbers behind a phase plot, in SI: the rate f(y) sampled across the range, and a few
 * solutions y(t) from starting values spread over the range, so that a reader sees what
 * happens from any start. The direction field's slopes are f(y), the same at every t for an
 * autonomous law, so the curve serves it too.
 */
import { integrate, denseAt } from '../ode/integrate.ts';
import { Status } from '../ode/types.ts';

export interface Portrait {
  readonly y: number[];
  /** f at each y; null where f is not a finite number. */
  readonly f: Array<number | null>;
  /** The time the solutions are followed for. */
  readonly horizon: number;
  readonly solutions: Array<{ readonly start: number; readonly t: number[]; readonly y: Array<number | null> }>;
}

const CURVE_POINTS = 201;
const SOLUTIONS = 9;
const SOLUTION_POINTS = 120;
/** Solutions are followed for this many of the slowest equilibrium's time constants. */
const TIME_CONSTANTS = 4;

export function phasePortrait(f: (y: number) => number, from: number, to: number, slopes: readonly number[]): Portrait {
  const y: number[] = [];
  const fy: Array<number | null> = [];
  for (let i = 0; i < CURVE_POINTS; i++) {
    const v = from + ((to - from) * i) / (CURVE_POINTS - 1);
    const r = f(v);
    y.push(v);
    fy.push(Number.isFinite(r) ? r : null);
  }
  const horizon = horizonOf(fy, from, to, slopes);
  // a solution that leaves the shown range (by a tenth of it) is not drawn further, so it is
  // held there instead of being followed toward a blow-up the plot would never show
  const lo = from - 0.1 * (to - from), hi = to + 0.1 * (to - from);
  const rhs = (_t: number, s: Float64Array, d: Float64Array) => { d[0] = s[0] < lo || s[0] > hi ? 0 : f(s[0]); };
  const solutions: Portrait['solutions'] = [];
  for (let k = 0; k < SOLUTIONS; k++) {
    const start = from + ((to - from) * (k + 0.5)) / SOLUTIONS;
    if (!Number.isFinite(f(start))) continue;
    const run = integrate(rhs, 0, [start], horizon, { method: 'auto', rtol: 1e-6, atol: 1e-9 * Math.max(Math.abs(from), Math.abs(to), 1e-300), maxSteps: 5000 });
    const t: number[] = [];
    const ys: Array<number | null> = [];
    const out = new Float64Array(1);
    const reached = run.status === Status.Success ? horizon : run.t;
    for (let j = 0; j < SOLUTION_POINTS; j++) {
      const at = j === SOLUTION_POINTS - 1 ? horizon : (horizon * j) / (SOLUTION_POINTS - 1);
      t.push(at);
      if (at > reached) { ys.push(null); continue; }
      if (at > 0 && !denseAt(run.segments, Math.min(at, reached), out)) { ys.push(null); continue; }
      const v = at === 0 ? start : out[0];
      const outside = v < lo || v > hi;
      ys.push(outside || !Number.isFinite(v) ? null : v);
    }
    solutions.push({ start, t, y: ys });
  }
  return { y, f: fy, horizon, solutions };
}

/** A few time constants of the slowest equilibrium; without one, the time to cross the range at a typical rate. */
function horizonOf(fy: ReadonlyArray<number | null>, from: number, to: number, slopes: readonly number[]): number {
  const rates = slopes.map(Math.abs).filter((s) => s > 0 && Number.isFinite(s));
  if (rates.length) return TIME_CONSTANTS / Math.min(...rates);
  const sizes = fy.filter((v): v is number => v !== null && v !== 0).map(Math.abs).sort((a, b) => a - b);
  const typical = sizes.length ? sizes[Math.floor(sizes.length / 2)] : 1;
  return (to - from) / typical;
}
