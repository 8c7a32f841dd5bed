/**
 * A Monte Carlo quantity's percentiles and SD with their own precision
 * (numerics/sampling/order-statistics.ts), as the report's fields and words: per percentile
 * (2.5, median, 97.5) its distribution-free 95% interval from order statistics, the standard
 * uncertainty that interval gives (its width / (2 · 1.96)) and the percentile shown to the place
 * of that uncertainty's first digit, as a verdict's probability is shown to its standard error's
 * (uncertainty-precision.ts); the SD's large-sample standard error from the samples' kurtosis.
 * Nothing else is computed from them: the defined names `_p025`, `_p975`, `_sd` are unchanged.
 */
import type { PercentilePrecision } from '../engine/report.ts';
import { formatNumber, type ReportQuantity } from '../units/quantity.ts';
import { unitAfterNumber } from '../units/units.ts';
import { quantileInterval, sdSE, fewestForInterval } from '../numerics/sampling/order-statistics.ts';
import { leadingPlace, roundTo, decimalsOf } from '../numerics/sampling/mc-precision.ts';

/** How a result's SI numbers are reported: a value in its unit, a difference in the SD's unit. */
export interface ResultScale {
  at(si: number): ReportQuantity;
  diff(si: number): ReportQuantity;
}

/** The percentiles of a summary, in SI. */
export interface SampleFigures {
  readonly sorted: Float64Array;
  readonly p025: number;
  readonly median: number;
  readonly p975: number;
  readonly sd: number;
  readonly kurtosis: number;
}

export interface PercentileFields {
  percentiles: { p025: PercentilePrecision; median: PercentilePrecision; p975: PercentilePrecision };
  sdSE: ReportQuantity;
  percentilePrecision: string;
}

const KEYS = [['p025', 0.025, '2.5 percentile'], ['median', 0.5, 'median'], ['p975', 0.975, '97.5 percentile']] as const;

const withUnit = (text: string, unit: string): string => (unit ? `${text} ${unitAfterNumber(unit)}` : text);
const count = (n: number): string => n.toLocaleString('en-US');
/** `x` to the place `place`, written with that many decimals. */
const fixed = (x: number, place: number): string => roundTo(x, place).toFixed(Math.min(20, decimalsOf(place)));

/** `digits ± u unit` where the two share a unit ("3.9 ± 0.2 mg / L"), else each with its own ("19.12 degC ± 0.024 K"). */
function plusMinus(digits: string, unit: string, u: ReportQuantity): string {
  const spread = formatNumber(u.value, 2);
  return u.unit === unit ? withUnit(`${digits} ± ${spread}`, unit) : `${withUnit(digits, unit)} ± ${withUnit(spread, u.unit)}`;
}

/** One percentile's fields and words. */
function onePercentile(sorted: Float64Array, p: number, label: string, si: number, scale: ResultScale): { fields: PercentilePrecision; words: string } {
  const q = scale.at(si);
  const ci = quantileInterval(sorted, p);
  if (ci.low === undefined || ci.high === undefined || ci.u === undefined) {
    const shown = withUnit(formatNumber(q.value), q.unit);
    return { fields: { shown }, words: `${label} ${shown} (fewer than ${count(fewestForInterval(p))} samples: no interval from order statistics)` };
  }
  const low = scale.at(ci.low), high = scale.at(ci.high), u = scale.diff(ci.u);
  const fields = { ci95: { low, high }, ranks: [ci.r, ci.s] as [number, number], coverage: ci.coverage, u };
  if (!(u.value > 0)) {
    const shown = withUnit(formatNumber(q.value), q.unit);
    return { fields: { shown, ...fields }, words: `${label} ${shown} ± 0 (the samples at both ends of its interval are equal)` };
  }
  // at most 12 significant digits of the value: past them a place shows the binary noise of its digits
  const place = q.value !== 0 ? Math.max(leadingPlace(u.value), leadingPlace(Math.abs(q.value)) * 1e-11) : leadingPlace(u.value);
  const digits = fixed(q.value, place);
  const finer = q.value !== 0 ? Math.max(place / 10, leadingPlace(Math.abs(q.value)) * 1e-11) : place / 10;
  const ends = withUnit(`${fixed(low.value, finer)} to ${fixed(high.value, finer)}`, q.unit);
  return { fields: { shown: withUnit(digits, q.unit), ...fields }, words: `${label} ${plusMinus(digits, q.unit, u)} (${ends})` };
}

/**
 * The percentiles' and the SD's precision of a quantity's Monte Carlo samples (sorted, SI).
 * Cost: O(√n) per percentile; the samples are already sorted.
 */
export function percentileFields(s: SampleFigures, scale: ResultScale): PercentileFields {
  const n = s.sorted.length;
  const said: string[] = [];
  const percentiles = {} as PercentileFields['percentiles'];
  for (const [key, p, label] of KEYS) {
    const one = onePercentile(s.sorted, p, label, s[key], scale);
    percentiles[key] = one.fields;
    said.push(one.words);
  }
  const se = scale.diff(sdSE(s.sd, s.kurtosis, n));
  const sdWords = s.sd > 0
    ? `the SD's Monte Carlo standard error ${withUnit(formatNumber(se.value, 2), se.unit)} (samples' kurtosis ${formatNumber(s.kurtosis, 3)})`
    : 'the SD is 0: every sample gave the same value';
  return {
    percentiles, sdSE: se,
    percentilePrecision: `Percentiles, each to the place of its own Monte Carlo uncertainty (in brackets the 95% interval for the percentile itself, from order statistics): ${said.join('; ')}; ${sdWords}.`,
  };
}
