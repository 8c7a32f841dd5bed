/**
 * TeX for what the printed sheet typesets, carried in the report (`tex` on rate and
 * parameters cells) so that the sheet only typesets it: each rate law as dState/dt = rate,
 * and each parameter's name and value. Symbols are read as the engine reads them: the study's
 * own names first (so a state `T` is not tesla), then constants, then units; in a parameter's
 * value, where states cannot be read, a state's name spelled like a unit is the unit (a tank
 * level `h` beside `0.9 / h`). An expression that does not parse gets no TeX (the sheet shows
 * its text).
 */
import type { Cell, Study } from '../study/types.ts';
import { NCA_RESULTS } from '../study/types.ts';
import { parseExpression } from '../expression/parse.ts';
import { nameTex, rateLawTex, symbolKinds, toTex, type SymbolKind } from '../expression/tex.ts';

/** How a symbol of the study is set: a name, a constant or a unit. */
export type KindOf = (name: string) => SymbolKind;

/** A parameter's TeX: its name, and its value when the value parses. */
export interface ItemTex {
  readonly name: string;
  readonly value?: string;
}

/** How a study's symbols are set: in rate laws (states readable) and in parameter values (states not). */
export interface StudySymbols {
  readonly law: KindOf;
  readonly value: KindOf;
}

/** The symbol kinds of a study, from the names its document defines. Cost: linear in the cells. */
export function studySymbols(study: Pick<Study, 'cells'>): StudySymbols {
  return symbolsOf(definedNames(study.cells), stateNames(study.cells));
}

function symbolsOf(defined: ReadonlySet<string>, states: ReadonlySet<string>): StudySymbols {
  return { law: symbolKinds(defined), value: symbolKinds(new Set([...defined].filter((n) => !states.has(n)))) };
}

function stateNames(cells: readonly Cell[]): Set<string> {
  return new Set(cells.flatMap((c) => (c.kind === 'rate' && typeof c.state === 'string' ? [c.state] : [])));
}

/** What `cellTex` gives. */
export type CellTex = ReturnType<typeof cellTex>;

/**
 * `cellTex` kept from one evaluation to the next: a cell's TeX is made again only when its
 * key (the caller's text of the cell) or the names the study defines change.
 */
export class KeptTex {
  private names: string | undefined;
  private symbols: StudySymbols | undefined;
  private readonly kept = new Map<string, { readonly key: string; readonly tex: CellTex }>();

  /** The study as it stands: call before `of` on each evaluation. Cost: linear in the cells. */
  study(cells: readonly Cell[]): void {
    const defined = definedNames(cells), states = stateNames(cells);
    const names = `${[...defined].join(' ')}|${[...states].join(' ')}`;
    if (names !== this.names) {
      this.names = names;
      this.symbols = symbolsOf(defined, states);
      this.kept.clear();
    }
    if (this.kept.size > cells.length) {
      const live = new Set(cells.map((c) => c.id));
      for (const id of [...this.kept.keys()]) if (!live.has(id)) this.kept.delete(id);
    }
  }

  /** The TeX of `cell`, whose content `key` stands for (equal keys, equal cells). */
  of(cell: Cell, key: string): CellTex {
    const k = this.kept.get(cell.id);
    if (k?.key === key) return k.tex;
    const tex = cellTex(cell, this.symbols!);
    this.kept.set(cell.id, { key, tex });
    return tex;
  }
}

/**
 * The `tex` a cell's report carries: the law as an equation for a rate cell, `{ name, value }`
 * by item name for a parameters cell; undefined for other kinds. Cost: a parse per expression
 * (cached by text).
 */
export function cellTex(cell: Cell, symbols: StudySymbols): string | Record<string, ItemTex> | undefined {
  if (cell.kind === 'rate') {
    const p = parseExpression(cell.rate);
    return p.ok && typeof cell.state === 'string' ? rateLawTex(cell.state, p.expr, symbols.law) : undefined;
  }
  if (cell.kind === 'parameters' && Array.isArray(cell.items)) {
    const out: Record<string, ItemTex> = {};
    for (const item of cell.items) {
      if (typeof item?.name !== 'string') continue;
      const p = parseExpression(item.value);
      out[item.name] = { name: nameTex(item.name), ...(p.ok ? { value: toTex(p.expr, symbols.value) } : {}) };
    }
    return out;
  }
  return undefined;
}

/**
 * The names a study defines, read from the document alone: parameters, states, answers,
 * estimates, data columns, profile results, and t.
 */
function definedNames(cells: readonly Cell[]): Set<string> {
  const out = new Set<string>(['t']);
  const add = (x: unknown) => { if (typeof x === 'string' && x) out.add(x); };
  for (const c of cells) {
    if (c.kind === 'parameters' && Array.isArray(c.items)) c.items.forEach((i) => add(i?.name));
    else if (c.kind === 'rate') add(c.state);
    else if (c.kind === 'simulate' && Array.isArray(c.find)) c.find.forEach((f) => add(f?.name));
    else if (c.kind === 'fit' && Array.isArray(c.estimate)) c.estimate.forEach((e) => add(e?.as));
    else if (c.kind === 'data' && Array.isArray(c.columns)) c.columns.forEach((col) => add(col?.name));
    else if (c.kind === 'nca') NCA_RESULTS.forEach((n) => add(`${typeof c.prefix === 'string' ? c.prefix : ''}${n}`));
  }
  return out;
}
