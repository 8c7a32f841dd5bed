/**
 * The end of a fit whose model is computed to a known accuracy (`modelAccuracy`): a better
 * Jacobian, one Gauss–Newton step with it, and the digits the estimate can be vouched for.
 *
 * 1. J(h), the central differences at the estimate, and J(2h), the same with twice the
 *    steps (2n more model calls), give the Richardson extrapolation
 *    J_R = (4·J(h) − J(2h)) / 3, whose truncation error is O(h⁴) instead of O(h²) (Richardson
 *    extrapolation of the central difference: Dahlquist & Björck, Numerical Methods in
 *    Scientific Computing vol. 1, SIAM 2008, sec. 3.4.6). E = |J(2h) − J(h)| bounds its error.
 * 2. The estimate stops where the iteration's Jacobian makes Jᵀr = 0; with a large residual
 *    (BoxBOD's sum of squares is 1168) an error of J moves that point. One Gauss–Newton step
 *    s = −J_R⁺·r from the estimate (one model call) is kept when it raises the sum of squares
 *    by no more than twice the bound on that sum's error from the model's (Σ|r_i|·e_i +
 *    ½·Σe_i²: below it, the sum of squares cannot tell the two points apart, and J_R can), and
 *    then J(h), J(2h) and J_R are formed again there (4n model calls): the standard errors
 *    depend on J at the estimate as much as on the estimate.
 * 3. The statistics are formed with J_R, and `fit-digits.ts` bounds the estimate's error.
 *
 * Skipped (null) when an estimate is on a bound, JᵀJ is singular, or the model fails at the
 * steps; the fit then keeps J(h) and reports no digits.
 */
import type { CheckedInput } from './fit-input.ts';
import type { CountedModel, ForwardJacobian } from './fit-model.ts';
import { fitDigits, pseudoInverse } from './fit-digits.ts';

/** What the polish leaves: the estimate (maybe moved), its residuals and cost, J_R and the digits. */
export interface Polished {
  readonly p: Float64Array;
  readonly r: Float64Array;
  readonly cost: number;
  readonly jacobian: Float64Array;
  readonly digits: number | null;
}

/**
 * Polishes the estimate p (residuals r, cost) whose central-difference Jacobian is `jacobian`
 * (see the module comment); `residualError` bounds each residual's error from the model.
 */
export function polish(
  input: CheckedInput, model: CountedModel, differences: ForwardJacobian, jacobian: Float64Array,
  p: Float64Array, r: Float64Array, cost: number, residualError: (r: Float64Array, out: Float64Array, p: Float64Array) => void,
): Polished | null {
  const { m, n, lower, upper } = input;
  let ex = extrapolate(differences, jacobian, p, r, m * n);
  if (!ex) return null;
  const both = pseudoInverse(ex.jacobian, m, n);
  if (!both) return null;
  // one Gauss–Newton step with J_R, kept inside the bounds and when the sum of squares does not rise beyond its error
  const pStep = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    let s = 0;
    for (let i = 0; i < m; i++) s -= both.pinv[j * m + i] * r[i];
    pStep[j] = Math.min(Math.max(p[j] + s, lower[j]), upper[j]);
  }
  let at = { p, r, cost };
  const e = new Float64Array(m);
  residualError(r, e, p);
  const rStep = new Float64Array(m);
  if (pStep.some((v, j) => v !== p[j]) && model.evaluate(pStep, rStep)) {
    let c = 0;
    for (let i = 0; i < m; i++) c += rStep[i] * rStep[i];
    if (0.5 * c <= cost + 2 * costError(r, e)) {
      // J_R again at the point moved to, for the statistics there
      if (differences.form(pStep, rStep) !== 'ok') return null;
      ex = extrapolate(differences, Float64Array.from(differences.values), pStep, rStep, m * n);
      if (!ex) return null;
      at = { p: pStep, r: rStep, cost: 0.5 * c };
      residualError(at.r, e, at.p);
    }
  }
  const found = fitDigits({ m, n, jacobian: ex.jacobian, jacobianError: ex.error, r: at.r, e, p: at.p, logScale: input.logParameters });
  return { ...at, jacobian: ex.jacobian, digits: found ? found.digits : null };
}

/** A bound on the error of ½·Σr² from residual errors e: Σ|r_i|·e_i + ½·Σe_i². */
function costError(r: Float64Array, e: Float64Array): number {
  let s = 0;
  for (let i = 0; i < r.length; i++) s += Math.abs(r[i]) * e[i] + 0.5 * e[i] * e[i];
  return s;
}

/** J_R = (4·J(h) − J(2h)) / 3 and E = |J(2h) − J(h)| at p, given J(h) there (2n model calls); null when the model fails. */
function extrapolate(differences: ForwardJacobian, narrow: Float64Array, p: Float64Array, r: Float64Array, size: number): { jacobian: Float64Array; error: Float64Array } | null {
  if (differences.form(p, r, 2) !== 'ok') return null;
  const wide = differences.values;
  const jacobian = new Float64Array(size);
  const error = new Float64Array(size);
  for (let k = 0; k < size; k++) {
    jacobian[k] = (4 * narrow[k] - wide[k]) / 3;
    error[k] = Math.abs(wide[k] - narrow[k]);
  }
  return { jacobian, error };
}
