import { html, css, nothing, type PropertyDeclarations } from 'lit';
import type { CsvReadReport } from '../../src/index.ts';
import { tableFromCsv } from '../../src/index.ts';
import { cellStyles, type ErrorClaims } from './common.ts';
import { CellElement, type CellDoc } from './cell-element.ts';

type DataCellDoc = CellDoc<'data'>;
type Entry = number | string | null;

/**
 * A data cell: the measurements as a table to edit in place (a unit per column, rows added
 * and deleted), or as CSV text pasted from a spreadsheet or read from a file. Bad entries are
 * kept as typed and flagged on their row by the engine; nothing is dropped.
 */
export class DataCellElement extends CellElement<'data'> {
  static override properties: PropertyDeclarations = { problem: { state: true }, read: { state: true } };
  problem?: string;
  /** What the engine said when it last read CSV text into the table: its notes and refused rows. */
  read?: CsvReadReport;
  static override styles = [cellStyles, css`
    table.grid { width: auto; }
    table.grid input { width: 6.5rem; font-variant-numeric: tabular-nums; text-align: right; }
    table.grid th input { display: block; text-align: left; margin-bottom: 2px; }
    table.grid th input:first-child { font-weight: 600; }
    tr.flagged td { background: #fdeceb; }
    textarea { width: 100%; min-height: 7rem; box-sizing: border-box; font-family: ui-monospace, monospace; font-size: 0.85rem; }
    .scroll { overflow-x: auto; max-height: 26rem; overflow-y: auto; }
    ul.csv-notes, ol.csv-rows { margin: 0.3rem 0 0; padding-left: 1.2rem; }
    ol.csv-rows { list-style: none; padding-left: 0; }
    .columns .column input { width: 6.5rem; margin-right: 0.2rem; }
    ol.csv-rows code { background: #fdeceb; padding: 0 0.2rem; }
  `];

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
        <div class="scroll"><table class="grid">
          <thead><tr><th></th>${columns.map((col, j) => html`<th>${this.column(j, claims)}</th>`)}<th></th></tr></thead>
          <tbody>${(c.rows ?? []).map((row, r) => html`<tr class=${flagged.has(r) ? 'flagged' : ''} title=${flagged.get(r) ?? ''}>
            <td class="muted">${r + 1}</td>
            ${columns.map((col, j) => html`<td><input type="text" inputmode="decimal" data-field="rows" aria-label="Row ${r + 1}, ${col.name}" .value=${show(row[j] as Entry)}
              @change=${(e: Event) => this.setEntry(r, j, (e.target as HTMLInputElement).value)} /></td>`)}
            <td><button class="quiet" aria-label="Delete row ${r + 1}" @click=${() => this.deleteRow(r)}>✕</button></td>
          </tr>`)}</tbody>
        </table></div>
        <div class="row">
          <button @click=${this.addRow}>Add a row</button>
          <button @click=${this.addColumn}>Add a column</button>
          <button @click=${() => this.replace({ ...withoutRows(c), csv: toCsv(c) })}>Edit as CSV text</button>
          <label>Import a CSV file <input type="file" accept=".csv,text/csv,text/plain" @change=${this.importFile} /></label>
        </div>`}
      ${c.csv === undefined && this.read ? csvReport(this.read, 'Read from the CSV text') : nothing}
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
      <textarea id="csv" data-field="csv" .value=${this.cell.csv ?? ''} @input=${(e: Event) => this.editCsv((e.target as HTMLTextAreaElement).value)}></textarea>
      ${error && !read?.problems?.length ? html`<p class="foot-error" role="alert">${error.message}</p>` : nothing}
      ${read ? csvReport(read, 'Read from the header and rows') : nothing}
      <div class="row"><button @click=${this.toTable}>Turn into a table</button>
        <label>Import a CSV file <input type="file" accept=".csv,text/csv,text/plain" @change=${this.importFile} /></label></div>`;
  }

  private editCsv(csv: string) {
    this.read = undefined;
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
    this.edit({ rows: [...(this.cell.rows ?? []), this.cell.columns.map(() => null)] });
  };

  private deleteRow(r: number) {
    this.edit({ rows: (this.cell.rows ?? []).filter((_, i) => i !== r) });
  }

  private addColumn = () => {
    const n = this.cell.columns.length + 1;
    this.edit({ columns: [...this.cell.columns, { name: `c${n}`, unit: '1' }], rows: (this.cell.rows ?? []).map((row) => [...row, null]) });
  };

  /**
   * The CSV text as a table, read by the engine's CSV reader (its columns, with the header's
   * units, and rows); the engine's notes stay shown. A problem is shown and nothing changes.
   */
  private toTable = () => {
    const r = tableFromCsv(this.cell.csv ?? '', this.cell.columns);
    this.read = { notes: r.notes, ...(r.ok ? {} : { problems: r.problems }) };
    if (!r.ok) {
      this.problem = r.problems.length ? undefined : r.message;
      return;
    }
    this.problem = undefined;
    const { csv: _csv, ...rest } = this.cell;
    this.replace({ ...rest, columns: r.columns.map((col) => ({ name: col.name, unit: col.unit })), rows: r.rows } as DataCellDoc);
  };

  private importFile = async (e: Event) => {
    const input = e.target as HTMLInputElement;
    const file = input.files?.[0];
    if (!file) return;
    const text = await file.text();
    input.value = '';
    this.read = undefined;
    this.replace({ ...withoutRows(this.cell), csv: text });
  };
}

/** The engine's report of reading CSV text, under a heading: notes, the start of clock times, refused rows. */
function csvReport(read: CsvReadReport, heading: string) {
  return html`${read.notes.length ? html`<p class="muted">${heading}:</p><ul class="csv-notes muted">${read.notes.map((n) => html`<li>${n}</li>`)}</ul>` : nothing}
    ${read.problems?.length ? html`<ol class="csv-rows" role="alert">${read.problems.map((p) => html`<li class="foot-error">Row ${p.row} (line ${p.line}) <code>${p.text}</code>: ${p.message}</li>`)}</ol>` : nothing}`;
}

function show(v: Entry): string {
  return v === null || v === undefined ? '' : String(v);
}

function withoutRows(c: DataCellDoc): Omit<DataCellDoc, 'rows'> {
  const { rows: _rows, ...rest } = c;
  return rest;
}

function toCsv(c: DataCellDoc): string {
  const head = c.columns.map((x) => x.name).join(',');
  return [head, ...(c.rows ?? []).map((r) => r.map((v) => show(v as Entry)).join(','))].join('\n');
}

customElements.define('data-cell', DataCellElement);
