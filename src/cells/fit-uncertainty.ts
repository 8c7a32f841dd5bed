/**
 * Each estimate's uncertainty as names downstream: `<as>_se` (its standard error), `<as>_lo`
 * and `<as>_hi` (the bounds of its 95% interval), with the very values the fit's report gives
 * as `standardError` and `ci95`. When the fit gives none (no degrees of freedom, estimates
 * that cannot be told apart), the names are left undefined with the reason.
 */
import type { Binding, Definition, JointNormal } from '../engine/node.ts';
import type { EstimateReport } from '../engine/report.ts';
import { type Quantity, deltaUnit } from '../units/quantity.ts';
import { quantitySig } from './signatures.ts';

/** The endings of the three names, after the estimate's `as`. */
export const UNCERTAINTY_ENDINGS = { standardError: '_se', lower: '_lo', upper: '_hi' } as const;

/** The three names an estimate defines besides its own, each at the path of its `as`. */
export function uncertaintyDefinitions(as: unknown, path: string): Definition[] {
  if (typeof as !== 'string') return [];
  return Object.values(UNCERTAINTY_ENDINGS).map((end) => ({ name: `${as}${end}`, path }));
}

/**
 * The bindings of the three names of each estimate, from the report's quantities (`template`:
 * the estimate's quantity, for its dimension, unit and temperature kind), or the reasons they
 * have none. `why`: the fit's own words on why it gave no standard errors, when it says.
 */
export function uncertaintyBindings(estimates: ReadonlyArray<{ as: string; template: Quantity; report: EstimateReport }>, dof: number, why: string | undefined):
  { bindings: Map<string, Binding>; reasons: Map<string, string> } {
  const bindings = new Map<string, Binding>();
  const reasons = new Map<string, string>();
  for (const { as, template, report } of estimates) {
    const names = [`${as}${UNCERTAINTY_ENDINGS.standardError}`, `${as}${UNCERTAINTY_ENDINGS.lower}`, `${as}${UNCERTAINTY_ENDINGS.upper}`];
    const se = report.standardError;
    const ci = report.ci95;
    if (!se || !ci || !Number.isFinite(se.si) || !ci.every((x) => Number.isFinite(x.si))) {
      const because = dof <= 0
        ? `the fit has no degrees of freedom (as many data points as estimates), so "${as}" has no standard error or interval`
        : `the fit gives "${as}" no standard error or interval${why ? ` (${why})` : ''}`;
      for (const n of names) reasons.set(n, `"${n}" is not defined: ${because}`);
      continue;
    }
    const difference: Quantity = { si: se.si, dim: template.dim, unit: deltaUnit(template.unit), ...(template.temp ? { temp: 'delta' as const } : {}) };
    const values: Quantity[] = [difference, { ...template, si: ci[0].si }, { ...template, si: ci[1].si }];
    names.forEach((n, i) => bindings.set(n, { kind: 'value', q: values[i], sig: quantitySig(values[i]) }));
  }
  return { bindings, reasons };
}

/**
 * The estimates as a joint normal, for an uncertainty cell's draws: the fit's covariance on
 * its working scale (log P for an estimate with a prior, P otherwise). Undefined when the fit
 * gives no covariance, or one that is not finite.
 */
export function jointOf(cell: string, names: readonly string[], p: ArrayLike<number>, covariance: Float64Array | null, logScale?: readonly boolean[]): JointNormal | undefined {
  if (!covariance || !covariance.every(Number.isFinite)) return undefined;
  const log = names.map((_, k) => logScale?.[k] === true);
  const center = Float64Array.from(names, (_, k) => (log[k] ? Math.log(p[k]) : p[k]));
  if (!center.every(Number.isFinite)) return undefined;
  return { cell, names: [...names], center, covariance: Float64Array.from(covariance), logScale: log };
}
