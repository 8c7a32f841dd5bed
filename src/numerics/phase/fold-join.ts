/**
 * The two branches of a fold carried from their last grid step to the fold itself. On the
 * grid a fold's pair is last seen up to one step before the fold, where near a saddle-node the
 * branches are steepest (y - y* ~ sqrt(p* - p)): left there, a chart shows them stopping short,
 * with a gap between them. Each branch is extended by points on the curve f(y, p) = 0 between
 * its last grid point and the fold, then by the fold point itself (semi-stable, slope 0).
 *
 * The points are spaced evenly in y (near a fold p(y) is a parabola, which even steps in y
 * sample evenly) and each p solved for by Brent's zero in p on the span between the grid point
 * and the fold: between the pair f has one sign, beyond the fold the other. A branch whose every
 * point is not bracketed so is not the fold's (an equilibrium leaving the range nearby): it is
 * left as it is.
 */
import { brentRoot } from '../brent.ts';
import { charge } from '../work-meter.ts';
import type { BranchPoint, Fold } from './sweep.ts';

/** Points added between a branch's last grid point and its fold (the fold point besides). */
export const FOLD_JOIN_POINTS = 8;
/** Brent's tolerance on p, as a fraction of the sweep's range (common practice: far below a pixel). */
const P_TOL = 1e-12;
/** A grid step's rounding: how far a point may lie past its step and still be on it. */
const SLACK = 1e-6;
/** Step for the slope's central difference, of the y range (cbrt(eps), common practice). */
const SLOPE_STEP = Math.cbrt(Number.EPSILON);

export interface FoldJoinContext {
  readonly f: (y: number, p: number) => number;
  readonly derivative?: (y: number, p: number) => number;
  readonly yFrom: number;
  readonly yTo: number;
  readonly pFrom: number;
  readonly pTo: number;
  /** The grid step in p (positive). */
  readonly step: number;
}

/** The end of a branch next to a fold, and the point the new points start from. */
interface End {
  readonly branch: BranchPoint[];
  readonly last: boolean;
  /** The last regular point before the fold (an attractor or a repeller). */
  readonly anchor: BranchPoint;
  /** True when the branch's end point is the fold as the grid found it (a semi-stable point on a step). */
  readonly endsOnFold: boolean;
}

/**
 * Extends, in place, the branches that end next to each fold so that they reach it. Returns the
 * calls of f spent. Cost: per fold, two branches of `FOLD_JOIN_POINTS` Brent zeros (about 10
 * calls each) and a slope difference each where no derivative is given.
 */
export function joinBranchesToFolds(branches: BranchPoint[][], folds: readonly Fold[], c: FoldJoinContext): number {
  let used = 0;
  const f = (y: number, p: number) => {
    used++;
    charge();
    try { const v = c.f(y, p); return typeof v === 'number' ? v : NaN; } catch { return NaN; }
  };
  for (const fold of folds) {
    for (const side of [1, -1]) {
      const end = nearestEnd(branches, fold, side, c);
      if (!end) continue;
      const added = curveTo(end.anchor, fold, f, c);
      if (!added) continue;
      const tail = end.endsOnFold ? added : [...added, { parameter: fold.parameter, value: fold.value, stability: 'semi-stable' as const, slope: 0 }];
      const b = end.branch;
      if (end.last) b.splice(end.endsOnFold ? b.length - 1 : b.length, 0, ...tail);
      else b.splice(end.endsOnFold ? 1 : 0, 0, ...tail.reverse());
    }
  }
  return used;
}

/**
 * Of the branch ends within a grid step of the fold, on the side where the pair exists, the one
 * nearest the fold on the side `side` of its value (+1 above, -1 below).
 */
function nearestEnd(branches: BranchPoint[][], fold: Fold, side: number, c: FoldJoinContext): End | undefined {
  const dir = Math.sign(c.pTo - c.pFrom);
  let best: End | undefined;
  let bestD = Infinity;
  for (const branch of branches) {
    for (const last of [true, false]) {
      const e = last ? branch[branch.length - 1] : branch[0];
      const inner = branch.length > 1 ? (last ? branch[branch.length - 2] : branch[1]) : undefined;
      // how far the fold lies beyond this end, in the branch's own direction
      const beyond = (last ? fold.parameter - e.parameter : e.parameter - fold.parameter) * dir;
      const onFold = e.stability === 'semi-stable' && Math.abs(beyond) <= SLACK * c.step;
      const anchor = onFold ? inner : e;
      if (!anchor || anchor.stability === 'semi-stable') continue;
      const reach = (last ? fold.parameter - anchor.parameter : anchor.parameter - fold.parameter) * dir;
      if (!(reach > SLACK * c.step && reach <= (1 + SLACK) * c.step)) continue;
      if (!onFold && beyond <= SLACK * c.step) continue;
      const d = (anchor.value - fold.value) * side;
      if (d > 0 && d < bestD) { bestD = d; best = { branch, last, anchor, endsOnFold: onFold }; }
    }
  }
  return best;
}

/** The points between `from` and the fold, from `from` onwards (not the fold), or null when one is not bracketed. */
function curveTo(from: BranchPoint, fold: Fold, f: (y: number, p: number) => number, c: FoldJoinContext): BranchPoint[] | null {
  const lo = Math.min(from.parameter, fold.parameter), hi = Math.max(from.parameter, fold.parameter);
  const xtol = P_TOL * Math.abs(c.pTo - c.pFrom);
  const h = SLOPE_STEP * Math.max(c.yTo - c.yFrom, Math.abs(fold.value));
  const out: BranchPoint[] = [];
  for (let i = 1; i <= FOLD_JOIN_POINTS; i++) {
    const y = from.value + ((fold.value - from.value) * i) / (FOLD_JOIN_POINTS + 1);
    const z = brentRoot((p) => f(y, p), lo, hi, { xtol, maxIterations: 60 });
    if (!z.converged) return null;
    const p = z.root;
    const slope = c.derivative ? c.derivative(y, p) : (f(y + h, p) - f(y - h, p)) / (2 * h);
    out.push({ parameter: p, value: y, stability: from.stability, slope });
  }
  return out;
}
