/**
 * A fit cell's Bayesian (MAP) estimate, or its estimate under an error model alone: the MAP fit
 * run on the fit cell's model (numerics/fit/map-objective.ts), and what its report adds per
 * estimate (the prior, how far the data moved the estimate, the SD of log P) and in its
 * summary. The standard errors and intervals are those of the posterior's normal
 * approximation on the log scale (natural scale for an estimate without a prior).
 */
import type { EstimateReport, FitFields, ReportQuantity } from '../engine/report.ts';
import { type Quantity, report, describe, deltaUnit } from '../units/quantity.ts';
import { fitMap, type MapResult } from '../numerics/fit/map-objective.ts';
import type { MapSettings } from './fit-prior.ts';

/** What the MAP fit needs of a fit cell's unknowns. */
export interface MapUnknown {
  readonly as: string;
  readonly guess: number;
  readonly lower: number;
  readonly upper: number;
}

/**
 * Runs the MAP fit. `residuals` writes f − y per point (unweighted: an error model goes with
 * weighting "none"), so the predictions are those plus y. The model is good to `accuracy`
 * (relative; the runs' tolerance) and each prediction f_i to `predictionError(f)_i`
 * (absolute): the fit differences centrally, is polished and reports its digits.
 */
export function runMapFit(settings: MapSettings, unknowns: readonly MapUnknown[], y: readonly number[],
  residuals: (p: Float64Array, out: Float64Array) => boolean, accuracy: number, predictionError: (f: Float64Array, out: Float64Array) => void): MapResult {
  const out = new Float64Array(y.length);
  return fitMap({
    predict: (p, f) => {
      if (!residuals(p, out)) return false;
      for (let i = 0; i < y.length; i++) f[i] = out[i] + y[i];
      return true;
    },
    y, additive: y.map(() => settings.additive), proportional: settings.proportional, priors: settings.priors,
    p0: unknowns.map((u) => u.guess), lower: unknowns.map((u) => u.lower), upper: unknowns.map((u) => u.upper),
    names: unknowns.map((u) => `"${u.as}"`), predictionError,
  }, { modelAccuracy: accuracy });
}

/** An estimate's prior as reported: its median in the estimate's unit, omega, and how far the data moved the estimate. */
export function priorReport(settings: MapSettings, k: number, estimate: Quantity, fit: MapResult): Pick<EstimateReport, 'prior' | 'logSD'> {
  const pr = settings.priors[k];
  if (!pr) return {};
  const value = fit.p[k];
  return {
    prior: { median: report({ ...estimate, si: pr.median }), omega: pr.omega, ratio: value / pr.median, shift: (Math.log(value) - Math.log(pr.median)) / pr.omega },
    ...(fit.workingSD ? { logSD: fit.workingSD[k] } : {}),
  };
}

/** The report's fields of a fit under an error model: the error model, and `bayesian` when a prior is given. */
export function errorModelReport(settings: MapSettings, observedTemplate: Quantity): Pick<FitFields, 'bayesian' | 'errorModel'> {
  const additive: ReportQuantity | undefined = settings.additive > 0
    ? report({ si: settings.additive, dim: observedTemplate.dim, unit: deltaUnit(observedTemplate.unit), ...(observedTemplate.temp ? { temp: 'delta' as const } : {}) })
    : undefined;
  return {
    ...(settings.bayesian ? { bayesian: true as const } : {}),
    errorModel: { ...(additive ? { additive } : {}), proportional: settings.proportional },
  };
}

/** The summary's words for each estimate of a MAP fit: value, the prior's median and the interval. */
export function mapSummary(settings: MapSettings, names: readonly string[], templates: readonly Quantity[], fit: MapResult, points: number): string {
  const each = names.map((as, k) => {
    const q = { ...templates[k], si: fit.p[k] };
    const pr = settings.priors[k];
    const prior = pr ? ` (prior median ${describe({ ...q, si: pr.median })}, moved ×${(fit.p[k] / pr.median).toPrecision(3)})` : '';
    const ci = fit.ci95 ? `, 95% interval ${describe({ ...q, si: fit.ci95[k][0] })} to ${describe({ ...q, si: fit.ci95[k][1] })}` : '';
    return `${as} = ${describe(q)}${prior}${ci}`;
  });
  const kind = settings.bayesian ? 'Bayesian (MAP) estimate' : 'Estimate under the error model';
  return `${kind}: ${each.join('; ')}; ${points} points; ${fit.converged ? 'converged' : `not converged (${fit.message})`}.`;
}
