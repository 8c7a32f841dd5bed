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
/** 1st, 2nd, 3rd, 4th, 11th, 12th, 13th, 21st, 1,936th. */
export function ordinal(n: number): string {
  const tens = n % 100, ones = n % 10;
  const end = tens >= 11 && tens <= 13 ? 'th' : ones === 1 ? 'st' : ones === 2 ? 'nd' : ones === 3 ? 'rd' : 'th';
  return `${count(n)}${end}`;
}

/** `x` to the place `place`, written with that many decimals. */
const fixed = (x: number, place: number): string => roundTo(x, place).toFixed(Math.min(20, decimalsOf(place)));

/** One percentile's fields and words. */
function onePercentile(sorted: Float64Array, p: number, label: string, si: number, scale: ResultScale): { fields: PercentilePrecision; words: string } {
  const n = sorted.length;
  const q = scale.at(si);
  const ci = quantileInterval(sorted, p);
  if (ci.low === undefined || ci.high === undefined || ci.u === undefined) {
    const shown = withUnit(formatNumber(q.value), q.unit);
    const side = ci.low === undefined && ci.high === undefined ? 'either end' : ci.low === undefined ? 'its lower end' : 'its upper end';
    return { fields: { shown }, words: `${label} ${shown} (fewer than ${count(fewestForInterval(p))} samples: no sample bounds ${side} of its 95% interval)` };
  }
  const low = scale.at(ci.low), high = scale.at(ci.high), u = scale.diff(ci.u);
  const ranks = `the ${ordinal(ci.r)} and ${ordinal(ci.s)} smallest of ${count(n)}`;
  const fields = { ci95: { low, high }, ranks: [ci.r, ci.s] as [number, number], coverage: ci.coverage, u };
  if (!(u.value > 0)) {
    const shown = withUnit(formatNumber(q.value), q.unit);
    return { fields: { shown, ...fields }, words: `${label} ${shown}, with no Monte Carlo error (its 95% interval's ends, ${ranks}, are equal)` };
  }
  const place = leadingPlace(u.value);
  const shown = withUnit(fixed(q.value, place), q.unit);
  const ends = `${withUnit(fixed(low.value, place / 10), low.unit)} to ${withUnit(fixed(high.value, place / 10), high.unit)}`;
  return { fields: { shown, ...fields }, words: `${label} ${shown} ± ${withUnit(formatNumber(u.value, 2), u.unit)} (95% interval ${ends}, ${ranks})` };
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
    ? `The SD's Monte Carlo standard error is ${withUnit(formatNumber(se.value, 2), se.unit)} (for large n, SD·sqrt((κ − 1)/(4n)) with the samples' kurtosis κ = ${formatNumber(s.kurtosis, 3)}).`
    : 'The SD is 0: every sample gave the same value.';
  return {
    percentiles, sdSE: se,
    percentilePrecision: `Each percentile to the place of its standard uncertainty's first digit (its distribution-free 95% interval's width / 3.92, from order statistics): ${said.join('; ')}. ${sdWords}`,
  };
}
