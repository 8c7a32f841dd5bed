/**
 * Nonlinear least squares over plain numbers: find p that minimises ½·Σ r_i(p)² for a model
 * the fitter sees only through its residuals (typically a simulation compared with data), with
 * optional bounds on each parameter, and report the statistics of the estimate.
 *
 * Failure is a result: every outcome has a status from `FitStatus` with a message from
 * `FIT_MESSAGES`; nothing throws (invalid input is the status `invalid-input`, whose `detail`
 * names the field), and the iteration and evaluation budgets bound the work.
 *
 * The method is Levenberg–Marquardt as a trust-region method with bounds (Moré 1977; see
 * `levenberg-marquardt.ts`). This file holds the entry (input checks in `fit-input.ts`, the
 * start, the statistics at the end, the result); beside it: `fit-types.ts` (problem, options,
 * statuses and messages, result), `fit-model.ts` (counted model calls, the forward-difference
 * Jacobian), `trust-region.ts` (the step within the radius), `fit-statistics.ts` (covariance,
 * intervals, identifiability).
 */
import { checkInput } from './fit-input.ts';
import { CountedModel, differenceJacobian } from './fit-model.ts';
import { polish } from './fit-polish.ts';
import { emptyStatistics, nameOf, statistics } from './fit-statistics.ts';
import {
  CONVERGED, FIT_MESSAGES, type FitResult, type FitStatus, type FitWarning, type LeastSquaresOptions, type LeastSquaresProblem,
} from './fit-types.ts';
import { levenbergMarquardt } from './levenberg-marquardt.ts';

export {
  FIT_DEFAULTS, FIT_MESSAGES, FitStatus, type FitResult, type FitWarning, type FitWarningKind,
  type LeastSquaresOptions, type LeastSquaresProblem,
} from './fit-types.ts';

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
  const { n, m, lower, upper, diffStep } = checked;
  const signal = options?.signal;
  const aborted = (): boolean => signal?.aborted === true;
  if (m < n) {
    return earlyResult('too-few-points', checked.p0, 0, 0, null, `${m} data points cannot determine ${n} parameters`, m - n);
  }

  const model = new CountedModel(problem, m, n);

  const p = Float64Array.from(checked.p0);
  const r0 = new Float64Array(m);
  if (aborted()) return earlyResult('cancelled', p, 0, 0, null, null, m - n);
  if (!model.evaluate(p, r0)) {
    const why = model.modelError !== null ? `the model threw: ${model.modelError}` : 'the model returned false or a value that is not a finite number';
    return earlyResult('model-failed-at-start', p, 1, model.modelFailures, model.modelError, why, m - n);
  }
  const differences = differenceJacobian(checked, model, aborted);
  const iterated = levenbergMarquardt(checked, model, differences, aborted, p, r0);
  const { iterations, rejectedSteps, ...end } = iterated;
  // differences still forward (a fit that stopped before converging) end central
  const jacobianAtP = iterated.jacobianAtP && !differences.refine?.();
  let { r, cost } = iterated;
  let status: FitStatus = end.status;
  const jac = differences.values;

  // Statistics at p, from a Jacobian there (one more when the last step moved p).
  const warnings: FitWarning[] = [];
  let jacobian: Float64Array | null = null;
  if (jacobianAtP) {
    jacobian = jac;
  } else if (status !== 'cancelled' && !aborted()) {
    const formed = differences.form(p, r);
    if (formed === 'ok') jacobian = jac;
    else if (formed === 'cancelled') status = 'cancelled';
  }
  if (status === 'model-failed-jacobian') jacobian = null;
  const final = status;
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
  // with the model's accuracy known: the extrapolated Jacobian, a last step, the digits (fit-polish.ts)
  let digits: number | null = null;
  if (jacobian && checked.modelAccuracy !== null && !atBound.some((b) => b) && !aborted()) {
    const accuracy = checked.modelAccuracy;
    const polished = polish(checked, model, differences, Float64Array.from(jacobian), p, r, cost,
      options.residualError ?? ((res, e) => e.fill(accuracy * res.reduce((a, v) => Math.max(a, Math.abs(v)), 0))));
    if (polished) {
      p.set(polished.p);
      r = polished.r;
      cost = polished.cost;
      jacobian = polished.jacobian;
      digits = polished.digits;
    } else {
      jacobian = Float64Array.from(jacobian);
    }
  }
  // a difference Jacobian tells columns apart no more finely than its own error
  const resolution = checked.modelAccuracy !== null ? Math.cbrt(checked.modelAccuracy) ** 2 : diffStep;
  const stats = jacobian
    ? statistics(jacobian, m, n, cost, p, resolution, warnings, problem.names)
    : (warnings.push({
        kind: 'no-jacobian', parameters: [],
        message: 'no Jacobian at the final parameters, so no standard errors, intervals or identifiability check',
      }), emptyStatistics(m, n, cost));
  const kept = jacobian ? Float64Array.from(jacobian) : null;
  return {
    status: final, message: FIT_MESSAGES[final], converged: CONVERGED.has(final),
    detail: model.modelError !== null ? `the model threw: ${model.modelError}` : null,
    p, residuals: r, cost, iterations, evaluations: model.evaluations, rejectedSteps,
    modelFailures: model.modelFailures, modelError: model.modelError,
    jacobian: kept, atBound, warnings, ...stats, digits,
  };
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
    atBound: Array.from(p, () => false), warnings: [], digits: null,
  };
}
