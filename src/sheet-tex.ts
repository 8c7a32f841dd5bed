/**
 * TeX for what the printed sheet typesets: each rate law as dState/dt = rate, and each
 * parameter's value. Symbols are read as the engine reads them: the study's own names first
 * (so a state `T` is not tesla), then constants, then units. An expression that does not
 * parse gets no TeX (the sheet shows its text).
 */
import type { Study } from './study/types.ts';
import { buildCellNodes } from './cells/index.ts';
import { parseExpression } from './expression/parse.ts';
import { rateLawTex, symbolKinds, toTex } from './expression/tex.ts';

export interface StudyTex {
  /** By rate cell id: the law as an equation. */
  readonly rates: ReadonlyMap<string, string>;
  /** By `cellId/name`: a parameter's value. */
  readonly values: ReadonlyMap<string, string>;
}

export function studyTex(study: Study): StudyTex {
  const defined = new Set<string>();
  for (const cell of study.cells) {
    for (const node of buildCellNodes(cell)) for (const d of node.defines) if (!d.name.startsWith('#')) defined.add(d.name);
  }
  defined.add('t');
  const kindOf = symbolKinds(defined);
  const rates = new Map<string, string>();
  const values = new Map<string, string>();
  for (const cell of study.cells) {
    if (cell.kind === 'rate') {
      const p = parseExpression(cell.rate);
      if (p.ok && typeof cell.state === 'string') rates.set(cell.id, rateLawTex(cell.state, p.expr, kindOf));
    } else if (cell.kind === 'parameters' && Array.isArray(cell.items)) {
      for (const item of cell.items) {
        const p = parseExpression(item?.value);
        if (p.ok && typeof item.name === 'string') values.set(`${cell.id}/${item.name}`, toTex(p.expr, kindOf));
      }
    }
  }
  return { rates, values };
}
