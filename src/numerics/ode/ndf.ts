/**
 * The stiff method on runs that are stiff over their span: the numerical differentiation
 * formulas (NDF) of orders 1 to 5, variable step and variable order, in backward-difference form, after
 * Shampine & Reichelt, "The MATLAB ODE Suite", SIAM J. Sci. Comput. 18 (1997), 1–22,
 * sec. 2 (the formulas, their κ values, the change of step size by rescaling the
 * differences, the choice of order). The simplified Newton iteration and the reuse of the
 * Jacobian follow Hairer & Wanner, Solving ODEs II, sec. IV.8; the iteration's convergence
 * test (its rate, when a remembered one may be trusted) is Shampine & Reichelt's, sec. 2.3
 * and their code ode15s (see `solve`).
 *
 * Why a multistep formula next to RODAS (`rosenbrock.ts`): on a forced stiff problem such as
 * y' = -1e4 (y - cos t), one RODAS step of size h with |hλ| between about 3 and 1e3 has a
 * local error that grows only like h^1.5…h^2 (order reduction: its stages are accurate to
 * low order only, and in that regime the stiff component of their error is not damped),
 * and its embedded estimate is 5–10 times larger still. Measured on that problem at
 * atol = 1e-3·rtol, RODAS held its step at h ≈ 1.4e-3 (hλ ≈ 14) all the way from t = 1 to
 * t = 10 at rtol 1e-8 — 7 229 steps, each with a Jacobian, 65 077 evaluations — and needed
 * 527 685 evaluations at rtol 1e-10; switching off the dense-output check (−12 %), the
 * differenced ∂f/∂t, or the differenced Jacobian left this unchanged, and the order
 * conditions of the coefficients hold to 1e-13 (test/engine/ode-coefficients.test.ts). A
 * backward differentiation formula has no stages: its error constant applies to the smooth
 * solution whatever hλ is, so the steps follow the accuracy of cos t alone (hundreds of
 * steps at rtol 1e-10, one or two evaluations each), with one Jacobian kept over many steps
 * and one LU factorization per change of step size or order.
 *
 * Per step: one to four evaluations of f (Newton iterations). A Jacobian is formed only when
 * the Newton iteration fails to converge with an old one (n evaluations by differences, or
 * one to difference plus one for f).
 *
 * Dense output: the interpolating polynomial through the last k+1 solution values, the
 * very polynomial the differences hold (order k on the step, continuous at step ends).
 */
import {
  type OdeContext, type StepOutcome, type Stepper,
  NonFiniteMark, collapseFailure, errorNorm, failure, initialStep, minStep, nonFiniteStatus, spendAttempt, trialStep,
} from './control.ts';
import { type StiffStart, formJacobian } from './jacobian.ts';
import { luFactor, luSolve } from './lu.ts';
import type { Jacobian } from './types.ts';
import { NDF, NDF_CONTROL, NDF_MAX_ORDER, NdfSegment, rescaleDifferences } from './ndf-formulas.ts';
import { ErrorAccumulation } from './ndf-accumulation.ts';

export { NDF, NDF_CONTROL, NDF_MAX_ORDER, NdfSegment, rescaleDifferences };

/** Adaptive variable-order NDF stepper. */
export class NdfStepper implements Stepper {
  t: number;
  readonly y: Float64Array;
  h = NaN;

  /** Backward differences of the solution at step h: D[0] = y_n, D[j] = ∇^j y_n. */
  private readonly D: Float64Array[];
  private readonly work: Float64Array[];
  private order = 1;
  /** Accepted steps since the step size or the order last changed. */
  private sameSteps = 0;
  private readonly jac: Float64Array;
  /** J was formed at the current accepted state. */
  private jacFresh = false;
  private readonly matrix: Float64Array;
  private readonly pivot: Int32Array;
  /** The h/α_k the matrix I - (h/α_k)·J was factored for (NaN: none). */
  private factoredFor = NaN;
  private readonly f: Float64Array;
  private readonly probe: Float64Array;
  private readonly yNew: Float64Array;
  private readonly psi: Float64Array;
  private readonly d: Float64Array;
  private readonly dy: Float64Array;
  private readonly mark: NonFiniteMark;
  private started = false;
  /** The global error carried so far and the error margin it asks for (`ndf-accumulation.ts`). */
  private readonly accumulation: ErrorAccumulation;
  private readonly local: Float64Array;
  /** Counts the Jacobians formed, so that the accumulation knows when J changed. */
  private jacVersion = 0;

  constructor(private readonly ctx: OdeContext, t0: number, y0: ArrayLike<number>, firstStep?: number,
    private readonly jacobian?: Jacobian, private readonly start?: StiffStart) {
    const n = ctx.n;
    this.t = t0;
    this.y = Float64Array.from(y0);
    this.D = Array.from({ length: NDF_MAX_ORDER + 3 }, () => new Float64Array(n));
    this.work = Array.from({ length: NDF_MAX_ORDER + 3 }, () => new Float64Array(n));
    this.jac = new Float64Array(n * n);
    this.matrix = new Float64Array(n * n);
    this.pivot = new Int32Array(n);
    this.f = new Float64Array(n);
    this.probe = new Float64Array(n);
    this.yNew = new Float64Array(n);
    this.psi = new Float64Array(n);
    this.d = new Float64Array(n);
    this.dy = new Float64Array(n);
    this.mark = new NonFiniteMark(n);
    this.accumulation = new ErrorAccumulation(n, NDF_CONTROL.errorMargin);
    this.local = new Float64Array(n);
    if (firstStep !== undefined) this.h = firstStep;
  }

  step(tEnd: number): StepOutcome {
    if (!this.started) {
      const begun = this.begin(tEnd);
      if (begun) return begun;
    }
    this.mark.clear();
    return this.attempt(tEnd);
  }

  /** f and J at the start, the first step, and the differences of order 1. */
  private begin(tEnd: number): StepOutcome | null {
    const { ctx, y, f } = this;
    if (this.start) {
      f.set(this.start.f0);
      this.jac.set(this.start.jac);
    } else {
      if (!ctx.rhs.call(this.t, y, f)) return failure(nonFiniteStatus(ctx, y, y, f), this.t, y);
      const bad = formJacobian(ctx, this.t, y, f, this.jac, this.probe, this.yNew, this.jacobian);
      if (bad) return bad;
    }
    this.jacFresh = true;
    if (Number.isNaN(this.h)) this.h = initialStep(ctx, this.t, y, f, tEnd, 1);
    this.h = Math.min(this.h, ctx.options.maxStep, tEnd - this.t);
    this.D[0].set(y);
    for (let i = 0; i < ctx.n; i++) this.D[1][i] = this.h * f[i];
    this.started = true;
    return null;
  }

  /** Changes the step to hNew, rescaling the differences. */
  private resize(hNew: number): void {
    if (hNew === this.h) return;
    rescaleDifferences(this.D, this.order, hNew / this.h, this.work);
    this.h = hNew;
    this.sameSteps = 0;
  }

  private attempt(tEnd: number): StepOutcome {
    const { ctx, D, y, yNew, d } = this;
    const n = ctx.n;
    const C = NDF_CONTROL;
    for (;;) {
      const budget = spendAttempt(ctx, this.t, y);
      if (budget) return budget;
      const t = this.t;
      const trial = trialStep(t, this.h, tEnd, ctx.options.maxStep);
      this.resize(trial.last ? tEnd - t : trial.h);
      const h = this.h;
      const tNew = trial.last ? tEnd : t + h;
      const k = this.order;
      const solved = this.solve(tNew, h, k);
      if (solved === 'retry') continue;
      if (solved !== 'converged') {
        ctx.counters.rejected++;
        this.resize(h * (solved === 'non-finite' ? C.nonFiniteShrink : C.failShrink));
        if (this.h < minStep(t)) return this.collapse();
        continue;
      }
      const norm = this.scaledError(d, this.accumulation.margin * NDF.errorConst[k]);
      const safety = this.safety;
      if (!(norm <= 1)) {
        ctx.counters.rejected++;
        const factor = Number.isFinite(norm) ? Math.max(C.minFactor, safety * Math.pow(norm, -1 / (k + 1))) : C.minFactor;
        this.resize(h * factor);
        if (this.h < minStep(t)) return this.collapse();
        continue;
      }
      for (let i = 0; i < n; i++) this.local[i] = NDF.errorConst[k] * d[i];
      ctx.counters.factorizations += this.accumulation.accept(this.local, this.jac, this.jacVersion, h, tNew, tEnd, y, yNew, ctx.options, this.rate < C.trustRate);
      // Accept: the differences move on to y_{n+1}.
      for (let i = 0; i < n; i++) D[k + 2][i] = d[i] - D[k + 1][i];
      D[k + 1].set(d);
      for (let j = k; j >= 0; j--) for (let i = 0; i < n; i++) D[j][i] += D[j + 1][i];
      const segment = this.segment(t, tNew, h, k, y);
      this.t = tNew;
      y.set(yNew);
      this.jacFresh = false;
      ctx.counters.steps++;
      this.sameSteps++;
      if (this.sameSteps > k) this.chooseOrder(norm, safety);
      return { ok: true, segment };
    }
  }

  private iterations = 0;
  /**
   * The Newton contraction rate last measured with the present matrix, NaN when none was
   * (a new factorization or Jacobian forgets it).
   */
  private rate = NaN;

  /** The safety factor falls with the Newton iterations the last step needed. */
  private get safety(): number {
    const m = NDF_CONTROL.newtonIterations;
    return (NDF_CONTROL.safety * (2 * m + 1)) / (2 * m + this.iterations);
  }

  /**
   * Solves the NDF of order k for y_{n+1} at tNew by simplified Newton: (I - c·J)·Δ =
   * c·f(y) - ψ - d with c = h/α_k, d = y - prediction, ψ = Σ γ_j ∇^j y_n / α_k. On
   * success yNew holds y_{n+1} and d its correction. 'retry' when the iteration failed with
   * an old Jacobian and a fresh one was formed (the step is tried again at the same size).
   *
   * The convergence test is Shampine & Reichelt's (1997, sec. 2.3; their ode15s): the rate
   * is measured from the second iteration on as ‖Δ_m‖/‖Δ_{m-1}‖, never let fall below 0.9
   * of the last one measured with the same matrix, and forgotten when the matrix changes;
   * the first iteration may stop on a remembered rate only against a tolerance ten times
   * stricter. Without that, a rate measured once where J was exact (Robertson's problem at
   * t = 0, a rate of 1e-7) let every later step stop after one iteration with a Jacobian
   * long out of date, which was never formed again: the steps shrank to the explicit
   * stability limit and the run spent its budget before t = 20.
   */
  private solve(tNew: number, h: number, k: number): 'converged' | 'retry' | 'diverged' | 'non-finite' {
    const { ctx, D, yNew, psi, d, dy, f, matrix, pivot } = this;
    const n = ctx.n;
    const { gamma, alpha } = NDF;
    const C = NDF_CONTROL;
    for (let i = 0; i < n; i++) {
      let pred = 0;
      let s = 0;
      for (let j = 0; j <= k; j++) pred += D[j][i];
      for (let j = 1; j <= k; j++) s += gamma[j] * D[j][i];
      yNew[i] = pred;
      psi[i] = s / alpha[k];
      d[i] = 0;
    }
    const c = h / alpha[k];
    if (c !== this.factoredFor) {
      for (let i = 0; i < n * n; i++) matrix[i] = -c * this.jac[i];
      for (let i = 0; i < n; i++) matrix[i * n + i] += 1;
      ctx.counters.factorizations++;
      this.factoredFor = luFactor(matrix, n, pivot) ? c : NaN;
      this.rate = NaN;
      if (Number.isNaN(this.factoredFor)) return this.refresh() ? 'retry' : 'diverged';
    }
    const tol = Math.max(10 * Number.EPSILON / ctx.options.rtol, C.newtonFraction);
    const floor = 100 * Number.EPSILON / ctx.options.rtol;
    let previous = NaN;
    for (let iter = 1; iter <= C.newtonIterations; iter++) {
      this.iterations = iter;
      if (!ctx.rhs.call(tNew, yNew, f)) {
        this.mark.set(ctx, tNew, this.y, yNew, f);
        return 'non-finite';
      }
      for (let i = 0; i < n; i++) dy[i] = c * f[i] - psi[i] - d[i];
      luSolve(matrix, n, pivot, dy);
      const size = this.scaledError(dy, 1, yNew);
      if (!Number.isFinite(size)) return this.refresh() ? 'retry' : 'diverged';
      if (iter > 1 && size > C.slowRate * previous) return this.refresh() ? 'retry' : 'diverged';
      for (let i = 0; i < n; i++) {
        yNew[i] += dy[i];
        d[i] += dy[i];
      }
      if (iter === 1) {
        const rate = this.rate;
        if (size <= floor || (rate < 1 && (rate / (1 - rate)) * size <= C.firstIterationShare * tol)) return 'converged';
      } else {
        const rate = Number.isNaN(this.rate) ? size / previous : Math.max(C.slowRate * this.rate, size / previous);
        this.rate = rate;
        const left = (rate / (1 - rate)) * size;
        if (size <= floor || left <= tol) return 'converged';
        if (left * Math.pow(rate, C.newtonIterations - iter) > tol) break;
      }
      previous = size;
    }
    return this.refresh() ? 'retry' : 'diverged';
  }

  /** Forms J afresh at the accepted state when it is old; false when it was fresh (or f failed). */
  private refresh(): boolean {
    if (this.jacFresh) return false;
    const { ctx, y, f } = this;
    if (!ctx.rhs.call(this.t, y, f)) return false;
    if (formJacobian(ctx, this.t, y, f, this.jac, this.probe, this.dy, this.jacobian)) return false;
    this.jacFresh = true;
    this.jacVersion++;
    this.factoredFor = NaN;
    this.rate = NaN;
    return true;
  }

  /** Error norm of w·v scaled by the tolerances at the accepted state and yNew (or `at`). */
  private scaledError(v: Float64Array, w: number, at: Float64Array = this.yNew): number {
    const dy = this.probe;
    for (let i = 0; i < v.length; i++) dy[i] = w * v[i];
    return errorNorm(dy, this.y, at, this.ctx.options);
  }

  /**
   * After k+1 steps at one size and order: the error the orders k-1 and k+1 would have made
   * (from ∇^k and ∇^{k+2}) against this step's, and the order that allows the longest next
   * step (Shampine & Reichelt 1997, sec. 2.3).
   */
  private chooseOrder(norm: number, safety: number): void {
    const k = this.order;
    const { D } = this;
    const { errorConst } = NDF;
    const C = NDF_CONTROL;
    const margin = this.accumulation.margin;
    const lower = k > 1 ? this.scaledError(D[k], margin * errorConst[k - 1], this.y) : Infinity;
    const higher = k < NDF_MAX_ORDER ? this.scaledError(D[k + 2], margin * errorConst[k + 1], this.y) : Infinity;
    const factors = [lower ** (-1 / k), norm ** (-1 / (k + 1)), higher ** (-1 / (k + 2))];
    let best = 1;
    for (let i = 0; i < 3; i++) if (!(factors[i] <= factors[best])) best = i;
    this.order = k + best - 1;
    const factor = Math.min(C.maxFactor, safety * factors[best]);
    this.resize(this.h * factor);
  }

  private collapse(): StepOutcome {
    const { ctx, y, f } = this;
    if (!ctx.rhs.call(this.t, y, f)) return failure(nonFiniteStatus(ctx, y, y, f), this.t, y);
    return collapseFailure(ctx, this.t, y, f, this.mark);
  }

  private segment(t0: number, t1: number, h: number, k: number, y0: Float64Array): NdfSegment {
    const n = this.ctx.n;
    const data = new Float64Array((k + 2) * n);
    data.set(y0, 0);
    data.set(this.yNew, n);
    for (let j = 1; j <= k; j++) data.set(this.D[j], (j + 1) * n);
    return new NdfSegment(t0, t1, h, n, k, data);
  }
}
