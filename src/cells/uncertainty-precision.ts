/**
 * How precise an uncertainty cell's Monte Carlo figures are (numerics/sampling/mc-precision.ts),
 * as the report's fields and words: for a verdict, the standard error of its probability, its
 * Wilson 95% interval and the probability shown to the place its standard error supports; for
 * a quantity, the standard error of its mean and the mean shown to the place it supports. Each
 * says, by JCGM 101:2008 7.9, how many samples would settle the last digit shown. Every standard
 * error is written by one rule (`uncertaintyText`).
 */
import { MAX_SAMPLES } from '../study/types.ts';
import type { ReportQuantity } from '../units/quantity.ts';
import { proportionSE, wilsonInterval, shareUncertainty, leadingPlace, roundTo, decimalsOf, settled, uncertaintyText } from '../numerics/sampling/mc-precision.ts';
import { figureDigits, plusMinus, placeWords, uncertaintyWords } from './uncertainty-digits.ts';

/** Say a count of samples: "38,000", rounded to two significant figures past 1,000. */
function count(n: number): string {
  const r = n >= 1000 ? Number(n.toPrecision(2)) : n;
  return r.toLocaleString('en-US');
}

function moreSamples(needed: number, what: string): string {
  if (needed > MAX_SAMPLES) return `settling ${what} would take about ${count(needed)} samples, more than the ${MAX_SAMPLES.toLocaleString('en-US')} a cell may draw`;
  return `about ${count(needed)} samples would settle ${what}`;
}

const percent = (p: number, decimals: number) => `${(100 * p).toFixed(decimals)}%`;

/** A verdict's precision: `yes` of `n` samples (n ≥ 1). */
export interface SharePrecision {
  readonly probabilitySE: number;
  readonly probabilityCI95: { readonly low: number; readonly high: number };
  /** The probability in percent, to the place of its standard error's first digit: "62%". */
  readonly shown: string;
  /** Words to follow the shown probability: its standard error, interval, and the samples that would settle its last digit. */
  readonly precision: string;
}

/**
 * The probability `yes / n` shown to the place of the first digit of its standard uncertainty
 * (its SE, or near 0 or n yes a quarter of the Wilson interval's width: `shareUncertainty`);
 * the interval's ends one digit finer. The last digit shown is settled when twice the SE is at
 * most half a unit of it (JCGM 101:2008 7.9.4): by this rounding it never is (the unit is at most
 * the uncertainty), so the words say how far another seed may move the figure and how many
 * samples would settle its last digit.
 */
export function sharePrecision(yes: number, n: number): SharePrecision {
  const p = yes / n;
  const se = proportionSE(p, n);
  const ci = wilsonInterval(yes, n);
  const u = shareUncertainty(yes, n);
  const place = Math.min(1, leadingPlace(100 * u)); // in percentage points, at most a whole point
  const decimals = Math.min(4, decimalsOf(place));
  const shown = yes === 0 ? '0%' : yes === n ? '100%' : `${roundTo(100 * p, place).toFixed(decimals)}%`;
  const inner = Math.min(5, decimals + 1);
  const range = `95% interval ${percent(ci.low, inner)} to ${percent(ci.high, inner)} (Wilson score)`;
  const needed = settled(u, n, place / 100).samplesNeeded;
  const digit = place >= 1 ? 'whole percent' : `${place.toFixed(decimals)} point`;
  const settle = `${moreSamples(needed, `the ${digit} shown`)} (JCGM 101:2008 7.9: twice the standard error within half a unit of it)`;
  const sentence = se > 0
    ? `± ${uncertaintyText(100 * se)} percentage points (Monte Carlo standard error); ${range}. Another seed may move it by about ${uncertaintyText(200 * se)} points (2 SE); ${settle}.`
    : `${yes === 0 ? 'none' : 'every one'} of ${n.toLocaleString('en-US')} samples was yes, so the standard error sqrt(p(1 − p)/n) is 0 and says nothing; ${range}. ${settle[0].toUpperCase()}${settle.slice(1)}.`;
  return { probabilitySE: se, probabilityCI95: ci, shown, precision: sentence };
}

/**
 * A mean's precision: `mean` and its standard error `se` (SD/sqrt(n), in the SD's unit) as the
 * report gives them. The mean is shown to the place of the standard error's first digit, as the
 * percentiles and a verdict's probability are; by JCGM 101:2008 7.9.4 (twice the standard error
 * within half a unit of the last digit) that digit is settled only when the place is held at the
 * mean's 12th significant digit, so the words say how far another seed may move it and how many
 * samples would settle it. The place said is the place of the digits shown (`figureDigits`).
 */
export function meanPrecision(mean: ReportQuantity, se: ReportQuantity, n: number): string {
  if (!(se.value > 0)) return `Every one of the ${n.toLocaleString('en-US')} samples gave the same value: its mean has no Monte Carlo error.`;
  const { digits, place } = figureDigits(mean.value, se.value);
  const at = placeWords(place!, se.unit);
  const s = settled(se.value, n, place!);
  const settle = s.settled ? `these samples settle its ${at} digit` : moreSamples(s.samplesNeeded, `its ${at} digit`);
  const why = place === leadingPlace(se.value) ? 'the place of the standard error\'s first digit' : 'its 12th significant digit (finer digits would show round-off)';
  return `Mean ${plusMinus(digits, mean.unit, se)} (Monte Carlo standard error, SD/√n), shown to ${at}, ${why}. `
    + `Another seed may move it by about ${uncertaintyWords({ ...se, value: 2 * se.value, si: 2 * se.si })} (2 SE); ${settle} (JCGM 101:2008 7.9: twice the standard error within half a unit of it).`;
}
