/**
 * The samples of f the search works from: sorting the refined grid, the typical and local
 * size of f, the panel bisection where f changes or bends a lot, and the parabola through
 * three samples that decides whether a dip in |f| is worth a search.
 */
import { type Ctx } from './search.ts';

/** A panel is bisected when its values vary by more than 2·(least |f|) + typical |f| ... */
const VARIATION_FACTOR = 2;
/** ... or its second difference exceeds this fraction of (least |f| + typical |f|). */
const CURVATURE_FACTOR = 0.5;

/** The samples in increasing order of y (the grid's refinements are appended out of order). */
export function sortedSamples(ys: readonly number[], fs: readonly number[]): [number[], number[]] {
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
export function typicalSize(fs: readonly number[]): number {
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
export function nearbySize(grid: readonly number[], from: number, h: number): (y: number) => number {
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
export function refine(c: Ctx, ys: number[], fs: number[], panels: number, maxDepth: number): boolean {
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

/** Vertex value of the parabola through three points, or NaN when it has no interior vertex. */
export function parabolaMin(x0: number, f0: number, x1: number, f1: number, x2: number, f2: number): number {
  const d01 = (f1 - f0) / (x1 - x0), d12 = (f2 - f1) / (x2 - x1);
  const a = (d12 - d01) / (x2 - x0); // leading coefficient
  if (!(a > 0)) return NaN;
  const xv = 0.5 * (x0 + x1) - d01 / (2 * a);
  if (xv < x0 || xv > x2) return NaN;
  return f1 + d01 * (xv - x1) + a * (xv - x0) * (xv - x1);
}
