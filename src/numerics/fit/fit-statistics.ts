/**
 * The statistics of a fit's estimate from the Jacobian at the solution: covariance
 * s²·(JᵀJ)⁻¹ with s² = 2·cost/(m − n), standard errors, 95% intervals
 * p ± t(0.975, m − n)·SE, correlations, and identifiability (parameters with no effect, or
 * that the data cannot tell apart). (JᵀJ)⁻¹ comes from the SVD of J with its columns scaled to
 * unit length, so that the rank test does not depend on the parameters' units;
 * `conditionNumber` is that of the scaled JᵀJ.
 */
import type { FitResult, FitWarning } from './fit-types.ts';
import { jacobiSvd } from './linear-algebra-small.ts';
import { studentTQuantile } from './student-t.ts';

/** Components of a right singular vector at least this large name the parameters involved. */
const INVOLVED_COMPONENT = 0.1;
/** Singular value ratio (scaled J) below which parameters are reported as poorly identified: cond(JᵀJ) > 1e8. */
const POORLY_IDENTIFIED_RATIO = 1e-4;
/** Floor of the ratio below which JᵀJ counts as singular: cond(JᵀJ) > 1e12. */
const SINGULAR_RATIO_FLOOR = 1e-6;

/** The statistical fields of a `FitResult`. */
export type Statistics = Pick<FitResult,
  'covariance' | 'standardErrors' | 'ci95' | 'correlation' | 'dof' | 'residualSD' | 'tQuantile95' | 'conditionNumber'>;

/** The statistics without a Jacobian: degrees of freedom, residual SD and t quantile only. */
export function emptyStatistics(m: number, n: number, cost: number | null): Statistics {
  const dof = m - n;
  return {
    covariance: null, standardErrors: null, ci95: null, correlation: null, dof,
    residualSD: dof > 0 && cost !== null ? Math.sqrt((2 * cost) / dof) : null,
    tQuantile95: dof > 0 ? studentTQuantile(0.975, dof) : null, conditionNumber: null,
  };
}

/** Parameter j in a message: its name when given, else "parameter j". */
export const nameOf = (j: number, names?: readonly string[]): string => names?.[j] ?? `parameter ${j}`;

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
export function statistics(
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
