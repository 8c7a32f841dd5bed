/**
 * The adaptive Dormand–Prince 8(5,3) method, for tight tolerances: twelve stages of order 8,
 * f at the new solution reused as the next step's first stage (twelve evaluations per
 * accepted step, eleven per rejected one), and three more for the dense output of order 7.
 * Its error per step falls like h^8 where dopri5's falls like h^5, so below rtol ≈ 1e-6 it
 * takes far fewer evaluations for the same accuracy (measured: `npm run bench -- work`).
 *
 * - Coefficients (`dp853-tableau.ts`): Prince & Dormand (1981), J. Comput. Appl. Math. 7,
 *   67–75; Hairer, Nørsett & Wanner, Solving ODEs I, sec. II.5 and II.6.
 * - Error estimate: Hairer, Nørsett & Wanner I, sec. II.5 ("the error estimator of DOP853"):
 *   with the fifth-order difference e₅ and the third-order difference e₃ (each scaled by
 *   atol + rtol·max(|y0|, |y1|)), err = h·‖e₅‖² / √(n·(‖e₅‖² + 0.01·‖e₃‖²)). It behaves like
 *   an estimate of order 8 for small h, and like the fifth-order one where that is small.
 * - Tolerance safety: the estimate is sharp, and the global error, and more so the order-7
 *   interpolant's error inside long steps, ended at 1–14 tolerance units against closed forms
 *   (up to 45 units locally inside one step of the logistic problem at rtol 1e-6). So the norm
 *   is taken against tolerances `DP853_TOLERANCE_SAFETY` (20) times tighter than asked, as
 *   production codes transform the user's tolerance (RADAU5 takes 0.1·rtol^(2/3): Hairer &
 *   Wanner, Solving ODEs II, sec. IV.8). Measured on the six work-precision problems at rtol
 *   1e-3 … 1e-10 (`npm run bench -- work`), the largest error on a 2001-point grid falls to
 *   0.05–0.73 units on the five smooth problems (1.72 on the stiff forced one, where dp853 is
 *   held by stability), for 13–30% more evaluations; a check of the interpolant's defect at
 *   the step's middle did as well on the smooth problems, but cost 2.5 times the evaluations
 *   on the stiff one and kept `auto` from seeing stiffness at rtol 1e-7.
 * - Step size: the controller of the same section with exponent 1/8, factors in [1/3, 6].
 * - Stiffness detection: Hairer & Wanner, Solving ODEs II, sec. IV.2, from f at the new
 *   solution and the last stage (both at t + h); the stability region reaches h·λ ≈ -6.4
 *   on the negative real axis, and the test fires above 6.1 (Hairer's choice for DOP853).
 */
import { type OdeContext } from './control.ts';
import { DP853, DP853_A, DP853_C, DP853_DENSE, DP853_E3, DP853_E5 } from './dp853-tableau.ts';
import { type EmbeddedPair, type StepControl, EmbeddedRkStepper } from './embedded-rk.ts';
import { stageValuesOnMode } from './explicit-rk.ts';
import { type DenseSegment, writeStepEnd } from './types.ts';

/** Step-size factor constants (Hairer, Nørsett & Wanner I, sec. II.4–II.5, for this method). */
export const DP853_CONTROL: StepControl = {
  safety: 0.9,
  minFactor: 1 / 3,
  maxFactor: 6,
  alpha: 1 / 8,
  beta: 0,
  rejectExponent: 1 / 8,
  errFloor: 1e-4,
  nonFiniteShrink: 0.25,
};

/**
 * Stiffness detection constants (Hairer & Wanner II, sec. IV.2, for this method). Measured
 * on y' = -1e4 (y - cos t) at rtol 1e-7 … 1e-10: dp853's steps there settle well below the
 * stability edge, so the test fires above 5 times the h|λ| of an accuracy-limited step on a
 * present mode (1.7 at rtol 1e-10, 4.0 at 1e-7); 10 signals (a dp853 step costs 2.5 dopri5
 * steps) instead of 15 let `auto` switch within 0.01 s there, in 630 … 1 100 evaluations.
 * Two, as dopri5's, once J's dominant eigenvalue is known to be fast over the rest of the run.
 */
export const DP853_STIFFNESS = {
  threshold: 6.1,
  signals: 10,
  reset: 6,
  fastSignals: 2,
  activeModeMultiple: 5,
  stages: [12, 11] as const,
} as const;

/**
 * The dp853 error estimate on y' = λy, y = 1, for real z = hλ, relative to rtol·|y| (atol
 * ignored): |E₅|² / √(E₅² + 0.01·E₃²) with E_m = z·Σ e_m,i K_i(z) over the stage values.
 * Grows like |z|^8 for small z.
 */
export function dp853ErrorOnMode(z: number): number {
  const K = stageValuesOnMode(DP853_A, 12, z);
  let e5 = 0;
  let e3 = 0;
  K.forEach((v, i) => {
    e5 += DP853_E5[i] * v;
    e3 += DP853_E3[i] * v;
  });
  e5 *= z;
  e3 *= z;
  const den = Math.sqrt(e5 * e5 + 0.01 * e3 * e3);
  return den > 0 ? (e5 * e5) / den : 0;
}

let lastRtol = NaN;
let lastHLambda = NaN;

/**
 * The h|λ| (at most the stability threshold) at which the dp853 error estimate on a mode of
 * relative size 1 reaches rtol, by bisection on log |z|: steps limited by accuracy on a mode
 * that is present sit near it. The last answer is kept (runs share their rtol).
 */
export function dp853ActiveModeHLambda(rtol: number): number {
  if (rtol === lastRtol) return lastHLambda;
  let lo = Math.log(1e-8);
  let hi = Math.log(DP853_STIFFNESS.threshold);
  if (dp853ErrorOnMode(-Math.exp(hi)) > rtol) {
    for (let i = 0; i < 60; i++) {
      const mid = (lo + hi) / 2;
      if (dp853ErrorOnMode(-Math.exp(mid)) > rtol) hi = mid;
      else lo = mid;
    }
  }
  lastRtol = rtol;
  lastHLambda = Math.exp(hi);
  return lastHLambda;
}

/** The continuous solution of one dp853 step (see `DP853_DENSE`), of order 7. */
export class Dp853Segment implements DenseSegment {
  /** [y0 | y1 | r3 | r4 | r5 | r6 | r7 | r8], each n long. */
  constructor(readonly t0: number, readonly t1: number, private readonly h: number, private readonly n: number,
    private readonly data: Float64Array) {}

  eval(t: number, out: Float64Array): void {
    const { data, n } = this;
    if (writeStepEnd(t, this.t0, this.t1, data, n, out)) return;
    const th = (t - this.t0) / this.h;
    const th1 = 1 - th;
    for (let i = 0; i < n; i++) {
      const y0 = data[i];
      const tail = data[4 * n + i] + th * (data[5 * n + i] + th1 * (data[6 * n + i] + th * data[7 * n + i]));
      out[i] = y0 + th * (data[n + i] - y0 + th1 * (data[2 * n + i] + th * (data[3 * n + i] + th1 * tail)));
    }
  }
}

function denseSegment(t0: number, t1: number, h: number, y0: Float64Array, y1: Float64Array, k: readonly Float64Array[]): Dp853Segment {
  const n = y0.length;
  const data = new Float64Array(8 * n);
  for (let i = 0; i < n; i++) {
    const delta = y1[i] - y0[i];
    const r3 = h * k[0][i] - delta;
    data[i] = y0[i];
    data[n + i] = y1[i];
    data[2 * n + i] = r3;
    data[3 * n + i] = delta - h * k[12][i] - r3;
    for (let m = 0; m < 4; m++) {
      const d = DP853_DENSE[m];
      let acc = 0;
      for (let j = 0; j < 16; j++) acc += d[j] * k[j][i];
      data[(4 + m) * n + i] = h * acc;
    }
  }
  return new Dp853Segment(t0, t1, h, n, data);
}

/** The tolerances the error norm is measured against are this many times tighter than asked (see the file's doc comment). */
export const DP853_TOLERANCE_SAFETY = 20;

/** Hairer's combined error norm against tolerances DP853_TOLERANCE_SAFETY times tighter (see the file's doc comment). */
function dp853ErrorNorm(h: number, k: readonly Float64Array[], y: Float64Array, yNew: Float64Array, ctx: OdeContext): number {
  const { atol, rtol } = ctx.options;
  let sum5 = 0;
  let sum3 = 0;
  for (let i = 0; i < ctx.n; i++) {
    let e5 = 0;
    let e3 = 0;
    for (let j = 0; j < 12; j++) {
      e5 += DP853_E5[j] * k[j][i];
      e3 += DP853_E3[j] * k[j][i];
    }
    const sc = atol[i] + rtol * Math.max(Math.abs(y[i]), Math.abs(yNew[i]));
    sum5 += (e5 / sc) ** 2;
    sum3 += (e3 / sc) ** 2;
  }
  const den = sum5 + 0.01 * sum3;
  return DP853_TOLERANCE_SAFETY * Math.abs(h) * sum5 / Math.sqrt(ctx.n * (den > 0 ? den : 1));
}

/** The Dormand–Prince 8(5,3) pair for the shared adaptive stepper. */
export const DP853_PAIR: EmbeddedPair = {
  tableau: DP853,
  c: DP853_C,
  a: DP853_A,
  newRateStage: 12,
  startOrder: 7,
  // The time-scale start (start-step.ts) saves dp853 45–90 evaluations a run, but its error
  // estimate is not yet reliable enough for the shifted step sequence (0.8–4 units on
  // the Bateman problem of test/engine/ode.test.ts at rtol 1e-9 depending on the first step
  // alone), so it keeps the book's start until that estimate is sharpened.
  timeScaleStart: false,
  control: DP853_CONTROL,
  stiffness: DP853_STIFFNESS,
  activeModeHLambda: dp853ActiveModeHLambda,
  errorNorm: dp853ErrorNorm,
  segment: denseSegment,
};

/** Adaptive Dormand–Prince 8(5,3) stepper (stiffness reported in `stiffAt`). */
export class Dp853Stepper extends EmbeddedRkStepper {
  constructor(ctx: OdeContext, t0: number, y0: ArrayLike<number>, firstStep?: number) {
    super(DP853_PAIR, ctx, t0, y0, firstStep);
  }
}
