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
 *
 * The step loop and the stiffness test are shared with dp853 (`embedded-rk.ts`); this file
 * holds the pair: coefficients, error norm, dense output and constants.
 */
import { type OdeContext, type ResolvedOptions } from './control.ts';
import { type EmbeddedPair, EmbeddedRkStepper } from './embedded-rk.ts';
import { type ButcherTableau, stageValuesOnMode } from './explicit-rk.ts';
import type { DenseSegment } from './types.ts';
import { DenseSlab, writeStepEnd } from './types.ts';

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
   * Positive tests enough once J's dominant eigenvalue is known to decay e-fold `STIFF_SPAN`
   * times over the rest of the run (`fastMode` in `embedded-rk.ts`). The 15 above guard a
   * run whose fast mode may be brief against a few steps at the edge; such a run has no
   * such mode. On y' = -1e4 (y - cos t) the steps after the initial transient hover at h|λ|
   * 3.06–3.51 around the edge, so only about half the tests count and 15 took 0.008 s and
   * about 200 evaluations at rtol 1e-3; 2 switch at t = 0.002 after about 80 (one test above
   * the edge may be the step controller's overshoot as a transient ends).
   */
  fastSignals: 2,
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
  const K = stageValuesOnMode(DOPRI5.a, 7, z);
  return Math.abs(z * K.reduce((acc, v, i) => acc + DOPRI5_E[i] * v, 0));
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
  /** `data` from `at`: [y0 | y1 | r3 | r4 | r5], each n long. */
  constructor(readonly t0: number, readonly t1: number, private readonly h: number, private readonly n: number,
    private readonly data: Float64Array, private readonly at = 0) {}

  eval(t: number, out: Float64Array): void {
    const { data, n, at } = this;
    if (writeStepEnd(t, this.t0, this.t1, data, n, out, at)) return;
    const th = (t - this.t0) / this.h;
    const th1 = 1 - th;
    for (let i = 0; i < n; i++) {
      const q = data[at + 2 * n + i] + th * (data[at + 3 * n + i] + th1 * data[at + 4 * n + i]);
      out[i] = th1 * data[at + i] + th * data[at + n + i] + th * th1 * q;
    }
  }
}

/** Where the segments' numbers come from: one chunk for many steps. */
const slab = new DenseSlab();

function denseSegment(t0: number, t1: number, h: number, y0: Float64Array, y1: Float64Array, k: readonly Float64Array[]): Dopri5Segment {
  const n = y0.length;
  const at = slab.take(5 * n);
  const data = slab.data;
  const d = DOPRI5_DENSE;
  for (let i = 0; i < n; i++) {
    const delta = y1[i] - y0[i];
    const r3 = h * k[0][i] - delta;
    const r4 = delta - h * k[6][i] - r3;
    let acc = 0;
    for (let j = 0; j < 7; j++) acc += d[j] * k[j][i];
    data[at + i] = y0[i];
    data[at + n + i] = y1[i];
    data[at + 2 * n + i] = r3;
    data[at + 3 * n + i] = r4;
    data[at + 4 * n + i] = h * acc;
  }
  return new Dopri5Segment(t0, t1, h, n, data, at);
}

/**
 * Root-mean-square of err_i / (atol_i + rtol·|y1_i|): the error of a step in the unit of the
 * value where it ends. The book's norm (`errorNorm`, Hairer, Nørsett & Wanner I, eq. 4.11)
 * takes max(|y0_i|, |y1_i|), which on a decaying component is the step's start: a step of
 * z = hλ then meets rtol·|y0| = rtol·e^{-z}·|y1|, up to 2.5 times the tolerance at its own
 * end for the |z| ≈ 0.9 of Bateman's absorption state, and the relative error of the steps
 * adds up along the decay. On Bateman's problem dopri5 ended at 1.42, 1.30 and 1.17 units at
 * rtol 1e-3 … 1e-5 (measured, bench/README.md); with this norm 0.98, 0.81 and 0.86, for 4 %
 * more evaluations. A growing component is measured as before (its end is its largest value).
 */
export function errorNormAtEnd(err: Float64Array, y1: Float64Array, o: ResolvedOptions): number {
  let sum = 0;
  for (let i = 0; i < err.length; i++) {
    const r = err[i] / (o.atol[i] + o.rtol * Math.abs(y1[i]));
    sum += r * r;
  }
  return Math.sqrt(sum / err.length);
}

/** The Dormand–Prince 5(4) pair for the shared adaptive stepper. */
export const DOPRI5_PAIR: EmbeddedPair = {
  tableau: DOPRI5,
  c: DOPRI5.c,
  a: DOPRI5.a,
  newRateStage: 6,
  startOrder: 4,
  timeScaleStart: true,
  control: DOPRI5_CONTROL,
  stiffness: { ...DOPRI5_STIFFNESS, stages: [6, 5] },
  activeModeHLambda,
  errorNorm(h: number, k: readonly Float64Array[], y: Float64Array, yNew: Float64Array, ctx: OdeContext, err: Float64Array): number {
    const e = DOPRI5_E;
    for (let i = 0; i < ctx.n; i++) {
      let acc = 0;
      for (let j = 0; j < 7; j++) acc += e[j] * k[j][i];
      err[i] = h * acc;
    }
    return errorNormAtEnd(err, yNew, ctx.options);
  },
  segment: denseSegment,
};

/** Adaptive Dormand–Prince 5(4) stepper (stiffness reported in `stiffAt`). */
export class Dopri5Stepper extends EmbeddedRkStepper {
  constructor(ctx: OdeContext, t0: number, y0: ArrayLike<number>, firstStep?: number) {
    super(DOPRI5_PAIR, ctx, t0, y0, firstStep);
  }
}
