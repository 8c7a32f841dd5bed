/** Change signatures of bindings: equal signatures mean downstream need not re-run. */
import type { Quantity } from '../units/quantity.ts';
import { formatUnit } from '../units/units.ts';

export function quantitySig(q: Quantity): string {
  return `${Object.is(q.si, -0) ? '-0' : q.si}|${q.dim.join(',')}|${q.temp ?? ''}|${formatUnit(q.unit)}`;
}
