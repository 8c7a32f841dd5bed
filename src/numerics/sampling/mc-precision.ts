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

/**
 * The place a Monte Carlo figure `x` with standard uncertainty `u` > 0 is shown to: that of u's
 * first significant digit (0.1 for u = 0.14, 0.001 for 0.0096, 10 for 12), but no finer than
 * x's 12th significant digit (past it a place shows the binary noise of its digits).
 */
export function shownPlace(x: number, u: number): number {
  const place = leadingPlace(u);
  return x !== 0 && Number.isFinite(x) ? Math.max(place, leadingPlace(Math.abs(x)) * 1e-11) : place;
}

/** `x` rounded to the power of ten `place` and written with exactly its decimals: "13.2", "1230". */
export function toPlace(x: number, place: number): string {
  return roundTo(x, place).toFixed(Math.min(20, decimalsOf(place)));
}

/**
 * A standard error (or any standard uncertainty) written with one or two significant digits,
 * by the rounding rule of the Particle Data Group's Review of Particle Physics (Introduction,
 * "Rounding"; from memory): when its three highest digits are 100 to 354, two digits (0.14,
 * 0.20); 355 to 949, one (0.5, 0.009); 950 to 999, rounded up to 1000 and written with two
 * (0.0096 → 0.010). One rule for every ± of the uncertainty cell. 0 is written "0"; figures
 * below 1e-4 or from 1e7 in exponent form with the same digits.
 */
export function uncertaintyText(u: number): string {
  if (!Number.isFinite(u)) return String(u);
  if (u === 0) return '0';
  const a = Math.abs(u);
  const place = leadingPlace(a);
  // the three highest digits; a hair of relative slack so 0.355 is not read as 354.999…
  const top = Math.floor((a / place) * 100 * (1 + 1e-12));
  const two = top <= 354 || top >= 950;
  const last = top <= 354 ? place / 10 : place; // the place of the last digit written
  const r = Math.sign(u) * Number(a.toPrecision(top <= 354 ? 2 : 1)); // 950–999: rounds up to 10·place
  if (a >= 1e-4 && a < 1e7) return r.toFixed(Math.min(20, decimalsOf(last)));
  return r.toExponential(two ? 1 : 0);
}
