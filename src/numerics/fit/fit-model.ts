/**
 * The fit's calls of the model: each call counted, a failure (false, a value that is not a
 * finite number, or an exception) recorded, and the point copied so the model cannot keep or
 * change it; and the Jacobian by forward differences.
 *
 * Jacobian: forward differences, column j with step h_j = diffStep·max(|p_j|, typical_j)
 * (Dennis & Schnabel, Numerical Methods for Unconstrained Optimization and Nonlinear
 * Equations, 1983, sec. 5.4 and Algorithm A5.6.3), where typical_j is scale_j, else |p0_j|,
 * else 1. The step is taken backwards when forwards would leave the bounds, and backwards
 * too when the model fails forwards. Default diffStep √ε ≈ 1.5e-8 suits a model exact to
 * rounding; for a simulation with relative tolerance tol, √tol is about right.
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
  /** Fills `values` at p; 'failed' when the model fails on both sides of some p_j, 'cancelled' when aborted. */
  form(p: Float64Array, r: Float64Array): 'ok' | 'failed' | 'cancelled';
}

/** The forward-difference Jacobian of `model` within the bounds of `input` (n model calls per form). */
export function forwardJacobian(input: CheckedInput, model: CountedModel, aborted: () => boolean): ForwardJacobian {
  const { n, m, lower, upper, typical, diffStep } = input;
  const jac = new Float64Array(m * n);
  const rStep = new Float64Array(m);
  const xStep = new Float64Array(n);
  const form = (p: Float64Array, r: Float64Array): 'ok' | 'failed' | 'cancelled' => {
    for (let j = 0; j < n; j++) {
      const pj = p[j];
      let h = diffStep * Math.max(Math.abs(pj), typical[j]);
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
  return { values: jac, form };
}
