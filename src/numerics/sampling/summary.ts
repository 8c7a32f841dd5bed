/**
 * Summaries of a sample: mean, standard deviation (n − 1), quantiles and a histogram.
 *
 * Quantiles are Hyndman and Fan's type 7 (the default of R's `quantile` and NumPy's
 * `percentile`): for sorted x₁…xₙ and probability p, h = (n − 1)p, and the quantile is
 * x⌊h⌋₊₁ + (h − ⌊h⌋)(x⌊h⌋₊₂ − x⌊h⌋₊₁).
 */

/** The summary of finite values. */
export interface SampleSummary {
  readonly n: number;
  readonly mean: number;
  /** With n − 1 in the denominator; 0 for one value. */
  readonly sd: number;
  readonly median: number;
  readonly p025: number;
  readonly p975: number;
  /** m₄/m₂² with moments about the mean (3 for a normal distribution); NaN when the values are all equal. */
  readonly kurtosis: number;
  /** The values in ascending order (for order statistics). */
  readonly sorted: Float64Array;
}

/** The summary of `values` (finite, at least one). Sorts a copy, which it returns. Cost: n log n. */
export function summarize(values: ArrayLike<number>): SampleSummary {
  const n = values.length;
  const sorted = Float64Array.from(values).sort();
  let mean = 0;
  for (let i = 0; i < n; i++) mean += (sorted[i] - mean) / (i + 1);
  let ss = 0, s4 = 0;
  for (let i = 0; i < n; i++) { const d2 = (sorted[i] - mean) ** 2; ss += d2; s4 += d2 * d2; }
  return {
    n, mean, sd: n > 1 ? Math.sqrt(ss / (n - 1)) : 0,
    median: quantileSorted(sorted, 0.5), p025: quantileSorted(sorted, 0.025), p975: quantileSorted(sorted, 0.975),
    kurtosis: ss > 0 ? (s4 / n) / (ss / n) ** 2 : NaN, sorted,
  };
}

/** The type 7 quantile of sorted values. */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 1) return sorted[0];
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, n - 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/**
 * A histogram of `values` over [min, max] in `bins` equal bins (Sturges' rule when not given:
 * ⌈log₂ n⌉ + 1, at most 40); the last bin includes max. A sample of one value gives one bin
 * around it. `edges` has one more entry than `counts`.
 */
export function histogram(values: ArrayLike<number>, bins?: number): { edges: number[]; counts: number[] } {
  const n = values.length;
  let min = Infinity, max = -Infinity;
  for (let i = 0; i < n; i++) { if (values[i] < min) min = values[i]; if (values[i] > max) max = values[i]; }
  if (!(max > min)) {
    const w = Math.abs(min) * 1e-6 || 1e-6;
    return { edges: [min - w, min + w], counts: [n] };
  }
  const k = bins ?? Math.min(40, Math.ceil(Math.log2(n)) + 1);
  const width = (max - min) / k;
  const counts = new Array<number>(k).fill(0);
  for (let i = 0; i < n; i++) counts[Math.min(k - 1, Math.floor((values[i] - min) / width))]++;
  const edges = Array.from({ length: k + 1 }, (_, i) => (i === k ? max : min + i * width));
  return { edges, counts };
}
