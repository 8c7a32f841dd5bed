import { html, css, nothing, unsafeCSS, type PropertyDeclarations } from 'lit';
import { live } from 'lit/directives/live.js';
import type { CsvRead, CsvReadReport, HeaderSource } from '../../src/index.ts';
import { PASTE_ROW_LIMIT, columnsFromPaste, roughRowCount } from '../../src/index.ts';
import { cellStyles, NARROW_PX, type ErrorClaims } from './common.ts';
import { CellElement, type CellDoc } from './cell-element.ts';
import { ROW_PX, type EntryEdit, type DataGridElement } from './data-grid.ts';
import { readCsvOffThread } from '../csv-client.ts';
import { csvReport, longText, toCsv, withoutRows } from './data-csv-text.ts';

type DataCellDoc = CellDoc<'data'>;
type Entry = number | string | null;
type Fresh = NonNullable<ReturnType<typeof columnsFromPaste>>;

/**
 * CSV text of more rows than this is shown as its first lines, not in a text box: a browser's
 * text box holding (or pasted) thousands of lines holds the page for a second or more. A paste
 * that makes the text this long is written by the cell, not by the browser, for that reason.
 * "Edit the whole text" opens the box all the same.
 */
const LONG_TEXT_ROWS = 1_000;

/**
 * A data cell: the measurements as a table to edit in place (a unit per column, rows added
 * and deleted; only the rows in view are drawn, `data-grid.ts`), or as CSV text pasted from a
 * spreadsheet or read from a file. CSV text becomes a table in the CSV worker, with the rows
 * read shown as it goes. Bad entries are kept as typed and flagged on their row by the
 * engine; nothing is dropped.
 */
export class DataCellElement extends CellElement<'data'> {
  static override properties: PropertyDeclarations = { problem: { state: true }, read: { state: true }, reading: { state: true }, wholeText: { state: true }, pasted: { state: true } };
  /** The rows of the text last shown, counted once per text. */
  private counted?: { text: string; rows: number };
  /** The whole of a long CSV text is shown in the text box (asked for). */
  wholeText = false;
  problem?: string;
  /** What the engine said when it last read CSV text into the table: its notes and refused rows. */
  read?: CsvReadReport;
  /** A read into a table under way: rows read so far, about how many there are, what is read. */
  reading?: { rowsRead: number; rows: number; what: string; stop: AbortController };
  /** A paste, a file or the text turned into a table gave a new cell the header's columns: the note that says so, while the cell has those columns. */
  pasted?: { note: string; columns: string };
  /** The read into a table last started, settled when it has been applied or refused (for tests). */
  converted?: Promise<void>;
  static override styles = [cellStyles, css`
    table.grid { width: auto; }
    table.grid input { width: 6.5rem; font-variant-numeric: tabular-nums; text-align: right; }
    table.grid tbody tr { height: ${unsafeCSS(ROW_PX)}px; }
    table.grid tbody td { padding-top: 0; padding-bottom: 0; vertical-align: middle; }
    table.grid tbody input { height: ${unsafeCSS(ROW_PX - 6)}px; box-sizing: border-box; }
    table.grid tr.gap td { padding: 0; }
    .long-text pre { margin: 0.3rem 0 0; padding: 0.4rem; background: #f4f6f8; border: 1px solid #9aa6b1; border-radius: 4px; font-size: 0.85rem; overflow-x: auto; }
    .reading { display: flex; gap: 0.6rem; align-items: center; }
    .reading progress { width: 14rem; }
    table.grid th input { display: block; text-align: left; margin-bottom: 2px; }
    table.grid th input:first-child { font-weight: 600; }
    tr.flagged td { background: #fdeceb; }
    @media ${unsafeCSS(`(max-width: ${NARROW_PX}px)`)} { table.grid input { width: 5.5rem; } }
    textarea { width: 100%; min-height: 7rem; box-sizing: border-box; font-family: ui-monospace, monospace; font-size: 0.85rem; }
    .scroll { overflow-x: auto; max-height: 26rem; overflow-y: auto; }
    ul.csv-notes, ol.csv-rows { margin: 0.3rem 0 0; padding-left: 1.2rem; }
    ol.csv-rows { list-style: none; padding-left: 0; }
    .columns .column input { width: 6.5rem; margin-right: 0.2rem; }
    ol.csv-rows code { background: #fdeceb; padding: 0 0.2rem; }
  `];

  override willUpdate(): void {
    // the note goes with the columns it speaks of (gone after an undo, or a column renamed)
    if (this.pasted && this.pasted.columns !== JSON.stringify(this.cell.columns)) this.pasted = undefined;
  }

  override render() {
    const c = this.cell;
    const claims = this.claims;
    const columns = Array.isArray(c.columns) ? c.columns : [];
    // a bad row's error is on its path (the table's rows are flagged; CSV text has its own view)
    const flagged = new Map<number, string>();
    for (const e of this.report?.errors ?? (this.report?.error ? [this.report.error] : [])) {
      const m = /\.rows\[(\d+)\]/.exec(e.path);
      if (m) flagged.set(Number(m[1]), e.message);
    }
    return html`
      ${c.csv !== undefined ? this.csvView(claims) : html`
        <data-grid .names=${columns.map((col) => col.name)} .heads=${columns.map((_, j) => this.column(j, claims))} .rows=${c.rows ?? []} .flagged=${flagged}
          @entry=${(e: CustomEvent<EntryEdit>) => this.setEntry(e.detail.row, e.detail.column, e.detail.text)}
          @delete-row=${(e: CustomEvent<number>) => this.deleteRow(e.detail)}></data-grid>
        <div class="row">
          <button @click=${this.addRow}>Add a row</button>
          <button @click=${this.addColumn}>Add a column</button>
          <button @click=${() => this.replace({ ...withoutRows(c), csv: toCsv(c) })}>Edit as CSV text</button>
          ${this.importControl()}
        </div>`}
      ${this.reading ? this.progress(this.reading) : nothing}
      ${c.csv === undefined && (this.read || this.pasted) ? csvReport(this.withPasteNote(this.read), 'Read from the CSV text') : nothing}
      ${this.report?.ok ? html`<p class="muted">${this.report.rowCount} rows${this.report.note ? `; ${this.report.note}` : ''}.</p>` : nothing}
      ${this.problem ? html`<p class="foot-error" role="alert">${this.problem}</p>` : nothing}
      ${this.footErrors()}`;
  }

  /** A column's name and unit, as inputs, with the engine's error on them. */
  private column(j: number, claims: ErrorClaims) {
    const col = this.cell.columns[j];
    const error = claims.take(`.columns[${j}].unit`) ?? claims.take(`.columns[${j}].name`);
    return html`<input type="text" data-field="columns[${j}].name" aria-label="Name of column ${j + 1}" .value=${col.name ?? ''} @change=${(e: Event) => this.setColumn(j, { name: (e.target as HTMLInputElement).value })} />
      <input type="text" data-field="columns[${j}].unit" aria-label="Unit of column ${col.name || j + 1}" .value=${col.unit ?? ''} @change=${(e: Event) => this.setColumn(j, { unit: (e.target as HTMLInputElement).value })} />
      ${error ? html`<div class="foot-error">${error.message}</div>` : nothing}`;
  }

  private csvView(claims: ErrorClaims) {
    const error = claims.take('.csv');
    const columns = Array.isArray(this.cell.columns) ? this.cell.columns : [];
    const read = (this.read?.problems?.length ? this.read : undefined) ?? this.report?.csv;
    return html`<label class="muted" for="csv">CSV text: a header row of column names (a unit may follow in parentheses, such as Temp (°C)), then one row per time, as a number or a clock time (comma, tab or semicolon separated; paste straight from a spreadsheet or a logger export)</label>
      <div class="row columns"><span class="lbl">Columns</span>${columns.map((_, j) => html`<span class="column">${this.column(j, claims)}</span>`)}</div>
      ${this.textBox(this.cell.csv ?? '')}
      ${error && !read?.problems?.length ? html`<p class="foot-error" role="alert">${error.message}</p>` : nothing}
      ${read || this.pasted ? csvReport(this.withPasteNote(read), 'Read from the header and rows') : nothing}
      <div class="row"><button class="to-table" @click=${this.toTable} ?disabled=${!!this.reading}>Turn into a table</button>
        ${this.importControl()}</div>`;
  }

  /** The engine's notes of a read, after the note of a paste that gave the cell its columns. */
  private withPasteNote(read: CsvReadReport | undefined): CsvReadReport {
    const notes = [...(this.pasted ? [this.pasted.note] : []), ...(read?.notes ?? [])];
    return { ...(read ?? {}), notes };
  }

  /** The CSV text in a box to edit, or, when long, its first lines and the count of the rest. */
  private textBox(csv: string) {
    if (this.counted?.text !== csv) this.counted = { text: csv, rows: roughRowCount(csv) };
    const rows = this.counted.rows;
    if (this.wholeText || rows <= LONG_TEXT_ROWS) {
      return html`<textarea id="csv" data-field="csv" spellcheck="false" .value=${live(csv)} @paste=${this.onPaste} @input=${(e: Event) => this.editCsv((e.target as HTMLTextAreaElement).value)}></textarea>`;
    }
    return longText(csv, rows, () => { this.wholeText = true; });
  }

  private importControl() {
    return html`<label>Import a CSV file <input type="file" accept=".csv,text/csv,text/plain" ?disabled=${!!this.reading} @change=${this.importFile} /></label>`;
  }

  /** A read under way: a progress bar of the rows read, and a way to stop it (nothing changes then). */
  private progress(r: NonNullable<DataCellElement['reading']>) {
    const words = `${r.what}: ${r.rowsRead.toLocaleString('en-US')} of about ${r.rows.toLocaleString('en-US')} rows read`;
    return html`<div class="row reading"><progress max=${Math.max(1, r.rows)} .value=${Math.min(r.rowsRead, r.rows)} aria-label=${r.what}></progress>
      <span role="status">${words}</span><button class="quiet" @click=${() => r.stop.abort()}>Stop</button></div>`;
  }

  override disconnectedCallback(): void {
    super.disconnectedCallback();
    this.reading?.stop.abort();
  }

  /**
   * A paste into the CSV text. Past `PASTE_ROW_LIMIT` rows it is refused with a message that
   * points to the file import (the text stays as it was; the paste is still on the clipboard).
   * A long paste is written into the box by the cell (the same text where the browser would
   * put it), as one edit: the browser's own paste of a long text holds the page for seconds.
   */
  private onPaste = (e: ClipboardEvent) => {
    const text = e.clipboardData?.getData('text/plain');
    if (!text) return;
    const rows = roughRowCount(text);
    if (rows > PASTE_ROW_LIMIT) {
      e.preventDefault();
      this.problem = `This paste holds about ${rows.toLocaleString('en-US')} rows; a paste into the text holds at most ${PASTE_ROW_LIMIT.toLocaleString('en-US')}. Save it as a CSV file and use "Import a CSV file", which reads it straight into the table. The text here is unchanged.`;
      return;
    }
    const area = e.target as HTMLTextAreaElement;
    const value = area.value.slice(0, area.selectionStart) + text + area.value.slice(area.selectionEnd);
    // a new, empty cell takes the header's columns with the text: one edit, one undo
    const fresh = columnsFromPaste(this.cell, value);
    if (fresh) {
      e.preventDefault();
      this.problem = undefined;
      this.read = undefined;
      this.pasted = { note: fresh.note, columns: JSON.stringify(fresh.columns) };
      if (value === text) this.counted = { text, rows };
      this.replace({ ...this.cell, csv: value, columns: fresh.columns });
      return;
    }
    if (rows <= LONG_TEXT_ROWS && roughRowCount(value) <= LONG_TEXT_ROWS) return;
    e.preventDefault();
    this.problem = undefined;
    this.wholeText = false;
    // the text replaced whole (the usual paste): its rows are the paste's, counted once
    if (value === text) this.counted = { text, rows };
    this.editCsv(value);
    // focus moves in the next frame: here it would lay the page out inside the paste's task
    void this.updateComplete.then(() => requestAnimationFrame(() => (this.shadowRoot?.querySelector('button.to-table') as HTMLButtonElement | null)?.focus()));
  };

  private editCsv(csv: string) {
    this.read = undefined;
    if (this.problem?.startsWith('This paste holds')) this.problem = undefined;
    this.edit({ csv }, 'csv');
  }

  private setColumn(j: number, patch: Partial<DataCellDoc['columns'][number]>) {
    this.edit({ columns: this.cell.columns.map((c, i) => (i === j ? { ...c, ...patch } : c)) });
  }

  private setEntry(r: number, j: number, text: string) {
    const t = text.trim();
    const v: Entry = t === '' ? null : Number.isFinite(Number(t)) ? Number(t) : t;
    const rows = (this.cell.rows ?? []).map((row, i) => (i === r ? row.map((x, k) => (k === j ? v : x)) : row));
    // text is kept as typed (the document's type says numbers): the engine flags its row
    this.replace({ ...this.cell, rows } as DataCellDoc);
  }

  private addRow = () => {
    const r = (this.cell.rows ?? []).length;
    this.edit({ rows: [...(this.cell.rows ?? []), this.cell.columns.map(() => null)] });
    // the table draws its rows itself (a window of them): it is asked to draw and focus the new one
    this.focusWhenShown('data-grid', (grid) => (grid as DataGridElement).focusEntry(r, 0));
  };

  private deleteRow(r: number) {
    this.edit({ rows: (this.cell.rows ?? []).filter((_, i) => i !== r) });
  }

  private addColumn = () => {
    const n = this.cell.columns.length + 1;
    this.edit({ columns: [...this.cell.columns, { name: `c${n}`, unit: '1' }], rows: (this.cell.rows ?? []).map((row) => [...row, null]) });
    this.focusWhenShown(`input[data-field="columns[${n - 1}].name"]`);
  };

  /**
   * The CSV text as a table, read by the engine's CSV reader in the CSV worker (its columns,
   * with the header's units, and rows); the engine's notes stay shown. A problem is shown and
   * nothing changes; so too when the text was changed while it was read.
   */
  private toTable = () => {
    const text = this.cell.csv ?? '';
    this.convert(text, 'Turning the text into a table', 'text', (r, fresh) => {
      if ((this.cell.csv ?? '') !== text) {
        this.problem = 'The text changed while it was being read, so nothing was turned into a table: press "Turn into a table" again.';
        return;
      }
      this.showRead(r);
      if (r.ok) this.adopt(r, fresh);
    });
  };

  /**
   * A CSV file read straight into the table, in the CSV worker. If it cannot be read, its
   * refused rows are listed and, up to `PASTE_ROW_LIMIT` rows, its text is put in the cell's
   * CSV text to correct; a longer file leaves the cell as it was.
   */
  private importFile = async (e: Event) => {
    const input = e.target as HTMLInputElement;
    const file = input.files?.[0];
    if (!file) return;
    const text = await file.text();
    input.value = '';
    this.convert(text, `Reading ${file.name}`, 'file', (r, fresh) => {
      this.showRead(r);
      if (r.ok) return this.adopt(r, fresh);
      if (roughRowCount(text) > PASTE_ROW_LIMIT) return;
      if (fresh) this.took(fresh.note, fresh.columns);
      this.replace({ ...withoutRows(this.cell), csv: text, ...(fresh ? { columns: fresh.columns } : {}) });
    });
  };

  /**
   * Reads `text` in the CSV worker with progress shown, then hands the read to `done` (not when
   * stopped). A new, empty cell takes the header's columns (`columnsFromPaste`, as a paste does),
   * which the worker then reads by name; `fresh` gives them and their note.
   */
  private convert(text: string, what: string, from: HeaderSource, done: (r: CsvRead, fresh?: Fresh) => void): void {
    if (this.reading) return;
    const stop = new AbortController();
    const reading = { rowsRead: 0, rows: this.counted?.text === text ? this.counted.rows : roughRowCount(text), what, stop };
    this.reading = reading;
    this.problem = undefined;
    const fresh = columnsFromPaste(this.cell, text, from);
    this.converted = readCsvOffThread(text, fresh?.columns ?? this.cell.columns ?? [], (rowsRead) => { this.reading = { ...reading, rowsRead }; }, stop.signal).then((r) => {
      this.reading = undefined;
      if (r) done(r, fresh);
    });
  }

  private showRead(r: CsvRead): void {
    this.read = { notes: r.notes, ...(r.ok ? {} : { problems: r.problems }) };
    this.problem = r.ok || r.problems.length ? undefined : r.message;
  }

  /** The read table in place of the cell's text or rows: one edit (with the header's columns' note when it took them). */
  private adopt(r: Extract<CsvRead, { ok: true }>, fresh?: Fresh): void {
    const { csv: _csv, ...rest } = this.cell;
    const columns = r.columns.map((col) => ({ name: col.name, unit: col.unit }));
    if (fresh) this.took(fresh.note, columns);
    this.replace({ ...rest, columns, rows: r.rows } as DataCellDoc);
  }

  /** The note that the cell took a header's columns, kept while it has them. */
  private took(note: string, columns: DataCellDoc['columns']): void {
    this.pasted = { note, columns: JSON.stringify(columns) };
  }
}

customElements.define('data-cell', DataCellElement);
