/**
 * The vocabulary of a least-squares fit (`fitLeastSquares` in `least-squares.ts`): the
 * problem, the options and their defaults, the statuses with one message each, the warnings
 * and the result.
 */

/** Defaults of the options. */
export const FIT_DEFAULTS = {
  maxIterations: 200,
  /** Per parameter plus one: the default budget is this times (n + 1). */
  evaluationsPerParameter: 200,
  ftol: 1e-12,
  xtol: 1e-10,
  gtol: 1e-10,
  diffStep: Math.sqrt(Number.EPSILON),
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

/** The statuses that count as converged. */
export const CONVERGED: ReadonlySet<FitStatus> = new Set<FitStatus>([
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
  /** Stop when actual and predicted relative reductions of the sum of squares are both at most ftol; default 1e-12. */
  readonly ftol?: number;
  /** Stop when the trust radius is at most xtol·‖D·p‖ (relative change of the parameters); default 1e-10. */
  readonly xtol?: number;
  /** Stop when |cos| of the angle between r and each free column of J is at most gtol; default 1e-10. */
  readonly gtol?: number;
  /** Relative step of the forward differences; default √ε ≈ 1.5e-8. Not used with `modelAccuracy`. */
  readonly diffStep?: number;
  /**
   * The relative accuracy of the model's values (a simulation's relative tolerance). When
   * given, the Jacobian is formed by central differences with the step cbrt(modelAccuracy)
   * per parameter (`fit-model.ts`), and the result carries `digits` (`fit-digits.ts`).
   */
  readonly modelAccuracy?: number;
  /**
   * With `modelAccuracy`: a bound on the error of each residual that the model's inaccuracy
   * makes (m values, absolute), for `digits`, given the residuals r at the parameters p.
   * Without it, modelAccuracy·max|r_i| is taken.
   */
  readonly residualError?: (r: Float64Array, out: Float64Array, p: Float64Array) => void;
  /**
   * For `digits`: which parameters are the logarithm (plus a constant) of the value whose
   * significant digits count, as a MAP fit searches an estimate with a prior: an error δ in
   * such a parameter is a relative error expm1(|δ|) of the value. Default: none.
   */
  readonly logParameters?: readonly boolean[];
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
  /**
   * Significant digits of every estimate the fit vouches for (`fit-digits.ts`), from the
   * model's accuracy, the Jacobian's error and the distance left to the optimum; null without
   * `modelAccuracy`, a Jacobian, or a nonsingular JᵀJ, or with an estimate on a bound.
   */
  readonly digits: number | null;
}
