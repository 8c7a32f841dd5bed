/**
 * Bayesian (maximum a posteriori, MAP) estimation with log-normal priors, over plain numbers.
 *
 * The objective, exactly as the study format states it:
 *   O(P) = Σ_i ((y_i − f_i(P)) / σ_i)² + Σ_k (log P_k − log median_k)² / ω_k²,
 *   σ_i² = additive_i² + (proportional · f_i(P))²,
 * the second sum over the estimates that carry a prior (the others have a flat prior). There
 * is no log σ term: σ depends on f, and the objective is minimised as written.
 *
 * Method: an estimate with a prior is searched on θ = log P (so it stays positive), one
 * without on θ = P. O is then a sum of squares of the residuals (f_i − y_i)/σ_i and
 * (θ_k − log median_k)/ω_k, minimised by the least-squares fitter (`least-squares.ts`; its
 * Jacobian differentiates σ's dependence on f too).
 *
 * Uncertainty: O = −2·log posterior + const, so the posterior's normal approximation on θ has
 * covariance 2·H⁻¹, with H the Hessian of O at the minimum, formed here by central second
 * differences of O (`curvature`). On the natural scale: an estimate on the log scale gets the
 * interval P̂·exp(±1.96·sd(log P)) and the standard error P̂·sd(log P) (first order); one on
 * the natural scale P̂ ± 1.96·sd and sd.
 */
import { fitLeastSquares } from './least-squares.ts';
import type { FitResult, LeastSquaresOptions } from './fit-types.ts';

/** A log-normal prior: log P ~ N(log median, omega²); median in the parameter's SI unit. */
export interface LogNormalPrior {
  readonly median: number;
  readonly omega: number;
}

/** A MAP problem: the model through its predictions, the data, the error model and the priors. */
export interface MapProblem {
  /** Writes the m predictions at the (natural) parameters p into f; false when the model cannot be computed there. */
  readonly predict: (p: Float64Array, f: Float64Array) => boolean;
  /** The m observations. */
  readonly y: ArrayLike<number>;
  /** The additive SD of each observation (≥ 0, in its unit). */
  readonly additive: ArrayLike<number>;
  /** The proportional SD (≥ 0, a plain number). */
  readonly proportional: number;
  /** One per parameter: its prior, or null for a flat one. */
  readonly priors: ReadonlyArray<LogNormalPrior | null>;
  /** Starting values (natural scale; positive where a prior is given). */
  readonly p0: ArrayLike<number>;
  readonly lower?: ArrayLike<number>;
  readonly upper?: ArrayLike<number>;
  /** What messages call each parameter. */
  readonly names?: readonly string[];
  /**
   * With the option `modelAccuracy`: a bound on each prediction's absolute error, given the
   * predictions f (m values into out), for the digits (`residualBounds`). Default:
   * modelAccuracy · max |f_i|.
   */
  readonly predictionError?: (f: Float64Array, out: Float64Array) => void;
}

/** The two-sided 95% quantile of the standard normal distribution. */
export const Z95 = 1.959963984540054;

/** σ of an observation whose prediction is f. */
export function sigmaOf(additive: number, proportional: number, f: number): number {
  return Math.sqrt(additive * additive + (proportional * f) ** 2);
}

/** The data part and the prior part of the objective at the natural parameters p, given the predictions f there. */
export function objectiveParts(problem: MapProblem, p: ArrayLike<number>, f: ArrayLike<number>): { data: number; prior: number } {
  let data = 0;
  for (let i = 0; i < f.length; i++) data += ((problem.y[i] - f[i]) / sigmaOf(problem.additive[i], problem.proportional, f[i])) ** 2;
  let prior = 0;
  problem.priors.forEach((pr, k) => { if (pr) prior += (Math.log(p[k]) - Math.log(pr.median)) ** 2 / (pr.omega * pr.omega); });
  return { data, prior };
}

/**
 * The Hessian (n×n, row-major) of `objective` at x by central second differences with steps
 * h; null when the objective cannot be computed at one of the 1 + 2n² points (n = 1: 3 calls,
 * n = 2: 9). Truncation error O(h²); rounding in O is magnified by 1/h².
 */
export function curvature(objective: (x: Float64Array) => number, x: ArrayLike<number>, h: ArrayLike<number>): Float64Array | null {
  const n = x.length;
  const at = (moves: ReadonlyArray<readonly [number, number]>): number => {
    const z = Float64Array.from(x);
    for (const [j, s] of moves) z[j] += s * h[j];
    return objective(z);
  };
  const o0 = at([]);
  const hess = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    hess[i * n + i] = (at([[i, 1]]) - 2 * o0 + at([[i, -1]])) / (h[i] * h[i]);
    for (let j = 0; j < i; j++) {
      const v = (at([[i, 1], [j, 1]]) - at([[i, 1], [j, -1]]) - at([[i, -1], [j, 1]]) + at([[i, -1], [j, -1]])) / (4 * h[i] * h[j]);
      hess[i * n + j] = v;
      hess[j * n + i] = v;
    }
  }
  return hess.every(Number.isFinite) ? hess : null;
}

/** The inverse of a symmetric positive definite matrix by Cholesky; null when it is not positive definite. */
export function inverseSpd(a: Float64Array, n: number): Float64Array | null {
  const l = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = a[i * n + j];
      for (let k = 0; k < j; k++) s -= l[i * n + k] * l[j * n + k];
      if (i === j) {
        if (!(s > 0)) return null;
        l[i * n + i] = Math.sqrt(s);
      } else l[i * n + j] = s / l[j * n + j];
    }
  }
  // columns of L⁻¹ᵀL⁻¹ by solving L·Lᵀ·x = e_c
  const inv = new Float64Array(n * n);
  const z = new Float64Array(n);
  for (let c = 0; c < n; c++) {
    for (let i = 0; i < n; i++) {
      let s = i === c ? 1 : 0;
      for (let k = 0; k < i; k++) s -= l[i * n + k] * z[k];
      z[i] = s / l[i * n + i];
    }
    for (let i = n - 1; i >= 0; i--) {
      let s = z[i];
      for (let k = i + 1; k < n; k++) s -= l[k * n + i] * inv[k * n + c];
      inv[i * n + c] = s / l[i * n + i];
    }
  }
  return inv;
}

/**
 * A MAP estimate: a `FitResult` on the natural scale (residuals are f − y, unweighted; `dof`
 * is the data's m − n, the priors aside; no residual SD; `evaluations` counts the model calls
 * of the curvature too), with the objective and the posterior.
 */
export interface MapResult extends FitResult {
  /** The objective at the estimate (data part + prior part). */
  readonly objective: number | null;
  readonly dataObjective: number | null;
  readonly priorObjective: number | null;
  /** Which parameters were searched on the log scale (those with a prior). */
  readonly logScale: readonly boolean[];
  /** The posterior SD of each θ (log P with a prior, P without); null without a positive definite curvature. */
  readonly workingSD: Float64Array | null;
  /** The Hessian of the objective on θ at the estimate; null when it could not be formed. */
  readonly hessian: Float64Array | null;
}

/**
 * Bounds on the errors of the residuals R (m data rows, then the prior rows) that the model's
 * errors make, given the predictions f there: a prediction off by δf_i moves
 * R_i = (f_i − y_i)/σ_i by at most δf_i·(1 + proportional·|R_i|)/σ_i (to first order:
 * ∂R_i/∂f_i = (1 − R_i·proportional·(proportional·f_i/σ_i))/σ_i, and |proportional·f_i| ≤ σ_i);
 * a prior row is computed from θ alone, with no model error.
 */
export function residualBounds(problem: MapProblem, f: Float64Array, r: ArrayLike<number>, accuracy: number, out: Float64Array): void {
  const m = f.length;
  const df = new Float64Array(m);
  if (problem.predictionError) problem.predictionError(f, df);
  else df.fill(accuracy * f.reduce((a, v) => Math.max(a, Math.abs(v)), 0));
  for (let i = 0; i < m; i++) {
    const s = sigmaOf(problem.additive[i], problem.proportional, f[i]);
    out[i] = (df[i] * (1 + problem.proportional * Math.abs(r[i]))) / s;
  }
  for (let i = m; i < out.length; i++) out[i] = 0;
}

/** Relative step of the curvature's differences: log P moves by 0.1%, P by 0.1% of its size. */
const CURVATURE_STEP = 1e-3;

/**
 * Minimises the MAP objective (see the module comment). Never throws. Bounds apply on the
 * natural scale (a bound ≤ 0 on an estimate with a prior is no bound). Cost: the fitter's
 * (per iteration n + 1 or more model calls) plus 1 + 2n² calls for the curvature.
 */
export function fitMap(problem: MapProblem, options: LeastSquaresOptions = {}): MapResult {
  const n = problem.p0.length;
  const m = problem.y.length;
  const logScale = problem.priors.map((p) => p !== null);
  const priorRows = logScale.filter(Boolean).length;
  const toNatural = (theta: ArrayLike<number>, p: Float64Array) => { for (let k = 0; k < n; k++) p[k] = logScale[k] ? Math.exp(theta[k]) : theta[k]; };
  const toWorking = (v: number, k: number, dflt: number) => (logScale[k] ? (v > 0 ? Math.log(v) : dflt) : v);
  const theta0 = Array.from({ length: n }, (_, k) => toWorking(problem.p0[k], k, NaN));
  // the fitter works on φ = θ − θ0 for the log-scale estimates, so that it starts at 0 and its
  // first trust radius (‖D·φ0‖, else 1) allows a step of about e-fold, not of |log P0|
  const offset = theta0.map((t, k) => (logScale[k] && Number.isFinite(t) ? t : 0));
  const p = new Float64Array(n);
  const f = new Float64Array(m);
  const residuals = (theta: Float64Array, out: Float64Array): boolean => {
    toNatural(theta, p);
    if (!problem.predict(p, f)) return false;
    for (let i = 0; i < m; i++) {
      const s = sigmaOf(problem.additive[i], problem.proportional, f[i]);
      if (!(s > 0)) return false;
      out[i] = (f[i] - problem.y[i]) / s;
    }
    let r = m;
    problem.priors.forEach((pr, k) => { if (pr) out[r++] = (theta[k] - Math.log(pr.median)) / pr.omega; });
    return true;
  };
  const lower = Array.from({ length: n }, (_, k) => toWorking(problem.lower?.[k] ?? -Infinity, k, -Infinity) - offset[k]);
  const upper = Array.from({ length: n }, (_, k) => toWorking(problem.upper?.[k] ?? Infinity, k, -Infinity) - offset[k]);
  const theta = new Float64Array(n);
  const shifted = (phi: Float64Array, out: Float64Array): boolean => {
    for (let k = 0; k < n; k++) theta[k] = phi[k] + offset[k];
    return residuals(theta, out);
  };
  // with the model's accuracy: the digits of θ, log P counted as relative (see `residualBounds`)
  let boundCalls = 0;
  const accuracy = options.modelAccuracy;
  const digitsOptions: LeastSquaresOptions = accuracy === undefined ? {} : {
    logParameters: logScale,
    residualError: (r, e, phi) => {
      boundCalls++;
      for (let k = 0; k < n; k++) theta[k] = phi[k] + offset[k];
      toNatural(theta, p);
      if (!problem.predict(p, f)) { e.fill(Infinity); return; }
      residualBounds(problem, f, r, accuracy, e);
    },
  };
  const fit = fitLeastSquares({
    residuals: shifted, m: m + priorRows, p0: theta0.map((t, k) => t - offset[k]), lower, upper, names: problem.names as string[] | undefined,
    scale: theta0.map((t, k) => (logScale[k] ? 1 : Math.abs(t) || 1)),
  }, { ...options, ...digitsOptions });

  for (let k = 0; k < n; k++) theta[k] = fit.p[k] + offset[k];
  const natural = new Float64Array(n);
  toNatural(theta, natural);
  const warnings = fit.warnings.filter((w) => w.kind !== 'no-degrees-of-freedom');
  const none = { objective: null, dataObjective: null, priorObjective: null, hessian: null, workingSD: null };
  if (!fit.residuals) {
    return { ...fit, ...none, p: natural, logScale, warnings, dof: m - n, evaluations: fit.evaluations + boundCalls, residualSD: null, standardErrors: null, ci95: null, covariance: null, correlation: null };
  }
  // predictions at the estimate: the residuals unweighted
  toNatural(theta, p);
  const predicted = problem.predict(p, f) ? Float64Array.from(f) : null;
  const parts = predicted ? objectiveParts(problem, natural, predicted) : null;
  let curvatureCalls = predicted ? 1 : 0;
  const objective = (x: Float64Array): number => {
    curvatureCalls++;
    const out = new Float64Array(m + priorRows);
    if (!residuals(x, out)) return NaN;
    let s = 0;
    for (const v of out) s += v * v;
    return s;
  };
  const steps = Array.from(theta, (t, k) => CURVATURE_STEP * (logScale[k] ? 1 : Math.max(Math.abs(t), Math.abs(theta0[k]) || 1)));
  const hessian = curvature(objective, theta, steps);
  const inv = hessian ? inverseSpd(hessian, n) : null;
  if (hessian && !inv) {
    warnings.push({ kind: 'not-identifiable', parameters: [], message: 'the objective is not curved upwards in every direction at the estimate, so there are no standard errors or intervals' });
  } else if (!hessian) {
    warnings.push({ kind: 'no-jacobian', parameters: [], message: 'the objective could not be computed around the estimate, so there are no standard errors or intervals' });
  }
  const covariance = inv ? inv.map((v) => 2 * v) : null;
  const workingSD = covariance ? Float64Array.from({ length: n }, (_, k) => Math.sqrt(covariance[k * n + k])) : null;
  const standardErrors = workingSD ? workingSD.map((s, k) => (logScale[k] ? natural[k] * s : s)) : null;
  const ci95 = workingSD
    ? Array.from(natural, (v, k) => (logScale[k]
      ? [v * Math.exp(-Z95 * workingSD[k]), v * Math.exp(Z95 * workingSD[k])] as const
      : [v - Z95 * workingSD[k], v + Z95 * workingSD[k]] as const))
    : null;
  const correlation = covariance
    ? Float64Array.from({ length: n * n }, (_, ij) => {
      const i = Math.floor(ij / n);
      const j = ij % n;
      return i === j ? 1 : covariance[ij] / Math.sqrt(covariance[i * n + i] * covariance[j * n + j]);
    })
    : null;
  return {
    ...fit, p: natural, logScale, warnings, dof: m - n, evaluations: fit.evaluations + boundCalls + curvatureCalls,
    residuals: predicted ? predicted.map((v, i) => v - problem.y[i]) : null,
    residualSD: null, tQuantile95: null,
    objective: parts ? parts.data + parts.prior : null, dataObjective: parts?.data ?? null, priorObjective: parts?.prior ?? null,
    hessian, workingSD, covariance, standardErrors, ci95, correlation,
  };
}
