/**
 * A fit's priors and error model, read and checked: `estimate[i].prior` (`median`, `omega`)
 * and `error` (`additive`, `proportional`). With them a fit is a Bayesian (MAP) estimate
 * (numerics/fit/map-objective.ts). Every problem is a FieldError on the field it concerns.
 */
import type { FitCell } from '../study/types.ts';
import type { CellError } from '../engine/node.ts';
import type { Lookup } from '../expression/evaluate.ts';
import { type Field, field, finiteQuantityOf, fail } from './fields.ts';
import { type Quantity, describe, valueIn } from '../units/quantity.ts';
import { type Dim, sameDim, describeDim, isDimensionless } from '../units/dimension.ts';
import { unitFactor } from '../units/units.ts';
import type { LogNormalPrior } from '../numerics/fit/map-objective.ts';

/** A plain number written as a number, or as an expression to evaluate. */
type NumberField = { readonly path: string; readonly value: number } | Field;

/** The parsed prior and error fields of a fit cell. */
export interface PriorFields {
  /** Per estimate: its prior's median and omega, or undefined without a prior. */
  readonly priors: ReadonlyArray<{ median?: Field; omega?: NumberField } | undefined>;
  readonly additive?: Field;
  readonly proportional?: NumberField;
  /** The expression fields, for the names they read. */
  readonly fields: ReadonlyArray<Field | undefined>;
}

function numberField(v: unknown, path: string, problems: CellError[]): NumberField | undefined {
  if (typeof v === 'number') return { path, value: v };
  return v === undefined ? undefined : field(v, path, problems);
}

/** Parses the fields (problems recorded with their paths), once per cell document. */
export function priorFields(cell: FitCell, at: string, problems: CellError[]): PriorFields {
  const estimates = Array.isArray(cell.estimate) ? cell.estimate : [];
  const priors = estimates.map((e, i) => {
    const pr = e?.prior;
    if (!pr || typeof pr !== 'object') return undefined;
    const path = `${at}.estimate[${i}].prior`;
    return { median: field(pr.median, `${path}.median`, problems), omega: numberField(pr.omega, `${path}.omega`, problems) };
  });
  const err = cell.error && typeof cell.error === 'object' ? cell.error : undefined;
  const additive = err?.additive !== undefined ? field(err.additive, `${at}.error.additive`, problems) : undefined;
  const proportional = numberField(err?.proportional, `${at}.error.proportional`, problems);
  const fields: Array<Field | undefined> = [additive];
  for (const p of priors) fields.push(p?.median, p?.omega && 'expr' in p.omega ? p.omega : undefined);
  if (proportional && 'expr' in proportional) fields.push(proportional);
  return { priors, additive, proportional, fields };
}

/** What an estimate must be for its prior to be checked: its parameter's dimension and the estimate's guess and bounds. */
export interface PriorTarget {
  readonly name: string;
  readonly template: Quantity;
  readonly guess: number;
  readonly upper: number;
  readonly guessPath: string;
  readonly maxPath: string;
}

/** The error model and priors in SI, ready for the MAP fit. */
export interface MapSettings {
  /** Per estimate: its prior (median in SI), or null. */
  readonly priors: ReadonlyArray<LogNormalPrior | null>;
  /** The additive SD in the observed states' SI unit (0 when not given). */
  readonly additive: number;
  readonly proportional: number;
  /** True when some estimate has a prior (a Bayesian estimate); false for an error model alone. */
  readonly bayesian: boolean;
}

/** A plain number from a number field: finite, dimensionless. */
function plainNumber(f: NumberField, lookup: Lookup, what: string): number {
  if (!('expr' in f)) {
    if (!Number.isFinite(f.value)) fail(f.path, `${what} must be a finite number`);
    return f.value;
  }
  const q = finiteQuantityOf(f, lookup);
  if (!isDimensionless(q.dim)) fail(f.path, `${what} must be a plain number (such as 0.3), not ${describe(q)}`, 'unit');
  return q.si;
}

/** A difference in SI: a temperature written on an offset scale (`0.5 degC`) counts as 0.5 K. */
const asDifference = (q: Quantity): number => (q.temp === 'point' ? valueIn(q, q.unit) * unitFactor(q.unit) : q.si);

/**
 * Checks the priors and the error model against the estimates and the observed states;
 * returns null for an ordinary least-squares fit (neither given). Throws FieldError: a prior
 * without an error model (on `error`), a weighting beside an error model, a median of the
 * wrong dimension or not above zero, omega not above zero, a guess or upper bound not above
 * zero under a prior, SDs negative or both zero, an additive SD of another dimension than the
 * observed columns.
 */
export function readMapSettings(cell: FitCell, at: string, pf: PriorFields, targets: readonly PriorTarget[],
  observed: ReadonlyArray<{ readonly column: string; readonly dim: Dim }>, lookup: Lookup): MapSettings | null {
  const anyPrior = pf.priors.some((p) => p !== undefined);
  const hasError = cell.error !== undefined && cell.error !== null;
  if (!anyPrior && !hasError) return null;
  if (!hasError) fail(`${at}.error`, 'a Bayesian (MAP) estimate needs an error model: give the measurements\' additive SD, proportional SD, or both');
  if ((cell.weighting ?? 'none') !== 'none') fail(`${at}.weighting`, `the error model sets the weights: weighting must be "none" beside it, not "${cell.weighting}"`);

  const priors = targets.map((t, i): LogNormalPrior | null => {
    const pr = pf.priors[i];
    if (!pr) return null;
    if (!pr.median || !pr.omega) fail(`${at}.estimate[${i}].prior`, 'a prior needs a median and an omega');
    const m = finiteQuantityOf(pr.median, lookup);
    if (!sameDim(m.dim, t.template.dim)) fail(pr.median.path, `the prior median must be ${describeDim(t.template.dim)} like ${t.name}; it is ${describe(m)}`, 'unit');
    if (!(m.si > 0)) fail(pr.median.path, `the prior median must be above zero (the prior is log-normal); it is ${describe(m)}`);
    const omega = plainNumber(pr.omega, lookup, 'omega');
    if (!(omega > 0)) fail(pr.omega.path, `omega (the SD of log ${t.name}) must be above zero; it is ${omega}`);
    if (!(t.guess > 0)) fail(t.guessPath, `the guess must be above zero: an estimate with a log-normal prior is positive`);
    if (!(t.upper > 0)) fail(t.maxPath, `the upper bound must be above zero: an estimate with a log-normal prior is positive`);
    return { median: m.si, omega };
  });

  let additive = 0;
  if (pf.additive) {
    const q = finiteQuantityOf(pf.additive, lookup);
    const other = observed.find((o) => !sameDim(o.dim, q.dim));
    if (other) fail(pf.additive.path, `the additive SD must be ${describeDim(other.dim)} like the column "${other.column}"; it is ${describe(q)}`, 'unit');
    additive = asDifference(q);
    if (!(additive >= 0)) fail(pf.additive.path, `the additive SD must not be negative; it is ${describe(q)}`);
  }
  const proportional = pf.proportional ? plainNumber(pf.proportional, lookup, 'the proportional SD') : 0;
  if (pf.proportional && !(proportional >= 0)) fail(pf.proportional.path, `the proportional SD must not be negative; it is ${proportional}`);
  if (!(additive > 0) && !(proportional > 0)) fail(pf.additive?.path ?? pf.proportional?.path ?? `${at}.error`, 'the additive and proportional SDs cannot both be zero: give at least one above zero');
  return { priors, additive, proportional, bayesian: anyPrior };
}
