/**
 * The adaptive Dormand–Prince 5(4) method: seven stages, the last one evaluated at the new
 * solution and reused as the next step's first (FSAL), so six evaluations per accepted step.
 *
 * - Coefficients: Dormand & Prince (1980), "A family of embedded Runge–Kutta formulae",
 *   J. Comput. Appl. Math. 6, 19–26; also Hairer, Nørsett & Wanner, Solving ODEs I, sec. II.5,
 *   Table 5.2. The fifth-order solution is propagated (local extrapolation).
 * - Step size: PI control, Hairer, Nørsett & Wanner I, sec. II.4 (eq. 4.13 and the remarks
 *   on β = 0.04 for this method); starting step from the same section.
 * - Dense output: the fourth-order continuous extension of Hairer, Nørsett & Wanner I,
 *   sec. II.6 (after Shampine 1986 and Dormand & Prince 1986), one `Dopri5Segment` per step.
 * - Stiffness detection: Hairer & Wanner, Solving ODEs II, sec. IV.2 ("Automatic stiffness
 *   detection"): h·λ is estimated from the last two stages, which share the point t + h.
 */
import {
  type OdeContext, type StepOutcome, type Stepper,
  NonFiniteMark, collapseFailure, errorNorm, failure, initialStep, minStep, nonFiniteStatus, spendAttempt, trialStep,
} from './control.ts';
import { type ButcherTableau, RkWork, rkStep } from './explicit-rk.ts';
import type { DenseSegment } from './types.ts';
import { writeStepEnd } from './types.ts';

/** The Dormand–Prince 5(4) tableau (FSAL: the last row of a is b). */
export const DOPRI5: ButcherTableau = {
  name: 'dopri5',
  order: 5,
  c: [0, 1 / 5, 3 / 10, 4 / 5, 8 / 9, 1, 1],
  a: [
    [],
    [1 / 5],
    [3 / 40, 9 / 40],
    [44 / 45, -56 / 15, 32 / 9],
    [19372 / 6561, -25360 / 2187, 64448 / 6561, -212 / 729],
    [9017 / 3168, -355 / 33, 46732 / 5247, 49 / 176, -5103 / 18656],
    [35 / 384, 0, 500 / 1113, 125 / 192, -2187 / 6784, 11 / 84],
  ],
  b: [35 / 384, 0, 500 / 1113, 125 / 192, -2187 / 6784, 11 / 84, 0],
  fsal: true,
};

/** Weights of the embedded fourth-order solution. */
export const DOPRI5_B_HAT: readonly number[] = [
  5179 / 57600, 0, 7571 / 16695, 393 / 640, -92097 / 339200, 187 / 2100, 1 / 40,
];

/** Error weights e = b - b̂: the local error estimate is h Σ e_i k_i. */
export const DOPRI5_E: readonly number[] = DOPRI5.b.map((b, i) => b - DOPRI5_B_HAT[i]);

/**
 * Dense-output weights d_i (Hairer, Nørsett & Wanner I, sec. II.6): with θ = (t - t0)/h,
 * y(θ) = y0 + θ(Δ + (1-θ)(r3 + θ(r4 + (1-θ) r5))) where Δ = y1 - y0, r3 = h k1 - Δ,
 * r4 = Δ - h k7 - r3 and r5 = h Σ d_i k_i. Fourth order in θ for every θ in [0, 1].
 */
export const DOPRI5_DENSE: readonly number[] = [
  -12715105075 / 11282082432, 0, 87487479700 / 32700410799, -10690763975 / 1880347072,
  701980252875 / 199316789632, -1453857185 / 822651844, 69997945 / 29380423,
];

/** Step-size factor constants (Hairer, Nørsett & Wanner I, sec. II.4). */
export const DOPRI5_CONTROL = {
  /** Safety factor on the predicted optimal step. */
  safety: 0.9,
  /** Smallest factor a step may shrink by at once. */
  minFactor: 0.2,
  /** Largest factor a step may grow by at once. */
  maxFactor: 10,
  /** PI controller: h_new = h · safety · err^(-alpha) · errOld^beta, alpha = 1/5 - 0.75·beta. */
  beta: 0.04,
  alpha: 0.2 - 0.75 * 0.04,
  /** After a rejection, plain error-per-step control: h_new = h · safety · err^(-1/5). */
  rejectExponent: 0.2,
  /** Floor on the previous error in the PI term, so that one tiny error does not force huge steps. */
  errFloor: 1e-4,
  /** Factor applied to a step whose stages met a non-finite rate. */
  nonFiniteShrink: 0.25,
} as const;

/** Stiffness detection constants (Hairer & Wanner II, sec. IV.2). */
export const DOPRI5_STIFFNESS = {
  /**
   * h·|λ| at which a step sits on the edge of the method's stability region along the
   * negative real axis (about 3.3 for DOPRI5).
   */
  threshold: 3.25,
  /** Positive tests (not interrupted by `reset` negative ones) before stiffness is reported. */
  signals: 15,
  /** Consecutive negative tests that clear the count. */
  reset: 6,
  /**
   * At tight tolerances the steps on a stiff problem settle below the stability edge (h|λ|
   * ≈ 2.7 at rtol 1e-8 and 1.3 at rtol 1e-10 on y' = -1e4 (y - cos t), measured), where the
   * test above never fires. So the threshold is also at most this multiple of the h|λ| an
   * accuracy-limited step would have on a mode that is present (`activeModeHLambda`): a
   * step that much longer can only stand on a mode that has decayed, which is stiffness.
   */
  activeModeMultiple: 10,
} as const;

/**
 * The dopri5 error estimate on y' = λy, y = 1, for real z = hλ: |z·Σ e_i K_i(z)| with the
 * stage values K_i(z) of the method (their Taylor series starts at z^5).
 */
export function dopri5ErrorOnMode(z: number): number {
  const { a } = DOPRI5;
  const K: number[] = [];
  let err = 0;
  for (let i = 0; i < 7; i++) {
    let v = 1;
    for (let j = 0; j < i; j++) v += z * a[i][j] * K[j];
    K.push(v);
    err += DOPRI5_E[i] * v;
  }
  return Math.abs(z * err);
}

/** The leading coefficient C of the estimate on a mode, |E(z)| ≈ C·|z|^5 for small z. */
const ERROR_ON_MODE_C5 = dopri5ErrorOnMode(-1e-2) / 1e-10;

/**
 * The h|λ| at which dopri5's error estimate on a mode of relative size 1 reaches rtol:
 * (rtol/C)^(1/5). Steps limited by accuracy on a mode that is present sit near it.
 */
export function activeModeHLambda(rtol: number): number {
  return Math.pow(rtol / ERROR_ON_MODE_C5, 1 / 5);
}

/** The continuous solution of one Dormand–Prince step (see `DOPRI5_DENSE`). */
export class Dopri5Segment implements DenseSegment {
  /** [y0 | y1 | r3 | r4 | r5], each n long. */
  private readonly data: Float64Array;
  constructor(readonly t0: number, readonly t1: number, private readonly h: number, private readonly n: number, data: Float64Array) {
    this.data = data;
  }

  eval(t: number, out: Float64Array): void {
    const { data, n } = this;
    if (writeStepEnd(t, this.t0, this.t1, data, n, out)) return;
    const th = (t - this.t0) / this.h;
    const th1 = 1 - th;
    for (let i = 0; i < n; i++) {
      const q = data[2 * n + i] + th * (data[3 * n + i] + th1 * data[4 * n + i]);
      out[i] = th1 * data[i] + th * data[n + i] + th * th1 * q;
    }
  }
}

function denseSegment(t0: number, t1: number, h: number, y0: Float64Array, y1: Float64Array, k: Float64Array[]): Dopri5Segment {
  const n = y0.length;
  const data = new Float64Array(5 * n);
  const d = DOPRI5_DENSE;
  for (let i = 0; i < n; i++) {
    const delta = y1[i] - y0[i];
    const r3 = h * k[0][i] - delta;
    const r4 = delta - h * k[6][i] - r3;
    let acc = 0;
    for (let j = 0; j < 7; j++) acc += d[j] * k[j][i];
    data[i] = y0[i];
    data[n + i] = y1[i];
    data[2 * n + i] = r3;
    data[3 * n + i] = r4;
    data[4 * n + i] = h * acc;
  }
  return new Dopri5Segment(t0, t1, h, n, data);
}

/** Adaptive Dormand–Prince stepper. */
export class Dopri5Stepper implements Stepper {
  t: number;
  readonly y: Float64Array;
  h = NaN;
  /** Time of the step at which stiffness was first reported, or null. */
  stiffAt: number | null = null;

  private readonly work: RkWork;
  private readonly yNew: Float64Array;
  private readonly err: Float64Array;
  private readonly mark: NonFiniteMark;
  private started = false;
  private errOld: number = DOPRI5_CONTROL.errFloor;
  private stiffSignals = 0;
  private calmTests = 0;
  /** h|λ| above which a step counts as a sign of stiffness (see `DOPRI5_STIFFNESS`). */
  private readonly stiffThreshold: number;

  constructor(private readonly ctx: OdeContext, t0: number, y0: ArrayLike<number>, firstStep?: number) {
    this.t = t0;
    this.y = Float64Array.from(y0);
    this.work = new RkWork(ctx.n, 7);
    this.yNew = new Float64Array(ctx.n);
    this.err = new Float64Array(ctx.n);
    this.mark = new NonFiniteMark(ctx.n);
    if (firstStep !== undefined) this.h = firstStep;
    const S = DOPRI5_STIFFNESS;
    this.stiffThreshold = Math.min(S.threshold, S.activeModeMultiple * activeModeHLambda(ctx.options.rtol));
  }

  step(tEnd: number): StepOutcome {
    const { ctx, work, y, yNew, err } = this;
    const k = work.k;
    const C = DOPRI5_CONTROL;
    if (!this.started) {
      if (!ctx.rhs.call(this.t, y, k[0])) return failure(nonFiniteStatus(ctx, y, y, k[0]), this.t, y);
      if (Number.isNaN(this.h)) this.h = initialStep(ctx, this.t, y, k[0], tEnd, 4);
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
      const bad = rkStep(DOPRI5, ctx.rhs, t, y, h, work, yNew, tNew);
      if (bad >= 0) {
        this.mark.set(ctx, t + DOPRI5.c[bad] * h, y, work.arg, k[bad]);
        ctx.counters.rejected++;
        rejected = true;
        this.h = h * C.nonFiniteShrink;
        if (this.h < minStep(t)) return collapseFailure(ctx, t, y, k[0], this.mark);
        continue;
      }
      const e = DOPRI5_E;
      for (let i = 0; i < ctx.n; i++) {
        let acc = 0;
        for (let j = 0; j < 7; j++) acc += e[j] * k[j][i];
        err[i] = h * acc;
      }
      const norm = errorNorm(err, y, yNew, ctx.options);
      if (norm <= 1) {
        const segment = denseSegment(t, tNew, h, y, yNew, k);
        this.detectStiffness(h, tNew);
        let factor = norm === 0 ? C.maxFactor : C.safety * Math.pow(norm, -C.alpha) * Math.pow(this.errOld, C.beta);
        factor = Math.min(rejected ? 1 : C.maxFactor, Math.max(C.minFactor, factor));
        this.errOld = Math.max(norm, C.errFloor);
        // A last step cut short to land on tEnd says little about longer steps: a restart
        // from here keeps at least the step that was planned before the cut.
        const planned = Math.min(this.h, ctx.options.maxStep);
        this.h = trial.last ? Math.max(h * factor, planned) : h * factor;
        this.t = tNew;
        y.set(yNew);
        k[0].set(k[6]);
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
   * h·λ ≈ h·|k7 - k6| / |y(t+h) - y6|: stages 6 and 7 are both at t + h, so their rates
   * differ by about J·(difference of their arguments). Stiffness is reported after
   * `DOPRI5_STIFFNESS.signals` tests above the stability threshold.
   */
  private detectStiffness(h: number, tNew: number): void {
    const k = this.work.k;
    const a6 = DOPRI5.a[5];
    const a7 = DOPRI5.a[6];
    let num = 0;
    let den = 0;
    for (let i = 0; i < this.ctx.n; i++) {
      const dk = k[6][i] - k[5][i];
      let dy = 0;
      for (let j = 0; j < 6; j++) dy += (a7[j] - (a6[j] ?? 0)) * k[j][i];
      dy *= h;
      num += dk * dk;
      den += dy * dy;
    }
    if (den <= 0) return;
    const hLambda = h * Math.sqrt(num / den);
    const S = DOPRI5_STIFFNESS;
    if (hLambda > this.stiffThreshold) {
      this.calmTests = 0;
      this.stiffSignals++;
      if (this.stiffSignals >= S.signals && this.stiffAt === null) this.stiffAt = tNew;
    } else {
      this.calmTests++;
      if (this.calmTests >= S.reset) this.stiffSignals = 0;
    }
  }
}
