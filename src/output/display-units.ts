/**
 * The units the trades read their results in, offered when a user switches the unit a value
 * is shown in: concentrations, flows, times, temperatures, powers and energies, lengths,
 * masses, volumes and rate constants. A value is offered those of its own dimension.
 */
import { unitFromText } from '../expression/unit-text.ts';
import { unitDim, unitFactor } from '../units/units.ts';
import { sameDim, TIME } from '../units/dimension.ts';

export const TRADE_UNITS: readonly string[] = Object.freeze([
  'mg / L', 'ug / mL', 'ug / L', 'g / L', 'mmol / L',
  'mL / min', 'L / h', 'L / min', 'gal / min', 'm^3 / s', 'm^3 / h', 'm^3 / d',
  's', 'min', 'h', 'd', 'week', 'year',
  'degC', 'degF', 'K',
  'W', 'kW', 'BTU / h', 'J', 'kJ', 'BTU',
  'mm', 'm', 'ft', 'in',
  'mg', 'g', 'kg', 'mL', 'L', 'm^3', 'gal',
  '1 / s', '1 / min', '1 / h', '1 / d',
  'm / s', 'km / h',
  'mg * h / L', 'ug * h / mL',
  'degC / h', 'degC / min', 'degF / h', 'K / s',
]);

const cache = new Map<string, readonly string[]>();

/**
 * Trade units of the same dimension as `unitText` (the unit a value is reported in), without
 * `unitText` itself; none for a unit that cannot be read or a plain number. `original`, the
 * unit the value had before one was picked (a report's `originalUnit`), comes first when it
 * differs from `unitText` and has its dimension, so that it can always be picked back.
 */
export function unitChoicesFor(unitText: string, original?: string): readonly string[] {
  const key = `${unitText}\n${original ?? ''}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const unit = unitFromText(unitText);
  const dim = unit && unit.length ? unitDim(unit) : undefined;
  const fits = (u: string) => u !== unitText && !!dim && sameDim(unitDim(unitFromText(u) ?? []), dim);
  const first = original !== undefined && unitFromText(original) && fits(original) ? [original] : [];
  const out = dim ? [...first, ...TRADE_UNITS.filter((u) => fits(u) && !first.includes(u))] : [];
  cache.set(key, out);
  return out;
}

/** A unit a time axis may be labelled in: multiply a time in the axis's own unit by `factor` to read it in `unit`. */
export interface AxisUnit {
  readonly unit: string;
  readonly factor: number;
}

/** A span reads well in a unit when it is this many of that unit, or more... */
const AXIS_FEWEST = 0.5;
/** ...and no more than this many (so that ticks are neither all fractions nor all huge numbers). */
const AXIS_MOST = 10_000;

/**
 * The units a time axis in `unitText` that spans `span` (in that unit) may be relabelled in:
 * its own unit always, and each trade time unit (`unitChoicesFor`) in which the span reads
 * between 0.5 and 10 000, smallest unit first. Only the own unit for a unit that cannot be
 * read, is not a time, or an empty span. Cost: a few unit look-ups.
 */
export function timeAxisUnits(unitText: string, span: number): AxisUnit[] {
  const own = unitFromText(unitText);
  if (!own || !own.length || !sameDim(unitDim(own), TIME) || !(span > 0)) return [{ unit: unitText, factor: 1 }];
  const ownSize = unitFactor(own);
  const sized = [unitText, ...unitChoicesFor(unitText)].map((unit) => ({ unit, size: unitFactor(unitFromText(unit)!) }));
  return sized
    .filter((u) => u.unit === unitText || ((span * ownSize) / u.size >= AXIS_FEWEST && (span * ownSize) / u.size <= AXIS_MOST))
    .sort((a, b) => a.size - b.size)
    .map((u) => ({ unit: u.unit, factor: ownSize / u.size }));
}
