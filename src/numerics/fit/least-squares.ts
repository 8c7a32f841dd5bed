/**
 * Nonlinear least squares over plain numbers: find p that minimises ½·Σ r_i(p)² for a model
 * the fitter sees only through its residuals (typically a simulation compared with data), with
 * optional bounds on each parameter, and report the statistics of the estimate.
 *
 * Method: Levenberg–Marquardt as a trust-region method (J. J. Moré, "The Levenberg–Marquardt
 * algorithm: implementation and theory", in Numerical Analysis (G. A. Watson, ed.), Springer
 * LNM 630, 1977). Each iteration forms the Jacobian J and looks for the step s that
 * minimises the linear model ½‖r + J·s‖² within ‖D·s‖ ≤ Δ:
 * s = −(JᵀJ + λ·DᵀD)⁻¹·Jᵀr, with λ ≥ 0 chosen so that ‖D·s‖ ≈ Δ (within 10%, as Moré
 * allows) unless the Gauss–Newton step (λ = 0) is already shorter. The step comes from the
 * singular value decomposition of J·D⁻¹, which makes ‖D·s(λ)‖ a closed form in λ; λ is found
 * by the safeguarded Newton iteration on 1/‖D·s(λ)‖ − 1/Δ (Hebden 1973; Moré 1977), and a
 * rank-deficient J gives the minimum-norm step. The radius Δ follows the ratio ρ of the actual
 * to the predicted reduction of the sum of squares (Moré's rules): below 1/4 it shrinks by a
 * factor in [1/10, 1/2] from a quadratic interpolation along the step; above 3/4 (or on a
 * Gauss–Newton step) it becomes twice the step. A step is accepted when ρ ≥ 1e-4. The first
 * radius is ‖D·p0‖ (Moré suggests up to 100 times that; a first step no longer than the
 * parameters themselves keeps a saturating model such as b1·(1 − e^(−b2·x)) from leaping to
 * where it is flat, as from the first start of NIST's BoxBOD problem).
 *
 * Scaling D: without `scale`, Moré's running maximum of the column norms of J, which makes
 * the iteration invariant to the parameters' units; with `scale`, D = 1/scale.
 *
 * Jacobian: forward differences, column j with step h_j = diffStep·max(|p_j|, typical_j)
 * (Dennis & Schnabel, Numerical Methods for Unconstrained Optimization and Nonlinear
 * Equations, 1983, sec. 5.4 and Algorithm A5.6.3), where typical_j is scale_j, else |p0_j|,
 * else 1. The step is taken backwards when forwards would leave the bounds, and backwards
 * too when the model fails forwards. Default diffStep √ε ≈ 1.5e-8 suits a model exact to
 * rounding; for a simulation with relative tolerance tol, √tol is about right.
 *
 * Bounds: projection with an active set (the projected Levenberg–Marquardt idea of Kanzow,
 * Yamashita & Fukushima, J. Comput. Appl. Math. 172, 2004). A parameter on a bound whose
 * gradient pushes it outwards is held fixed for the iteration; the trust-region step is taken
 * in the others, and the trial point is clipped into the box. The predicted reduction is that
 * of the clipped step, so the radius logic stays honest, and every trial point is feasible: the
 * model is never called outside the bounds, differences included. `atBound` reports the
 * parameters that end exactly on a bound.
 *
 * Statistics at the solution (from a Jacobian there): covariance s²·(JᵀJ)⁻¹ with
 * s² = 2·cost/(m − n), standard errors, 95% intervals p ± t(0.975, m − n)·SE, correlations.
 * (JᵀJ)⁻¹ comes from the SVD of J with its columns scaled to unit length, so that the rank
 * test does not depend on the parameters' units; `conditionNumber` is that of the scaled JᵀJ.
 *
 * Failure is a result: every outcome has a status from `FitStatus` with a message from
 * `FIT_MESSAGES`; nothing throws (invalid input is the status `invalid-input`, whose `detail`
 * names the field), and the iteration and evaluation budgets bound the work.
 */
import { jacobiSvd } from './linear-algebra-small.ts';
import { studentTQuantile } from './student-t.ts';

const EPS = Number.EPSILON;

// Tuning constants (Moré 1977 and common practice).
/** Initial radius as a multiple of ‖D·p0‖ (Moré's "factor"; he suggests 100, we take 1: see above). */
const INITIAL_RADIUS_FACTOR = 1;
/** A trial step is accepted when actual/predicted reduction is at least this (Moré 1977). */
const ACCEPT_RATIO = 1e-4;
/** Below this ratio the radius shrinks; at or above GOOD_RATIO it grows. */
const POOR_RATIO = 0.25;
const GOOD_RATIO = 0.75;
/** Bounds of the shrink factor chosen by interpolation (Moré 1977). */
const MIN_SHRINK = 0.1;
const MAX_SHRINK = 0.5;
/** Shrink factor after a trial where the model failed. */
const FAILED_SHRINK = 0.25;
/** ‖D·s‖ within this fraction of Δ is close enough to the radius (Moré 1977: σ = 0.1). */
const RADIUS_TOLERANCE = 0.1;
/** Most Newton iterations for λ; two or three are typical. */
const MAX_LAMBDA_ITERATIONS = 60;
/** Components of a right singular vector at least this large name the parameters involved. */
const INVOLVED_COMPONENT = 0.1;
/** Singular value ratio (scaled J) below which parameters are reported as poorly identified: cond(JᵀJ) > 1e8. */
const POORLY_IDENTIFIED_RATIO = 1e-4;
/** Floor of the ratio below which JᵀJ counts as singular: cond(JᵀJ) > 1e12. */
const SINGULAR_RATIO_FLOOR = 1e-6;
/** Rejections in a row that need no evaluation (the clipped step vanished) before giving up. */
const MAX_EMPTY_STEPS = 200;

/** Defaults of the options. */
export const FIT_DEFAULTS = {
  maxIterations: 200,
  /** Per parameter plus one: the default budget is this times (n + 1). */
  evaluationsPerParameter: 200,
  ftol: 1e-12,
  xtol: 1e-10,
  gtol: 1e-10,
  diffStep: Math.sqrt(EPS),
} as const;

/** How a fit ended. */
export const FitStatus = {
  ConvergedFtol: 'converged-ftol',
  ConvergedXtol: 'converged-xtol',
  ConvergedGtol: 'converged-gtol',
  ExactFit: 'exact-fit',
  PrecisionLimit: 'precision-limit',
  MaxIterations: 'max-iterations',
  MaxEvaluations: 'max-evaluations',
  Cancelled: 'cancelled',
  ModelFailedAtStart: 'model-failed-at-start',
  ModelFailedNearPoint: 'model-failed-jacobian',
  ModelFailedSteps: 'model-failed-steps',
  TooFewPoints: 'too-few-points',
  InvalidInput: 'invalid-input',
} as const;
export type FitStatus = (typeof FitStatus)[keyof typeof FitStatus];

/** One message per status, for a person. */
export const FIT_MESSAGES: Readonly<Record<FitStatus, string>> = {
  'converged-ftol': 'converged: the sum of squares changes by less than the relative tolerance ftol',
  'converged-xtol': 'converged: the parameters change by less than the relative tolerance xtol',
  'converged-gtol': 'converged: the residuals are orthogonal to every direction the free parameters can move (gtol)',
  'exact-fit': 'converged: the model reproduces the data exactly (every residual is zero)',
  'precision-limit': 'converged as far as rounding allows: no smaller step or further reduction can be resolved',
  'max-iterations': 'stopped: the iteration limit (maxIterations) was reached before convergence',
  'max-evaluations': 'stopped: the model-evaluation limit (maxEvaluations) was reached before convergence',
  'cancelled': 'stopped: the fit was cancelled',
  'model-failed-at-start': 'the model could not be evaluated at the starting values',
  'model-failed-jacobian': 'stopped: the model failed on both sides of the current parameters while its derivatives were estimated',
  'model-failed-steps': 'stopped: the model fails at every trial point close to the best parameters found, which lie at the edge of the region where it can be computed',
  'too-few-points': 'there are fewer data points than parameters to estimate',
  'invalid-input': 'the problem or its options are invalid',
};

const CONVERGED: ReadonlySet<FitStatus> = new Set<FitStatus>([
  'converged-ftol', 'converged-xtol', 'converged-gtol', 'exact-fit', 'precision-limit',
]);

/** The problem: m residuals of n = p0.length parameters. */
export interface LeastSquaresProblem {
  /**
   * Writes the m (weighted) residuals at `p` into `out` and returns true; returns false when
   * the model cannot be computed at `p` (the trial step is then rejected). Non-finite values
   * and a thrown exception count as false. It must not keep `p` or `out`.
   */
  readonly residuals: (p: Float64Array, out: Float64Array) => boolean;
  /** Number of residuals (data points), a positive integer. */
  readonly m: number;
  /** Starting values; clipped into the bounds. */
  readonly p0: ArrayLike<number>;
  /** Lower bounds, one per parameter (−Infinity for none); default none. */
  readonly lower?: ArrayLike<number>;
  /** Upper bounds, one per parameter (Infinity for none); default none. */
  readonly upper?: ArrayLike<number>;
  /** Typical size of each parameter (positive): sets the step metric D = 1/scale and the difference steps. */
  readonly scale?: ArrayLike<number>;
  /** What warnings call each parameter (such as `"k_hat"`); `parameter j` by default. */
  readonly names?: readonly string[];
}

export interface LeastSquaresOptions {
  /** Most iterations (one Jacobian each); default 200. */
  readonly maxIterations?: number;
  /** Most calls of `residuals`, differences included; default 200·(n + 1). The Jacobian for the statistics at the end may add n more. */
  readonly maxEvaluations?: number;
  /** Stop when actual and predicted relative reductions of the sum of squares are both at most ftol; default 1e-10. */
  readonly ftol?: number;
  /** Stop when the trust radius is at most xtol·‖D·p‖ (relative change of the parameters); default 1e-10. */
  readonly xtol?: number;
  /** Stop when |cos| of the angle between r and each free column of J is at most gtol; default 1e-10. */
  readonly gtol?: number;
  /** Relative step of the forward differences; default √ε ≈ 1.5e-8. */
  readonly diffStep?: number;
  /** Checked before every model evaluation; when `aborted` is true the fit stops with `cancelled`. */
  readonly signal?: { readonly aborted: boolean };
}

/** What a warning is about. */
export type FitWarningKind =
  | 'no-effect' | 'not-identifiable' | 'poorly-identified' | 'at-bound' | 'no-degrees-of-freedom' | 'no-jacobian';

/** A remark on the estimate, naming the parameters (indices into p) it concerns. */
export interface FitWarning {
  readonly kind: FitWarningKind;
  readonly parameters: readonly number[];
  readonly message: string;
}

/** The outcome of `fitLeastSquares`. Matrices are row-major Float64Arrays. */
export interface FitResult {
  readonly status: FitStatus;
  /** FIT_MESSAGES[status]. */
  readonly message: string;
  /** What the fixed message leaves out (the invalid field, the model's exception), or null. */
  readonly detail: string | null;
  /** True for the converged statuses (ftol, xtol, gtol, exact fit, precision limit). */
  readonly converged: boolean;
  /** The best parameters found (the start when nothing better was found or the input was invalid). */
  readonly p: Float64Array;
  /** Residuals at p (m); null when the model never ran or failed at the start. */
  readonly residuals: Float64Array | null;
  /** ½·Σ r² at p; null with `residuals`. */
  readonly cost: number | null;
  /** Iterations made (Jacobians formed during the search). */
  readonly iterations: number;
  /** Calls of `residuals`, differences included. */
  readonly evaluations: number;
  /** Trial steps rejected (no sufficient reduction, or the model failed there). */
  readonly rejectedSteps: number;
  /** Calls of `residuals` that failed (false, non-finite values, or an exception). */
  readonly modelFailures: number;
  /** The message of the first exception thrown by `residuals`, if any. */
  readonly modelError: string | null;
  /** J at p, m×n; null when it could not be formed (or the fit stopped before one). */
  readonly jacobian: Float64Array | null;
  /** s²·(JᵀJ)⁻¹, n×n; null when JᵀJ is singular, m = n, or J is missing. */
  readonly covariance: Float64Array | null;
  /** √diag(covariance); null with it. */
  readonly standardErrors: Float64Array | null;
  /** p ± t(0.975, dof)·SE per parameter; null with the covariance. */
  readonly ci95: ReadonlyArray<readonly [number, number]> | null;
  /** Correlation matrix of the estimates, n×n; null with the covariance. */
  readonly correlation: Float64Array | null;
  /** Degrees of freedom m − n. */
  readonly dof: number;
  /** √(2·cost/dof); null when dof is 0 or the cost is unknown. */
  readonly residualSD: number | null;
  /** t(0.975, dof) used for ci95; null when dof is 0. */
  readonly tQuantile95: number | null;
  /** Condition number of JᵀJ with J's columns scaled to unit length (Infinity when singular); null without J. */
  readonly conditionNumber: number | null;
  /** Which parameters ended exactly on a bound. */
  readonly atBound: readonly boolean[];
  /** Identifiability, bounds and degrees-of-freedom remarks. */
  readonly warnings: readonly FitWarning[];
}

interface CheckedInput {
  readonly n: number;
  readonly m: number;
  readonly p0: Float64Array;
  readonly lower: Float64Array;
  readonly upper: Float64Array;
  readonly scale: Float64Array | null;
  readonly typical: Float64Array;
  readonly maxIterations: number;
  readonly maxEvaluations: number;
  readonly ftol: number;
  readonly xtol: number;
  readonly gtol: number;
  readonly diffStep: number;
}

/** Checks the input; returns the problem in working form or the reason it is invalid. */
function checkInput(problem: LeastSquaresProblem, options: LeastSquaresOptions): CheckedInput | { invalid: string } {
  const bad = (why: string) => ({ invalid: why });
  if (problem === null || typeof problem !== 'object') return bad('the problem must be an object');
  if (typeof problem.residuals !== 'function') return bad('residuals must be a function');
  const m = problem.m;
  if (!Number.isInteger(m) || m < 1) return bad(`m must be a positive integer; it is ${m}`);
  const p0In = problem.p0;
  if (!p0In || typeof p0In.length !== 'number' || p0In.length < 1) return bad('p0 must hold at least one number');
  const n = p0In.length;
  const vector = (name: string, v: ArrayLike<number> | undefined, fill: number): Float64Array | string => {
    if (v === undefined) return new Float64Array(n).fill(fill);
    if (!v || v.length !== n) return `${name} must have one entry per parameter (${n}); it has ${v?.length}`;
    return Float64Array.from(v);
  };
  const p0 = Float64Array.from(p0In);
  for (let j = 0; j < n; j++) if (!Number.isFinite(p0[j])) return bad(`p0[${j}] must be a finite number; it is ${p0[j]}`);
  const lower = vector('lower', problem.lower, -Infinity);
  if (typeof lower === 'string') return bad(lower);
  const upper = vector('upper', problem.upper, Infinity);
  if (typeof upper === 'string') return bad(upper);
  for (let j = 0; j < n; j++) {
    if (Number.isNaN(lower[j]) || lower[j] === Infinity) return bad(`lower[${j}] must be a number or -Infinity; it is ${lower[j]}`);
    if (Number.isNaN(upper[j]) || upper[j] === -Infinity) return bad(`upper[${j}] must be a number or Infinity; it is ${upper[j]}`);
    if (!(lower[j] < upper[j])) return bad(`lower[${j}] (${lower[j]}) must be below upper[${j}] (${upper[j]})`);
    p0[j] = Math.min(Math.max(p0[j], lower[j]), upper[j]);
  }
  let scale: Float64Array | null = null;
  if (problem.scale !== undefined) {
    const s = vector('scale', problem.scale, 1);
    if (typeof s === 'string') return bad(s);
    for (let j = 0; j < n; j++) if (!(s[j] > 0 && Number.isFinite(s[j]))) return bad(`scale[${j}] must be a positive finite number; it is ${s[j]}`);
    scale = s;
  }
  const typical = new Float64Array(n);
  for (let j = 0; j < n; j++) typical[j] = scale ? scale[j] : p0[j] !== 0 ? Math.abs(p0[j]) : 1;

  const o = options ?? {};
  const positiveInteger = (name: string, v: number | undefined, dflt: number): number | string => {
    if (v === undefined) return dflt;
    return Number.isInteger(v) && v >= 1 ? v : `${name} must be a positive integer; it is ${v}`;
  };
  const tolerance = (name: string, v: number | undefined, dflt: number): number | string => {
    if (v === undefined) return dflt;
    return v >= 0 && Number.isFinite(v) ? v : `${name} must be a finite number >= 0; it is ${v}`;
  };
  const maxIterations = positiveInteger('maxIterations', o.maxIterations, FIT_DEFAULTS.maxIterations);
  if (typeof maxIterations === 'string') return bad(maxIterations);
  const maxEvaluations = positiveInteger('maxEvaluations', o.maxEvaluations, FIT_DEFAULTS.evaluationsPerParameter * (n + 1));
  if (typeof maxEvaluations === 'string') return bad(maxEvaluations);
  const ftol = tolerance('ftol', o.ftol, FIT_DEFAULTS.ftol);
  if (typeof ftol === 'string') return bad(ftol);
  const xtol = tolerance('xtol', o.xtol, FIT_DEFAULTS.xtol);
  if (typeof xtol === 'string') return bad(xtol);
  const gtol = tolerance('gtol', o.gtol, FIT_DEFAULTS.gtol);
  if (typeof gtol === 'string') return bad(gtol);
  const diffStep = o.diffStep ?? FIT_DEFAULTS.diffStep;
  if (!(diffStep > 0 && diffStep < 1)) return bad(`diffStep must be a number between 0 and 1; it is ${diffStep}`);
  return { n, m, p0, lower, upper, scale, typical, maxIterations, maxEvaluations, ftol, xtol, gtol, diffStep };
}

/** ‖v‖₂ without overflow for the sizes a fit has (plain sum of squares). */
function norm2(v: ArrayLike<number>): number {
  let acc = 0;
  for (let i = 0; i < v.length; i++) acc += v[i] * v[i];
  return Math.sqrt(acc);
}

/** ‖D·v‖₂. */
function scaledNorm(d: Float64Array, v: ArrayLike<number>): number {
  let acc = 0;
  for (let j = 0; j < d.length; j++) acc += (d[j] * v[j]) ** 2;
  return Math.sqrt(acc);
}

/**
 * The trust-region step in scaled variables z = D·s for the SVD Ĵ = U·diag(sig)·Vᵀ (k columns)
 * and a = Uᵀr: z(λ) = −Σ sig_i·a_i/(sig_i² + λ)·v_i, with λ = 0 when the (minimum-norm)
 * Gauss–Newton step fits in 1.1·Δ, otherwise λ > 0 with |‖z‖ − Δ| ≤ 0.1·Δ. Writes z into `z`
 * and returns λ.
 */
function trustRegionStep(
  sig: Float64Array, a: Float64Array, v: Float64Array, k: number, delta: number, z: Float64Array,
): number {
  const coef = new Float64Array(k);
  const rankTol = sig[0] * k * EPS;
  let gn2 = 0;
  for (let i = 0; i < k; i++) if (sig[i] > rankTol) gn2 += (a[i] / sig[i]) ** 2;
  let lambda = 0;
  if (Math.sqrt(gn2) <= (1 + RADIUS_TOLERANCE) * delta) {
    for (let i = 0; i < k; i++) coef[i] = sig[i] > rankTol ? -a[i] / sig[i] : 0;
  } else {
    let g2 = 0;
    for (let i = 0; i < k; i++) g2 += (sig[i] * a[i]) ** 2;
    let lo = 0;
    let hi = Math.sqrt(g2) / delta; // ‖z(λ)‖ ≤ ‖Ĵᵀr‖/λ, so ‖z(hi)‖ ≤ Δ
    if (hi > 0) {
      // Newton from λ = 0 on the Gauss–Newton norm (restricted to the numerical rank).
      const q0 = Math.sqrt(gn2);
      let s0 = 0;
      for (let i = 0; i < k; i++) if (sig[i] > rankTol) s0 += a[i] ** 2 / sig[i] ** 4;
      lambda = ((q0 - delta) * q0 * q0) / (delta * s0);
      for (let it = 0; it < MAX_LAMBDA_ITERATIONS; it++) {
        if (!(lambda > lo && lambda < hi)) lambda = Math.max(1e-3 * hi, Math.sqrt(lo * hi));
        let q2 = 0, s = 0;
        for (let i = 0; i < k; i++) {
          const den = sig[i] * sig[i] + lambda;
          const w = (sig[i] * a[i]) / den;
          q2 += w * w;
          s += (w * w) / den;
        }
        const q = Math.sqrt(q2);
        if (Math.abs(q - delta) <= RADIUS_TOLERANCE * delta) break;
        if (q > delta) lo = lambda; else hi = lambda;
        // Newton on φ(λ) = 1/‖z(λ)‖ − 1/Δ: φ' = S/‖z‖³ with S = Σ (sig·a)²/(sig² + λ)³
        lambda += ((q - delta) * q2) / (delta * s);
      }
      for (let i = 0; i < k; i++) coef[i] = (-sig[i] * a[i]) / (sig[i] * sig[i] + lambda);
    } else {
      lambda = 0; // no gradient in the free variables: the step is zero
    }
  }
  for (let j = 0; j < k; j++) {
    let acc = 0;
    for (let i = 0; i < k; i++) acc += v[j * k + i] * coef[i];
    z[j] = acc;
  }
  return lambda;
}

/**
 * Fits the parameters of `problem` by least squares (see the module comment for the method).
 * Never throws. Cost: per iteration n + 1 or more model evaluations, an SVD of m×n
 * (about 3·m·n² multiply-adds per sweep) and O(m·n) work per trial step.
 */
export function fitLeastSquares(problem: LeastSquaresProblem, options: LeastSquaresOptions = {}): FitResult {
  const checked = checkInput(problem, options);
  if ('invalid' in checked) {
    const p0 = Array.from(problem?.p0 ?? [], Number);
    const m = Number.isInteger(problem?.m) ? problem.m : 0;
    return earlyResult('invalid-input', Float64Array.from(p0), 0, 0, null, checked.invalid, m - p0.length);
  }
  const { n, m, lower, upper, scale, typical, maxIterations, maxEvaluations, ftol, xtol, gtol, diffStep } = checked;
  const signal = options?.signal;
  const aborted = (): boolean => signal?.aborted === true;
  if (m < n) {
    return earlyResult('too-few-points', checked.p0, 0, 0, null, `${m} data points cannot determine ${n} parameters`, m - n);
  }

  // Model evaluation: counts, failure handling, a private copy of the point.
  let evaluations = 0;
  let modelFailures = 0;
  let modelError: string | null = null;
  const xCall = new Float64Array(n);
  const evaluate = (x: Float64Array, out: Float64Array): boolean => {
    evaluations++;
    xCall.set(x);
    let ok: boolean;
    try {
      ok = problem.residuals(xCall, out) === true;
    } catch (e) {
      ok = false;
      if (modelError === null) modelError = e instanceof Error ? e.message : String(e);
    }
    if (ok) {
      for (let i = 0; i < m; i++) if (!Number.isFinite(out[i])) { ok = false; break; }
    }
    if (!ok) modelFailures++;
    return ok;
  };

  const p = Float64Array.from(checked.p0);
  let r = new Float64Array(m);
  if (aborted()) return earlyResult('cancelled', p, 0, 0, null, null, m - n);
  if (!evaluate(p, r)) {
    const why = modelError !== null ? `the model threw: ${modelError}` : 'the model returned false or a value that is not a finite number';
    return earlyResult('model-failed-at-start', p, 1, modelFailures, modelError, why, m - n);
  }
  let cost = 0.5 * norm2(r) ** 2;

  // Forward-difference Jacobian at p (r = residuals at p) into jac (m×n row-major).
  const jac = new Float64Array(m * n);
  const rStep = new Float64Array(m);
  const xStep = new Float64Array(n);
  const formJacobian = (): 'ok' | 'failed' | 'cancelled' => {
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
        if (!evaluate(xStep, rStep)) continue;
        const inv = 1 / hEff;
        for (let i = 0; i < m; i++) jac[i * n + j] = (rStep[i] - r[i]) * inv;
        done = true;
      }
      if (!done) return 'failed';
    }
    return 'ok';
  };

  const d = new Float64Array(n);
  const colNorm = new Float64Array(n);
  const g = new Float64Array(n);
  const free: number[] = [];
  const pTrial = new Float64Array(n);
  let rTrial = new Float64Array(m);
  const step = new Float64Array(n);
  const js = new Float64Array(m);
  let delta = 0;
  let iterations = 0;
  let rejectedSteps = 0;
  let jacobianAtP = false;
  let status: FitStatus | null = null;

  outer: for (;;) {
    if (cost === 0) { status = 'exact-fit'; break; }
    if (iterations >= maxIterations) { status = 'max-iterations'; break; }
    if (evaluations + n > maxEvaluations) { status = 'max-evaluations'; break; }
    const formed = formJacobian();
    if (formed === 'cancelled') { status = 'cancelled'; break; }
    if (formed === 'failed') { status = 'model-failed-jacobian'; break; }
    jacobianAtP = true;
    iterations++;

    for (let j = 0; j < n; j++) {
      let acc = 0, gj = 0;
      for (let i = 0; i < m; i++) {
        const v = jac[i * n + j];
        acc += v * v;
        gj += v * r[i];
      }
      colNorm[j] = Math.sqrt(acc);
      g[j] = gj;
    }
    if (iterations === 1) {
      for (let j = 0; j < n; j++) d[j] = scale ? 1 / scale[j] : colNorm[j] > 0 ? colNorm[j] : 1;
      const xn = scaledNorm(d, p);
      delta = xn > 0 ? INITIAL_RADIUS_FACTOR * xn : INITIAL_RADIUS_FACTOR;
    } else if (!scale) {
      for (let j = 0; j < n; j++) d[j] = Math.max(d[j], colNorm[j]);
    }

    // Active set: a parameter on a bound with the gradient pushing it out stays there.
    free.length = 0;
    for (let j = 0; j < n; j++) {
      const pinned = (p[j] <= lower[j] && g[j] > 0) || (p[j] >= upper[j] && g[j] < 0);
      if (!pinned) free.push(j);
    }
    // Gradient test on the free parameters: |cos| of the angle between r and each column, zero at a stationary point.
    const rNorm = Math.sqrt(2 * cost);
    let gMax = 0;
    for (const j of free) if (colNorm[j] > 0) gMax = Math.max(gMax, Math.abs(g[j]) / (colNorm[j] * rNorm));
    if (gMax <= gtol) { status = 'converged-gtol'; break; }

    // SVD of the scaled free columns Ĵ = J_F·D_F⁻¹ and a = Uᵀr.
    const k = free.length;
    const jHat = new Float64Array(m * k);
    for (let i = 0; i < m; i++) for (let c = 0; c < k; c++) jHat[i * k + c] = jac[i * n + free[c]] / d[free[c]];
    const svd = jacobiSvd(jHat, m, k);
    const a = new Float64Array(k);
    for (let c = 0; c < k; c++) {
      let acc = 0;
      for (let i = 0; i < m; i++) acc += svd.u[i * k + c] * r[i];
      a[c] = acc;
    }
    const z = new Float64Array(k);
    let firstTrial = true;
    let emptySteps = 0;

    for (;;) {
      const lambda = trustRegionStep(svd.s, a, svd.v, k, delta, z);
      // Trial point: the step in the free parameters, clipped into the box.
      pTrial.set(p);
      let clipped = false;
      for (let c = 0; c < k; c++) {
        const j = free[c];
        const want = p[j] + z[c] / d[j];
        const got = Math.min(Math.max(want, lower[j]), upper[j]);
        if (got !== want) clipped = true;
        pTrial[j] = got;
      }
      for (let j = 0; j < n; j++) step[j] = pTrial[j] - p[j];
      const stepNorm = scaledNorm(d, step);
      if (iterations === 1 && firstTrial && stepNorm > 0) delta = Math.min(delta, stepNorm);
      firstTrial = false;
      // Predicted reduction of the linear model for the step actually taken.
      let gs = 0;
      for (let j = 0; j < n; j++) gs += g[j] * step[j];
      let js2 = 0;
      for (let i = 0; i < m; i++) {
        let acc = 0;
        for (let j = 0; j < n; j++) acc += jac[i * n + j] * step[j];
        js[i] = acc;
        js2 += acc * acc;
      }
      const predicted = -gs - 0.5 * js2;
      const xNorm = scaledNorm(d, p);

      if (!(stepNorm > 0) || !(predicted > 0)) {
        // Nothing to try (the clipped step vanished or does not descend): shrink and retry.
        rejectedSteps++;
        emptySteps++;
        delta = MAX_SHRINK * Math.min(delta, stepNorm > 0 ? stepNorm : delta);
        if (delta <= xtol * xNorm) { status = 'converged-xtol'; break outer; }
        if (!(delta > EPS * xNorm) || emptySteps >= MAX_EMPTY_STEPS) { status = 'precision-limit'; break outer; }
        continue;
      }
      emptySteps = 0;
      if (evaluations + 1 > maxEvaluations) { status = 'max-evaluations'; break outer; }
      if (aborted()) { status = 'cancelled'; break outer; }
      const ok = evaluate(pTrial, rTrial);
      const trialCost = ok ? 0.5 * norm2(rTrial) ** 2 : Infinity;
      const actualRel = ok ? 1 - trialCost / cost : -Infinity;
      const predictedRel = predicted / cost;
      const ratio = ok ? actualRel / predictedRel : -1;

      // Radius update (Moré 1977).
      if (ratio < POOR_RATIO) {
        let shrink: number;
        if (!ok) shrink = FAILED_SHRINK;
        else if (actualRel >= 0) shrink = MAX_SHRINK;
        else {
          // minimiser of the quadratic through cost(0), cost'(0) = gs and cost(1) along the step
          const curvature = trialCost - cost - gs;
          shrink = curvature > 0 ? -gs / (2 * curvature) : MIN_SHRINK;
          shrink = Math.min(Math.max(shrink, MIN_SHRINK), MAX_SHRINK);
        }
        delta = shrink * Math.min(delta, stepNorm);
      } else if (ratio >= GOOD_RATIO || lambda === 0) {
        delta = clipped ? Math.max(delta, 2 * stepNorm) : 2 * stepNorm;
      }

      const accepted = ok && ratio >= ACCEPT_RATIO;
      if (accepted) {
        p.set(pTrial);
        const tr = r; r = rTrial; rTrial = tr;
        cost = trialCost;
        jacobianAtP = false;
      } else {
        rejectedSteps++;
      }

      const xNormNow = scaledNorm(d, p);
      if (ok && Math.abs(actualRel) <= ftol && predictedRel <= ftol && ratio <= 2) { status = 'converged-ftol'; break outer; }
      if (delta <= xtol * xNormNow || !(delta > EPS * xNormNow)) {
        // the radius collapsed: convergence, unless it collapsed because the model kept failing
        status = !ok ? 'model-failed-steps' : delta <= xtol * xNormNow ? 'converged-xtol' : 'precision-limit';
        break outer;
      }
      if (cost === 0) { status = 'exact-fit'; break outer; }
      if (ok && Math.abs(actualRel) <= EPS && predictedRel <= EPS && ratio <= 2) { status = 'precision-limit'; break outer; }
      if (accepted) continue outer;
    }
  }

  // Statistics at p, from a Jacobian there (one more when the last step moved p).
  const warnings: FitWarning[] = [];
  let jacobian: Float64Array | null = null;
  if (jacobianAtP) {
    jacobian = jac;
  } else if (status !== 'cancelled' && !aborted()) {
    const formed = formJacobian();
    if (formed === 'ok') jacobian = jac;
    else if (formed === 'cancelled') status = 'cancelled';
  }
  if (status === 'model-failed-jacobian') jacobian = null;
  const final = status as FitStatus;
  const atBound = Array.from(p, (v, j) => v <= lower[j] || v >= upper[j]);
  for (let j = 0; j < n; j++) {
    if (atBound[j]) {
      const which = p[j] <= lower[j] ? 'lower' : 'upper';
      warnings.push({
        kind: 'at-bound', parameters: [j],
        message: `${nameOf(j, problem.names)} ended on its ${which} bound; its interval treats the bound as absent`,
      });
    }
  }
  const stats = jacobian
    ? statistics(jacobian, m, n, cost, p, diffStep, warnings, problem.names)
    : (warnings.push({
        kind: 'no-jacobian', parameters: [],
        message: 'no Jacobian at the final parameters, so no standard errors, intervals or identifiability check',
      }), emptyStatistics(m, n, cost));
  return {
    status: final, message: FIT_MESSAGES[final], converged: CONVERGED.has(final),
    detail: modelError !== null ? `the model threw: ${modelError}` : null,
    p, residuals: r, cost, iterations, evaluations, rejectedSteps, modelFailures, modelError,
    jacobian: jacobian ? Float64Array.from(jacobian) : null, atBound, warnings, ...stats,
  };
}

type Statistics = Pick<FitResult,
  'covariance' | 'standardErrors' | 'ci95' | 'correlation' | 'dof' | 'residualSD' | 'tQuantile95' | 'conditionNumber'>;

function emptyStatistics(m: number, n: number, cost: number | null): Statistics {
  const dof = m - n;
  return {
    covariance: null, standardErrors: null, ci95: null, correlation: null, dof,
    residualSD: dof > 0 && cost !== null ? Math.sqrt((2 * cost) / dof) : null,
    tQuantile95: dof > 0 ? studentTQuantile(0.975, dof) : null, conditionNumber: null,
  };
}

/** Parameter j in a message: its name when given, else "parameter j". */
const nameOf = (j: number, names?: readonly string[]): string => names?.[j] ?? `parameter ${j}`;

/** "k and V", "parameter 0, parameter 1 and parameter 2". */
const listNames = (js: readonly number[], names?: readonly string[]): string => {
  const each = js.map((j) => nameOf(j, names));
  return each.length === 1 ? each[0] : `${each.slice(0, -1).join(', ')} and ${each[each.length - 1]}`;
};

/**
 * Covariance, standard errors, intervals, correlations and identifiability from J at the
 * solution. JᵀJ counts as singular when a singular value of the column-scaled J is below
 * max(1e-6, 10·diffStep) times the largest: a difference Jacobian cannot tell columns apart
 * more finely than its step.
 */
function statistics(
  jac: Float64Array, m: number, n: number, cost: number, p: Float64Array, diffStep: number, warnings: FitWarning[], names?: readonly string[],
): Statistics {
  const base = emptyStatistics(m, n, cost);
  const colNorm = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    let acc = 0;
    for (let i = 0; i < m; i++) acc += jac[i * n + j] ** 2;
    colNorm[j] = Math.sqrt(acc);
  }
  const scaled = new Float64Array(m * n);
  for (let i = 0; i < m; i++) {
    for (let j = 0; j < n; j++) scaled[i * n + j] = colNorm[j] > 0 ? jac[i * n + j] / colNorm[j] : 0;
  }
  const svd = jacobiSvd(scaled, m, n);
  if (!svd.converged && Number.isNaN(svd.s[0])) return base;
  const sMax = svd.s[0];
  const sMin = svd.s[n - 1];
  const conditionNumber = sMin > 0 ? (sMax / sMin) ** 2 : Infinity;
  const singularRatio = Math.max(SINGULAR_RATIO_FLOOR, 10 * diffStep);
  const poorRatio = Math.max(POORLY_IDENTIFIED_RATIO, singularRatio);

  const noEffect: number[] = [];
  for (let j = 0; j < n; j++) if (colNorm[j] === 0) noEffect.push(j);
  if (noEffect.length > 0) {
    warnings.push({
      kind: 'no-effect', parameters: noEffect,
      message: `${listNames(noEffect, names)} ${noEffect.length === 1 ? 'has' : 'have'} no effect on the residuals here, so the data say nothing about ${noEffect.length === 1 ? 'it' : 'them'}`,
    });
  }
  const condText = Number.isFinite(conditionNumber) ? `cond(JᵀJ) ≈ ${conditionNumber.toPrecision(2)}` : 'JᵀJ is singular';
  const involved = (limit: number): number[] => {
    const set = new Set<number>();
    for (let k = 0; k < n; k++) {
      if (svd.s[k] > limit * sMax) continue;
      for (let j = 0; j < n; j++) if (Math.abs(svd.v[j * n + k]) >= INVOLVED_COMPONENT && colNorm[j] > 0) set.add(j);
    }
    return [...set].sort((x, y) => x - y);
  };
  const singular = noEffect.length > 0 || !(sMin > singularRatio * sMax);
  const collinear = involved(singularRatio);
  if (collinear.length > 0) {
    warnings.push({
      kind: 'not-identifiable', parameters: collinear,
      message: `${listNames(collinear, names)} cannot be told apart by these data: some combination of them leaves the residuals unchanged (nearly collinear columns of the Jacobian; ${condText}). Fix one of them or change the model's parameters`,
    });
  } else {
    const poor = involved(poorRatio);
    if (poor.length > 0) {
      warnings.push({
        kind: 'poorly-identified', parameters: poor,
        message: `${listNames(poor, names)} are poorly determined together (${condText}): their estimates are strongly correlated and their intervals wide`,
      });
    }
  }
  if (base.dof === 0) {
    warnings.push({
      kind: 'no-degrees-of-freedom', parameters: [],
      message: 'as many data points as parameters: the residual variance, standard errors and intervals cannot be estimated',
    });
  }
  if (singular || base.dof === 0) return { ...base, conditionNumber };

  // (JᵀJ)⁻¹ = C⁻¹·V·Σ⁻²·Vᵀ·C⁻¹ with C = diag(column norms).
  const inv = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let acc = 0;
      for (let k = 0; k < n; k++) acc += (svd.v[i * n + k] * svd.v[j * n + k]) / (svd.s[k] * svd.s[k]);
      const value = acc / (colNorm[i] * colNorm[j]);
      inv[i * n + j] = value;
      inv[j * n + i] = value;
    }
  }
  const s2 = (2 * cost) / base.dof;
  const covariance = inv.map((v) => v * s2);
  const standardErrors = new Float64Array(n);
  for (let j = 0; j < n; j++) standardErrors[j] = Math.sqrt(covariance[j * n + j]);
  const t = base.tQuantile95 as number;
  const ci95 = Array.from(p, (v, j) => [v - t * standardErrors[j], v + t * standardErrors[j]] as const);
  const correlation = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      correlation[i * n + j] = i === j ? 1 : inv[i * n + j] / Math.sqrt(inv[i * n + i] * inv[j * n + j]);
    }
  }
  return { ...base, covariance, standardErrors, ci95, correlation, conditionNumber };
}

/** A result for a fit that stopped before its first iteration. */
function earlyResult(
  status: FitStatus, p: Float64Array, evaluations: number, modelFailures: number, modelError: string | null,
  detail: string | null, dof: number,
): FitResult {
  return {
    status, message: FIT_MESSAGES[status], detail, converged: false, p, residuals: null, cost: null,
    iterations: 0, evaluations, rejectedSteps: 0, modelFailures, modelError, jacobian: null,
    covariance: null, standardErrors: null, ci95: null, correlation: null, dof,
    residualSD: null, tQuantile95: null, conditionNumber: null,
    atBound: Array.from(p, () => false), warnings: [],
  };
}
