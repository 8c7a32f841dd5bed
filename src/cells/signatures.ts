/** Change signatures of bindings: equal signatures mean downstream need not re-run. */
import type { Quantity } from '../units/quantity.ts';
import { formatUnit } from '../units/units.ts';
import type { Dim } from '../units/dimension.ts';

export function quantitySig(q: Quantity): string {
  return `${Object.is(q.si, -0) ? '-0' : q.si}|${dimText(q.dim)}|${q.temp ?? ''}|${formatUnit(q.unit)}`;
}

/** Dimensions are immutable (`readonly number[]`), so their text is cached by identity: a what-if loop signs thousands of values of one dimension. */
const dimTexts = new WeakMap<Dim, string>();

function dimText(d: Dim): string {
  let text = dimTexts.get(d);
  if (text === undefined) {
    text = d.join(',');
    dimTexts.set(d, text);
  }
  return text;
}
