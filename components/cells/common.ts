/**
 * What every cell element shares: errors looked up by field path, the study's names for the
 * expression fields, the edit event, and the shared styles. Look-ups only; no computation.
 */
import { css, html, nothing, unsafeCSS } from 'lit';
import type { Cell, CellError, ParameterValue, PlotScale, Report, ReportBase, ReportQuantity } from '../../src/index.ts';
import { fieldWords, formatNumber, problemWords, unitAfterNumber, waitedOn, waitWords, UNCERTAINTY_ENDINGS } from '../../src/index.ts';
import type { ReportsOf } from '../../src/index.ts';
import type { StudyName } from '../expr-field.ts';

/** A cell element's request to change its cell. */
export interface CellEditDetail {
  readonly cell: unknown;
  /** Edits with the same key in a row are one undo step (typing in one field). */
  readonly mergeKey?: string;
}

export function editEvent(cell: unknown, mergeKey?: string): CustomEvent<CellEditDetail> {
  return new CustomEvent('cell-edit', { detail: { cell, mergeKey }, bubbles: true, composed: true });
}

/** What the words of a cell's messages are made from: the study's document and report, and the cell's id. */
export interface WordsContext {
  readonly doc: { readonly cells: readonly Cell[] };
  readonly report: ReportsOf;
  readonly self: string;
}

/**
 * Hands out the cell's errors by field path (relative, like `.items[0].value`), in words; what
 * is left is shown at the cell's foot. A wait is not handed to its fields: the cell says it
 * once (`waits()`). Without a context (no document yet) the messages are the engine's own.
 */
export class ErrorClaims {
  private readonly byPath = new Map<string, CellError>();
  private readonly claimed = new Set<string>();
  private readonly all: CellError[];

  constructor(report: Pick<ReportBase, 'error' | 'errors'> | undefined, private readonly words?: WordsContext) {
    this.all = report?.errors ?? (report?.error ? [report.error] : []);
    for (const e of this.all) {
      if (e.kind === 'waits' && e.waitsOn !== undefined) continue;
      const rel = e.path.replace(/^cells\[\d+\]/, '');
      if (!this.byPath.has(rel)) this.byPath.set(rel, e);
    }
  }

  /** The error on that field, if any; the field shows it, so the foot does not. */
  take(rel: string): { message: string; span?: [number, number] } | undefined {
    const e = this.byPath.get(rel);
    if (!e) return undefined;
    this.claimed.add(rel);
    return { message: this.message(e), ...(e.span ? { span: [e.span[0], e.span[1]] as [number, number] } : {}) };
  }

  /** Errors no field took, in order, each with its place and message in words. */
  rest(): Array<{ place: string; message: string }> {
    return [...this.byPath].filter(([rel]) => !this.claimed.has(rel)).map(([, e]) => ({ place: this.place(e.path), message: this.message(e) }));
  }

  /** The cell's waits, one sentence per cell waited on ("waits on Fit "k": ..."), its own cell left out. */
  waits(): string[] {
    const ids = waitedOn(this.all).filter((id) => id !== this.words?.self);
    return ids.map((id) => (this.words ? waitWords(this.words.doc, this.words.report, id, this.all) : `waits on cell "${id}"`));
  }

  private message(e: CellError): string {
    return this.words ? problemWords(this.words.doc, this.words.report, e) : e.message;
  }

  private place(path: string): string {
    return this.words ? fieldWords(this.words.doc, path, false) : path;
  }
}

/** An error shown under the field or result it belongs to, or nothing. */
export function footError(e: { message: string } | undefined) {
  return e ? html`<div class="foot-error" role="alert">${e.message}</div>` : nothing;
}

/** A reported value as text: yes or no for a condition (`truth`), else as showQ does. */
export function showValue(q: ParameterValue | ReportQuantity | undefined, digits = 4): string {
  return q && 'truth' in q && typeof q.truth === 'boolean' ? (q.truth ? 'yes' : 'no') : showQ(q, digits);
}

/**
 * A name that may wrap after its underscores and nowhere else it can help (`t90_<wbr>in_<wbr>half_<wbr>lives`),
 * for a narrow name column; the text is unchanged.
 */
export function nameBreaks(name: string): string | ReturnType<typeof html> {
  const parts = name.split(/(?<=_)(?=.)/);
  return parts.length < 2 ? name : html`${parts.map((p, i) => (i ? html`<wbr>${p}` : p))}`;
}

/** A quantity as text: 4 significant figures and its unit. */
export function showQ(q: ReportQuantity | undefined, digits = 4): string {
  if (!q) return '';
  const v = formatNumber(q.value, digits);
  return q.unit ? `${v} ${unitAfterNumber(q.unit)}` : v;
}

const namesCache = new WeakMap<Report, { doc?: object; names: StudyName[] }>();

/**
 * The study's names with their current values, for completion, colouring and the name tooltip
 * (one list per report and document). Names the document defines that have no value now (their
 * cell failed or waits) are listed too, with no value: the engine still reads them as the
 * study's, so `V` stays the volume, not the volt.
 */
export function namesOf(report: Report | undefined, doc?: { readonly cells: readonly Cell[] }): StudyName[] {
  if (!report) return [];
  let hit = namesCache.get(report);
  if (!hit || hit.doc !== doc) {
    hit = { doc, names: collectNames(report, doc) };
    namesCache.set(report, hit);
  }
  return hit.names;
}

function collectNames(report: Report, doc?: { readonly cells: readonly Cell[] }): StudyName[] {
  const out: StudyName[] = [];
  for (const c of report?.cells ?? []) {
    for (const [name, q] of Object.entries(c.values ?? {})) out.push({ name, detail: showValue(q) });
    if (c.kind === 'simulate') for (const [name, q] of Object.entries(c.results ?? {})) if (!('notReached' in q)) out.push({ name, detail: showValue(q) });
    // a comparison's answers, one per question and scenario (src/cells/compare.ts)
    if (c.kind === 'compare') for (const s of c.scenarios ?? []) for (const [q, a] of Object.entries(s.results)) if (!('notReached' in a)) out.push({ name: `${q}_${s.name}`, detail: `${showQ(a)} (${q} under ${s.name})` });
    for (const [name, e] of Object.entries(c.estimates ?? {})) {
      out.push({ name, detail: `${showQ(e.value)} (fitted)` });
      // its standard error and 95% bounds, names too (src/cells/fit-uncertainty.ts)
      if (e.standardError) out.push({ name: `${name}${UNCERTAINTY_ENDINGS.standardError}`, detail: `${showQ(e.standardError)} (standard error of ${name})` });
      if (e.ci95) out.push({ name: `${name}${UNCERTAINTY_ENDINGS.lower}`, detail: `${showQ(e.ci95[0])} (95% lower bound of ${name})` },
        { name: `${name}${UNCERTAINTY_ENDINGS.upper}`, detail: `${showQ(e.ci95[1])} (95% upper bound of ${name})` });
    }
    if (c.state !== undefined && c.initial) out.push({ name: c.state, detail: `state, starts at ${showQ(c.initial)}`, state: true });
  }
  const known = new Set(out.map((n) => n.name));
  const add = (name: unknown, state = false) => {
    if (typeof name === 'string' && name && !known.has(name)) { known.add(name); out.push(state ? { name, state } : { name }); }
  };
  for (const c of doc?.cells ?? []) {
    if (c.kind === 'parameters' && Array.isArray(c.items)) for (const i of c.items) add(i?.name);
    if (c.kind === 'rate') add(c.state, true);
    if (c.kind === 'simulate' && Array.isArray(c.find)) for (const f of c.find) add(f?.name);
    if (c.kind === 'fit' && Array.isArray(c.estimate)) {
      for (const e of c.estimate) if (typeof e?.as === 'string') for (const end of ['', ...Object.values(UNCERTAINTY_ENDINGS)]) add(`${e.as}${end}`);
    }
  }
  return out;
}

/**
 * The width (CSS px) below which a cell's tables become stacked blocks, one per row: a phone.
 * A tablet (820 px) keeps the columns.
 */
export const NARROW_PX = 700;
const narrow = unsafeCSS(`(max-width: ${NARROW_PX}px)`);

/**
 * A table of rows the user edits, stacked: each row a block whose cells wrap side by side, each
 * under its own heading (its `data-label`), the remove button (`td.remove`) at the block's top
 * right, a `td.wide` on a line of its own. For `table.stack` on a phone, `table.stack-always`
 * everywhere.
 */
function stacked(table: string) {
  return unsafeCSS(`
    ${table}, ${table} tbody { display: block; }
    .scroll:has(> ${table}) { overflow-x: visible; }
    ${table} thead { display: none; }
    ${table} tr { display: flex; flex-wrap: wrap; align-items: flex-end; gap: 0.3rem 0.6rem; padding: 0.45rem 2.2rem 0.45rem 0; border-bottom: 1px solid #d5dbe0; position: relative; }
    ${table} td { display: block; flex: 1 1 7.5rem; min-width: 0; padding: 0; }
    ${table} td[data-label]::before { content: attr(data-label); display: block; font-size: 0.75rem; color: #4a5560; margin-bottom: 0.1rem; }
    ${table} td.remove { position: absolute; top: 0.45rem; right: 0; }
    ${table} td.wide { flex-basis: 100%; }
    ${table} td.result { white-space: normal; }
    ${table} input[type='text'], ${table} select { width: 100%; box-sizing: border-box; }
    ${table} expr-field { min-width: 0; }`);
}

export const cellStyles = css`
  :host { display: block; }
  .row { display: flex; flex-wrap: wrap; gap: 0.5rem 0.9rem; align-items: center; margin: 0.35rem 0; }
  label { font-size: 0.85rem; color: #3b4650; }
  .lbl { font-size: 0.85rem; color: #3b4650; min-width: 4.5rem; }
  expr-field { flex: 1 1 12rem; min-width: 10rem; }
  /* narrower fields by class: the content security policy refuses style attributes */
  expr-field.w7 { flex: 0 1 7rem; }
  expr-field.w8 { flex: 0 1 8rem; }
  expr-field.w9 { flex: 0 1 9rem; }
  expr-field.w10 { flex: 0 1 10rem; }
  table.fit-width { width: auto; }
  caption.start { text-align: left; }
  input[type='text'], input[type='number'], select, textarea { font: inherit; padding: 0.25rem 0.4rem; border: 1px solid #9aa6b1; border-radius: 4px; background: #fff; color: #1c2329; }
  input:focus-visible, select:focus-visible, textarea:focus-visible, button:focus-visible { outline: 2px solid #1d5fa8; outline-offset: 1px; }
  /* line-height 1.3: at a label's 0.85rem the monospace underscore fell below an input's line box and k_min read "k min" */
  input[type='text'], input[type='number'] { line-height: 1.3; }
  input.name { width: 7rem; font-family: ui-monospace, monospace; }
  /* a name box grows with its name up to 17rem where the browser can size a field to its text; past that the name scrolls and is the box's title */
  @supports (field-sizing: content) { input.name { field-sizing: content; width: auto; min-width: 7rem; max-width: min(100%, 17rem); } }
  button { font: inherit; font-size: 0.85rem; padding: 0.2rem 0.6rem; border: 1px solid #8795a1; border-radius: 4px; background: #f3f5f7; color: #1c2329; cursor: pointer; }
  button:hover { background: #e4e9ee; }
  button.quiet { border-color: transparent; background: transparent; }
  /* a cell still computing (pending-line.ts): its previous figures in grey (still readable), its charts faded */
  .result { font-variant-numeric: tabular-nums; color: var(--stale-color, #0f3d6b); white-space: nowrap; }
  .figures { color: var(--stale-color, inherit); }
  .figures svg { opacity: var(--stale-opacity, 1); }
  .foot-error { color: #a3211a; margin: 0.3rem 0 0; font-size: 0.9rem; }
  .path { font-family: ui-monospace, monospace; font-size: 0.8rem; }
  table { border-collapse: collapse; width: 100%; }
  th { text-align: left; font-size: 0.8rem; font-weight: 600; color: #3b4650; padding: 0.2rem 0.4rem; border-bottom: 1px solid #d5dbe0; }
  td { padding: 0.2rem 0.4rem; vertical-align: top; }
  td.num { text-align: right; font-variant-numeric: tabular-nums; }
  .summary { color: #2b3640; font-size: 0.92rem; margin: 0.4rem 0; }
  .muted { color: #5b6670; font-size: 0.85rem; }
  .sr { position: absolute; width: 1px; height: 1px; overflow: hidden; clip: rect(0 0 0 0); white-space: nowrap; }
  select { max-width: 100%; }
  label:has(select) { max-width: 100%; }
  @media ${narrow} { ${stacked('table.stack')} }
  ${stacked('table.stack-always')}
  @media print { button, select, input[type='range'] { display: none !important; } }
`;

/** A stored axis choice that is neither linear nor log: the message, and the two choices to pick from. */
export function plotScaleError(error: { message: string } | undefined, pick: (scale: PlotScale) => void) {
  return error ? html`<p class="foot-error">Plot scale: ${error.message}
    <button @click=${() => pick('linear')}>Draw it on a linear axis</button> <button @click=${() => pick('log')}>Draw it on a log axis</button></p>` : nothing;
}

/** The cell with its plot's axis choice (no field for linear, the default). */
export function withPlotScale<T extends { plotScale?: unknown }>(cell: T, scale: PlotScale): T {
  const { plotScale: _old, ...rest } = cell;
  return (scale === 'log' ? { ...rest, plotScale: 'log' } : rest) as T;
}
