/**
 * A paste into a new data cell that still holds nothing typed: the pasted header's columns
 * (names, and units where the header gives them) take the place of the new cell's `t` (h) and
 * `C` (mg / L), so a logger export (`Time,Temp (°C)`) does not clash with columns the user
 * never chose. A cell with values typed, or with columns set by the user, is left to the
 * reader's usual matching (by name, else by position, else a message).
 */
import type { DataColumn } from '../study/types.ts';
import { readCsvTable } from './read.ts';
import { readHeaderEntry } from './header.ts';

/** A new data cell's columns and placeholder rows (the app's "add Measurements"). */
export const NEW_DATA_COLUMNS: readonly DataColumn[] = [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }];
export const NEW_DATA_ROWS: ReadonlyArray<ReadonlyArray<number | null>> = [[0, null], [1, null]];

/** Lines of the paste read for its header: the header, title lines above it, and a first row or so. */
const HEAD_LINES = 64;

/** The fields of a data cell this rule reads. */
export interface DataCellContent {
  readonly columns: readonly DataColumn[];
  readonly rows?: ReadonlyArray<ReadonlyArray<number | string | null>>;
  readonly csv?: string;
}

/**
 * Where the text read comes from: a paste into the cell's text (`text` is the text after it), a
 * file imported into the cell ("Import a CSV file": `text` is the file's), or the cell's own
 * text turned into a table ("Turn into a table": `text` is the cell's `csv`, so the cell is
 * judged new and empty on its columns and rows alone).
 */
export type HeaderSource = 'paste' | 'file' | 'text';

const SOURCE_WORDS: Record<HeaderSource, string> = { paste: "the pasted header's columns", file: "the imported file's header columns", text: "the text's header columns" };

/**
 * The columns a paste (or a file, or the cell's text, `from`) gives the cell, and the note that
 * says so; undefined when the cell keeps its own (it is not new and empty, the header does not
 * name at least two columns, or it already names the cell's). A column the header gives no
 * unit keeps the new cell's unit at its place (as the match by position would), and the note
 * says so. Reading the whole `text` with the columns given (`readCsvTable(text, columns)`)
 * matches them by name. Cost: the first `HEAD_LINES` lines of `text`, and the cell's own text.
 */
export function columnsFromPaste(cell: DataCellContent, text: string, from: HeaderSource = 'paste'): { columns: DataColumn[]; note: string } | undefined {
  if (!isNewAndEmpty(from === 'text' ? { columns: cell.columns, rows: cell.rows } : cell)) return undefined;
  const head = firstLines(text, HEAD_LINES);
  const read = readCsvTable(head, [], { adopt: true });
  const columns = read.columns;
  if (!columns || columns.length < 2) return undefined;
  const entries = columns.map((c) => readHeaderEntry(c.header, c.position));
  if (entries.some((e) => e.label === '')) return undefined;
  const named = (name: string) => entries.some((e) => e.text === name || e.label === name || e.name === name);
  if (cell.columns.every((c) => named(c.name))) return undefined;
  // each name must find its column again when the engine reads the text with them
  if (!columns.every((c) => named(c.name))) return undefined;
  const out: DataColumn[] = [];
  const said: string[] = [];
  for (const [j, c] of columns.entries()) {
    if (c.unitFrom !== 'cell') {
      out.push({ name: c.name, unit: c.unit });
      said.push(c.unit === '1' ? c.name : `${c.name} in ${c.unit}`);
      continue;
    }
    const unit = NEW_DATA_COLUMNS[j]?.unit ?? '1';
    out.push({ name: c.name, unit });
    said.push(`${c.name} in ${unit === '1' ? 'plain numbers' : unit} (the header gives no unit; ${j < NEW_DATA_COLUMNS.length ? "the new cell's" : 'set it'} if the file's is another)`);
  }
  const old = cell.columns.map((c) => `${c.name} in ${c.unit}`).join(', ');
  return { columns: out, note: `${SOURCE_WORDS[from]} take the place of the new cell's (${old}): ${said.join(', ')}` };
}

/** A new cell the user has typed nothing into: the new cell's columns, and no row but its placeholders. */
export function isNewAndEmpty(cell: DataCellContent): boolean {
  const cols = Array.isArray(cell.columns) ? cell.columns : [];
  if (cols.length !== NEW_DATA_COLUMNS.length) return false;
  if (!cols.every((c, j) => c?.name?.trim() === NEW_DATA_COLUMNS[j].name && c?.unit?.replace(/\s+/g, '') === NEW_DATA_COLUMNS[j].unit.replace(/\s+/g, ''))) return false;
  if (!placeholders(cell.rows ?? [])) return false;
  if (cell.csv === undefined || cell.csv.trim() === '') return true;
  const read = readCsvTable(firstLines(cell.csv, HEAD_LINES), cols);
  return read.ok && read.rows.length < HEAD_LINES - 2 && placeholders(read.rows);
}

/** Rows that hold nothing typed: row i has no time or the time i (the new cell's), and no other value. */
function placeholders(rows: ReadonlyArray<ReadonlyArray<number | string | null>>): boolean {
  return rows.every((r, i) => Array.isArray(r) && (r[0] === null || r[0] === i) && r.slice(1).every((v) => v === null));
}

/** The first `n` lines of `text` (found without splitting the rest). */
function firstLines(text: string, n: number): string {
  let at = -1;
  for (let k = 0; k < n && (k === 0 || at >= 0); k++) at = text.indexOf('\n', at + 1);
  return at < 0 ? text : text.slice(0, at);
}
