/**
 * How precise a Monte Carlo sample's percentiles and SD are, from the sample itself:
 *
 * - A distribution-free interval for a quantile ξ_p from order statistics (W. J. Conover,
 *   Practical Nonparametric Statistics, 3rd ed., Wiley 1999, sec. 3.2, the confidence interval
 *   for a quantile; H. A. David & H. N. Nagaraja, Order Statistics, 3rd ed., Wiley 2003,
 *   sec. 7.1; section numbers from memory). Of n independent draws of a continuous variable,
 *   the number B below ξ_p is Binomial(n, p), and x₍ᵣ₎ ≤ ξ_p < x₍ₛ₎ exactly when r ≤ B < s,
 *   so [x₍ᵣ₎, x₍ₛ₎] holds ξ_p with probability P(r ≤ B ≤ s − 1), whatever the distribution.
 *   The ranks are chosen with equal tails: r the largest with P(B ≤ r − 1) ≤ α/2, s the
 *   smallest with P(B ≥ s) ≤ α/2, so the coverage is at least 1 − α (more, as B is discrete).
 *   Where no rank 1 ≤ r (or s ≤ n) meets its tail (too few samples: below 146 for the 2.5 and
 *   97.5 percentiles, below 6 for the median), that end has no order statistic.
 * - A percentile's standard uncertainty from its interval: its width / (2 · 1.96), the SD a
 *   normal distribution with that 95% interval has (as JCGM 101:2008 does the other way).
 * - The standard error of a sample SD s for large n, s·sqrt((κ − 1)/(4n)) with κ = m₄/m₂² the
 *   sample's kurtosis (not the excess): the sampling variance of the second moment,
 *   (μ₄ − σ⁴)/n (A. Stuart & J. K. Ord, Kendall's Advanced Theory of Statistics, vol. 1, 6th
 *   ed. 1994, sec. 10.5; from memory), carried to its square root by the delta method
 *   (Var √V ≈ Var V / 4V). For a normal sample κ = 3 and it is σ/√(2n).
 * Pure numbers; no units.
 */

/** The window of binomial terms summed: 12 SDs and 40 terms either side of the mode. */
const WINDOW_SDS = 12;
const WINDOW_MIN = 40;

/**
 * The distribution function of Binomial(n, p) on a window around its mode that holds all but
 * a negligible share of its mass (below 1e-20 for the p of the 2.5, 50 and 97.5 percentiles, by
 * the multiplicative Chernoff bounds exp(−δ²μ/(2 + δ)) and exp(−δ²μ/2)): `cdf(k)` = P(B ≤ k),
 * 0 below the window and 1 above it. The terms are built from the mode by the ratio of
 * consecutive terms, pmf(k + 1)/pmf(k) = (n − k)/(k + 1) · p/(1 − p), and scaled by their sum,
 * so no factorial or power of n is formed (no underflow at n = 100,000). Cost: O(√n).
 */
export function binomialCdf(n: number, p: number): (k: number) => number {
  if (p <= 0) return (k) => (k >= 0 ? 1 : 0);
  if (p >= 1) return (k) => (k >= n ? 1 : 0);
  const mode = Math.min(n, Math.floor((n + 1) * p));
  const half = Math.ceil(WINDOW_SDS * Math.sqrt(n * p * (1 - p))) + WINDOW_MIN;
  const lo = Math.max(0, mode - half), hi = Math.min(n, mode + half);
  const w = new Float64Array(hi - lo + 1);
  const odds = p / (1 - p);
  w[mode - lo] = 1;
  for (let k = mode; k < hi; k++) w[k + 1 - lo] = w[k - lo] * ((n - k) / (k + 1)) * odds;
  for (let k = mode; k > lo; k--) w[k - 1 - lo] = w[k - lo] * (k / (n - k + 1)) / odds;
  let total = 0;
  for (let i = 0; i < w.length; i++) total += w[i];
  // cumulative from below, and from above (so that an upper tail keeps its digits)
  const below = new Float64Array(w.length), above = new Float64Array(w.length);
  let acc = 0;
  for (let i = 0; i < w.length; i++) { acc += w[i]; below[i] = acc / total; }
  acc = 0;
  for (let i = w.length - 1; i >= 0; i--) { above[i] = acc / total; acc += w[i]; }
  return (k) => {
    if (k < lo) return 0;
    if (k >= hi) return 1;
    const i = k - lo;
    return below[i] <= 0.5 ? below[i] : 1 - above[i];
  };
}

/** The ranks (1-based) of an order-statistic interval for the p quantile of n draws. */
export interface OrderRanks {
  /** Rank of the lower end, 0 when no order statistic will do (too few samples). */
  readonly r: number;
  /** Rank of the upper end, n + 1 when no order statistic will do. */
  readonly s: number;
  /** P(r ≤ B ≤ s − 1) for B ~ Binomial(n, p): the interval's coverage, at least the level asked. */
  readonly coverage: number;
}

/**
 * The equal-tailed ranks r < s for the p quantile of n draws at `level` (default 0.95): r the
 * largest rank with P(B ≤ r − 1) ≤ (1 − level)/2, s the smallest with P(B ≥ s) ≤ (1 − level)/2.
 * Cost: O(√n).
 */
export function orderRanks(n: number, p: number, level = 0.95): OrderRanks {
  const tail = (1 - level) / 2;
  const F = binomialCdf(n, p);
  // P(B ≤ r − 1) grows with r: step from the mean down while the tail is too big, then up while the next still fits
  let r = Math.max(0, Math.min(n, Math.floor(n * p)));
  while (r > 0 && F(r - 1) > tail) r--;
  while (r < n && F(r) <= tail) r++;
  // P(B ≥ s) = 1 − F(s − 1) falls as s grows
  let s = Math.max(r + 1, Math.min(n + 1, Math.ceil(n * p)));
  while (s <= n && 1 - F(s - 1) > tail) s++;
  while (s > r + 1 && 1 - F(s - 2) <= tail) s--;
  const upper = s <= n ? F(s - 1) : 1;
  const lower = r >= 1 ? F(r - 1) : 0;
  return { r, s, coverage: upper - lower };
}

/** A quantile's interval from a sorted sample, and the standard uncertainty it gives. */
export interface QuantileInterval extends OrderRanks {
  /** x₍ᵣ₎ and x₍ₛ₎; undefined where the rank is 0 or n + 1 (too few samples). */
  readonly low?: number;
  readonly high?: number;
  /** (high − low) / (2 · 1.96); undefined when an end is. */
  readonly u?: number;
}

/** The 97.5% point of the standard normal, to 16 figures. */
const Z975 = 1.959963984540054;

/**
 * The 95% interval for the p quantile of the distribution `sorted` (ascending, finite) was
 * drawn from, and its standard uncertainty. Cost: O(√n); the sample must already be sorted.
 */
export function quantileInterval(sorted: ArrayLike<number>, p: number): QuantileInterval {
  const n = sorted.length;
  const ranks = orderRanks(n, p);
  const low = ranks.r >= 1 ? sorted[ranks.r - 1] : undefined;
  const high = ranks.s <= n ? sorted[ranks.s - 1] : undefined;
  return {
    ...ranks,
    ...(low !== undefined ? { low } : {}),
    ...(high !== undefined ? { high } : {}),
    ...(low !== undefined && high !== undefined ? { u: (high - low) / (2 * Z975) } : {}),
  };
}

/** The fewest draws for which the p quantile's 95% interval has both ends: (1 − p)ⁿ and pⁿ at most 2.5%. */
export function fewestForInterval(p: number): number {
  const q = Math.min(p, 1 - p);
  return Math.ceil(Math.log(0.025) / Math.log(1 - q));
}

/**
 * The standard error of a sample SD `sd` of n draws whose kurtosis m₄/m₂² is `kurtosis`, for
 * large n: sd·sqrt((κ − 1)/(4n)). 0 when sd is 0.
 */
export function sdSE(sd: number, kurtosis: number, n: number): number {
  if (!(sd > 0)) return 0;
  return sd * Math.sqrt(Math.max(0, kurtosis - 1) / (4 * n));
}
