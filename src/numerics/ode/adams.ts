/**
 * Variable-order, variable-step Adams formulas for smooth problems at tight tolerances: the
 * Adams–Bashforth predictor of order k and the Adams–Moulton corrector of order k + 1, both
 * taken from the polynomial that interpolates f at the actual past times (no rescaling on a
 * change of step), in Newton's divided-difference form as in Hairer, Nørsett & Wanner,
 * Solving ODEs I, sec. III.5 ("Variable step size Adams methods") and Shampine & Gordon,
 * Computer Solution of Ordinary Differential Equations (1975), ch. 4–5.
 *
 * Two evaluations of f per step, PECE (Hairer, Nørsett & Wanner I, sec. III.1; Shampine &
 * Gordon's mode): predict, evaluate f there, correct once, and evaluate f at the corrected
 * value, the rate the step keeps. The history is kept in place (`adams-history.ts`). The
 * one-evaluation mode this method ran before (P(EC): f at the predicted value kept) left the
 * history's rates off the solution by h·λ times the predictor's error, an error of the size
 * of the estimate itself that the estimate does not see: on Bateman's problem at rtol 1e-7
 * the estimate swung between 1e-4 and 0.1 of the tolerance from one step to the next, against
 * the true local error (largest where the estimate was smallest), the step see-sawed by
 * ±20 %, and the global error reached 1.63 units. With the final evaluation the estimates
 * hold and the steps are about twice as long: within 1 unit on the five smooth work-precision
 * problems, for fewer evaluations on Bateman, about as many on two, more on two (up to half
 * as many again on Michaelis–Menten), each within 1.25x LSODA (bench/README.md).
 *
 * - Error estimate: the corrector of order k + 1 is propagated (local extrapolation); the
 *   difference to the corrector of order k, h·G_k·f[t_{n+1}, …, t_{n-k+1}] in the Newton
 *   form, estimates the error of order k (Shampine & Gordon's ERK), in the norm of
 *   `control.ts`. The same differences give the estimates at orders k - 1 and k + 1.
 * - Order and step: after each step the order among k - 1, k, k + 1 that allows the longest
 *   next step is taken, h ~ est_q^(-1/(q+1)); the step grows at most twofold and shrinks at
 *   most fivefold (Shampine & Gordon keep ratios near 2 for the stability of the variable
 *   formulas). Start: order 1 from a first step for order 1 (`start-step.ts`), the order
 *   raised by one a step while the history is shorter than the next order needs. After a dose
 *   (a carried step), a Runge–Kutta step that gives several rates at once (`adams-start.ts`);
 *   the formulas go on at the order that history allows, with steps of twice its spacing.
 * - Dense output: the corrector's polynomial integrated from t_n, of order k + 1 on the step,
 *   the step's end reproduced bit for bit (`writeStepEnd`).
 * - Modes: this file is the step loop; the arithmetic of a mode is an `AdamsFormulas`
 *   (`adams-formulas.ts`): PECE on the history kept in place, or below `PECE_FROM_RTOL` the
 *   one-evaluation mode on differences rebuilt each step (`adams-rebuilt.ts`), each to the
 *   last bit as it was when each had a loop of its own.
 * - Stiffness: every `STIFF_TEST_EVERY`-th step, from the final evaluation,
 *   h·‖f(y_c) − f(p)‖/‖y_c − p‖ estimates h|λ| of the mode the correction excites. Above
 *   `stiffHLambda(k, rtol)` it counts as a sign of stiffness. Where that ratio would decay
 *   e-fold `STIFF_SPAN` times over the rest of the run, J's dominant eigenvalue is checked by
 *   power iteration from the correction (`FastModeCheck`, shared with the explicit pairs);
 *   while it spans `STIFF_SPAN` e-folds, `STIFF_FAST_SIGNALS` signs in a row set `stiffAt`.
 *   A run without such a mode is never reported stiff (see `STIFF_FAST_SIGNALS`).
 */
import {
  type OdeContext, type StepOutcome, type Stepper,
  NonFiniteMark, collapseFailure, failure, minStep, nonFiniteStatus, spendAttempt, trialStep,
} from './control.ts';
import { startStep } from './start-step.ts';
import { AdamsStartWork, rkStart, startPoints } from './adams-start.ts';
import { ADAMS_CONTROL, STIFF_FAST_SIGNALS, STIFF_RECHECK, STIFF_TEST_EVERY, stiffHLambda } from './adams-control.ts';
import { FastModeCheck, suggestsFastMode } from './fast-mode.ts';
import { type AdamsFormulas, InPlaceFormulas } from './adams-formulas.ts';
import { RebuiltFormulas } from './adams-rebuilt.ts';

export { ADAMS_MAX_ORDER } from './adams-history.ts';
export { ADAMS_CONTROL, STIFF_FAST_SIGNALS, STIFF_RECHECK, STIFF_TEST_EVERY, stiffHLambda } from './adams-control.ts';

/**
 * The Runge–Kutta start after a dose spans P − 1 spacings of this fraction of the carried
 * step (`adams-start.ts`). A quarter was right for the one-evaluation mode this method had
 * before, and that mode keeps it (`PEC_START_SPACING`); the carried steps are about twice as
 * long with the final evaluation, and a quarter then had the starting step rejected at every
 * restart of the 6-dose problem (6 evaluations each). Measured over rtol 1e-3 … 1e-10 on the
 * 6 IV doses: 1 864 evaluations with a quarter, 1 783 with 0.15, 1 753 with a tenth.
 */
export const START_SPACING = 0.1;
/** `START_SPACING` of the one-evaluation mode (half of the carried step rejected the starting step at most restarts of the 6-dose problem). */
const PEC_START_SPACING = 0.25;

/**
 * The final evaluation (PECE) is made at this rtol and above; below it, one evaluation a
 * step (P(EC)). A fit's model runs at rtol 1e-10 and must be smooth in its parameters: with
 * PECE each step's error is a sizeable share of the run's, and a change in the step sequence
 * (an order chosen otherwise, the last step landing otherwise) moved a decay's end by 1e-11
 * relative for a change of its rate of 1e-7 (the one-evaluation mode: no visible jump, its
 * error a sum of many small ones), and the exactly determined fit of
 * test/engine/fit-residuals.test.ts left residuals of 5e-11. Below 1e-9 the one-evaluation
 * mode reaches its tolerance on the work-precision problems (0.3–0.75 units at 1e-10). There
 * the steps are made in the one-evaluation mode as it was (`adams-rebuilt.ts`): a fit's
 * model is then the same to the last bit, and so are its model runs (NIST Misra1a and BoxBOD
 * took 1.18 and 1.27 times forward differences' runs for their digits; the same mode with the
 * history kept in place, equal but for rounding, 1.39 and 1.35: test/engine/fit-certified.test.ts
 * holds them to 1.3).
 */
export const PECE_FROM_RTOL = 1e-9;

/** Adaptive variable-order Adams stepper (PECE, or P(EC) below `PECE_FROM_RTOL`; stiffness reported in `stiffAt`). */
export class AdamsStepper implements Stepper {
  t: number;
  readonly y: Float64Array;
  h = NaN;
  /** Time of the step at which stiffness was first reported, or null. */
  stiffAt: number | null = null;
  /** The predictor's order. */
  order = 1;

  private readonly mark: NonFiniteMark;
  private readonly f0: Float64Array;
  private readonly p: Float64Array;
  private readonly fp: Float64Array;
  private readonly yNew: Float64Array;
  private readonly fc: Float64Array;
  private started = false;
  private readonly startWork: AdamsStartWork;
  private stepsSinceTest = 0;
  private stiffSignals = 0;
  /** Whether the run has a fast mode (asked at a sign of stiffness that suggests one). */
  private readonly fastCheck = new FastModeCheck();
  /** Signs of stiffness since the check last found no fast mode. */
  private signalsSinceCheck = 0;
  /** The final evaluation (PECE) at every step; else the one-evaluation mode (rtol below `PECE_FROM_RTOL`). */
  private pece = true;
  /** The mode's arithmetic: `inPlace` or `rebuilt`, the latter made on first use. */
  private formulas: AdamsFormulas;
  private readonly inPlace: InPlaceFormulas;
  private rebuilt: RebuiltFormulas | null = null;

  constructor(private ctx: OdeContext, t0: number, y0: ArrayLike<number>, firstStep?: number) {
    const n = ctx.n;
    this.t = t0;
    this.y = Float64Array.from(y0);
    this.mark = new NonFiniteMark(n);
    this.f0 = new Float64Array(n);
    this.p = new Float64Array(n);
    this.fp = new Float64Array(n);
    this.yNew = new Float64Array(n);
    this.fc = new Float64Array(n);
    this.startWork = new AdamsStartWork(n);
    this.inPlace = new InPlaceFormulas(n, ctx.options);
    this.formulas = this.inPlace;
    this.restart(ctx, t0, y0, firstStep);
  }

  /**
   * Starts again from (t0, y0) under a new run's context (of the same number of states), as
   * the constructor leaves it: only the work arrays are kept, each written before it is read
   * (the pieces of a dosing schedule, or the runs of a what-if loop, set them up once).
   */
  restart(ctx: OdeContext, t0: number, y0: ArrayLike<number>, firstStep?: number): void {
    this.ctx = ctx;
    this.t = t0;
    this.y.set(y0);
    this.h = firstStep ?? NaN;
    this.stiffAt = null;
    this.order = 1;
    this.started = false;
    this.stepsSinceTest = 0;
    this.stiffSignals = 0;
    this.fastCheck.clear();
    this.signalsSinceCheck = 0;
    this.mark.clear();
    this.pece = ctx.options.rtol >= PECE_FROM_RTOL;
    this.formulas = this.pece ? this.inPlace : (this.rebuilt ??= new RebuiltFormulas(ctx.n, ctx.options));
    this.formulas.options = ctx.options;
    this.formulas.clear();
  }

  /** The first step of a piece: the history from one point (a run's first piece) or from a Runge–Kutta start. */
  private begin(tEnd: number): StepOutcome {
    const { ctx, y, f0, formulas } = this;
    if (!ctx.rhs.call(this.t, y, f0)) return failure(nonFiniteStatus(ctx, y, y, f0), this.t, y);
    if (Number.isNaN(this.h)) {
      // A run's first piece climbs from order 1: the Runge–Kutta start's history comes from
      // an order-4 interpolant, and a fit's model (one piece, rtol 1e-10) then lost its
      // smoothness in the parameters (NIST BoxBOD to 6 digits, test/engine/fit-certified.test.ts).
      this.h = startStep(ctx, this.t, y, f0, tEnd, 1);
      formulas.loadOne(this.t, f0, this.h);
      this.order = 1;
      this.started = true;
      return this.step(tEnd);
    }
    const points = startPoints(ctx.options.rtol);
    // A step carried from a previous piece (`firstStep`) is the Adams step there; the start
    // spans points - 1 spacings of `START_SPACING` of it each.
    const first = (this.pece ? START_SPACING : PEC_START_SPACING) * this.h * (points - 1);
    const start = rkStart(ctx, this.t, y, f0, first, tEnd, points, this.startWork);
    if (!('T' in start)) return start;
    const spacings = Math.max(1, start.T.length - 1);
    this.order = spacings;
    this.h = (2 * start.h) / spacings;
    formulas.load(start.T, start.F, this.h);
    this.t = start.tNew;
    y.set(this.startWork.yNew);
    this.started = true;
    ctx.counters.steps++;
    return { ok: true, segment: start.segment };
  }

  step(tEnd: number): StepOutcome {
    if (!this.started) return this.begin(tEnd);
    const { ctx, y, p, fp, yNew, formulas } = this;
    const { n, options } = ctx;
    const C = ADAMS_CONTROL;
    this.mark.clear();
    let rejected = false;
    for (;;) {
      const budget = spendAttempt(ctx, this.t, y);
      if (budget) return budget;
      const t = this.t;
      const trial = trialStep(t, this.h, tEnd, options.maxStep);
      const tNew = trial.last ? tEnd : t + trial.h;
      const h = tNew - t;
      const k = Math.min(this.order, formulas.count);
      // the corrector's differences up to m: one past the order, for the estimate at k + 1
      const m = Math.min(k + 1, formulas.count);
      formulas.predict(h, k, m, y, p);
      if (!ctx.rhs.call(tNew, p, fp)) {
        this.mark.set(ctx, tNew, y, p, fp);
        ctx.counters.rejected++;
        rejected = true;
        this.h = h * C.nonFiniteShrink;
        if (this.h < minStep(t)) return collapseFailure(ctx, t, y, formulas.rate(), this.mark);
        continue;
      }
      const est = formulas.correct(h, k, m, y, p, fp, yNew);
      if (!(est <= 1)) {
        ctx.counters.rejected++;
        rejected = true;
        this.mark.clear();
        const factor = Number.isFinite(est) ? Math.max(C.minFactor, C.safety * Math.pow(est, -1 / (k + 1))) : C.minFactor;
        // repeated failures fall back in order, as the estimate at a lower order is more robust
        if (this.order > 1 && factor < 0.5) this.order--;
        this.h = h * factor;
        if (this.h < minStep(t)) return collapseFailure(ctx, t, y, formulas.rate(), this.mark);
        continue;
      }
      const segment = formulas.segment(t, tNew, h, k, m, y, yNew);
      if (this.pece) {
        // the final evaluation (PECE): the step keeps f at the corrected value, and the new
        // differences are taken from it; where f is not finite there, f at the predicted value.
        // Not on a piece's last step: the next piece starts afresh (a dose changed the state).
        if (!trial.last && ctx.rhs.call(tNew, yNew, this.fc)) {
          formulas.keep(this.fc, m);
          if (++this.stepsSinceTest >= STIFF_TEST_EVERY && this.stiffAt === null) {
            this.stepsSinceTest = 0;
            this.testStiffness(h, k, tNew, tEnd);
          }
        }
      } else if (++this.stepsSinceTest >= STIFF_TEST_EVERY && this.stiffAt === null) {
        // one evaluation a step: the stiffness test evaluates f at the corrected value, kept
        this.stepsSinceTest = 0;
        if (ctx.rhs.call(tNew, yNew, this.fc)) {
          this.testStiffness(h, k, tNew, tEnd);
          formulas.keep(this.fc, m);
        }
      }
      // order and step for the next step
      const chosen = formulas.next(est, k, m, this.order, y, yNew);
      const factor = Math.min(rejected ? 1 : C.maxFactor, Math.max(C.minFactor, chosen.factor));
      this.order = chosen.order;
      const planned = Math.min(this.h, options.maxStep);
      this.h = trial.last ? Math.max(h * factor, planned) : h * factor;
      formulas.accept(tNew, m);
      this.t = tNew;
      for (let c = 0; c < n; c++) y[c] = yNew[c];
      ctx.counters.steps++;
      return { ok: true, segment };
    }
  }

  /**
   * h|λ| ≈ h·‖f(y_c) − f(p)‖/‖y_c − p‖ against `stiffHLambda`; J's dominant |λ| checked
   * (`FastModeCheck`, from the correction y_c − p) at a sign whose ratio suggests a fast mode,
   * once, or again after `STIFF_RECHECK` signs when the check found none.
   */
  private testStiffness(h: number, k: number, tNew: number, tEnd: number): void {
    const { ctx, fc, fp, yNew, p, fastCheck } = this;
    const n = ctx.n;
    let num = 0;
    let den = 0;
    for (let c = 0; c < n; c++) {
      const df = fc[c] - fp[c];
      const dy = yNew[c] - p[c];
      num += df * df;
      den += dy * dy;
    }
    if (!(den > 0)) return;
    const lambda = Math.sqrt(num / den);
    if (!(h * lambda > stiffHLambda(k, ctx.options.rtol))) {
      this.stiffSignals = 0;
      return;
    }
    this.stiffSignals++;
    this.signalsSinceCheck++;
    const ask = fastCheck.fast === undefined || (fastCheck.fast === false && this.signalsSinceCheck >= STIFF_RECHECK);
    if (ask && suggestsFastMode(lambda, tNew, tEnd)) {
      const v = fastCheck.direction(n);
      for (let c = 0; c < n; c++) v[c] = yNew[c] - p[c];
      fastCheck.confirm(ctx, tNew, yNew, fc, tEnd);
      this.signalsSinceCheck = 0;
    }
    if (fastCheck.fast === true && fastCheck.spans(tNew, tEnd) && this.stiffSignals >= STIFF_FAST_SIGNALS) this.stiffAt = tNew;
  }
}
