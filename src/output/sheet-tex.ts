/**
 * TeX for what the printed sheet typesets: each rate law as dState/dt = rate, and each
 * parameter's value. Symbols are read as the engine reads them: the study's own names first
 * (so a state `T` is not tesla), then constants, then units; in a parameter's value, where
 * states cannot be read, a state's name spelled like a unit is the unit (a tank level `h`
 * beside `0.9 / h`). An expression that does not parse gets no TeX (the sheet shows its text).
 */
import type { Study } from '../study/types.ts';
import { NCA_RESULTS } from '../study/types.ts';
import { parseExpression } from '../expression/parse.ts';
import { rateLawTex, symbolKinds, toTex } from '../expression/tex.ts';

export interface StudyTex {
  /** By rate cell id: the law as an equation. */
  readonly rates: ReadonlyMap<string, string>;
  /** By `cellId/name`: a parameter's value. */
  readonly values: ReadonlyMap<string, string>;
}

export function studyTex(study: Study): StudyTex {
  const defined = definedNames(study);
  const kindOf = symbolKinds(defined);
  const states = new Set(study.cells.flatMap((c) => (c.kind === 'rate' && typeof c.state === 'string' ? [c.state] : [])));
  const valueKindOf = symbolKinds(new Set([...defined].filter((n) => !states.has(n))));
  const rates = new Map<string, string>();
  const values = new Map<string, string>();
  for (const cell of study.cells) {
    if (cell.kind === 'rate') {
      const p = parseExpression(cell.rate);
      if (p.ok && typeof cell.state === 'string') rates.set(cell.id, rateLawTex(cell.state, p.expr, kindOf));
    } else if (cell.kind === 'parameters' && Array.isArray(cell.items)) {
      for (const item of cell.items) {
        const p = parseExpression(item?.value);
        if (p.ok && typeof item.name === 'string') values.set(`${cell.id}/${item.name}`, toTex(p.expr, valueKindOf));
      }
    }
  }
  return { rates, values };
}

/**
 * The names a study defines, read from the document alone (the sheet's code does not load the
 * cell builders): parameters, states, answers, estimates, data columns, profile results, and t.
 */
function definedNames(study: Study): Set<string> {
  const out = new Set<string>(['t']);
  const add = (x: unknown) => { if (typeof x === 'string' && x) out.add(x); };
  for (const c of study.cells) {
    if (c.kind === 'parameters' && Array.isArray(c.items)) c.items.forEach((i) => add(i?.name));
    else if (c.kind === 'rate') add(c.state);
    else if (c.kind === 'simulate' && Array.isArray(c.find)) c.find.forEach((f) => add(f?.name));
    else if (c.kind === 'fit' && Array.isArray(c.estimate)) c.estimate.forEach((e) => add(e?.as));
    else if (c.kind === 'data' && Array.isArray(c.columns)) c.columns.forEach((col) => add(col?.name));
    else if (c.kind === 'nca') NCA_RESULTS.forEach((n) => add(`${typeof c.prefix === 'string' ? c.prefix : ''}${n}`));
  }
  return out;
}
