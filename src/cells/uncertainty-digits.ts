/**
 * How an uncertainty cell writes a Monte Carlo figure beside its own uncertainty: the figure to
 * the place of its standard error's first digit (`shownPlace`), the standard error with one or
 * two significant digits by one rule (`uncertaintyText`), each with its unit. Used by the mean's
 * and SD's figures and words (uncertainty-precision.ts), the percentiles'
 * (uncertainty-percentiles.ts) and, through the report's strings, every view. Only what is shown
 * is rounded: the report's numbers and the defined names keep their full values.
 */
import { formatNumber, type ReportQuantity } from '../units/quantity.ts';
import { unitAfterNumber } from '../units/units.ts';
import { shownPlace, toPlace, uncertaintyText } from '../numerics/sampling/mc-precision.ts';

/** `text` followed by the unit as written after a number ("3.9 mg / L", "0.26 /h"); no unit, the text. */
export const withUnit = (text: string, unit: string): string => (unit ? `${text} ${unitAfterNumber(unit)}` : text);

/**
 * The digits of a figure `x` (in its shown unit) with standard uncertainty `u` (in the same
 * unit's size): to the place of u's first digit, or, when u is 0 or has no value, to 4
 * significant figures with no place.
 */
export function figureDigits(x: number, u: number): { digits: string; place?: number } {
  if (!(u > 0)) return { digits: formatNumber(x) };
  const place = shownPlace(x, u);
  return { digits: toPlace(x, place), place };
}

/** A standard uncertainty as a report gives it, written by the one rule, with its unit: "0.14 mg / L". */
export const uncertaintyWords = (u: ReportQuantity): string => withUnit(uncertaintyText(u.value), u.unit);

/** `digits ± u unit` where the two share a unit ("3.9 ± 0.20 mg / L"), else each with its own ("19.12 degC ± 0.024 K"). */
export function plusMinus(digits: string, unit: string, u: ReportQuantity): string {
  const spread = uncertaintyText(u.value);
  return u.unit === unit ? withUnit(`${digits} ± ${spread}`, unit) : `${withUnit(digits, unit)} ± ${withUnit(spread, u.unit)}`;
}

/** A place (a power of ten) with the unit it is in: "0.1 mg / L", "10 min". */
export const placeWords = (place: number, unit: string): string => withUnit(toPlace(place, place), unit);

/** A Monte Carlo quantity's mean and SD as shown, each with its standard error, every one with its unit. */
export interface ShownFigures {
  /** The mean to the place of its standard error's first digit: "13.2 mg / L". */
  readonly mean: string;
  /** The mean's standard error SD/√n by the one rule: "0.14 mg / L". */
  readonly meanSE: string;
  /** The SD to the place of its standard error's first digit: "6.1 mg / L". */
  readonly sd: string;
  /** The SD's standard error by the one rule: "0.12 mg / L". */
  readonly sdSE: string;
}

/** The shown figures of a mean and an SD from the report's quantities (standard errors in the SD's unit). */
export function shownFigures(mean: ReportQuantity, meanSE: ReportQuantity, sd: ReportQuantity, sdSE: ReportQuantity): ShownFigures {
  return {
    mean: withUnit(figureDigits(mean.value, meanSE.value).digits, mean.unit),
    meanSE: uncertaintyWords(meanSE),
    sd: withUnit(figureDigits(sd.value, sdSE.value).digits, sd.unit),
    sdSE: uncertaintyWords(sdSE),
  };
}
