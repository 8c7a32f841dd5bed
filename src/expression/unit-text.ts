/**
 * Unit text as the report writes it ("mg / L", "degC", "h") back into a display unit, and SI
 * values shown in it: for placing values from one cell on another cell's plot.
 */
import { parseExpression } from './parse.ts';
import { literalOf } from './literal.ts';
import { type DisplayUnit, NO_UNIT, unitDim, lookupUnit, isOffsetTemperature } from '../units/units.ts';
import { valueIn } from '../units/quantity.ts';

/** The display unit a report's unit text stands for; undefined when it is not a plain unit. */
export function unitFromText(text: string): DisplayUnit | undefined {
  if (text.trim() === '') return NO_UNIT;
  const p = parseExpression(text);
  if (!p.ok) return undefined;
  const lit = literalOf(p.expr, () => false, new WeakMap());
  return lit && lit.coef === 1 ? lit.unit : undefined;
}

/** An SI magnitude as a number in `unit` (a lone degC or degF is read as a temperature reading). */
export function shownIn(si: number, unit: DisplayUnit): number {
  const point = unit.length === 1 && unit[0][1] === 1 && isOffsetTemperature(lookupUnit(unit[0][0])!);
  return valueIn({ si, dim: unitDim(unit), unit, ...(point ? { temp: 'point' as const } : {}) }, unit);
}
