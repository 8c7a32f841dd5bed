/**
 * Equilibria of y' = f(y, p) as the parameter p runs over a range: the analysis of
 * `findEquilibria` at each step, equilibria linked into branches across steps, and the fold
 * points (saddle-nodes) where two equilibria meet and vanish.
 *
 * Branches: continuation by nearest match (common practice for sampled bifurcation
 * diagrams). Between neighbouring steps, pairs are matched greedily by distance, first among
 * equilibria of the same stability (within `maxJump`), then any (within a tenth of it).
 *
 * Folds: where a neighbouring attractor–repeller pair (or one semi-stable point) has no
 * continuation at the next step, or appears without one at the previous step. The fold is
 * then solved for as the regular zero of F(y, p) = (f, ∂f/∂y) (the standard defining system
 * of a fold point; see Kuznetsov, "Elements of Applied Bifurcation Theory", ch. 10)
 * by Newton's method with finite-difference derivatives, seeded from the grid step; should
 * Newton fail or leave the step, by bisection on p of "the pair is still there" (the largest
 * value of σ·f between the pair, σ its sign there, found by Brent's localmin, is positive).
 * The fold's two branches then end at the fold itself, not at the last grid step before it
 * (`fold-join.ts`).
 */
import { brentMinimize } from '../brent.ts';
import { findEquilibria, type EquilibriumOptions, type PhaseAnalysis, type Stability, type Equilibrium } from './equilibria.ts';
import { charge } from '../work-meter.ts';
import { joinBranchesToFolds } from './fold-join.ts';

export interface SweepOptions extends Omit<EquilibriumOptions, 'derivative'> {
  /** ∂f/∂y when known exactly (passed to each step's analysis). */
  readonly derivative?: (y: number, p: number) => number;
  /**
   * Largest change of value between neighbouring steps that continues a branch with the same
   * stability or through a semi-stable point (default 0.5·(yTo - yFrom)); an attractor
   * continues as a repeller, or the reverse, only within a tenth of that.
   */
  readonly maxJump?: number;
  /** Cap on calls of f spent locating one fold (default 2000). */
  readonly maxFoldEvaluations?: number;
}

export interface BranchPoint {
  readonly parameter: number;
  readonly value: number;
  readonly stability: Stability;
  readonly slope: number;
}

/** One continued equilibrium, in increasing step order. */
export interface Branch {
  readonly points: readonly BranchPoint[];
}

export interface Fold {
  readonly parameter: number;
  readonly value: number;
  /** As the parameter runs from pFrom to pTo, the pair vanishes at the fold, or appears there. */
  readonly pair: 'vanishes' | 'appears';
  /**
   * How it was located: the 2×2 Newton solve, bisection on p, or only the grid step (not
   * refined: a semi-stable point found on the grid where Newton failed, or the fold budget ran out).
   */
  readonly method: 'newton' | 'bisection' | 'grid';
  readonly converged: boolean;
}

export interface SweepResult {
  /** The parameter values of the steps, pFrom to pTo inclusive. */
  readonly parameters: readonly number[];
  /** The full analysis at each step. */
  readonly steps: readonly PhaseAnalysis[];
  readonly branches: readonly Branch[];
  /** In order of parameter step. */
  readonly folds: readonly Fold[];
  /** Calls of f in all. */
  readonly evaluations: number;
  /** True when any step or fold search ran out of its budget. */
  readonly budgetExhausted: boolean;
  readonly warnings: readonly string[];
}

const EPS = Number.EPSILON;
const DEFAULT_MAX_JUMP_OF_WIDTH = 0.5;
/** A branch changes stability only over a jump this fraction of maxJump. */
const STABILITY_CHANGE_JUMP = 0.1;
const DEFAULT_MAX_FOLD_EVALUATIONS = 2000;
/** Steps for differences (common practice): cbrt(eps) for first derivatives, eps^(1/4) for second. */
const STEP1 = Math.cbrt(EPS);
const STEP2 = Math.pow(EPS, 0.25);
const NEWTON_MAX_ITERATIONS = 30;
/** Newton stops when both steps are below this fraction of their range's width ... */
const NEWTON_TOL = 1e-13;
/** ... or below this fraction and no longer halving (the differences' rounding floor). */
const NEWTON_FLOOR = 1e-9;
/** Bisection in p stops at this fraction of the grid step. */
const BISECTION_TOL_OF_STEP = 1e-13;
/** A fold may lie this fraction of a step outside its grid step (rounding of the seed). */
const STEP_SLACK = 1e-6;
const BISECTION_MAX_ITERATIONS = 60;
/** Two folds closer than this fraction of both ranges are one (found from both sides of a grid step). */
const FOLD_SAME = 1e-6;
const MAX_STEPS = 100000;
/** Units of work charged for each point of a sweep, beyond its evaluations of f. */
const SWEEP_POINT_WORK = 1000;

/**
 * Analyses y' = f(y, p) on [yFrom, yTo] at `steps` parameter values evenly spaced from pFrom
 * to pTo (both included), links the equilibria into branches and locates the folds.
 * Cost: `steps` analyses (each bounded by `maxEvaluations`, typically 70–150 calls of f for a
 * law with one or two equilibria) plus about 40 calls per fold.
 */
export function sweepEquilibria(
  f: (y: number, p: number) => number, yFrom: number, yTo: number, pFrom: number, pTo: number, steps: number,
  options: SweepOptions = {},
): SweepResult {
  if (typeof f !== 'function') throw new TypeError('f must be a function of (y, p)');
  for (const [name, v] of [['yFrom', yFrom], ['yTo', yTo], ['pFrom', pFrom], ['pTo', pTo]] as const) {
    if (!Number.isFinite(v)) throw new RangeError(`${name} must be a finite number; it is ${v}`);
  }
  if (!(yFrom < yTo)) throw new RangeError(`yFrom must be less than yTo; they are ${yFrom} and ${yTo}`);
  if (pFrom === pTo) throw new RangeError(`pFrom and pTo must differ; both are ${pFrom}`);
  if (!Number.isInteger(steps) || steps < 2 || steps > MAX_STEPS) throw new RangeError(`steps must be an integer from 2 to ${MAX_STEPS}; it is ${steps}`);
  const yWidth = yTo - yFrom;
  const maxJump = options.maxJump ?? DEFAULT_MAX_JUMP_OF_WIDTH * yWidth;
  if (!(maxJump > 0) || !Number.isFinite(maxJump)) throw new RangeError(`maxJump must be a finite number > 0; it is ${maxJump}`);
  const maxFoldEvaluations = options.maxFoldEvaluations ?? DEFAULT_MAX_FOLD_EVALUATIONS;
  if (!Number.isInteger(maxFoldEvaluations) || maxFoldEvaluations < 1) throw new RangeError(`maxFoldEvaluations must be an integer >= 1; it is ${maxFoldEvaluations}`);
  const { derivative, maxJump: _j, maxFoldEvaluations: _m, ...stepOptions } = options;

  const parameters: number[] = [];
  for (let k = 0; k < steps; k++) parameters.push(k === steps - 1 ? pTo : pFrom + ((pTo - pFrom) * k) / (steps - 1));
  const warnings: string[] = [];
  let evaluations = 0;
  let budgetExhausted = false;
  const analyses: PhaseAnalysis[] = parameters.map((p) => {
    // a sweep point costs about as much again as its evaluations of f (numerics/work-meter.ts)
    charge(SWEEP_POINT_WORK);
    const a = findEquilibria((y) => f(y, p), yFrom, yTo, { ...stepOptions, derivative: derivative && ((y) => derivative(y, p)) });
    evaluations += a.evaluations;
    if (a.budgetExhausted) budgetExhausted = true;
    for (const w of a.warnings) warnings.push(`at parameter ${p}: ${w}`);
    return a;
  });

  // Branches
  const branches: BranchPoint[][] = [];
  let owner: number[] = analyses[0].equilibria.map((e) => { branches.push([point(parameters[0], e)]); return branches.length - 1; });
  const seeds: Array<{ k: number; pair: Fold['pair']; members: Equilibrium[]; at: number }> = [];
  for (let k = 1; k < steps; k++) {
    const prev = analyses[k - 1].equilibria, cur = analyses[k].equilibria;
    const [matchPrev, matchCur] = link(prev, cur, maxJump);
    const next: number[] = cur.map((e, j) => {
      const i = matchCur[j];
      if (i >= 0) { branches[owner[i]].push(point(parameters[k], e)); return owner[i]; }
      branches.push([point(parameters[k], e)]);
      return branches.length - 1;
    });
    for (const g of pairsWithout(prev, matchPrev)) seeds.push({ k: k - 1, pair: 'vanishes', members: g, at: k - 1 });
    for (const g of pairsWithout(cur, matchCur)) seeds.push({ k: k - 1, pair: 'appears', members: g, at: k });
    owner = next;
  }

  // Folds
  const folds: Fold[] = [];
  for (const s of seeds) {
    const ctx: FoldContext = {
      f, yFrom, yTo, pA: parameters[s.k], pB: parameters[s.k + 1], pRange: Math.abs(pTo - pFrom), pair: s.pair, members: s.members,
      pSeed: parameters[s.at], budget: maxFoldEvaluations, used: 0,
    };
    const fold = locateFold(ctx);
    evaluations += ctx.used;
    if (ctx.used >= ctx.budget) budgetExhausted = true;
    if (fold && !folds.some((g) => Math.abs(g.parameter - fold.parameter) <= FOLD_SAME * Math.abs(pTo - pFrom)
      && Math.abs(g.value - fold.value) <= FOLD_SAME * yWidth)) folds.push(fold);
  }
  // the fold's two branches carried from their last grid step to the fold (fold-join.ts)
  evaluations += joinBranchesToFolds(branches, folds.filter((g) => g.converged), {
    f, derivative, yFrom, yTo, pFrom, pTo, step: Math.abs(pTo - pFrom) / (steps - 1),
  });
  return { parameters, steps: analyses, branches: branches.map((points) => ({ points })), folds, evaluations, budgetExhausted, warnings };
}

function point(parameter: number, e: Equilibrium): BranchPoint {
  return { parameter, value: e.value, stability: e.stability, slope: e.slope };
}

/**
 * Greedy nearest matching between the equilibria of neighbouring steps: shortest first, those
 * of the same stability (within maxJump) before those that differ: a semi-stable point with
 * any (within maxJump; it is where a fold or crossing sits on the grid), an attractor with a
 * repeller only within a tenth of maxJump. Returns for each side the index matched on the
 * other (or -1).
 */
function link(prev: readonly Equilibrium[], cur: readonly Equilibrium[], maxJump: number): [number[], number[]] {
  const mp = prev.map(() => -1), mc = cur.map(() => -1);
  const pairs: Array<[number, number, number]> = [];
  prev.forEach((a, i) => cur.forEach((b, j) => { const d = Math.abs(a.value - b.value); if (d <= maxJump) pairs.push([d, i, j]); }));
  pairs.sort((x, y) => x[0] - y[0]);
  for (const sameOnly of [true, false]) {
    for (const [d, i, j] of pairs) {
      if (mp[i] >= 0 || mc[j] >= 0) continue;
      const a = prev[i].stability, b = cur[j].stability;
      if (a !== b && (sameOnly || (a !== 'semi-stable' && b !== 'semi-stable' && d > STABILITY_CHANGE_JUMP * maxJump))) continue;
      mp[i] = j; mc[j] = i;
    }
  }
  return [mp, mc];
}

/**
 * Unmatched equilibria that can be the two sides of a fold: every two neighbours (in value
 * order) that are an attractor and a repeller, both unmatched, and every lone unmatched
 * semi-stable point. Where three unmatched neighbours alternate (a fold pair beside an
 * equilibrium entering the range), both pairs are candidates; the fold search rejects the
 * pair that has no fold between it.
 */
function pairsWithout(list: readonly Equilibrium[], match: readonly number[]): Equilibrium[][] {
  const out: Equilibrium[][] = [];
  const hard = (e: Equilibrium) => e.stability !== 'semi-stable';
  for (let i = 0; i < list.length; i++) {
    if (match[i] >= 0) continue;
    const a = list[i], b = list[i + 1];
    if (b && match[i + 1] < 0 && hard(a) && hard(b) && a.stability !== b.stability) out.push([a, b]);
    if (!hard(a)) out.push([a]);
  }
  return out;
}

interface FoldContext {
  readonly f: (y: number, p: number) => number;
  readonly yFrom: number;
  readonly yTo: number;
  /** The grid step that holds the fold: the pair exists at one end and not at the other. */
  readonly pA: number;
  readonly pB: number;
  /** Width of the whole parameter range (the scale for steps in p). */
  readonly pRange: number;
  readonly pair: Fold['pair'];
  readonly members: readonly Equilibrium[];
  /** The parameter at which `members` were found. */
  readonly pSeed: number;
  readonly budget: number;
  used: number;
}

class FoldBudget extends Error {}

function evalIn(c: FoldContext, y: number, p: number): number {
  if (c.used >= c.budget) throw new FoldBudget();
  c.used++;
  charge();
  try { const v = c.f(y, p); return typeof v === 'number' ? v : NaN; } catch { return NaN; }
}

function locateFold(c: FoldContext): Fold | null {
  const values = c.members.map((m) => m.value);
  const y0 = values.reduce((s, v) => s + v, 0) / values.length;
  const lone = c.members.length === 1;
  // what the grid alone says: a lone semi-stable point is on the fold to the grid's accuracy;
  // a pair's fold lies within the step, near the pair's middle
  const grid: Fold = { parameter: lone ? c.pSeed : 0.5 * (c.pA + c.pB), value: y0, pair: c.pair, method: 'grid', converged: false };
  try {
    const n = newtonFold(c, y0, c.pSeed);
    if (n) return { parameter: n.p, value: n.y, pair: c.pair, method: 'newton', converged: true };
    if (lone) return grid;
    const b = bisectFold(c);
    return b ? { parameter: b.p, value: b.y, pair: c.pair, method: 'bisection', converged: b.converged } : null;
  } catch (e) {
    if (!(e instanceof FoldBudget)) throw e;
    return grid;
  }
}

/**
 * Newton's method on F(y, p) = (f, f_y) = 0 with f_y a central difference, and the Jacobian
 * [[f_y, f_p], [f_yy, f_yp]] by differences. Returns null when it fails or converges outside
 * the grid step.
 */
function newtonFold(c: FoldContext, y: number, p: number): { y: number; p: number } | null {
  const yWidth = c.yTo - c.yFrom, step = Math.abs(c.pB - c.pA);
  const pLo = Math.min(c.pA, c.pB) - STEP_SLACK * step, pHi = Math.max(c.pA, c.pB) + STEP_SLACK * step;
  const f = (yy: number, pp: number) => evalIn(c, yy, pp);
  let last = Infinity;
  for (let it = 0; it < NEWTON_MAX_ITERATIONS; it++) {
    const ys = Math.max(Math.abs(y), yWidth), ps = Math.max(Math.abs(p), c.pRange);
    const hy = STEP1 * ys, hp = STEP1 * ps, ky = STEP2 * ys, kp = STEP2 * ps;
    const f0 = f(y, p);
    const fy = (f(y + hy, p) - f(y - hy, p)) / (2 * hy);
    const fp = (f(y, p + hp) - f(y, p - hp)) / (2 * hp);
    const fyy = (f(y + ky, p) - 2 * f0 + f(y - ky, p)) / (ky * ky);
    const fyp = (f(y + ky, p + kp) - f(y + ky, p - kp) - f(y - ky, p + kp) + f(y - ky, p - kp)) / (4 * ky * kp);
    const det = fy * fyp - fp * fyy;
    if (!Number.isFinite(det) || det === 0 || !Number.isFinite(f0) || !Number.isFinite(fy)) return null;
    const dy = (-f0 * fyp + fp * fy) / det;
    const dp = (-fy * fy + fyy * f0) / det;
    y += dy; p += dp;
    if (!Number.isFinite(y) || !Number.isFinite(p) || y < c.yFrom - 0.5 * yWidth || y > c.yTo + 0.5 * yWidth) return null;
    // the size of the step relative to the ranges: converged when tiny, or when small and no
    // longer shrinking (the rounding in the differences sets a floor)
    const size = Math.max(Math.abs(dy) / (yWidth + 4 * EPS * Math.abs(y)), Math.abs(dp) / (c.pRange + 4 * EPS * Math.abs(p)));
    if (size <= NEWTON_TOL || (size <= NEWTON_FLOOR && size >= 0.5 * last)) {
      return p < pLo || p > pHi || y < c.yFrom || y > c.yTo ? null : { y, p };
    }
    last = size;
  }
  return null;
}

/**
 * Bisection on p between the step end where the pair exists and the one where it does not,
 * with "max of σ·f over the pair's window > 0" as the test (σ the sign of f between them).
 */
function bisectFold(c: FoldContext): { y: number; p: number; converged: boolean } | null {
  const [a, b] = c.members;
  const sigma = a.right === '+' ? 1 : a.right === '-' ? -1 : 0;
  if (sigma === 0) return null;
  const margin = 0.5 * (b.value - a.value);
  const lo = Math.max(c.yFrom, a.value - margin), hi = Math.min(c.yTo, b.value + margin);
  const yWidth = c.yTo - c.yFrom;
  const peak = (p: number) => {
    const m = brentMinimize((y) => -sigma * evalIn(c, y, p), lo, hi, { xtol: 1e-12 * yWidth, maxIterations: 100 });
    return { y: m.x, value: -m.fx };
  };
  let pIn = c.pair === 'vanishes' ? c.pA : c.pB, pOut = c.pair === 'vanishes' ? c.pB : c.pA;
  const atIn = peak(pIn), atOut = peak(pOut);
  if (!(atIn.value > 0) || atOut.value > 0) return null; // not a fold between these steps
  let best = atIn;
  const tol = 4 * EPS * Math.max(Math.abs(pIn), Math.abs(pOut)) + BISECTION_TOL_OF_STEP * Math.abs(pOut - pIn);
  for (let it = 0; it < BISECTION_MAX_ITERATIONS; it++) {
    if (Math.abs(pOut - pIn) <= tol) return { y: best.y, p: 0.5 * (pIn + pOut), converged: true };
    const pm = 0.5 * (pIn + pOut);
    const at = peak(pm);
    if (at.value > 0) { pIn = pm; best = at; } else pOut = pm;
  }
  return { y: best.y, p: 0.5 * (pIn + pOut), converged: false };
}
