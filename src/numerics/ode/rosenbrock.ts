/**
 * The stiff method: RODAS, a Rosenbrock (linearly implicit Runge–Kutta) method of order 4
 * with an embedded order-3 solution, six stages, L-stable and stiffly accurate (Hairer &
 * Wanner, Solving ODEs II, sec. IV.7, "RODAS"). Each step solves six linear systems with
 * one LU factorization of (1/(hγ))·I - J; no Newton iteration, so a step never fails to
 * converge.
 *
 * Formulation (Hairer & Wanner II, eq. 7.4' with u_i = Σ_{j≤i} γ_ij k_j):
 *   ((1/(hγ))·I - J) u_i = f(t + c_i h, y + Σ_{j<i} a_ij u_j) + Σ_{j<i} (c_ij / h) u_j + h γ_i ∂f/∂t,
 *   y1 = y + Σ m_i u_i,  error estimate y1 - ŷ1 = u_6.
 * J = ∂f/∂y at the step's start, analytic when given, else forward differences (n
 * evaluations); ∂f/∂t by one forward difference unless the problem is declared autonomous.
 *
 * Dense output: a third-order continuous extension (the weights `RODAS_DENSE`, see
 * there), one `RosenbrockSegment` per step. Unless `denseErrorControl` is off, a step is
 * accepted only when the interpolant's estimated error inside it also meets the tolerance
 * (see `denseError`): on a stiff problem the steps can grow far beyond what a cubic can
 * interpolate, and crossings and maxima are read from the interpolant.
 *
 * Order reduction (measured): on y' = -1e4 (y - cos t) the local error of a step grows only
 * like h^1.5…h^2 for 3 < h|λ| < 1e3, and the embedded estimate u_6 is 5–10 times that, so
 * at rtol 1e-8 the steps stay near h|λ| ≈ 14 over the whole run. The stiff method therefore
 * hands runs that are stiff over their span to the NDF (`stiff-choice.ts`, `ndf.ts`).
 */
import {
  type OdeContext, type StepOutcome, type Stepper,
  NonFiniteMark, collapseFailure, errorNorm, failure, initialStep, minStep, nonFiniteStatus, spendAttempt, trialStep,
} from './control.ts';
import { type StiffStart, formJacobian } from './jacobian.ts';
import { luFactor, luSolve } from './lu.ts';
import { type DenseSegment, Status, writeStepEnd } from './types.ts';

/**
 * RODAS coefficients in the u-formulation above (Hairer & Wanner II, sec. IV.7). The tests
 * convert them back to the (α_ij, γ_ij, b_i) form and check every order condition up to
 * order 4 (order 3 for the embedded solution), the c_i and γ_i sums and L-stability.
 */
export const RODAS = {
  gamma: 0.25,
  /** Stage times c_i = Σ_j α_ij. */
  c: [0, 0.386, 0.21, 0.63, 1, 1],
  /** γ_i = Σ_{j≤i} γ_ij, the weights of ∂f/∂t. */
  gammaSum: [0.25, -0.1043, 0.1035, -0.0362, 0, 0],
  a: [
    [],
    [1.544],
    [0.9466785280815826, 0.2557011698983284],
    [3.314825187068521, 2.896124015972201, 0.9986419139977817],
    [1.221224509226641, 6.019134481288629, 12.53708332932087, -0.687886036105895],
    [1.221224509226641, 6.019134481288629, 12.53708332932087, -0.687886036105895, 1],
  ],
  cc: [
    [],
    [-5.6688],
    [-2.430093356833875, -0.2063599157091915],
    [-0.1073529058151375, -9.594562251023355, -20.47028614809616],
    [7.496443313967647, -10.24680431464352, -33.99990352819905, 11.7089089320616],
    [8.083246795921522, -7.981132988064893, -31.52159432874371, 16.31930543123136, -6.058818238834054],
  ],
  /** Weights of the order-4 solution: stiffly accurate, y1 = (argument of stage 6) + u_6. */
  m: [1.221224509226641, 6.019134481288629, 12.53708332932087, -0.687886036105895, 1, 1],
  /** Weights of the embedded order-3 solution: the argument of stage 6. */
  mHat: [1.221224509226641, 6.019134481288629, 12.53708332932087, -0.687886036105895, 1, 0],
} as const;

/**
 * Continuous extension y(θ) = (1-θ)·y0 + θ·y1 + θ(1-θ)·(P + θ·Q) with P = Σ e_i u_i and
 * Q = Σ g_i u_i, θ = (t - t0)/h. Derived for this implementation from five linear conditions
 * on each of e and g (u_6 unused): the order conditions of the trees with up to three
 * vertices at every θ (order 3 on non-stiff problems), and, in the stiff limit hλ → -∞ of
 * y' = λ(y - G(t)) + G'(t), exact reproduction of a quadratic G (so that on a stiff
 * problem's slow manifold the interpolant follows the solution, not the step's chord). The
 * solution coincides, to 1e-13, with the published RODAS dense output (Hairer & Wanner II,
 * sec. IV.7). The tests re-derive every condition.
 */
export const RODAS_DENSE = {
  e: [10.126235083445863, -7.4879958776101745, -34.800918615557492, -7.9927717075688536, 1.0251377232956762, 0],
  g: [-0.67628033928013853, 6.0877146516800522, 16.430843208924887, 24.76722511418404, -6.5943891257169378, 0],
} as const;

/**
 * Where the dense output's error is checked, as a fraction of the step. Not the midpoint:
 * in the stiff limit the interpolant's leading error (from a cubic G, see `RODAS_DENSE`)
 * is θ(1-θ)(1-2θ)-shaped and vanishes at θ = 1/2; near 1/4 it is close to its largest.
 */
export const DENSE_CHECK_THETA = 0.25;

/** Step-size constants (common practice for Rosenbrock codes; Hairer & Wanner II, sec. IV.7). */
export const RODAS_CONTROL = {
  safety: 0.9,
  minFactor: 0.2,
  maxFactor: 6,
  /** The embedded solution has order 3, so the error scales as h^4. */
  exponent: 1 / 4,
  /** Factor for a step whose stages met a non-finite rate or a singular matrix. */
  nonFiniteShrink: 0.25,
} as const;

const SQRT_EPS = Math.sqrt(Number.EPSILON);

/** The factor a rejected step shrinks by for an error norm above 1 (NaN: the smallest). */
function shrinkFactor(norm: number): number {
  const C = RODAS_CONTROL;
  return Number.isFinite(norm) ? Math.max(C.minFactor, C.safety * Math.pow(norm, -C.exponent)) : C.minFactor;
}
const STAGES = 6;

/** The continuous solution of one RODAS step (see `RODAS_DENSE`). */
export class RosenbrockSegment implements DenseSegment {
  /** [y0 | y1 | P | Q], each n long. */
  constructor(readonly t0: number, readonly t1: number, private readonly n: number, private readonly data: Float64Array) {}

  eval(t: number, out: Float64Array): void {
    const { data, n } = this;
    if (writeStepEnd(t, this.t0, this.t1, data, n, out)) return;
    const th = (t - this.t0) / (this.t1 - this.t0);
    const th1 = 1 - th;
    for (let i = 0; i < n; i++) {
      out[i] = th1 * data[i] + th * data[n + i] + th * th1 * (data[2 * n + i] + th * data[3 * n + i]);
    }
  }
}

/** Adaptive RODAS stepper. */
export class RosenbrockStepper implements Stepper {
  t: number;
  readonly y: Float64Array;
  h = NaN;

  private readonly f0: Float64Array;
  private readonly ft: Float64Array;
  private readonly jac: Float64Array;
  private readonly matrix: Float64Array;
  private readonly pivot: Int32Array;
  private readonly u: Float64Array[];
  private readonly arg: Float64Array;
  private readonly fi: Float64Array;
  private readonly yNew: Float64Array;
  private readonly midError: Float64Array;
  private readonly slope: Float64Array;
  private readonly mark: NonFiniteMark;
  private started = false;
  /** f0 holds f(t, y) for the current accepted state. */
  private haveF0 = false;
  /** `jac` already holds J at the starting (t, y), formed (and counted) by the caller. */
  private givenJacobian = false;

  /** J as formed at the start of the last step (row-major, n×n; read only). */
  get lastJacobian(): Float64Array {
    return this.jac;
  }

  constructor(private readonly ctx: OdeContext, t0: number, y0: ArrayLike<number>, firstStep?: number,
    private readonly jacobian?: (t: number, y: Float64Array, jac: Float64Array) => void,
    private readonly autonomous = false, private readonly denseControl = true, start?: StiffStart) {
    const n = ctx.n;
    this.t = t0;
    this.y = Float64Array.from(y0);
    this.f0 = new Float64Array(n);
    this.ft = new Float64Array(n);
    this.jac = new Float64Array(n * n);
    this.matrix = new Float64Array(n * n);
    this.pivot = new Int32Array(n);
    this.u = Array.from({ length: STAGES }, () => new Float64Array(n));
    this.arg = new Float64Array(n);
    this.fi = new Float64Array(n);
    this.yNew = new Float64Array(n);
    this.midError = new Float64Array(n);
    this.slope = new Float64Array(n);
    this.mark = new NonFiniteMark(n);
    if (firstStep !== undefined) this.h = firstStep;
    if (start) {
      this.jac.set(start.jac);
      this.f0.set(start.f0);
      this.haveF0 = true;
      this.givenJacobian = true;
    }
  }

  step(tEnd: number): StepOutcome {
    const { ctx, y, f0 } = this;
    if (!this.haveF0) {
      if (!ctx.rhs.call(this.t, y, f0)) return failure(nonFiniteStatus(ctx, y, y, f0), this.t, y);
      this.haveF0 = true;
    }
    if (!this.started) {
      if (Number.isNaN(this.h)) this.h = initialStep(ctx, this.t, y, f0, tEnd, 3);
      this.started = true;
    }
    const derivatives = this.formDerivatives(tEnd);
    if (derivatives) return derivatives;
    this.mark.clear();
    return this.attempt(tEnd);
  }

  /** Forms J = ∂f/∂y and ∂f/∂t at the accepted (t, y); a failure when f is not finite there. */
  private formDerivatives(tEnd: number): StepOutcome | null {
    const { ctx, y, f0, jac, fi, ft } = this;
    const n = ctx.n;
    const t = this.t;
    if (this.givenJacobian) {
      // The caller formed J at this very (t, y) to choose the method: count it once.
      this.givenJacobian = false;
    } else {
      const bad = formJacobian(ctx, t, y, f0, jac, this.arg, fi, this.jacobian);
      if (bad) return bad;
    }
    if (this.autonomous) {
      ft.fill(0);
      return null;
    }
    // Forward difference, or backward where a forward one would evaluate f past tEnd.
    let dt = SQRT_EPS * Math.max(Math.abs(t), Math.abs(this.h));
    const tp = t + dt <= tEnd ? t + dt : t - dt;
    dt = tp - t;
    if (!ctx.rhs.call(tp, y, fi)) return failure(nonFiniteStatus(ctx, y, y, fi), tp, y);
    for (let i = 0; i < n; i++) ft[i] = (fi[i] - f0[i]) / dt;
    return null;
  }

  private attempt(tEnd: number): StepOutcome {
    const { ctx, y, f0, ft, jac, matrix, pivot, u, arg, fi, yNew } = this;
    const n = ctx.n;
    const C = RODAS_CONTROL;
    const { a, cc, c, gammaSum, m, gamma } = RODAS;
    let rejected = false;
    for (;;) {
      const budget = spendAttempt(ctx, this.t, y);
      if (budget) return budget;
      const t = this.t;
      const trial = trialStep(t, this.h, tEnd, ctx.options.maxStep);
      const tNew = trial.last ? tEnd : t + trial.h;
      const h = tNew - t;
      const diag = 1 / (h * gamma);
      for (let i = 0; i < n * n; i++) matrix[i] = -jac[i];
      for (let i = 0; i < n; i++) matrix[i * n + i] += diag;
      ctx.counters.factorizations++;
      let ok = luFactor(matrix, n, pivot);
      if (ok) {
        for (let s = 0; s < STAGES && ok; s++) {
          const ui = u[s];
          if (s === 0) {
            ui.set(f0);
          } else {
            const as = a[s];
            for (let i = 0; i < n; i++) {
              let acc = y[i];
              for (let j = 0; j < s; j++) acc += as[j] * u[j][i];
              arg[i] = acc;
            }
            const ts = c[s] === 1 ? tNew : t + c[s] * h;
            if (!ctx.rhs.call(ts, arg, fi)) {
              this.mark.set(ctx, ts, y, arg, fi);
              ok = false;
              break;
            }
            const cs = cc[s];
            for (let i = 0; i < n; i++) {
              let acc = fi[i];
              for (let j = 0; j < s; j++) acc += (cs[j] / h) * u[j][i];
              ui[i] = acc;
            }
          }
          if (gammaSum[s] !== 0) for (let i = 0; i < n; i++) ui[i] += h * gammaSum[s] * ft[i];
          luSolve(matrix, n, pivot, ui);
          for (let i = 0; i < n; i++) if (!Number.isFinite(ui[i])) ok = false;
        }
      }
      if (!ok) {
        ctx.counters.rejected++;
        rejected = true;
        this.h = h * C.nonFiniteShrink;
        if (this.h < minStep(t)) return collapseFailure(ctx, t, y, f0, this.mark);
        continue;
      }
      for (let i = 0; i < n; i++) {
        let acc = y[i];
        for (let j = 0; j < STAGES; j++) acc += m[j] * u[j][i];
        yNew[i] = acc;
      }
      const stepNorm = errorNorm(u[STAGES - 1], y, yNew, ctx.options);
      let norm = stepNorm;
      let nonFinite = false;
      if (stepNorm <= 1 && this.denseControl) {
        const dense = this.denseError(t, h, yNew);
        if (dense === null) {
          this.mark.set(ctx, t + DENSE_CHECK_THETA * h, y, this.midError, fi);
          nonFinite = true;
          norm = NaN;
        } else if (!(dense > 1 && h * shrinkFactor(dense) < minStep(t))) {
          norm = Math.max(stepNorm, dense);
        }
        // Otherwise a transient faster than t can resolve: the step stands on its own error
        // estimate, since no representable step could make its interpolant accurate.
      }
      if (norm <= 1) {
        const segment = this.segment(t, tNew, yNew);
        let factor = norm === 0 ? C.maxFactor : C.safety * Math.pow(norm, -C.exponent);
        factor = Math.min(rejected ? 1 : C.maxFactor, Math.max(C.minFactor, factor));
        const planned = Math.min(this.h, ctx.options.maxStep);
        this.h = trial.last ? Math.max(h * factor, planned) : h * factor;
        this.t = tNew;
        y.set(yNew);
        this.haveF0 = false;
        ctx.counters.steps++;
        return { ok: true, segment };
      }
      ctx.counters.rejected++;
      rejected = true;
      if (!nonFinite) this.mark.clear();
      this.h = h * shrinkFactor(norm);
      if (this.h < minStep(t)) return collapseFailure(ctx, t, y, f0, this.mark);
    }
  }

  /**
   * Error norm of the dense output inside the step, estimated from its defect (Enright's
   * defect control; Shampine, Numerical Solution of ODEs, sec. 7.3): with u(t) the
   * interpolant and δ = u'(t*) - f(t*, u(t*)) at t* = t + θ*·h, the error is about
   * ((1/(hγ))·I - J)⁻¹·δ: about hγ·δ where f is not stiff and δ/(-λ) where it is, so one
   * formula serves both regimes and reuses the step's LU. Costs one evaluation of f.
   * Null when f is not finite at the interpolated state (left in `midError`, f in `fi`).
   */
  private denseError(t: number, h: number, yNew: Float64Array): number | null {
    const { ctx, y, u, midError, fi, matrix, pivot } = this;
    const n = ctx.n;
    const th = DENSE_CHECK_THETA;
    const th1 = 1 - th;
    const slope = this.slope;
    for (let i = 0; i < n; i++) {
      const [p, q] = denseTerms(u, i);
      // y(θ) = (1-θ)y0 + θy1 + θ(1-θ)(P + θQ) and its derivative in t.
      midError[i] = th1 * y[i] + th * yNew[i] + th * th1 * (p + th * q);
      slope[i] = (yNew[i] - y[i] + (1 - 2 * th) * (p + th * q) + th * th1 * q) / h;
    }
    if (!ctx.rhs.call(t + th * h, midError, fi)) return null;
    for (let i = 0; i < n; i++) slope[i] -= fi[i];
    luSolve(matrix, n, pivot, slope);
    return errorNorm(slope, y, yNew, ctx.options);
  }

  private segment(t0: number, t1: number, y1: Float64Array): RosenbrockSegment {
    const n = this.ctx.n;
    const data = new Float64Array(4 * n);
    const u = this.u;
    for (let i = 0; i < n; i++) {
      const [p, q] = denseTerms(u, i);
      data[i] = this.y[i];
      data[n + i] = y1[i];
      data[2 * n + i] = p;
      data[3 * n + i] = q;
    }
    return new RosenbrockSegment(t0, t1, n, data);
  }
}

/**
 * The dense output's P and Q for state i (y(θ) = (1-θ)y0 + θy1 + θ(1-θ)(P + θQ)), from the
 * stage increments u: shared by the segment and the mid-step error check.
 */
function denseTerms(u: readonly Float64Array[], i: number): [number, number] {
  const { e, g } = RODAS_DENSE;
  let p = 0;
  let q = 0;
  for (let j = 0; j < STAGES; j++) {
    p += e[j] * u[j][i];
    q += g[j] * u[j][i];
  }
  return [p, q];
}
