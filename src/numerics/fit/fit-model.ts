/**
 * The fit's calls of the model: each call counted, a failure (false, a value that is not a
 * finite number, or an exception) recorded, and the point copied so the model cannot keep or
 * change it; and the Jacobian by forward or central differences.
 *
 * Jacobian: forward differences, column j with step h_j = diffStep·max(|p_j|, typical_j)
 * (Dennis & Schnabel, Numerical Methods for Unconstrained Optimization and Nonlinear
 * Equations, 1983, sec. 5.4 and Algorithm A5.6.3), where typical_j is scale_j, else |p0_j|,
 * else 1. The step is taken backwards when forwards would leave the bounds, and backwards
 * too when the model fails forwards. Default diffStep √ε ≈ 1.5e-8 suits a model exact to
 * rounding; for a simulation with relative tolerance tol, √tol is about right.
 *
 * Central differences (with `modelAccuracy` = eps_f, the model's relative accuracy): column j
 * is (r(p + h_j·e_j) − r(p − h_j·e_j)) / 2h_j with h_j = cbrt(eps_f)·max(|p_j|, typical_j),
 * the step that balances the truncation error h²/6·|r'''| against the model's error
 * eps_f·|r|/h (Dennis & Schnabel 1983, sec. 5.6; Nocedal & Wright, Numerical Optimization,
 * 2nd ed., 2006, sec. 8.1), so J is good to about eps_f^(2/3) instead of the forward
 * difference's eps_f^(1/2): for a run at rtol 1e-10, about 2e-7 instead of 1e-5. Where one
 * side leaves the bounds or the model fails there, the second-order one-sided difference
 * (−3·r(p) + 4·r(p ± h) − r(p ± 2h)) / ±2h on the other side, of the same order. Cost: 2n
 * model calls per Jacobian (one more per one-sided column). With `modelAccuracy` a fit starts
 * on forward differences with the step √eps_f and turns to central ones near the end
 * (`refine`, called by the iteration: `levenberg-marquardt.ts`).
 */
import type { CheckedInput } from './fit-input.ts';
import type { LeastSquaresProblem } from './fit-types.ts';
import { rethrowWork } from '../work-meter.ts';

/** The model as the fit calls it: counts, failure handling, a private copy of the point. */
export class CountedModel {
  /** Calls of `residuals`. */
  evaluations = 0;
  /** Calls that failed. */
  modelFailures = 0;
  /** The message of the first exception thrown by `residuals`, if any. */
  modelError: string | null = null;
  private readonly xCall: Float64Array;
  constructor(private readonly problem: LeastSquaresProblem, private readonly m: number, n: number) {
    this.xCall = new Float64Array(n);
  }

  /** Writes the residuals at x into out; false when the model failed there. */
  evaluate(x: Float64Array, out: Float64Array): boolean {
    const { problem, m, xCall } = this;
    this.evaluations++;
    xCall.set(x);
    let ok: boolean;
    try {
      ok = problem.residuals(xCall, out) === true;
    } catch (e) {
      rethrowWork(e);
      ok = false;
      if (this.modelError === null) this.modelError = e instanceof Error ? e.message : String(e);
    }
    if (ok) {
      for (let i = 0; i < m; i++) if (!Number.isFinite(out[i])) { ok = false; break; }
    }
    if (!ok) this.modelFailures++;
    return ok;
  }
}

/** A Jacobian buffer (m×n row-major) and the way to fill it at p, given r = residuals at p. */
export interface ForwardJacobian {
  readonly values: Float64Array;
  /** Model calls one `form` makes (at least; a one-sided central column adds one). */
  readonly callsPerForm: number;
  /**
   * Fills `values` at p with steps `stepFactor` times the usual ones (1 by default); 'failed'
   * when the model fails on both sides of some p_j, 'cancelled' when aborted.
   */
  form(p: Float64Array, r: Float64Array, stepFactor?: number): 'ok' | 'failed' | 'cancelled';
  /** Central differences from now on, when the differences are forward so far; false when they are central already (or only forward). */
  refine?(): boolean;
  /** True while the differences are the central ones. */
  readonly central: boolean;
}

/**
 * The Jacobian by forward differences, or, when the input gives the model's accuracy eps_f,
 * by forward differences with the step √eps_f (n calls) until `refine`, then central ones.
 */
export function differenceJacobian(input: CheckedInput, model: CountedModel, aborted: () => boolean): ForwardJacobian {
  if (input.modelAccuracy === null) return forwardJacobian(input, model, aborted);
  const values = new Float64Array(input.m * input.n);
  const forward = forwardJacobian(input, model, aborted, Math.sqrt(input.modelAccuracy), values);
  const central = centralJacobian(input, input.modelAccuracy, model, aborted, values);
  let now = forward;
  return {
    values,
    get callsPerForm() { return now.callsPerForm; },
    get central() { return now === central; },
    form: (p, r, stepFactor) => now.form(p, r, stepFactor),
    refine: () => (now === central ? false : (now = central, true)),
  };
}

/** The forward-difference Jacobian of `model` within the bounds of `input` (n model calls per form), with the relative step `diffStep` (the input's by default). */
export function forwardJacobian(input: CheckedInput, model: CountedModel, aborted: () => boolean,
  diffStep = input.diffStep, jac = new Float64Array(input.m * input.n)): ForwardJacobian {
  const { n, m, lower, upper, typical } = input;
  const rStep = new Float64Array(m);
  const xStep = new Float64Array(n);
  const form = (p: Float64Array, r: Float64Array, stepFactor = 1): 'ok' | 'failed' | 'cancelled' => {
    for (let j = 0; j < n; j++) {
      const pj = p[j];
      let h = stepFactor * diffStep * Math.max(Math.abs(pj), typical[j]);
      let forward = pj + h <= upper[j];
      if (!forward && pj - h < lower[j]) {
        // the box is narrower than the step: use the wider side, with a shorter step
        forward = upper[j] - pj >= pj - lower[j];
        h = 0.5 * (forward ? upper[j] - pj : pj - lower[j]);
      }
      let done = false;
      for (let attempt = 0; attempt < 2 && !done; attempt++) {
        const side = attempt === 0 ? forward : !forward;
        const target = side ? pj + h : pj - h;
        if (target > upper[j] || target < lower[j]) continue;
        const hEff = target - pj; // the step actually represented
        if (hEff === 0) continue;
        if (aborted()) return 'cancelled';
        xStep.set(p);
        xStep[j] = target;
        if (!model.evaluate(xStep, rStep)) continue;
        const inv = 1 / hEff;
        for (let i = 0; i < m; i++) jac[i * n + j] = (rStep[i] - r[i]) * inv;
        done = true;
      }
      if (!done) return 'failed';
    }
    return 'ok';
  };
  return { values: jac, callsPerForm: n, form, central: false };
}

/** The central-difference Jacobian of `model` within the bounds of `input` (2n model calls per form, see the module comment). */
function centralJacobian(input: CheckedInput, accuracy: number, model: CountedModel, aborted: () => boolean,
  jac = new Float64Array(input.m * input.n)): ForwardJacobian {
  const { n, m, lower, upper, typical } = input;
  const rPlus = new Float64Array(m);
  const rMinus = new Float64Array(m);
  const xStep = new Float64Array(n);
  const relative = Math.cbrt(accuracy);
  /** r at p with p_j moved to `target`, into out; false when outside the bounds or the model failed. */
  const at = (p: Float64Array, j: number, target: number, out: Float64Array): boolean => {
    if (target > upper[j] || target < lower[j]) return false;
    xStep.set(p);
    xStep[j] = target;
    return model.evaluate(xStep, out);
  };
  const form = (p: Float64Array, r: Float64Array, stepFactor = 1): 'ok' | 'failed' | 'cancelled' => {
    for (let j = 0; j < n; j++) {
      const pj = p[j];
      const want = stepFactor * relative * Math.max(Math.abs(pj), typical[j]);
      // a step no wider than the box allows, rounded so that p_j ± h is exactly h away
      const room = Math.max(upper[j] - pj, pj - lower[j]);
      const hTry = room >= 2 * want ? want : room / 2;
      const h = (pj + hTry) - pj;
      if (!(h > 0)) return 'failed';
      if (aborted()) return 'cancelled';
      const plus = at(p, j, pj + h, rPlus);
      if (aborted()) return 'cancelled';
      const minus = at(p, j, pj - h, rMinus);
      if (plus && minus) {
        const inv = 1 / (2 * h);
        for (let i = 0; i < m; i++) jac[i * n + j] = (rPlus[i] - rMinus[i]) * inv;
        continue;
      }
      // one side only: the second-order one-sided difference on the side that has a value
      const side = plus ? 1 : minus ? -1 : 0;
      if (side === 0) return 'failed';
      const near = side > 0 ? rPlus : rMinus;
      const far = side > 0 ? rMinus : rPlus; // the other buffer is free to hold r(p ± 2h)
      if (aborted()) return 'cancelled';
      if (!at(p, j, pj + 2 * side * h, far)) return 'failed';
      const inv = 1 / (2 * side * h);
      for (let i = 0; i < m; i++) jac[i * n + j] = (-3 * r[i] + 4 * near[i] - far[i]) * inv;
    }
    return 'ok';
  };
  return { values: jac, callsPerForm: 2 * n, form, central: true };
}
