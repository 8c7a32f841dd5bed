/**
 * Where a one-state autonomous law y' = f(y) settles: every equilibrium in [from, to], its
 * stability, the poles, jumps and gaps where f is not a value that can be crossed, the
 * intervals where f is identically zero, and the sign of f between them.
 *
 * Plain numbers in, plain numbers out (SI magnitudes in practice); no units, no study model.
 *
 * The method, in order (each step is common practice for bracketing all zeros of a black-box
 * function; the refinements are Brent's):
 * 1. Sample f on a uniform grid of panels, then bisect panels where f changes a lot or bends
 *    a lot relative to its typical size (breadth first, a fixed depth and a share of the budget).
 * 2. Where f is not finite, locate the ends of the gap by bisection; a gap that shrinks to a
 *    point across which |f| grows is a pole.
 * 3. Across each sign change, Brent's zero (`brentRoot`); the bracket then tells a zero (|f|
 *    falls to nothing) from a pole (|f| grows without bound) from a jump (neither).
 * 4. At each local minimum of |f| on the grid with no sign change nearby, Brent's `localmin` on
 *    sign·f: if it goes below zero it has split a hidden pair of zeros (each then polished by
 *    Brent); if its minimum is zero to within the tolerance it is a touching zero (a double
 *    root), whose location is polished as a zero of f'. Large local maxima of |f| are checked
 *    the same way for poles that do not change sign (1/y²).
 * 5. Each equilibrium is classified from the sign of f at a small offset on each side (scaled
 *    to the grid spacing and to the distance to the next feature), with f'(y*) by a central
 *    difference (or the caller's derivative) as a cross-check.
 *
 * Tolerances scale with the problem: locations with the width of [from, to] (and |y|), values
 * of f with its size nearby (the largest |f| on the initial grid within two cells), so kelvin
 * near 300, concentrations near 1e-6 and exp(y) over fifty units all behave alike. Work is
 * bounded by `maxEvaluations` (default 3000); hitting it is reported, never an exception.
 *
 * Limits (what sampling cannot see): two zeros so close that f between them stays within the
 * zero tolerance are one semi-stable point (with the defaults, zeros closer than about 1e-6 of
 * the range's width may merge); three or more zeros inside one grid cell across which f changes sign show
 * as one; a gap or a spike narrower than a cell is found only when a sample, Brent or the
 * minimiser lands in it; a zero at a corner of f (a kink) is classified by the signs, with a
 * warning that the difference slope disagrees.
 *
 * This file holds the entry (argument checks, budget shares, the order of the steps); the
 * steps live beside it: `grid.ts` (step 1), `gaps.ts` (step 2), `zeros.ts` (steps 3–4),
 * `classify.ts` (step 5), `sign-intervals.ts` (the sign of f between features), `search.ts`
 * (the shared evaluator and tolerances), `types.ts` (the public shapes).
 */
import { classify, dedupe, probeSide, uniquePoints } from './classify.ts';
import { locateGaps } from './gaps.ts';
import { nearbySize, refine, sortedSamples, typicalSize } from './grid.ts';
import { BudgetError, Evaluator, EPS, type Ctx, type Found } from './search.ts';
import { signIntervals } from './sign-intervals.ts';
import type { EquilibriumOptions, PhaseAnalysis, Singularity, Span } from './types.ts';
import { scanRuns } from './zeros.ts';

export type {
  Equilibrium, EquilibriumOptions, FSign, PhaseAnalysis, SignInterval, Singularity, Span, Stability,
} from './types.ts';

/** Defaults, see EquilibriumOptions. */
const DEFAULT_PANELS = 32;
const DEFAULT_MAX_DEPTH = 6;
const DEFAULT_MAX_EVALUATIONS = 3000;
const DEFAULT_ZERO_TOLERANCE = 1e-10;
/** Location tolerance relative to the width of the range. */
const DEFAULT_XTOL_OF_WIDTH = 1e-12;
/** |f| below NOISE times the local size of f is taken as rounding, with no sign, when probing beside a point. */
const NOISE = 1e-13;
/** Share of the budget the grid refinement may use, and the share kept for classification. */
const REFINE_SHARE = 0.3;
const CLASSIFY_SHARE = 0.1;

function checkPositiveInt(name: string, v: number, min: number): number {
  if (!Number.isInteger(v) || v < min) throw new RangeError(`${name} must be an integer >= ${min}; it is ${v}`);
  return v;
}
function checkNonNegative(name: string, v: number): number {
  if (!Number.isFinite(v) || v < 0) throw new RangeError(`${name} must be a finite number >= 0; it is ${v}`);
  return v;
}

/**
 * Every equilibrium of y' = f(y) in [from, to] with its stability, and the sign of f between
 * (see the module comment for the method). `from` < `to`, both finite. Bounded work: at most
 * `maxEvaluations` calls of f (default 3000; a smooth law with a few equilibria takes 100–200).
 * Throws only for invalid arguments (a RangeError naming the option).
 */
export function findEquilibria(
  f: (y: number) => number, from: number, to: number, options: EquilibriumOptions = {},
): PhaseAnalysis {
  if (typeof f !== 'function') throw new TypeError('f must be a function of one number');
  if (!Number.isFinite(from)) throw new RangeError(`from must be a finite number; it is ${from}`);
  if (!Number.isFinite(to)) throw new RangeError(`to must be a finite number; it is ${to}`);
  if (!(from < to)) throw new RangeError(`from must be less than to; they are ${from} and ${to}`);
  const panels = checkPositiveInt('panels', options.panels ?? DEFAULT_PANELS, 1);
  const maxDepth = checkPositiveInt('maxDepth', options.maxDepth ?? DEFAULT_MAX_DEPTH, 0);
  const maxEvaluations = checkPositiveInt('maxEvaluations', options.maxEvaluations ?? DEFAULT_MAX_EVALUATIONS, 2 * panels + 1);
  const width = to - from;
  const xtol = checkNonNegative('xtol', options.xtol ?? DEFAULT_XTOL_OF_WIDTH * width);
  const rtol = Math.max(checkNonNegative('rtol', options.rtol ?? 4 * EPS), 4 * EPS);
  const zeroTolerance = checkNonNegative('zeroTolerance', options.zeroTolerance ?? DEFAULT_ZERO_TOLERANCE);
  if (options.derivative !== undefined && typeof options.derivative !== 'function') throw new TypeError('derivative must be a function of one number');

  const ev = new Evaluator(f, maxEvaluations);
  const warnings: string[] = [];

  // 1. The grid: 2·panels + 1 samples (ends exact).
  const ys: number[] = [], fs: number[] = [];
  const n0 = 2 * panels;
  for (let i = 0; i <= n0; i++) {
    const y = i === n0 ? to : from + (width * i) / n0;
    ys.push(y); fs.push(ev.at(y));
  }
  const fScale = typicalSize(fs);
  const localScale = nearbySize(fs, from, width / n0);
  const noiseTolerance = Math.min(NOISE, zeroTolerance);
  const c: Ctx = {
    ev, from, to, width, xtol, rtol, fScale, localScale,
    zeroAt: (y) => zeroTolerance * localScale(y), noiseAt: (y) => noiseTolerance * localScale(y),
    derivative: options.derivative, warnings, gaps: [], exhausted: false,
  };

  // Grid refinement, breadth first.
  ev.limit = Math.max(ev.count, Math.floor(REFINE_SHARE * maxEvaluations));
  const cut = refine(c, ys, fs, panels, maxDepth);
  if (cut) { c.exhausted = true; warnings.push('grid refinement stopped at its share of the evaluation budget'); }

  // 2–4. Discovery, with the budget less the share kept for classification.
  ev.limit = Math.max(ev.count, maxEvaluations - Math.floor(CLASSIFY_SHARE * maxEvaluations));
  const [Y, F] = sortedSamples(ys, fs);
  const found: Found[] = [];
  const gaps = c.gaps;
  const zeroIntervals: Span[] = [];
  try {
    locateGaps(c, Y, F, gaps, found);
    scanRuns(c, Y, F, found, zeroIntervals);
  } catch (e) {
    if (!(e instanceof BudgetError)) throw e;
    c.exhausted = true;
    warnings.push(`the evaluation budget (${maxEvaluations}) ran out while searching; some equilibria may be missing`);
  }

  // 5. Classification and the sign intervals, with whatever budget is left.
  ev.limit = maxEvaluations;
  const roots = dedupe(c, found.filter((x): x is Extract<Found, { kind: 'root' }> => x.kind === 'root'), zeroIntervals);
  const poles = uniquePoints(c, found.filter((x) => x.kind === 'pole').map((x) => x.y));
  const jumpsAt = uniquePoints(c, found.filter((x) => x.kind === 'jump').map((x) => x.y));
  const points = [...roots.map((r) => r.y), ...poles, ...jumpsAt].sort((a, b) => a - b);
  const spans = [...gaps, ...zeroIntervals];
  const equilibria = roots.map((r) => classify(c, r.y, r.converged, { Y, F }, points, spans));
  const singular = (at: number): Singularity => ({ at, left: probeSide(c, at, -1, { Y, F }, points, spans), right: probeSide(c, at, 1, { Y, F }, points, spans) });
  const intervals = signIntervals(c, Y, F, points, gaps, zeroIntervals, equilibria);
  if (c.exhausted && !warnings.some((w) => w.includes('budget'))) warnings.push(`the evaluation budget (${maxEvaluations}) ran out`);
  return {
    equilibria, poles: poles.map(singular), jumps: jumpsAt.map(singular),
    gaps: gaps.sort((a, b) => a.from - b.from), zeroIntervals: zeroIntervals.sort((a, b) => a.from - b.from),
    intervals, evaluations: ev.count, budgetExhausted: c.exhausted, warnings,
    scale: { f: fScale },
  };
}
