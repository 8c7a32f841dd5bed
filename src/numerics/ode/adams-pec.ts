/**
 * The Adams formulas with one evaluation of f a step (P(EC): the corrector applied once to f
 * at the predicted value, and that rate kept), their divided differences rebuilt from the
 * kept rates at every step: the stepper `adams.ts` ran before it took the final evaluation and
 * kept its history in place, kept as it was for rtol below `PECE_FROM_RTOL` (`adams.ts`), where
 * a fit's model runs and must stay as smooth in its parameters as it was: see `PECE_FROM_RTOL`.
 * The method is `adams.ts`'s (Hairer, Nørsett & Wanner, Solving ODEs I, sec. III.5; Shampine &
 * Gordon 1975, ch. 4–5), with its constants (`adams-control.ts`); its start after a dose is
 * `adams-start.ts`. Every `STIFF_TEST_EVERY`-th step evaluates f at the corrected value too,
 * for the stiffness test, and keeps that rate.
 */
import {
  type OdeContext, type StepOutcome, type Stepper,
  NonFiniteMark, collapseFailure, errorNorm, failure, minStep, nonFiniteStatus, spendAttempt, trialStep,
} from './control.ts';
import { startStep } from './start-step.ts';
import { AdamsStartWork, rkStart, startPoints } from './adams-start.ts';
import { AdamsSegment, dividedDifferences, newtonIntegrals } from './adams-newton.ts';
import { ADAMS_MAX_ORDER } from './adams-history.ts';
import { ADAMS_CONTROL, STIFF_REMAINING, STIFF_SIGNALS, STIFF_TEST_EVERY, stiffHLambda } from './adams-control.ts';


/** to[i] = from[i] for i < n: for the few states of a rate law, faster than `set`'s call. */
function copy(from: Float64Array, to: Float64Array, n: number): void {
  for (let i = 0; i < n; i++) to[i] = from[i];
}

/** The factor on h that brings an estimate e of order q to the target (safety included). */
function stepFactor(e: number, q: number): number {
  return e === 0 ? ADAMS_CONTROL.maxFactor : ADAMS_CONTROL.safety * Math.pow(e, -1 / (q + 1));
}

/** Adaptive variable-order Adams stepper (P(EC), stiffness reported in `stiffAt`). */
export class AdamsPecStepper implements Stepper {
  t: number;
  readonly y: Float64Array;
  h = NaN;
  /** Time of the step at which stiffness was first reported, or null. */
  stiffAt: number | null = null;
  /** The predictor's order. */
  order = 1;

  /** Past times and rates, newest first: T[0] = t, F[0] = the rate kept for t. */
  private readonly T: number[] = [];
  private readonly F: Float64Array[] = [];
  private readonly mark: NonFiniteMark;
  private readonly p: Float64Array;
  private readonly fp: Float64Array;
  private readonly yNew: Float64Array;
  private readonly err: Float64Array;
  private readonly fc: Float64Array;
  private readonly d: Float64Array[];
  private readonly x = new Float64Array(ADAMS_MAX_ORDER + 3);
  private readonly g = new Float64Array(ADAMS_MAX_ORDER + 3);
  private readonly coef = new Float64Array(ADAMS_MAX_ORDER + 4);
  private started = false;
  private readonly startWork: AdamsStartWork;
  private stepsSinceTest = 0;
  private stiffSignals = 0;

  constructor(private ctx: OdeContext, t0: number, y0: ArrayLike<number>, firstStep?: number) {
    const n = ctx.n;
    this.t = t0;
    this.y = Float64Array.from(y0);
    this.mark = new NonFiniteMark(n);
    this.p = new Float64Array(n);
    this.fp = new Float64Array(n);
    this.yNew = new Float64Array(n);
    this.err = new Float64Array(n);
    this.fc = new Float64Array(n);
    this.startWork = new AdamsStartWork(n);
    this.d = Array.from({ length: ADAMS_MAX_ORDER + 3 }, () => new Float64Array(n));
    if (firstStep !== undefined) this.h = firstStep;
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
    this.T.length = 0;
    this.F.length = 0;
    this.started = false;
    this.stepsSinceTest = 0;
    this.stiffSignals = 0;
    this.mark.clear();
  }

  /** The scaled norm of h·G_i·d_i (the size of Newton term i in the step). */
  private termNorm(i: number, h: number): number {
    const { err, d, g, y, yNew, ctx } = this;
    for (let c = 0; c < ctx.n; c++) err[c] = h * g[i] * d[i][c];
    return errorNorm(err, y, yNew, ctx.options);
  }

  step(tEnd: number): StepOutcome {
    const { ctx, y, p, fp, yNew, d, x, g, T, F } = this;
    const n = ctx.n;
    const C = ADAMS_CONTROL;
    if (!this.started) {
      const f0 = new Float64Array(n);
      if (!ctx.rhs.call(this.t, y, f0)) return failure(nonFiniteStatus(ctx, y, y, f0), this.t, y);
      if (Number.isNaN(this.h)) {
        // A run's first piece climbs from order 1: the Runge–Kutta start's history comes from
        // an order-4 interpolant, and a fit's model (one piece, rtol 1e-10) then lost its
        // smoothness in the parameters (NIST BoxBOD to 6 digits, test/engine/fit-certified.test.ts).
        this.h = startStep(ctx, this.t, y, f0, tEnd, 1);
        T.length = 0;
        F.length = 0;
        T.push(this.t);
        F.push(f0);
        this.order = 1;
        this.started = true;
        return this.step(tEnd);
      }
      const points = startPoints(ctx.options.rtol);
      // A step carried from a previous piece (`firstStep`) is the Adams step there; the start
      // spans points - 1 spacings of a quarter of it each (half of it rejected the starting
      // step at most restarts of the 6-dose problem, each rejection costing 6 evaluations).
      const first = 0.25 * this.h * (points - 1);
      const start = rkStart(ctx, this.t, y, f0, first, tEnd, points, this.startWork);
      if (!('T' in start)) return start;
      T.length = 0;
      F.length = 0;
      T.push(...start.T);
      F.push(...start.F);
      this.order = Math.max(1, T.length - 1);
      this.h = (2 * start.h) / Math.max(1, T.length - 1);
      this.t = start.tNew;
      y.set(this.startWork.yNew);
      this.started = true;
      ctx.counters.steps++;
      return { ok: true, segment: start.segment };
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
      const k = Math.min(this.order, T.length);
      // predictor: nodes t_n, t_{n-1}, … in units of h from t_n
      for (let l = 0; l < k; l++) {
        x[l] = (T[l] - t) / h;
        copy(F[l], d[l], n);
      }
      dividedDifferences(x, d, k - 1);
      newtonIntegrals(x, k - 1, 1, g, this.coef);
      for (let c = 0; c < n; c++) {
        let acc = 0;
        for (let i = 0; i < k; i++) acc += g[i] * d[i][c];
        p[c] = y[c] + h * acc;
      }
      if (!ctx.rhs.call(tNew, p, fp)) {
        this.mark.set(ctx, tNew, y, p, fp);
        ctx.counters.rejected++;
        rejected = true;
        this.h = h * C.nonFiniteShrink;
        if (this.h < minStep(t)) return collapseFailure(ctx, t, y, F[0], this.mark);
        continue;
      }
      // corrector: nodes t_{n+1}, t_n, …; up to k + 2 of them for the estimate at order k + 1
      const m = Math.min(k + 1, T.length);
      x[0] = 1;
      copy(fp, d[0], n);
      for (let l = 0; l < m; l++) {
        x[l + 1] = (T[l] - t) / h;
        copy(F[l], d[l + 1], n);
      }
      dividedDifferences(x, d, m);
      newtonIntegrals(x, m, 1, g, this.coef);
      for (let c = 0; c < n; c++) {
        let acc = 0;
        for (let i = 0; i <= k; i++) acc += g[i] * d[i][c];
        yNew[c] = y[c] + h * acc;
      }
      const est = this.termNorm(k, h) / C.target;
      if (!(est <= 1)) {
        ctx.counters.rejected++;
        rejected = true;
        this.mark.clear();
        const factor = Number.isFinite(est) ? Math.max(C.minFactor, C.safety * Math.pow(est, -1 / (k + 1))) : C.minFactor;
        // repeated failures fall back in order, as the estimate at a lower order is more robust
        if (this.order > 1 && factor < 0.5) this.order--;
        this.h = h * factor;
        if (this.h < minStep(t)) return collapseFailure(ctx, t, y, F[0], this.mark);
        continue;
      }
      const estLow = k > 1 ? this.termNorm(k - 1, h) / C.target : Infinity;
      const estHigh = m === k + 1 ? this.termNorm(k + 1, h) / C.target : NaN;
      const segment = this.segment(t, tNew, h, m);
      let kept = fp;
      if (++this.stepsSinceTest >= STIFF_TEST_EVERY && this.stiffAt === null) {
        this.stepsSinceTest = 0;
        if (ctx.rhs.call(tNew, yNew, this.fc)) {
          this.testStiffness(h, k, tNew, tEnd);
          kept = this.fc;
        }
      }
      // order and step for the next step
      let next = this.order;
      let factor = stepFactor(est, k);
      if (k < this.order) {
        // the history was shorter than the order: keep building it
      } else if (Number.isNaN(estHigh)) {
        if (this.order < ADAMS_MAX_ORDER) next = this.order + 1;
      } else {
        const low = stepFactor(estLow, k - 1);
        const high = this.order < ADAMS_MAX_ORDER ? stepFactor(estHigh, k + 1) : 0;
        if (low >= factor && low >= high / C.raiseMargin) {
          next = this.order - 1;
          factor = low;
        } else if (high > C.raiseMargin * factor) {
          next = this.order + 1;
          factor = high;
        }
      }
      factor = Math.min(rejected ? 1 : C.maxFactor, Math.max(C.minFactor, factor));
      this.order = next;
      const planned = Math.min(this.h, ctx.options.maxStep);
      this.h = trial.last ? Math.max(h * factor, planned) : h * factor;
      // keep the history: newest first, as many as the next order's estimates use
      T.unshift(tNew);
      F.unshift(F.length >= ADAMS_MAX_ORDER + 2 ? F.pop()! : new Float64Array(n));
      if (T.length > ADAMS_MAX_ORDER + 2) T.pop();
      copy(kept, F[0], n);
      this.t = tNew;
      copy(yNew, y, n);
      ctx.counters.steps++;
      return { ok: true, segment };
    }
  }

  /** The dense output of the step just made, from the corrector's k + 1 Newton terms. */
  private segment(t0: number, t1: number, h: number, m: number): AdamsSegment {
    const k = Math.min(this.order, this.T.length);
    return AdamsSegment.ofRows(t0, t1, h, this.y, this.yNew, this.d, this.x, Math.min(k, m));
  }

  /** h|λ| ≈ h·‖f(y_c) − f(p)‖/‖y_c − p‖ against `stiffHLambda`. */
  private testStiffness(h: number, k: number, tNew: number, tEnd: number): void {
    let num = 0;
    let den = 0;
    for (let c = 0; c < this.ctx.n; c++) {
      const df = this.fc[c] - this.fp[c];
      const dy = this.yNew[c] - this.p[c];
      num += df * df;
      den += dy * dy;
    }
    if (!(den > 0)) return;
    const hLambda = h * Math.sqrt(num / den);
    if (hLambda > stiffHLambda(k, this.ctx.options.rtol) && (hLambda / h) * (tEnd - tNew) >= STIFF_REMAINING) {
      if (++this.stiffSignals >= STIFF_SIGNALS) this.stiffAt = tNew;
    } else {
      this.stiffSignals = 0;
    }
  }
}
