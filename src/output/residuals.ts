/**
 * How a fit's residuals are reported and drawn, so that the arithmetic's rounding is never shown
 * as if it were a misfit.
 *
 * Reported: a residual (measured minus fitted, in SI) whose size is within
 * {@link ROUND_OFF_EPSILONS} machine epsilons of the state's scale (the largest magnitude among
 * its measured values and its starting value, in SI) is reported as exactly 0. A model value
 * and a measurement of that scale each carry a rounding error of about ε·scale per operation
 * that made them (unit conversions, the closed form's exp and products, the solver's sums:
 * tens of operations), so a difference below 128·ε·scale says nothing about the fit. A solver's
 * own error (relative tolerance 1e-10 in a fit) is far above that bound and is left as it is.
 *
 * Drawn: a plot of residuals spans at least ±{@link RESIDUAL_AXIS_FLOOR} of the scale around
 * zero, so that differences far below what measurements carry (a millionth of their size) are
 * not magnified to fill the axis.
 */

/** Residuals within this many machine epsilons of the scale are round-off. */
export const ROUND_OFF_EPSILONS = 128;

/** The least half-height of a residual axis, as a share of the data's scale. */
export const RESIDUAL_AXIS_FLOOR = 1e-6;

/** `residual`, or exactly 0 when it is within round-off of `scale` (both in SI; scale > 0). */
export function withoutRoundOff(residual: number, scale: number): number {
  return Math.abs(residual) <= ROUND_OFF_EPSILONS * Number.EPSILON * Math.abs(scale) ? 0 : residual;
}

/** The least half-height of an axis of residuals of data of that scale (SI). */
export function residualAxisFloor(scale: number): number {
  return RESIDUAL_AXIS_FLOOR * Math.abs(scale);
}
