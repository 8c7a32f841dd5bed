/**
 * The significant digits of a fit's estimates that the fit can vouch for, when the model is
 * computed to a known relative accuracy (a simulation at a relative tolerance).
 *
 * The estimate p solves Jᵀr = 0 for the computed residuals r and the difference Jacobian J.
 * Three things put the computed p away from the exact least-squares estimate, each bounded
 * at the end of the fit by first-order perturbation of the normal equations (Björck,
 * Numerical Methods for Least Squares Problems, SIAM 1996, sec. 1.4 and 9.1):
 *
 * 1. The distance left to the computed optimum: the Gauss–Newton step s = −J⁺r, |s_j|.
 * 2. The model's error in the residuals, |δr_i| ≤ e_i: |(J⁺δr)_j| ≤ Σ_i |J⁺_ji|·e_i.
 * 3. The Jacobian's error |δJ| ≤ E: the optimum moves by (JᵀJ)⁻¹δJᵀr, at most
 *    Σ_k |(JᵀJ)⁻¹_jk|·Σ_i E_ik·|r_i|. E is measured, not assumed (`fit-polish.ts`): the
 *    same differences with twice the step, E = |J(2h) − J(h)|, three times the truncation
 *    error of J(h) plus the model's noise at both steps, which bounds the error of the
 *    extrapolated J the fit ends with.
 *
 * The rule: err_j = (1) + (2) + (3), and the digits vouched for are
 * floor(−log10(max_j err_j / |p_j|)), between 0 and 15; estimates exactly 0 are left out.
 * A parameter that is the logarithm of the value whose digits count (`logScale`, as a MAP
 * fit's estimate with a prior, searched on log P plus a constant) has the relative error
 * expm1(err_j) in place of err_j / |p_j|: the value lies within exp(±err_j) of its estimate.
 * None (null) when JᵀJ is singular or an estimate is on a bound (its step is not free).
 * Cost: an SVD of m×n and O(m·n²) work.
 */
import { jacobiSvd } from './linear-algebra-small.ts';

/** Singular value ratio of the column-scaled J below which no digits are claimed (cond(JᵀJ) > 1e16). */
const SINGULAR_RATIO = 1e-8;
/** The most digits a double can hold. */
const MOST_DIGITS = 15;

/** What `fitDigits` reads: J and a bound on its error (m×n row-major), r, the residual error bounds e, the estimate p. */
export interface DigitsInput {
  readonly m: number;
  readonly n: number;
  readonly jacobian: Float64Array;
  readonly jacobianError: Float64Array;
  readonly r: Float64Array;
  readonly e: Float64Array;
  readonly p: Float64Array;
  /** Per parameter: the logarithm of the value whose digits count (see the module comment); default none. */
  readonly logScale?: readonly boolean[];
}

/** The three bounds per estimate (absolute) and the digits they leave. */
export interface Digits {
  readonly digits: number;
  /** Per estimate: the Gauss–Newton step left, the model's error, the Jacobian's error. */
  readonly step: Float64Array;
  readonly model: Float64Array;
  readonly jacobian: Float64Array;
}

/** J⁺ (n×m) and (JᵀJ)⁻¹ (n×n) of J (m×n), from the SVD of J with unit columns; null when JᵀJ is (nearly) singular. */
export function pseudoInverse(J: Float64Array, m: number, n: number): { pinv: Float64Array; inv: Float64Array } | null {
  // J = U·Σ·Vᵀ·C, C = diag(column norms)
  const col = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    let acc = 0;
    for (let i = 0; i < m; i++) acc += J[i * n + j] ** 2;
    col[j] = Math.sqrt(acc);
    if (!(col[j] > 0 && Number.isFinite(col[j]))) return null;
  }
  const scaled = new Float64Array(m * n);
  for (let i = 0; i < m; i++) for (let j = 0; j < n; j++) scaled[i * n + j] = J[i * n + j] / col[j];
  const svd = jacobiSvd(scaled, m, n);
  if (!svd.converged || !(svd.s[n - 1] > SINGULAR_RATIO * svd.s[0])) return null;
  // J⁺ = C⁻¹·V·Σ⁻¹·Uᵀ and (JᵀJ)⁻¹ = C⁻¹·V·Σ⁻²·Vᵀ·C⁻¹
  const pinv = new Float64Array(n * m);
  const inv = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < m; i++) {
      let acc = 0;
      for (let k = 0; k < n; k++) acc += (svd.v[j * n + k] * svd.u[i * n + k]) / svd.s[k];
      pinv[j * m + i] = acc / col[j];
    }
    for (let l = 0; l < n; l++) {
      let acc = 0;
      for (let k = 0; k < n; k++) acc += (svd.v[j * n + k] * svd.v[l * n + k]) / (svd.s[k] * svd.s[k]);
      inv[j * n + l] = acc / (col[j] * col[l]);
    }
  }
  return { pinv, inv };
}

/** The digits vouched for (see the module comment), or null when JᵀJ is singular. */
export function fitDigits(input: DigitsInput): Digits | null {
  const { m, n, jacobian: J, jacobianError: E, r, e, p, logScale } = input;
  const both = pseudoInverse(J, m, n);
  if (!both) return null;
  const { pinv, inv } = both;
  // Σ_i E_ik·|r_i| per column k
  const dJr = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    let acc = 0;
    for (let i = 0; i < m; i++) acc += E[i * n + k] * Math.abs(r[i]);
    dJr[k] = acc;
  }
  const step = new Float64Array(n);
  const model = new Float64Array(n);
  const jac = new Float64Array(n);
  let worst = 0;
  for (let j = 0; j < n; j++) {
    let s = 0, mod = 0, jj = 0;
    for (let i = 0; i < m; i++) {
      s += pinv[j * m + i] * r[i];
      mod += Math.abs(pinv[j * m + i]) * e[i];
    }
    for (let k = 0; k < n; k++) jj += Math.abs(inv[j * n + k]) * dJr[k];
    step[j] = Math.abs(s);
    model[j] = mod;
    jac[j] = jj;
    const err = step[j] + mod + jj;
    if (logScale?.[j]) worst = Math.max(worst, Math.expm1(err));
    else if (p[j] !== 0) worst = Math.max(worst, err / Math.abs(p[j]));
  }
  const digits = worst > 0 ? Math.min(MOST_DIGITS, Math.max(0, Math.floor(-Math.log10(worst)))) : MOST_DIGITS;
  return { digits, step, model, jacobian: jac };
}
