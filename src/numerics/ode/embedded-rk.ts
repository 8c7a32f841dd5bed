/**
 * The adaptive stepper shared by the embedded explicit Runge–Kutta pairs (dopri5, dp853):
 * a pair is its coefficients, its error norm, its dense output and its constants; this file
 * runs the step loop (rejections, non-finite stages, step-size control) and the stiffness
 * test once for all of them.
 *
 * - Step size: PI control, Hairer, Nørsett & Wanner, Solving ODEs I, sec. II.4 (eq. 4.13);
 *   starting step from the same section.
 * - Stiffness detection: Hairer & Wanner, Solving ODEs II, sec. IV.2 ("Automatic stiffness
 *   detection"): h·λ is estimated from two stages that share the point t + h. Where J's
 *   dominant eigenvalue (by power iteration, `dominantRate` in `jacobian.ts`) would decay
 *   e-fold `STIFF_SPAN` times over the rest of the run, as the stiff method's own choice
 *   asks (`stiff-choice.ts`), `fastSignals` tests above the edge are enough.
 */
import {
  type OdeContext, type StepOutcome, type Stepper,
  NonFiniteMark, collapseFailure, failure, initialStep, minStep, nonFiniteStatus, spendAttempt, trialStep,
} from './control.ts';
import { startStep } from './start-step.ts';
import { type ButcherTableau, RkWork, rkStages, rkStep } from './explicit-rk.ts';
import type { DenseSegment } from './types.ts';
import { FastModeCheck, suggestsFastMode } from './fast-mode.ts';

/** Step-size factor constants of a pair. */
export interface StepControl {
  /** Safety factor on the predicted optimal step. */
  readonly safety: number;
  /** Smallest factor a step may shrink by at once. */
  readonly minFactor: number;
  /** Largest factor a step may grow by at once. */
  readonly maxFactor: number;
  /** PI controller: h_new = h · safety · err^(-alpha) · errOld^beta. */
  readonly alpha: number;
  readonly beta: number;
  /** After a rejection, plain error-per-step control: h_new = h · safety · err^(-rejectExponent). */
  readonly rejectExponent: number;
  /** Floor on the previous error in the PI term, so that one tiny error does not force huge steps. */
  readonly errFloor: number;
  /** Factor applied to a step whose stages met a non-finite rate. */
  readonly nonFiniteShrink: number;
}

/** Stiffness test constants of a pair. */
export interface StiffnessTest {
  /** h·|λ| on the edge of the method's stability region along the negative real axis. */
  readonly threshold: number;
  /** Positive tests (not interrupted by `reset` negative ones) before stiffness is reported. */
  readonly signals: number;
  /** Consecutive negative tests that clear the count. */
  readonly reset: number;
  /**
   * Positive tests enough when the mode the test sees would still decay e-fold at least
   * `STIFF_SPAN` times over what is left of the run (|λ|·(tEnd - t) ≥ `STIFF_SPAN`).
   */
  readonly fastSignals: number;
  /**
   * The threshold is also at most this multiple of the h|λ| an accuracy-limited step would
   * have on a mode that is present (`activeModeHLambda`): a step that much longer can only
   * stand on a mode that has decayed, which is stiffness.
   */
  readonly activeModeMultiple: number;
  /** Two stages evaluated at t + h: h·λ ≈ h·|k_a - k_b| / |arg_a - arg_b|. */
  readonly stages: readonly [number, number];
}

/** An embedded explicit pair: what differs between dopri5 and dp853. */
export interface EmbeddedPair {
  /** The stages of a step; `rkStep` runs them. */
  readonly tableau: ButcherTableau;
  /**
   * Every stage the pair evaluates, as rows (c, a): the step's, then those evaluated only
   * once the step is accepted (the rate at the new solution, extra stages of the dense
   * output). Equal to the tableau's when there are none.
   */
  readonly c: readonly number[];
  readonly a: readonly (readonly number[])[];
  /** The stage that holds f(t + h, y_new): the next step's first stage. */
  readonly newRateStage: number;
  /** Order used for the starting step's guess h ~ (0.01/|y''|)^(1/(p+1)). */
  readonly startOrder: number;
  /**
   * The first step from the solution's time scale (`start-step.ts`) rather than the book's
   * rule (`initialStep`, which reads t in its own unit as the time scale).
   */
  readonly timeScaleStart: boolean;
  readonly control: StepControl;
  readonly stiffness: StiffnessTest;
  /** The h|λ| of an accuracy-limited step on a mode of relative size 1 at this rtol. */
  activeModeHLambda(rtol: number): number;
  /** The scaled error of a step (accept when at most 1); `err` is scratch of length n. */
  errorNorm(h: number, k: readonly Float64Array[], y: Float64Array, yNew: Float64Array, ctx: OdeContext, err: Float64Array): number;
  /** The continuous solution of an accepted step, from its stages (all of `c` evaluated). */
  segment(t0: number, t1: number, h: number, y0: Float64Array, y1: Float64Array, k: readonly Float64Array[]): DenseSegment;
}

/** Adaptive stepper for an embedded pair. */
export class EmbeddedRkStepper implements Stepper {
  t: number;
  readonly y: Float64Array;
  h = NaN;
  /** Time of the step at which stiffness was first reported, or null. */
  stiffAt: number | null = null;

  private readonly work: RkWork;
  private readonly yNew: Float64Array;
  private readonly err: Float64Array;
  private readonly mark: NonFiniteMark;
  private ctx: OdeContext;
  private started = false;
  private errOld: number;
  private stiffSignals = 0;
  private calmTests = 0;
  /**
   * Whether J's dominant eigenvalue at the first step whose test suggested it was fast
   * enough that |λ|·(span left) ≥ `STIFF_SPAN` (`fastMode`); `fast` undefined until then.
   */
  private readonly fastCheck = new FastModeCheck();
  /** h|λ| above which a step counts as a sign of stiffness (see `StiffnessTest`). */
  private stiffThreshold: number;

  constructor(private readonly pair: EmbeddedPair, ctx: OdeContext, t0: number, y0: ArrayLike<number>,
    firstStep?: number) {
    this.ctx = ctx;
    this.t = t0;
    this.y = new Float64Array(ctx.n);
    this.work = new RkWork(ctx.n, pair.c.length);
    this.yNew = new Float64Array(ctx.n);
    this.err = new Float64Array(ctx.n);
    this.mark = new NonFiniteMark(ctx.n);
    this.errOld = pair.control.errFloor;
    this.stiffThreshold = NaN;
    this.restart(ctx, t0, y0, firstStep);
  }

  /**
   * Starts again from (t0, y0) under a new run's context (of the same number of states), in
   * the state the constructor leaves: only the work arrays are kept, and each is written
   * before it is read. So a run of many pieces, or many runs, allocates them once.
   */
  restart(ctx: OdeContext, t0: number, y0: ArrayLike<number>, firstStep?: number): void {
    this.ctx = ctx;
    this.t = t0;
    this.y.set(y0);
    this.h = firstStep ?? NaN;
    this.stiffAt = null;
    this.started = false;
    this.errOld = this.pair.control.errFloor;
    this.stiffSignals = 0;
    this.calmTests = 0;
    this.fastCheck.clear();
    this.mark.clear();
    const S = this.pair.stiffness;
    this.stiffThreshold = Math.min(S.threshold, S.activeModeMultiple * this.pair.activeModeHLambda(ctx.options.rtol));
  }

  step(tEnd: number): StepOutcome {
    const { ctx, work, y, yNew, err, pair } = this;
    const k = work.k;
    const C = pair.control;
    const s = pair.tableau.c.length;
    if (!this.started) {
      if (!ctx.rhs.call(this.t, y, k[0])) return failure(nonFiniteStatus(ctx, y, y, k[0]), this.t, y);
      if (Number.isNaN(this.h)) {
        this.h = pair.timeScaleStart ? startStep(ctx, this.t, y, k[0], tEnd, pair.startOrder) : initialStep(ctx, this.t, y, k[0], tEnd, pair.startOrder);
      }
      this.started = true;
    }
    this.mark.clear();
    let rejected = false;
    for (;;) {
      const budget = spendAttempt(ctx, this.t, y);
      if (budget) return budget;
      const t = this.t;
      const trial = trialStep(t, this.h, tEnd, ctx.options.maxStep);
      const tNew = trial.last ? tEnd : t + trial.h;
      const h = tNew - t;
      let bad = rkStep(pair.tableau, ctx.rhs, t, y, h, work, yNew, tNew);
      let norm = NaN;
      if (bad < 0) {
        norm = pair.errorNorm(h, k, y, yNew, ctx, err);
        // The stages after acceptance (the new rate, the dense output's) only for a step kept.
        if (norm <= 1 && pair.c.length > s) bad = rkStages(pair.c, pair.a, s, pair.c.length, ctx.rhs, t, y, h, work, tNew);
      }
      if (bad >= 0) {
        this.mark.set(ctx, t + pair.c[bad] * h, y, work.arg, k[bad]);
        ctx.counters.rejected++;
        rejected = true;
        this.h = h * C.nonFiniteShrink;
        if (this.h < minStep(t)) return collapseFailure(ctx, t, y, k[0], this.mark);
        continue;
      }
      if (norm <= 1) {
        const segment = pair.segment(t, tNew, h, y, yNew, k);
        this.detectStiffness(h, tNew, tEnd);
        let factor = norm === 0 ? C.maxFactor : C.safety * Math.pow(norm, -C.alpha) * Math.pow(this.errOld, C.beta);
        factor = Math.min(rejected ? 1 : C.maxFactor, Math.max(C.minFactor, factor));
        this.errOld = Math.max(norm, C.errFloor);
        // A last step cut short to land on tEnd says little about longer steps: a restart
        // from here keeps at least the step that was planned before the cut.
        const planned = Math.min(this.h, ctx.options.maxStep);
        this.h = trial.last ? Math.max(h * factor, planned) : h * factor;
        this.t = tNew;
        y.set(yNew);
        k[0].set(k[pair.newRateStage]);
        ctx.counters.steps++;
        return { ok: true, segment };
      }
      ctx.counters.rejected++;
      rejected = true;
      this.mark.clear();
      const factor = Number.isFinite(norm) ? Math.max(C.minFactor, C.safety * Math.pow(norm, -C.rejectExponent)) : C.minFactor;
      this.h = h * factor;
      if (this.h < minStep(t)) return collapseFailure(ctx, t, y, k[0], this.mark);
    }
  }

  /**
   * h·λ ≈ h·|k_a - k_b| / |arg_a - arg_b| for the two stages of `StiffnessTest.stages`, both
   * at t + h: their rates differ by about J·(difference of their arguments). Stiffness is
   * reported after `signals` tests above the threshold, or `fastSignals` once `fastMode`
   * found a fast mode (asked once a run, at the first test above the threshold whose
   * |λ|·(tEnd - t) reaches `STIFF_SPAN`).
   */
  private detectStiffness(h: number, tNew: number, tEnd: number): void {
    const k = this.work.k;
    const S = this.pair.stiffness;
    // read by index: destructuring the pair would allocate on every step
    const ia = S.stages[0];
    const ib = S.stages[1];
    const rowA = this.pair.a[ia];
    const rowB = this.pair.a[ib];
    const top = Math.max(ia, ib);
    let num = 0;
    let den = 0;
    for (let i = 0; i < this.ctx.n; i++) {
      const dk = k[ia][i] - k[ib][i];
      let dy = 0;
      for (let j = 0; j < top; j++) dy += ((rowA[j] ?? 0) - (rowB[j] ?? 0)) * k[j][i];
      dy *= h;
      num += dk * dk;
      den += dy * dy;
    }
    if (den <= 0) return;
    const lambda = Math.sqrt(num / den);
    const hLambda = h * lambda;
    if (hLambda > this.stiffThreshold) {
      this.calmTests = 0;
      this.stiffSignals++;
      if (this.fastCheck.fast === undefined && suggestsFastMode(lambda, tNew, tEnd)) this.fastMode(h, tNew, tEnd);
      const enough = this.fastCheck.fast === true ? S.fastSignals : S.signals;
      if (this.stiffSignals >= enough && this.stiffAt === null) this.stiffAt = tNew;
    } else {
      this.calmTests++;
      if (this.calmTests >= S.reset) this.stiffSignals = 0;
    }
  }

  /**
   * Whether the run has a mode that decays e-fold `STIFF_SPAN` times over what is left of it
   * (`FastModeCheck`, from the direction the test measured along), asked once a run.
   */
  private fastMode(h: number, tNew: number, tEnd: number): void {
    const n = this.ctx.n;
    const k = this.work.k;
    const S = this.pair.stiffness;
    const rowA = this.pair.a[S.stages[0]];
    const rowB = this.pair.a[S.stages[1]];
    const v = this.fastCheck.direction(n);
    for (let i = 0; i < n; i++) {
      let dy = 0;
      for (let j = 0; j < Math.max(S.stages[0], S.stages[1]); j++) dy += ((rowA[j] ?? 0) - (rowB[j] ?? 0)) * k[j][i];
      v[i] = h * dy;
    }
    this.fastCheck.confirm(this.ctx, tNew, this.yNew, k[this.pair.newRateStage], tEnd);
  }
}
