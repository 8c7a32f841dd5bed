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
 */
import { brentMinimize, brentRoot } from '../brent.ts';

export type Stability = 'attractor' | 'repeller' | 'semi-stable';
/** The sign of f somewhere: rising, falling, or zero to within the tolerance. */
export type FSign = '+' | '-' | '0';

export interface Equilibrium {
  /** y* with f(y*) = 0. */
  readonly value: number;
  readonly stability: Stability;
  /** f'(y*): the caller's derivative when given and finite, else the central difference. */
  readonly slope: number;
  readonly slopeSource: 'derivative' | 'difference';
  /** The central-difference estimate of f'(y*) (NaN when f is not defined on either side). */
  readonly slopeDifference: number;
  /** Sign of f just below and just above y* (null where f is not defined there). */
  readonly left: FSign | null;
  readonly right: FSign | null;
  /** f(y*) as evaluated. */
  readonly residual: number;
  /** False when the slope's sign contradicts the side signs (a warning says so too). */
  readonly consistent: boolean;
  /** False when the location could not be refined to tolerance (budget or a failed search). */
  readonly converged: boolean;
}

/** A point where f is not crossed continuously: |f| unbounded (pole) or a finite jump in sign. */
export interface Singularity {
  readonly at: number;
  readonly left: FSign | null;
  readonly right: FSign | null;
}

export interface Span {
  readonly from: number;
  readonly to: number;
}

/**
 * The sign of f on a piece of [from, to]. `from`/`to` null mean the range's own edge.
 * sign: '+' rising, '-' falling, '0' f identically zero there, 'none' f not defined (a gap).
 */
export interface SignInterval {
  readonly from: number | null;
  readonly to: number | null;
  readonly sign: '+' | '-' | '0' | 'none';
}

export interface PhaseAnalysis {
  /** In increasing order of value. */
  readonly equilibria: readonly Equilibrium[];
  /** Points where |f| grows without bound (with or without a change of sign). */
  readonly poles: readonly Singularity[];
  /** Points where f changes sign by a finite jump, without passing through zero. */
  readonly jumps: readonly Singularity[];
  /** Where f is not a finite number (NaN, ±Infinity, or f threw). */
  readonly gaps: readonly Span[];
  /** Where f is identically zero (every point there is an equilibrium). */
  readonly zeroIntervals: readonly Span[];
  /** Cover [from, to] in order, split at every equilibrium, pole, jump, gap and zero interval. */
  readonly intervals: readonly SignInterval[];
  /** Calls of f. */
  readonly evaluations: number;
  /** True when the evaluation budget cut the work short (the result may be incomplete). */
  readonly budgetExhausted: boolean;
  readonly warnings: readonly string[];
  /** Typical |f|: the median of |f| on the initial grid (zero itself is judged locally, see zeroTolerance). */
  readonly scale: { readonly f: number };
}

export interface EquilibriumOptions {
  /** Panels in the initial grid; each panel is two cells (default 32, so 65 samples). */
  readonly panels?: number;
  /** Levels of panel bisection allowed beyond the initial grid (default 6). */
  readonly maxDepth?: number;
  /** Hard cap on calls of f (default 3000). */
  readonly maxEvaluations?: number;
  /** Absolute location tolerance (default 1e-12 times the width of [from, to]). */
  readonly xtol?: number;
  /** Relative location tolerance (default 4 machine epsilons). */
  readonly rtol?: number;
  /**
   * |f| at or below this fraction of the local size of f (the largest |f| on the initial grid
   * within two cells) counts as zero (default 1e-10). Local, so that exp(y) - 5 on [0, 50] is
   * judged near its root by values near its root.
   */
  readonly zeroTolerance?: number;
  /** f'(y), when known exactly: used for the reported slope and to polish touching zeros. */
  readonly derivative?: (y: number) => number;
}

/** Defaults, see EquilibriumOptions. */
const DEFAULT_PANELS = 32;
const DEFAULT_MAX_DEPTH = 6;
const DEFAULT_MAX_EVALUATIONS = 3000;
const DEFAULT_ZERO_TOLERANCE = 1e-10;
/** Location tolerance relative to the width of the range. */
const DEFAULT_XTOL_OF_WIDTH = 1e-12;
const EPS = Number.EPSILON;
/** |f| below NOISE times the local size of f is taken as rounding, with no sign, when probing beside a point. */
const NOISE = 1e-13;
/** Share of the budget the grid refinement may use, and the share kept for classification. */
const REFINE_SHARE = 0.3;
const CLASSIFY_SHARE = 0.1;
/** A panel is bisected when its values vary by more than 2·(least |f|) + typical |f| ... */
const VARIATION_FACTOR = 2;
/** ... or its second difference exceeds this fraction of (least |f| + typical |f|). */
const CURVATURE_FACTOR = 0.5;
/** Across a converged sign-change bracket: |f| fallen by this factor is a zero ... */
const ROOT_DROP = 1e-3;
/** ... grown by this factor is a pole; anything between is a jump. */
const POLE_GROWTH = 1e3;
/** A grid minimum of |f| is not searched when the parabola through it stays above PRUNE times its depth. */
const PRUNE = 8;
/** Local maxima of |f| below this multiple of the typical |f| are not examined as poles. */
const POLE_CANDIDATE = 10;
/** Side-sign probing: first offset as a fraction of the local spacing, growth factor, tries. */
const SIDE_FRACTION = 0.25;
const SIDE_GROWTH = 4;
const SIDE_TRIES = 4;
/** Beside a zero, an odd part of f below this fraction of the even part means a touching zero. */
const EVEN_DOMINATES = 0.1;
/** Steps for differences: cube root of epsilon for first derivatives (common practice). */
const DIFF_STEP = Math.cbrt(EPS);

/** Iteration cap for one Brent zero: a triple root converges only linearly and may need ~100. */
const BRENT_MAX_ITERATIONS = 200;
/** Iteration cap for one Brent minimisation (a local minimum or maximum of f). */
const MINIMIZE_MAX_ITERATIONS = 200;

class BudgetError extends Error {}

/** Calls f, counts the calls, and refuses past the current limit. A throw from f is NaN. */
class Evaluator {
  count = 0;
  limit: number;
  constructor(private readonly f: (y: number) => number, readonly cap: number) { this.limit = cap; }
  get left(): number { return this.limit - this.count; }
  at(y: number): number {
    if (this.count >= this.limit) throw new BudgetError();
    this.count++;
    let v: unknown;
    try { v = this.f(y); } catch { v = NaN; }
    return typeof v === 'number' ? v : NaN;
  }
}

type Found =
  | { kind: 'root'; y: number; converged: boolean }
  | { kind: 'pole' | 'jump'; y: number };

interface Ctx {
  readonly ev: Evaluator;
  readonly from: number;
  readonly to: number;
  readonly width: number;
  readonly xtol: number;
  readonly rtol: number;
  /** Typical |f|: the median over the initial grid. */
  readonly fScale: number;
  /** The largest |f| on the initial grid within two cells of y: the scale zero is judged against there. */
  readonly localScale: (y: number) => number;
  /** |f| at or below this counts as zero at y. */
  readonly zeroAt: (y: number) => number;
  /** |f| at or below this is rounding at y: it carries no sign. */
  readonly noiseAt: (y: number) => number;
  readonly derivative?: (y: number) => number;
  readonly warnings: string[];
  /** Gaps found so far (a sign change can reveal one). */
  readonly gaps: Span[];
  exhausted: boolean;
}

const tolAt = (c: Ctx, y: number): number => c.xtol + c.rtol * Math.abs(y);
const signOf = (c: Ctx, v: number, floor: number): FSign | null =>
  !Number.isFinite(v) ? null : Math.abs(v) <= floor ? '0' : v > 0 ? '+' : '-';

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

/** The samples in increasing order of y (the grid's refinements are appended out of order). */
function sortedSamples(ys: readonly number[], fs: readonly number[]): [number[], number[]] {
  let inOrder = true;
  for (let i = 1; i < ys.length && inOrder; i++) inOrder = ys[i - 1] < ys[i];
  if (inOrder) return [ys as number[], fs as number[]];
  const order = new Uint32Array(ys.length);
  for (let i = 0; i < order.length; i++) order[i] = i;
  order.sort((a, b) => ys[a] - ys[b]);
  const Y = new Array<number>(ys.length), F = new Array<number>(ys.length);
  for (let i = 0; i < order.length; i++) { Y[i] = ys[order[i]]; F[i] = fs[order[i]]; }
  return [Y, F];
}

/** The median of |f| over the finite nonzero samples: the typical size of f, robust to poles. */
function typicalSize(fs: readonly number[]): number {
  const a: number[] = [];
  for (const v of fs) if (Number.isFinite(v) && v !== 0) a.push(Math.abs(v));
  const n = a.length;
  if (n === 0) return 0;
  const hi = select(a, n >> 1);
  return n % 2 ? hi : 0.5 * (select(a, (n >> 1) - 1) + hi);
}

/** The k-th smallest element (0-based), by Hoare's quickselect (CACM 1961, Algorithm 65); reorders a. */
function select(a: number[], k: number): number {
  let lo = 0, hi = a.length - 1;
  while (lo < hi) {
    const pivot = a[(lo + hi) >> 1];
    let i = lo, j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) { const t = a[i]; a[i] = a[j]; a[j] = t; i++; j--; }
    }
    if (k <= j) hi = j; else if (k >= i) lo = i; else return a[k];
  }
  return a[k];
}

/** Local size of f: the largest finite |f| among the initial grid samples within two cells of y. */
function nearbySize(grid: readonly number[], from: number, h: number): (y: number) => number {
  const n = grid.length;
  const abs = new Float64Array(n), window = new Float64Array(n);
  for (let i = 0; i < n; i++) abs[i] = Number.isFinite(grid[i]) ? Math.abs(grid[i]) : 0;
  for (let i = 0; i < n; i++) {
    let m = abs[i];
    if (i > 0 && abs[i - 1] > m) m = abs[i - 1];
    if (i > 1 && abs[i - 2] > m) m = abs[i - 2];
    if (i + 1 < n && abs[i + 1] > m) m = abs[i + 1];
    if (i + 2 < n && abs[i + 2] > m) m = abs[i + 2];
    window[i] = m;
  }
  return (y) => window[Math.min(n - 1, Math.max(0, Math.round((y - from) / h)))];
}

/**
 * Bisects panels (three samples a, m, b) where f changes a lot or bends a lot, measured
 * against the least |f| in the panel plus the typical |f| (so that large, smooth values, as
 * near the top of an exponential, are left alone). Returns true when the budget cut it short.
 */
function refine(c: Ctx, ys: number[], fs: number[], panels: number, maxDepth: number): boolean {
  const queue: Array<[number, number, number, number]> = []; // indices a, m, b and depth
  for (let p = 0; p < panels; p++) queue.push([2 * p, 2 * p + 1, 2 * p + 2, 0]);
  for (let head = 0; head < queue.length; head++) {
    const [a, m, b, depth] = queue[head];
    if (depth >= maxDepth) continue;
    const fa = fs[a], fm = fs[m], fb = fs[b];
    if (!Number.isFinite(fa) || !Number.isFinite(fm) || !Number.isFinite(fb)) continue;
    const least = Math.min(Math.abs(fa), Math.abs(fm), Math.abs(fb));
    const variation = Math.max(fa, fm, fb) - Math.min(fa, fm, fb);
    const bend = Math.abs(fa - 2 * fm + fb);
    if (variation <= VARIATION_FACTOR * least + c.fScale && bend <= CURVATURE_FACTOR * (least + c.fScale)) continue;
    if (c.ev.left < 2) return true;
    const yl = 0.5 * (ys[a] + ys[m]), yr = 0.5 * (ys[m] + ys[b]);
    if (!(yl > ys[a] && yl < ys[m] && yr > ys[m] && yr < ys[b])) continue; // at the resolution of doubles
    const l = ys.length;
    ys.push(yl, yr); fs.push(c.ev.at(yl), c.ev.at(yr));
    queue.push([a, l, m, depth + 1], [m, l + 1, b, depth + 1]);
  }
  return false;
}

/**
 * Bisection for the edge between a point where f is finite and one where it is not, to the
 * location tolerance. Returns the last finite point found and f there.
 */
function finiteEdge(c: Ctx, yFinite: number, fFinite: number, yBad: number): { y: number; f: number } {
  let g = yFinite, fg = fFinite, b = yBad;
  while (Math.abs(b - g) > tolAt(c, g)) {
    const m = 0.5 * (g + b);
    if (m === g || m === b) break;
    const fm = c.ev.at(m);
    if (Number.isFinite(fm)) { g = m; fg = fm; } else b = m;
  }
  return { y: g, f: fg };
}

/**
 * Gaps: each run of non-finite samples becomes a span whose ends are located by bisection;
 * the last finite points found are added to the samples (so runs start at the gap's edge).
 * A gap that shrinks to a point across which |f| grows is a pole instead. A root where f
 * tends to zero at a gap's edge (f = sqrt(y) at 0) is recorded as an equilibrium there.
 */
function locateGaps(c: Ctx, Y: number[], F: number[], gaps: Span[], found: Found[]): void {
  const extra: Array<[number, number]> = [];
  for (let i = 0; i < Y.length; i++) {
    if (Number.isFinite(F[i])) continue;
    let j = i;
    while (j + 1 < Y.length && !Number.isFinite(F[j + 1])) j++;
    const left = i > 0 ? finiteEdge(c, Y[i - 1], F[i - 1], Y[i]) : undefined;
    const right = j + 1 < Y.length ? finiteEdge(c, Y[j + 1], F[j + 1], Y[j]) : undefined;
    const from = left ? left.y : c.from, to = right ? right.y : c.to;
    if (left) extra.push([left.y, left.f]);
    if (right) extra.push([right.y, right.f]);
    const point = left && right && to - from <= 4 * (tolAt(c, from) + tolAt(c, to));
    const grew = (e: { f: number }, k: number) => Math.abs(e.f) >= POLE_GROWTH * Math.abs(F[k]);
    if (point && grew(left, i - 1) && grew(right, j + 1)) found.push({ kind: 'pole', y: 0.5 * (from + to) });
    else gaps.push({ from, to });
    // f tending to zero at the edge of its domain
    for (const [e, k] of [[left, i - 1], [right, j + 1]] as const) {
      if (!e || point) continue;
      const fe = Math.abs(e.f);
      if (fe <= c.zeroAt(e.y) || (fe <= ROOT_DROP * Math.abs(F[k]) && Math.sign(e.f) === Math.sign(F[k]))) {
        found.push({ kind: 'root', y: e.y, converged: true });
      }
    }
    i = j;
  }
  if (extra.length === 0) return;
  const all = Y.map((y, k) => [y, F[k]] as [number, number]).concat(extra).sort((a, b) => a[0] - b[0]);
  Y.length = 0; F.length = 0;
  for (const [y, v] of all) {
    if (Y.length && y === Y[Y.length - 1]) continue;
    Y.push(y); F.push(v);
  }
}

/**
 * Brent on a sign-change bracket, then zero, pole or jump from how |f| behaved. Where Brent
 * meets a point at which f is not finite, the gap around it is located and each finite side
 * is searched in turn (bounded by the budget).
 */
function resolveSignChange(c: Ctx, a: number, fa: number, b: number, fb: number, found: Found[]): void {
  const cap = Math.min(BRENT_MAX_ITERATIONS, c.ev.left);
  const r = brentRoot((y) => c.ev.at(y), a, b, { xtol: c.xtol, rtol: c.rtol, maxIterations: Math.max(0, cap - 1) }, fa, fb);
  if (r.status === 'iteration-limit' && cap < BRENT_MAX_ITERATIONS) c.exhausted = true;
  if (r.status === 'non-finite') { hiddenGap(c, a, fa, b, fb, r.root, found); return; }
  if (r.status === 'exact-zero') { found.push({ kind: 'root', y: r.root, converged: true }); return; }
  const end = Math.min(Math.abs(r.fBracket[0]), Math.abs(r.fBracket[1]));
  if (end <= c.zeroAt(r.root) || end <= ROOT_DROP * Math.min(Math.abs(fa), Math.abs(fb))) {
    found.push({ kind: 'root', y: r.root, converged: r.converged });
  } else if (end >= POLE_GROWTH * Math.max(Math.abs(fa), Math.abs(fb))) {
    found.push({ kind: 'pole', y: 0.5 * (r.bracket[0] + r.bracket[1]) });
  } else if (r.converged) {
    found.push({ kind: 'jump', y: 0.5 * (r.bracket[0] + r.bracket[1]) });
  } else {
    found.push({ kind: 'root', y: r.root, converged: false });
    c.warnings.push(`the sign change between ${a} and ${b} was not resolved to tolerance`);
  }
}

/** A gap found inside a cell at x: its ends by bisection, then the finite sides searched. */
function hiddenGap(c: Ctx, a: number, fa: number, b: number, fb: number, x: number, found: Found[]): void {
  const left = finiteEdge(c, a, fa, x), right = finiteEdge(c, b, fb, x);
  c.gaps.push({ from: left.y, to: right.y });
  for (const [y0, f0, e] of [[a, fa, left], [b, fb, right]] as const) {
    if (Math.abs(e.f) <= c.zeroAt(e.y)) found.push({ kind: 'root', y: e.y, converged: true });
    else if (e.y !== y0 && Math.sign(e.f) !== Math.sign(f0)) {
      if (y0 < e.y) resolveSignChange(c, y0, f0, e.y, e.f, found);
      else resolveSignChange(c, e.y, e.f, y0, f0, found);
    }
  }
}

/** Vertex value of the parabola through three points, or NaN when it has no interior vertex. */
function parabolaMin(x0: number, f0: number, x1: number, f1: number, x2: number, f2: number): number {
  const d01 = (f1 - f0) / (x1 - x0), d12 = (f2 - f1) / (x2 - x1);
  const a = (d12 - d01) / (x2 - x0); // leading coefficient
  if (!(a > 0)) return NaN;
  const xv = 0.5 * (x0 + x1) - d01 / (2 * a);
  if (xv < x0 || xv > x2) return NaN;
  return f1 + d01 * (xv - x1) + a * (xv - x0) * (xv - x1);
}

/** The derivative for polishing: the caller's, or a central difference. */
function slopeFn(c: Ctx, y0: number): (y: number) => number {
  if (c.derivative) { const d = c.derivative; return (y) => { try { return d(y); } catch { return NaN; } }; }
  const h = DIFF_STEP * Math.max(Math.abs(y0), c.width);
  return (y) => (c.ev.at(y + h) - c.ev.at(y - h)) / (2 * h);
}

/**
 * A local minimum of s·f on [L, R] (s the sign of f on the grid there): a dip below zero by
 * more than the zero tolerance splits into two sign changes; a minimum within the tolerance
 * of zero (either side: rounding in f can make a double zero dip slightly) is a touching
 * zero, polished as a zero of f'.
 */
function examineMinimum(c: Ctx, L: number, fL: number, R: number, fR: number, s: number, found: Found[]): void {
  const cap = Math.min(MINIMIZE_MAX_ITERATIONS, c.ev.left);
  const m = brentMinimize((y) => s * c.ev.at(y), L, R, {
    xtol: c.xtol, maxIterations: Math.max(0, cap - 2), stop: (x, v) => v < -c.zeroAt(x),
  });
  if (m.status === 'iteration-limit' && cap < MINIMIZE_MAX_ITERATIONS) c.exhausted = true;
  if (m.status === 'stopped') {
    const fc = s * m.fx;
    resolveSignChange(c, L, fL, m.x, fc, found);
    resolveSignChange(c, m.x, fc, R, fR, found);
    return;
  }
  if (!(m.fx <= c.zeroAt(m.x))) return;
  let y = m.x, fy = s * m.fx;
  // polish: the zero of f' near the minimum (f is flat there, f' is not)
  const w = Math.min(64 * Math.sqrt(EPS) * Math.max(Math.abs(y), c.width), 0.5 * (R - L));
  const lo = Math.max(L, y - w), hi = Math.min(R, y + w);
  if (hi > lo) {
    const g = slopeFn(c, y);
    const glo = g(lo), ghi = g(hi);
    if (Number.isFinite(glo) && Number.isFinite(ghi) && Math.sign(glo) !== Math.sign(ghi)) {
      const budget = Math.floor(Math.min(60, c.ev.left) / (c.derivative ? 1 : 2));
      const r = brentRoot(g, lo, hi, { xtol: c.xtol, rtol: c.rtol, maxIterations: Math.max(0, budget - 2) }, glo, ghi);
      if (r.converged) {
        const fp = c.ev.at(r.root);
        if (Math.abs(fp) <= Math.max(Math.abs(fy), c.zeroAt(y))) { y = r.root; fy = fp; }
      }
    }
  }
  found.push({ kind: 'root', y, converged: m.converged });
}

/** A large local maximum of |f|: a pole when |f| grows without bound toward a point. */
function examineMaximum(c: Ctx, L: number, R: number, s: number, peak: number, found: Found[]): void {
  const cap = Math.min(MINIMIZE_MAX_ITERATIONS, c.ev.left);
  const m = brentMinimize((y) => -s * c.ev.at(y), L, R, {
    xtol: c.xtol, maxIterations: Math.max(0, cap - 2), stop: (_, v) => !Number.isFinite(v),
  });
  if (m.status === 'stopped' || Math.abs(m.fx) >= POLE_GROWTH * Math.abs(peak)) found.push({ kind: 'pole', y: m.x });
}

/**
 * The scan of each run of finite samples: zero samples (points or intervals), sign changes,
 * and the local minima and large maxima of |f| where the sign does not change.
 */
function scanRuns(c: Ctx, Y: number[], F: number[], found: Found[], zeroIntervals: Span[]): void {
  const classes = F.map((v, k) => (Number.isFinite(v) ? signOf(c, v, c.zeroAt(Y[k]))! : 'x' as const));
  const cls = (k: number): FSign | 'x' => classes[k];
  const n = Y.length;
  let s = 0;
  while (s < n) {
    if (cls(s) === 'x') { s++; continue; }
    let e = s;
    while (e + 1 < n && cls(e + 1) !== 'x') e++;
    scanRun(c, Y, F, s, e, cls, found, zeroIntervals);
    s = e + 1;
  }
}

function scanRun(
  c: Ctx, Y: number[], F: number[], s: number, e: number, cls: (k: number) => FSign | 'x',
  found: Found[], zeroIntervals: Span[],
): void {
  const isZero = (y: number) => { const v = c.ev.at(y); return Number.isFinite(v) && Math.abs(v) <= c.zeroAt(y); };
  const zeroEdge = (yNon: number, yZero: number): number => { // bisection on "f is zero"
    let a = yNon, b = yZero;
    while (Math.abs(b - a) > tolAt(c, b)) {
      const m = 0.5 * (a + b);
      if (m === a || m === b) break;
      if (isZero(m)) b = m; else a = m;
    }
    return b;
  };
  // zero samples
  for (let i = s; i <= e; i++) {
    if (cls(i) !== '0') continue;
    let j = i;
    while (j + 1 <= e && cls(j + 1) === '0') j++;
    let interval = j > i;
    if (interval) { // check between the zero samples (at most 8 places)
      const stride = Math.max(1, Math.ceil((j - i) / 8));
      for (let k = i; k < j && interval; k += stride) interval = isZero(0.5 * (Y[k] + Y[k + 1]));
    }
    if (interval) {
      zeroIntervals.push({ from: i > s ? zeroEdge(Y[i - 1], Y[i]) : Y[i], to: j < e ? zeroEdge(Y[j + 1], Y[j]) : Y[j] });
    } else {
      for (let k = i; k <= j; k++) zeroPoint(c, Y, F, k, s, e, found);
    }
    i = j;
  }
  // sign changes between neighbours
  for (let k = s; k < e; k++) {
    const a = cls(k), b = cls(k + 1);
    if ((a === '+' && b === '-') || (a === '-' && b === '+')) resolveSignChange(c, Y[k], F[k], Y[k + 1], F[k + 1], found);
  }
  // stretches of one sign: local minima (touching zeros, hidden pairs) and large maxima (poles)
  for (let u = s; u <= e; u++) {
    const sg = cls(u);
    if (sg !== '+' && sg !== '-') continue;
    let v = u;
    while (v + 1 <= e && cls(v + 1) === sg) v++;
    const sgn = sg === '+' ? 1 : -1;
    const A = (k: number) => Math.abs(F[k]);
    for (let k = u + 1; k < v; k++) {
      if (A(k) < A(k - 1) && A(k) <= A(k + 1)) {
        const q = parabolaMin(Y[k - 1], A(k - 1), Y[k], A(k), Y[k + 1], A(k + 1));
        const depth = Math.max(A(k - 1), A(k + 1)) - A(k);
        if (!(q > PRUNE * depth)) examineMinimum(c, Y[k - 1], F[k - 1], Y[k + 1], F[k + 1], sgn, found);
      } else if (A(k) > A(k - 1) && A(k) >= A(k + 1) && A(k) >= POLE_CANDIDATE * c.fScale) {
        examineMaximum(c, Y[k - 1], Y[k + 1], sgn, F[k], found);
      }
    }
    // ends of the run (the range's edge or a gap's edge), not ends next to a zero or a sign change
    if (u === s && v > u && A(u) < A(u + 1)) {
      const q = v >= u + 2 ? parabolaMin(Y[u], A(u), Y[u + 1], A(u + 1), Y[u + 2], A(u + 2)) : NaN;
      if (v < u + 2 || (q === q && !(q > PRUNE * (A(u + 1) - A(u))))) examineMinimum(c, Y[u], F[u], Y[u + 1], F[u + 1], sgn, found);
    }
    if (v === e && v > u && A(v) < A(v - 1)) {
      const q = v >= u + 2 ? parabolaMin(Y[v - 2], A(v - 2), Y[v - 1], A(v - 1), Y[v], A(v)) : NaN;
      if (v < u + 2 || (q === q && !(q > PRUNE * (A(v - 1) - A(v))))) examineMinimum(c, Y[v - 1], F[v - 1], Y[v], F[v], sgn, found);
    }
    u = v;
  }
}

/** Strictly opposite signs (a product would underflow for tiny values). */
const opposite = (a: number, b: number): boolean => (a > 0 && b < 0) || (a < 0 && b > 0);

/** A single sample where |f| is within the zero tolerance: exact, polished by Brent, or touching. */
function zeroPoint(c: Ctx, Y: number[], F: number[], k: number, s: number, e: number, found: Found[]): void {
  if (F[k] === 0) {
    found.push({ kind: 'root', y: Y[k], converged: true });
    // the same sign on both sides: a double zero, or a simple one with a second zero in a
    // neighbouring cell, which the dip between them reveals
    if (k > s && k < e && opposite(F[k - 1], -F[k + 1])) examineMinimum(c, Y[k - 1], F[k - 1], Y[k + 1], F[k + 1], Math.sign(F[k + 1]), found);
    return;
  }
  if (k > s && opposite(F[k - 1], F[k])) { resolveSignChange(c, Y[k - 1], F[k - 1], Y[k], F[k], found); return; }
  if (k < e && opposite(F[k + 1], F[k])) { resolveSignChange(c, Y[k], F[k], Y[k + 1], F[k + 1], found); return; }
  const sgn = Math.sign(F[k]);
  const L = k > s ? k - 1 : k, R = k < e ? k + 1 : k;
  const before = found.length;
  if (R > L) examineMinimum(c, Y[L], F[L], Y[R], F[R], sgn, found);
  if (found.length === before) found.push({ kind: 'root', y: Y[k], converged: true });
}

/** Roots sorted, with near-duplicates merged and those inside a zero interval dropped. */
function dedupe(c: Ctx, roots: Array<{ y: number; converged: boolean }>, zeroIntervals: readonly Span[]): Array<{ y: number; converged: boolean }> {
  const sorted = roots.filter((r) => !zeroIntervals.some((z) => r.y >= z.from - 2 * tolAt(c, z.from) && r.y <= z.to + 2 * tolAt(c, z.to)))
    .sort((a, b) => a.y - b.y);
  const out: Array<{ y: number; converged: boolean }> = [];
  for (const r of sorted) {
    const last = out[out.length - 1];
    if (last && r.y - last.y <= 4 * tolAt(c, r.y)) { if (!last.converged && r.converged) out[out.length - 1] = r; continue; }
    out.push(r);
  }
  return out;
}

function uniquePoints(c: Ctx, ys: number[]): number[] {
  const out: number[] = [];
  for (const y of ys.sort((a, b) => a - b)) if (!out.length || y - out[out.length - 1] > 4 * tolAt(c, y)) out.push(y);
  return out;
}

/** Distance from y to the nearest other feature in direction dir (Infinity when none). */
function roomOnSide(c: Ctx, y: number, dir: 1 | -1, points: readonly number[], spans: readonly Span[]): number {
  let room = Infinity;
  const tiny = 4 * tolAt(c, y);
  for (const p of points) { const d = dir * (p - y); if (d > tiny) room = Math.min(room, d); }
  for (const sp of spans) for (const p of [sp.from, sp.to]) { const d = dir * (p - y); if (d > tiny) room = Math.min(room, d); }
  return room;
}

/** The grid spacing at y (the width of the sample cell around it). */
function spacingAt(Y: readonly number[], y: number): number {
  let lo = 0, hi = Y.length - 1;
  while (hi - lo > 1) { const m = (lo + hi) >> 1; if (Y[m] <= y) lo = m; else hi = m; }
  let w = Y[hi] - Y[lo];
  if (lo > 0) w = Math.min(w, Y[lo] - Y[lo - 1] || w);
  if (hi < Y.length - 1) w = Math.min(w, Y[hi + 1] - Y[hi] || w);
  return w > 0 ? w : Y[Y.length - 1] - Y[0];
}

/** Evaluation that yields NaN instead of running past the budget (classification is best effort). */
function tryAt(c: Ctx, y: number): number {
  if (c.ev.left <= 0) { c.exhausted = true; return NaN; }
  return c.ev.at(y);
}

/** Samples of f, sorted by y. */
interface Grid { readonly Y: readonly number[]; readonly F: readonly number[] }

/**
 * The sign of f just beside y in direction dir: first at a quarter of the local spacing (or
 * of the room to the nearest feature on either side), then further out while f there is
 * within rounding of zero. Past the budget, the nearest grid sample on that side decides.
 */
function probeSide(c: Ctx, y: number, dir: 1 | -1, grid: Grid, points: readonly number[], spans: readonly Span[]): FSign | null {
  const room = roomOnSide(c, y, dir, points, spans);
  const near = Math.min(room, roomOnSide(c, y, dir === 1 ? -1 : 1, points, spans));
  let d = Math.max(SIDE_FRACTION * Math.min(spacingAt(grid.Y, y), near), 2 * tolAt(c, y));
  let result: FSign | null = null;
  for (let k = 0; k < SIDE_TRIES; k++) {
    if (k > 0 && d > 0.5 * room) break;
    if (c.ev.left <= 0) { c.exhausted = true; return result ?? gridSide(c, y, dir, grid, room); }
    const v = c.ev.at(y + dir * d);
    const sg = signOf(c, v, c.noiseAt(y));
    if (sg === null) { if (k === 0) return null; break; }
    result = sg;
    if (sg !== '0') return sg;
    d *= SIDE_GROWTH;
  }
  return result;
}

/** The sign of the nearest grid sample beside y in direction dir that lies before the next feature. */
function gridSide(c: Ctx, y: number, dir: 1 | -1, grid: Grid, room: number): FSign | null {
  const { Y, F } = grid;
  let lo = 0, hi = Y.length;
  while (lo < hi) { const m = (lo + hi) >> 1; if (Y[m] < y) lo = m + 1; else hi = m; }
  for (let k = dir === 1 ? lo : lo - 1; k >= 0 && k < Y.length; k += dir) {
    const d = dir * (Y[k] - y);
    if (d <= 0) continue;
    if (d >= room) break;
    const sg = signOf(c, F[k], c.noiseAt(Y[k]));
    if (sg === '+' || sg === '-') return sg;
  }
  return null;
}

/** Stability from the side signs; the slope decides only where both sides are unknown. */
function stabilityFrom(left: FSign | null, right: FSign | null, slope: number): Stability {
  const known = (s: FSign | null) => s === '+' || s === '-';
  if (known(left) && known(right)) {
    if (left === '+' && right === '-') return 'attractor';
    if (left === '-' && right === '+') return 'repeller';
    return 'semi-stable';
  }
  if (known(left)) return left === '+' ? 'attractor' : 'repeller';
  if (known(right)) return right === '-' ? 'attractor' : 'repeller';
  return slope < 0 ? 'attractor' : slope > 0 ? 'repeller' : 'semi-stable';
}

function classify(c: Ctx, y: number, converged: boolean, grid: Grid, points: readonly number[], spans: readonly Span[]): Equilibrium {
  const residual = tryAt(c, y);
  const left = probeSide(c, y, -1, grid, points, spans), right = probeSide(c, y, 1, grid, points, spans);
  // central difference, kept clear of neighbouring features; one-sided where f is undefined
  const room = Math.min(roomOnSide(c, y, -1, points, spans), roomOnSide(c, y, 1, points, spans));
  const h = Math.min(DIFF_STEP * Math.max(Math.abs(y), c.width), 0.5 * room);
  const fp = tryAt(c, y + h), fm = tryAt(c, y - h);
  let slopeDifference = (fp - fm) / (2 * h);
  if (!Number.isFinite(slopeDifference)) {
    slopeDifference = Number.isFinite(fp) ? (fp - residual) / h : Number.isFinite(fm) ? (residual - fm) / h : NaN;
  }
  let slope = slopeDifference, slopeSource: Equilibrium['slopeSource'] = 'difference';
  if (c.derivative) {
    let d = NaN;
    try { d = c.derivative(y); } catch { /* fall back to the difference */ }
    if (Number.isFinite(d)) { slope = d; slopeSource = 'derivative'; }
  }
  const stability = stabilityFrom(left, right, slope);
  // the slope counts as zero when tiny against the size of f per width of the range, or when
  // the odd part of f about y (what a slope makes) is small beside the even part (a touching
  // zero, where the difference quotient is all truncation error)
  const flat = 1e-6 * c.localScale(y) / c.width;
  const odd = Math.abs(fp - fm), even = Math.abs(fp + fm - 2 * residual);
  const slopeSign = !Number.isFinite(slope) || Math.abs(slope) <= flat || odd <= EVEN_DOMINATES * even ? 0 : Math.sign(slope);
  const consistent = slopeSign === 0 || (slopeSign < 0 ? stability === 'attractor' : stability === 'repeller');
  if (!consistent) {
    c.warnings.push(`at ${y} the slope ${slope} disagrees with the sign of f on each side (${left ?? 'undefined'} / ${right ?? 'undefined'}); stability is taken from the signs`);
  }
  return { value: y, stability, slope, slopeSource, slopeDifference, left, right, residual, consistent, converged };
}

/** The sign of f on (a, b): from grid samples inside, else by evaluating, else from a neighbour's side. */
function signBetween(c: Ctx, Y: readonly number[], F: readonly number[], a: number, b: number, equilibria: readonly Equilibrium[]): '+' | '-' | '0' {
  let pos = 0, neg = 0;
  let lo = 0, hi = Y.length;
  while (lo < hi) { const m = (lo + hi) >> 1; if (Y[m] <= a) lo = m + 1; else hi = m; }
  for (let k = lo; k < Y.length && Y[k] < b; k++) {
    if (!Number.isFinite(F[k]) || Math.abs(F[k]) <= c.noiseAt(Y[k])) continue;
    if (F[k] > 0) pos++; else neg++;
  }
  if (pos && neg) c.warnings.push(`f has both signs on the grid between ${a} and ${b}; a feature there may be missed`);
  if (pos || neg) return pos >= neg ? '+' : '-';
  for (const t of [0.5, 0.25, 0.75]) {
    const x = a + t * (b - a);
    const sg = signOf(c, tryAt(c, x), c.noiseAt(x));
    if (sg === '+' || sg === '-') return sg;
  }
  const eqLeft = equilibria.find((q) => q.value === a), eqRight = equilibria.find((q) => q.value === b);
  const side = eqLeft?.right ?? eqRight?.left;
  return side === '+' || side === '-' ? side : '0';
}

function signIntervals(
  c: Ctx, Y: readonly number[], F: readonly number[], points: readonly number[], gaps: readonly Span[],
  zeroIntervals: readonly Span[], equilibria: readonly Equilibrium[],
): SignInterval[] {
  type Mark = { from: number; to: number; sign: SignInterval['sign'] | null };
  const marks: Mark[] = [
    ...points.map((p) => ({ from: p, to: p, sign: null })),
    ...gaps.map((g) => ({ from: g.from, to: g.to, sign: 'none' as const })),
    ...zeroIntervals.map((z) => ({ from: z.from, to: z.to, sign: '0' as const })),
  ].sort((a, b) => a.from - b.from || a.to - b.to);
  const out: SignInterval[] = [];
  let cursor = c.from, atEdge = true;
  const end = (y: number, edge: boolean) => (edge ? null : y);
  for (const m of marks) {
    if (m.from > cursor) out.push({ from: end(cursor, atEdge), to: m.from, sign: signBetween(c, Y, F, cursor, m.from, equilibria) });
    if (m.sign !== null && m.to > Math.max(m.from, cursor)) {
      const startsAtEdge = m.from <= c.from;
      const endsAtEdge = m.to >= c.to;
      out.push({ from: end(Math.max(m.from, cursor), startsAtEdge && atEdge), to: end(m.to, endsAtEdge), sign: m.sign });
      atEdge = endsAtEdge;
    } else {
      atEdge = false;
    }
    cursor = Math.max(cursor, m.to);
  }
  if (cursor < c.to) out.push({ from: end(cursor, atEdge), to: null, sign: signBetween(c, Y, F, cursor, c.to, equilibria) });
  return out;
}
