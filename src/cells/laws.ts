/** The rate laws a simulate or fit cell integrates: the ones it names, then those whose states they read, transitively. */
import type { Binding, Law, RunContext } from '../engine/node.ts';
import { cellRef } from '../engine/node.ts';
import { FieldError } from './fields.ts';

/** The laws of the rate cells `ids` (at `path`) and of the cells whose states they read. */
export function collectLaws(ids: readonly string[], path: string, ctx: RunContext): Law[] {
  const laws: Law[] = [];
  const seen = new Set<string>();
  const add = (id: string, at: string) => {
    if (seen.has(id)) return;
    const b = ctx.binding(cellRef(id));
    if (b?.kind !== 'law') throw new FieldError({ kind: 'invalid', path: at, message: `cell "${id}" is not a rate cell` });
    seen.add(id);
    laws.push((b as Extract<Binding, { kind: 'law' }>).law);
  };
  ids.forEach((id, i) => add(id, `${path}[${i}]`));
  for (let i = 0; i < laws.length; i++) for (const [, owner] of laws[i].states) add(owner, path);
  return laws;
}
