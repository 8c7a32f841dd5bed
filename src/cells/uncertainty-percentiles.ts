/**
 * A Monte Carlo quantity's percentiles and SD with their own precision
 * (numerics/sampling/order-statistics.ts), as the report's fields and words: per percentile
 * (2.5, median, 97.5) its distribution-free 95% interval from order statistics, the standard
 * uncertainty that interval gives (its width / (2 · 1.96)) and the percentile shown to the place
 * of that uncertainty's first digit, as a verdict's probability is shown to its standard error's
 * (uncertainty-precision.ts); the SD's large-sample standard error from the samples' kurtosis, and
 * the SD shown to the place of its first digit. Each ± by the one rule of uncertainty-digits.ts.
 * Nothing else is computed from them: the defined names `_p025`, `_p975`, `_sd` are unchanged.
 */
import type { PercentilePrecision } from '../engine/report.ts';
import { formatNumber, type ReportQuantity } from '../units/quantity.ts';
import { quantileInterval, sdSE, fewestForInterval } from '../numerics/sampling/order-statistics.ts';
import { shownPlace, leadingPlace, toPlace } from '../numerics/sampling/mc-precision.ts';
import { withUnit, plusMinus, figureDigits } from './uncertainty-digits.ts';

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

const count = (n: number): string => n.toLocaleString('en-US');
/** The samples' kurtosis to the place of its own standard error's first digit, sqrt(24/n) for normal samples (more for others): "4.0" at 2,000 samples. */
const kurtosisText = (k: number, n: number): string => toPlace(k, shownPlace(k, Math.sqrt(24 / n)));

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
  const place = shownPlace(q.value, u.value);
  const digits = toPlace(q.value, place);
  const finer = q.value !== 0 ? Math.max(place / 10, leadingPlace(Math.abs(q.value)) * 1e-11) : place / 10;
  const ends = withUnit(`${toPlace(low.value, finer)} to ${toPlace(high.value, finer)}`, q.unit);
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
  const sd = scale.diff(s.sd);
  const sdWords = s.sd > 0 && se.value > 0
    ? `SD ${plusMinus(figureDigits(sd.value, se.value).digits, sd.unit, se)}, to the place of its Monte Carlo standard error's first digit (SD·sqrt((κ − 1)/(4n)), the samples' kurtosis κ ${kurtosisText(s.kurtosis, n)})`
    : s.sd > 0 ? `SD ${withUnit(formatNumber(sd.value), sd.unit)} (its large-sample standard error is 0 at the samples' kurtosis ${kurtosisText(s.kurtosis, n)})` : 'the SD is 0: every sample gave the same value';
  return {
    percentiles, sdSE: se,
    percentilePrecision: `Percentiles, each to the place of its own Monte Carlo uncertainty (in brackets the 95% interval for the percentile itself, from order statistics): ${said.join('; ')}; ${sdWords}.`,
  };
}
