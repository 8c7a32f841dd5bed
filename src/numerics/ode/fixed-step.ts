/**
 * Fixed-step explicit methods (Euler, Heun, classical RK4): steps of the given size from t0,
 * at t0 + i·step (not accumulated, so no drift), the last one shortened to land exactly on
 * the end. No error control: the user chose the step.
 *
 * Dense output between steps is the cubic Hermite interpolant of the two end states and
 * their rates (common practice; Hairer, Nørsett & Wanner, Solving ODEs I, sec. II.6, eq.
 * 6.7). The rate at a step's end is the first stage of the next step, so it costs one extra
 * evaluation per run, not per step.
 */
import {
  type OdeContext, type StepOutcome, type Stepper, failure, nonFiniteStatus, spendAttempt,
} from './control.ts';
import { type ButcherTableau, RkWork, rkStep } from './explicit-rk.ts';
import { type DenseSegment, Status, writeStepEnd } from './types.ts';

/** Cubic Hermite interpolant on [t0, t1] through (y0, f0) and (y1, f1). */
export class HermiteSegment implements DenseSegment {
  /** [y0 | y1 | h·f0 | h·f1], each n long. */
  constructor(readonly t0: number, readonly t1: number, private readonly n: number, private readonly data: Float64Array) {}

  static from(t0: number, t1: number, y0: Float64Array, f0: Float64Array, y1: Float64Array, f1: Float64Array): HermiteSegment {
    const n = y0.length;
    const h = t1 - t0;
    const data = new Float64Array(4 * n);
    for (let i = 0; i < n; i++) {
      data[i] = y0[i];
      data[n + i] = y1[i];
      data[2 * n + i] = h * f0[i];
      data[3 * n + i] = h * f1[i];
    }
    return new HermiteSegment(t0, t1, n, data);
  }

  /**
   * y(θ) = (1-θ)·y0 + θ·y1 + θ(1-θ)·((1-θ)(h f0 - Δ) - θ(h f1 - Δ)), Δ = y1 - y0: value and
   * slope match at both ends, so the interpolant has local error O(h⁴).
   */
  eval(t: number, out: Float64Array): void {
    const { data, n } = this;
    if (writeStepEnd(t, this.t0, this.t1, data, n, out)) return;
    const th = (t - this.t0) / (this.t1 - this.t0);
    const th1 = 1 - th;
    for (let i = 0; i < n; i++) {
      const delta = data[n + i] - data[i];
      const bump = th1 * (data[2 * n + i] - delta) - th * (data[3 * n + i] - delta);
      out[i] = th1 * data[i] + th * data[n + i] + th * th1 * bump;
    }
  }
}

/**
 * The number of steps of size `step` that cover [t0, tEnd], the last one possibly shorter.
 * A remainder below `SLIVER` of a step is absorbed into the last full step instead.
 */
export const SLIVER = 1e-9;

function fixedStepCount(t0: number, tEnd: number, step: number): number {
  return Math.max(1, Math.ceil((tEnd - t0) / step - SLIVER));
}

/** A fixed-step stepper for one explicit tableau, from t0 with the given step. */
export class FixedStepper implements Stepper {
  t: number;
  readonly y: Float64Array;
  readonly h: number;
  private readonly work: RkWork;
  private readonly yNew: Float64Array;
  private started = false;
  /** Index of the next step (t = origin + index·step). */
  private index = 0;

  constructor(private readonly ctx: OdeContext, private readonly tab: ButcherTableau, private readonly origin: number,
    y0: ArrayLike<number>, step: number) {
    this.t = origin;
    this.y = Float64Array.from(y0);
    this.h = step;
    this.work = new RkWork(ctx.n, tab.c.length);
    this.yNew = new Float64Array(ctx.n);
  }

  step(tEnd: number): StepOutcome {
    const { ctx, work, y, yNew } = this;
    const k = work.k;
    if (!this.started) {
      if (!ctx.rhs.call(this.t, y, k[0])) return failure(nonFiniteStatus(ctx, y, y, k[0]), this.t, y);
      this.started = true;
    }
    const budget = spendAttempt(ctx, this.t, y);
    if (budget) return budget;
    const total = fixedStepCount(this.origin, tEnd, this.h);
    const t = this.t;
    const tNew = this.index + 1 >= total ? tEnd : this.origin + (this.index + 1) * this.h;
    const h = tNew - t;
    const f0 = Float64Array.from(k[0]);
    const bad = rkStep(this.tab, ctx.rhs, t, y, h, work, yNew, tNew);
    if (bad >= 0) {
      // A blow-up is reported at the last accepted state; an undefined rate where f failed.
      const status = nonFiniteStatus(ctx, y, work.arg, k[bad]);
      return status === Status.Blowup ? failure(status, t, y) : failure(status, t + this.tab.c[bad] * h, work.arg);
    }
    // The rate at the new point: the Hermite slope here and the next step's first stage.
    const f1 = work.arg;
    if (!ctx.rhs.call(tNew, yNew, f1)) return failure(nonFiniteStatus(ctx, y, yNew, f1), tNew, yNew);
    const segment = HermiteSegment.from(t, tNew, y, f0, yNew, f1);
    k[0].set(f1);
    y.set(yNew);
    this.t = tNew;
    this.index++;
    ctx.counters.steps++;
    return { ok: true, segment };
  }
}
