/**
 * The units the trades read their results in, offered when a user switches the unit a value
 * is shown in: concentrations, flows, times, temperatures, powers and energies, lengths,
 * masses, volumes and rate constants. A value is offered those of its own dimension.
 */
import { unitFromText } from '../expression/unit-text.ts';
import { unitDim } from '../units/units.ts';
import { sameDim } from '../units/dimension.ts';

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
