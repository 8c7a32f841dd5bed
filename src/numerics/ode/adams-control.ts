/**
 * The constants both modes of the Adams formulas share (PECE, and one evaluation a step,
 * `adams-rebuilt.ts`, both run by the loop of `adams.ts`): step-size control and the
 * stiffness test.
 */

/**
 * Step-size constants (Shampine & Gordon 1975, ch. 5; common practice). The safety factor
 * and the error target were measured on the work-precision problems (bench/README.md), in
 * the one-evaluation mode; measured again with PECE, 0.9 left 1.1–1.6 units on Bateman and
 * Michaelis–Menten and a target of 0.2 up to 2, so they stay. In the one-evaluation mode: with
 * 0.9 and a target of 1 a quarter of the steps were rejected and the global error reached
 * 3–35 tolerance units at rtol 1e-7 … 1e-10; with 0.8 and 0.1, 0.1–1.6 units. The error
 * left is relative error carried along a decaying component (Bateman's absorption state,
 * Michaelis–Menten's tail) and added up over the steps, and a step size that see-sawed by
 * ±15 % with the order flipping between 5 and 6. A target of 0.05 and the step held unless it
 * could grow by 20 % brought every smooth problem within 0.86 units, but made a fit's model
 * (one piece at rtol 1e-10) rough enough in its parameters that NIST BoxBOD missed 6 digits
 * (test/engine/fit-certified.test.ts), so they are not taken (bench/README.md).
 */
export const ADAMS_CONTROL = {
  safety: 0.8,
  /** A step is kept when the order-k estimate is at most this fraction of the tolerance. */
  target: 0.1,
  maxFactor: 2,
  minFactor: 0.2,
  /** A higher order is taken only when it allows a step this much longer. */
  raiseMargin: 1.1,
  nonFiniteShrink: 0.25,
} as const;

/** Steps between two stiffness tests (with PECE they use the final evaluation; in the one-evaluation mode each costs one). */
export const STIFF_TEST_EVERY = 8;
/**
 * Positive tests in a row that report stiffness, once J's dominant eigenvalue is known to
 * decay e-fold `STIFF_SPAN` times over the rest of the run (`FastModeCheck`, `fast-mode.ts`),
 * as the explicit pairs' `fastSignals`: one test above the threshold may be the step
 * controller's overshoot as a transient ends. Without that check a run is not reported stiff:
 * a mode that decays fewer times over what is left of the run (a fast transient near its end,
 * a plateau such as logistic growth's end) costs fewer steps at the stability limit than the
 * stiff method's start (a Jacobian, a factorization, its own order ramp), and the test's
 * ratio alone, a norm, overstates |λ| where states of different units are coupled.
 */
export const STIFF_FAST_SIGNALS = 2;
/**
 * Positive tests, after a check that found no such mode, before it is asked again: J may
 * change along a nonlinear run (a reaction that turns stiff on the way). At most 8 evaluations
 * every 8 tests (64 steps) while the steps stand above the threshold.
 */
export const STIFF_RECHECK = 8;

/**
 * The h|λ| above which a step counts as a sign of stiffness: 4 times the h|λ| at which the
 * order-k estimate on a mode of relative size 1 reaches rtol (about rtol^(1/(k+1)) for the
 * Adams error constants, which lie between 1/12 and 1/2), capped at 1, about the edge of the
 * stability region of the PEC pairs of orders 2 to 12 on the negative real axis (Hairer,
 * Nørsett & Wanner I, sec. III.3; common practice).
 */
export function stiffHLambda(k: number, rtol: number): number {
  return Math.min(1, 4 * Math.pow(rtol, 1 / (k + 1)));
}

