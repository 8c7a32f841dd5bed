/**
 * A data cell's CSV text as the cell shows it: the engine's notes and refused rows of a read,
 * the first lines of a long text, and the table written back as text ("Edit as CSV text").
 * Rendering and text only; the reading is the engine's.
 */
import { html, nothing } from 'lit';
import type { CsvReadReport } from '../../src/index.ts';
import type { CellDoc } from './cell-element.ts';

type DataCellDoc = CellDoc<'data'>;
type Entry = number | string | null;

/** Lines of a long text shown. */
const PREVIEW_LINES = 8;

/** The engine's report of reading CSV text, under a heading: notes, the start of clock times, refused rows. */
export function csvReport(read: CsvReadReport, heading: string) {
  return html`${read.notes.length ? html`<p class="muted">${heading}:</p><ul class="csv-notes muted">${read.notes.map((n) => html`<li>${n}</li>`)}</ul>` : nothing}
    ${read.problems?.length ? html`<ol class="csv-rows" role="alert">${read.problems.map((p) => html`<li class="foot-error">Row ${p.row} (line ${p.line}) <code>${p.text}</code>: ${p.message}</li>`)}</ol>` : nothing}`;
}

/** A long CSV text of `rows` rows as its first lines and the count of the rest, with a button to open it whole (`openWhole`). */
export function longText(csv: string, rows: number, openWhole: () => void) {
  return html`<div class="long-text" data-field="csv" role="group" aria-label="CSV text, its first lines">
    <pre>${firstLines(csv, PREVIEW_LINES)}</pre>
    <p class="muted">… about ${(rows + 1 - PREVIEW_LINES).toLocaleString('en-US')} more lines (${rows.toLocaleString('en-US')} rows, ${Math.ceil(csv.length / 1024).toLocaleString('en-US')} KB of text).
      <button class="quiet" @click=${openWhole}>Edit the whole text</button> (a long text makes the page slow while it is open)</p></div>`;
}

/** The first `n` lines of `text` (found without splitting the rest). */
export function firstLines(text: string, n: number): string {
  let at = -1;
  for (let k = 0; k < n && (k === 0 || at >= 0); k++) at = text.indexOf('\n', at + 1);
  return at < 0 ? text : text.slice(0, at);
}

function show(v: Entry): string {
  return v === null || v === undefined ? '' : String(v);
}

/** The cell without its rows (the CSV text then holds them). */
export function withoutRows(c: DataCellDoc): Omit<DataCellDoc, 'rows'> {
  const { rows: _rows, ...rest } = c;
  return rest;
}

/** The cell's table as CSV text: a header of its names, a line per row, empty entries left empty. */
export function toCsv(c: DataCellDoc): string {
  const head = c.columns.map((x) => x.name).join(',');
  return [head, ...(c.rows ?? []).map((r) => r.map((v) => show(v as Entry)).join(','))].join('\n');
}
