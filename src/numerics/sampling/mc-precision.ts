/**
 * How precise a Monte Carlo figure is, from its own samples:
 * - the standard error of a share of yes, sqrt(p(1 − p)/n), and of a mean, SD/sqrt(n);
 * - the Wilson score interval of a share (E. B. Wilson, "Probable inference, the law of
 *   succession, and statistical inference", J. Am. Stat. Assoc. 22 (1927) 209–212; method 3 of
 *   R. G. Newcombe, "Two-sided confidence intervals for the single proportion: comparison of
 *   seven methods", Statistics in Medicine 17 (1998) 857–872), which stays inside [0, 1] and
 *   keeps a width at 0 or n yes, where the normal interval p ± z·SE collapses to a point;
 * - the decimal place a figure is shown to (the place of its standard error's first
 *   significant digit), and the numerical tolerance of JCGM 101:2008 (GUM Supplement 1), 7.9:
 *   a figure c × 10^l with n_dig significant digits has tolerance δ = ½ × 10^l, and the
 *   samples are enough for it when twice its standard error is at most δ (7.9.4).
 * Pure numbers; no units.
 */

/** The 97.5% point of the standard normal, to 16 figures (a 95% two-sided interval). */
export const Z975 = 1.959963984540054;

/** Standard error of a share `p` of yes among `n` independent samples: sqrt(p(1 − p)/n). */
export function proportionSE(p: number, n: number): number {
  return Math.sqrt(Math.max(0, p * (1 - p)) / n);
}

/** Standard error of a mean of `n` independent samples with standard deviation `sd`. */
export function meanSE(sd: number, n: number): number {
  return sd / Math.sqrt(n);
}

/**
 * The Wilson score interval for `yes` of `n` (0 ≤ yes ≤ n, n ≥ 1) at the normal point `z`
 * (default the 95% interval's): the proportions π with |yes/n − π| ≤ z·sqrt(π(1 − π)/n),
 * (p + z²/2n ∓ z·sqrt(p(1 − p)/n + z²/4n²)) / (1 + z²/n). Exactly 0 at no yes and 1 at all yes.
 */
export function wilsonInterval(yes: number, n: number, z = Z975): { low: number; high: number } {
  const p = yes / n;
  const z2 = z * z;
  const denom = 1 + z2 / n;
  const center = (p + z2 / (2 * n)) / denom;
  const half = (z * Math.sqrt(p * (1 - p) / n + z2 / (4 * n * n))) / denom;
  return { low: yes <= 0 ? 0 : Math.max(0, center - half), high: yes >= n ? 1 : Math.min(1, center + half) };
}

/**
 * The standard uncertainty by which a share's shown digits are chosen: its standard error, or,
 * where that is smaller (at or near 0 or n yes, where it vanishes), a quarter of the Wilson
 * interval's width (the SE a normal interval of that width would have, width / (2·1.96)).
 */
export function shareUncertainty(yes: number, n: number): number {
  const { low, high } = wilsonInterval(yes, n);
  return Math.max(proportionSE(yes / n, n), (high - low) / (2 * Z975));
}

/** The power of ten of `u`'s first significant digit (u > 0): 0.01 for 0.0123, 10 for 47. */
export function leadingPlace(u: number): number {
  const l = Math.floor(Math.log10(u));
  const place = 10 ** l;
  // log10 of an exact power of ten can land a hair below it
  return place * 10 <= u ? place * 10 : place;
}

/** `x` rounded to a multiple of `place` (a power of ten), without binary noise (0.62, not 0.6200000000000001). */
export function roundTo(x: number, place: number): number {
  const decimals = Math.max(0, -Math.round(Math.log10(place)));
  return Number((Math.round(x / place) * place).toFixed(Math.min(20, decimals)));
}

/** Decimals after the point for a power of ten `place`: 2 for 0.01, 0 for 1 or 10. */
export function decimalsOf(place: number): number {
  return Math.max(0, -Math.round(Math.log10(place)));
}

/**
 * JCGM 101:2008 7.9.2 and 7.9.4 for a figure with standard error `se` from `n` samples and
 * tolerance δ = ½ `place`: whether 2·se ≤ δ, and the samples at which it would be
 * (se falls as 1/sqrt(n), so n·(2·se/δ)², rounded up).
 */
export function settled(se: number, n: number, place: number): { settled: boolean; samplesNeeded: number } {
  const delta = place / 2;
  const ok = 2 * se <= delta;
  return { settled: ok, samplesNeeded: ok ? n : Math.ceil(n * (2 * se / delta) ** 2) };
}
