/**
 * The units a study's own inputs are written in, gathered once per evaluation for the
 * display rule of src/units/simplest-unit.ts: the states' units, the runs' start and end, and
 * every parameter whose value is a plain number with a unit (`2 m^3`, `100 L / min`), in that
 * order. A parameter computed from others (`V / Q`) adds nothing.
 */
import type { Cell } from '../study/types.ts';
import { parseExpression } from '../expression/parse.ts';
import { literalOf } from '../expression/literal.ts';
import { type DisplayUnit } from '../units/units.ts';
import { type StudyUnits, studyUnitsOf } from '../units/simplest-unit.ts';

export function studyUnits(cells: readonly Cell[]): StudyUnits {
  const names = new Set<string>();
  for (const c of cells) {
    if (c.kind === 'parameters' && Array.isArray(c.items)) for (const it of c.items) if (typeof it?.name === 'string') names.add(it.name);
    if (c.kind === 'rate' && typeof c.state === 'string') names.add(c.state);
  }
  const isName = (n: string) => names.has(n);
  const memo = new WeakMap();
  const unitOf = (text: unknown): DisplayUnit[] => {
    if (typeof text !== 'string') return [];
    const p = parseExpression(text);
    const lit = p.ok ? literalOf(p.expr, isName, memo) : null;
    return lit && lit.unit.length ? [Object.freeze(lit.unit.map(([n, q]) => Object.freeze([n, q] as const)))] : [];
  };
  const states: DisplayUnit[] = [];
  const runs: DisplayUnit[] = [];
  const written: DisplayUnit[] = [];
  for (const c of cells) {
    if (c.kind === 'rate') states.push(...unitOf(`1 ${typeof c.unit === 'string' ? c.unit : ''}`));
    else if (c.kind === 'simulate') runs.push(...unitOf(c.from), ...unitOf(c.to));
    else if (c.kind === 'parameters' && Array.isArray(c.items)) for (const it of c.items) written.push(...unitOf(it?.value));
  }
  return studyUnitsOf([...states, ...runs, ...written]);
}
