/**
 * The significant digits of a solve cell's answer that its accuracy supports.
 *
 * The rule: the target, computed again by the runs between the varied value and it, is good to
 * `TOLERANCE_UNITS` times their relative tolerance (`WhatIf.accuracy`, the loosest run's; a fit
 * takes the same 10 tolerance units as the error bound of a fitted value), relative to the
 * wanted value. That error divided by the target's slope at the answer, plus Brent's tolerance
 * on the answer itself (`ROOT_TOLERANCE` of the range), is the answer's error δ. The answer is
 * shown to the last decimal place u with δ ≤ u / 2, in the unit it is shown in, so that every
 * digit shown is right to within half a unit: from 1 to `MOST_DIGITS` significant digits. A run
 * with no bound on its error (a fixed step) or a target flat at the answer supports no claim:
 * no digits (the app shows its usual 4).
 */

/** A run's answers are taken to be within this many of its tolerance units. */
export const TOLERANCE_UNITS = 10;
/** Brent's tolerance on a zero, as a share of the range searched (`numerics/roots-in-range.ts`' default). */
export const ROOT_TOLERANCE = 1e-10;
/** The most digits an answer is shown with: those of every figure of the report's text. */
export const MOST_DIGITS = 6;
/** Points nearer the answer than this share of the range are left out of its slope: the runs' error would swamp their difference. */
const SLOPE_GAP = 1e-3;

/**
 * The target's slope at the answer `x` (target `y` there) from the points evaluated during the
 * search: the secant through the nearest point at least `SLOPE_GAP` of the range away on each
 * side, or from the answer to the nearest one on one side; NaN when there is none.
 */
export function slopeAt(seen: ReadonlyArray<readonly [number, number]>, x: number, y: number, range: number): number {
  const gap = SLOPE_GAP * range;
  let left: readonly [number, number] | undefined, right: readonly [number, number] | undefined;
  for (const p of seen) {
    if (p[0] <= x - gap && (!left || p[0] > left[0])) left = p;
    if (p[0] >= x + gap && (!right || p[0] < right[0])) right = p;
  }
  if (left && right) return (right[1] - left[1]) / (right[0] - left[0]);
  const one = left ?? right;
  return one ? (one[1] - y) / (one[0] - x) : NaN;
}

/**
 * The answer's error δ in SI: `accuracy` the runs' relative tolerance (0 when the target is
 * exact to round-off, NaN when unbounded), `scale` the target's size (the wanted value's),
 * `slope` the target's slope at the answer, `range` max - min.
 */
export function answerError(accuracy: number, scale: number, slope: number, range: number): number {
  const fromTarget = accuracy === 0 ? 0 : (TOLERANCE_UNITS * accuracy * Math.abs(scale)) / Math.abs(slope);
  return fromTarget + ROOT_TOLERANCE * range;
}

/** The significant digits of `value` (as shown) whose last place u has `error` (in the same unit) ≤ u / 2; undefined when nothing can be claimed. */
export function supportedDigits(value: number, error: number): number | undefined {
  if (!Number.isFinite(error) || !(error >= 0) || !Number.isFinite(value) || value === 0) return undefined;
  if (error === 0) return MOST_DIGITS;
  const place = Math.ceil(Math.log10(2 * error) - 1e-12);
  const lead = Math.floor(Math.log10(Math.abs(value)) + 1e-12);
  return Math.min(MOST_DIGITS, Math.max(1, lead - place + 1));
}
