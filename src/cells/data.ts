/**
 * A data cell: a table of measurements with a unit per column, given as rows or as CSV text
 * (read with papaparse). Values become SI magnitudes for the cells that use the table (fit,
 * nca). A row that is not numbers, or a time that goes backwards, is an error naming the
 * row; a missing value (an empty entry, or null) is allowed and listed, never dropped silently.
 */
import Papa from 'papaparse';
import type { DataCell } from '../study/types.ts';
import type { Binding, CellError, GraphNode, Outcome } from '../engine/node.ts';
import { cellRef } from '../engine/node.ts';
import type { NodeOutput } from '../engine/report.ts';
import { type Field, field, unitOf, FieldError, guarded } from './fields.ts';
import { fromUnit } from '../units/quantity.ts';
import { type DisplayUnit, formatUnit } from '../units/units.ts';

export function dataNodes(cell: DataCell, at: string): Array<GraphNode<NodeOutput<'data'>>> {
  const problems: CellError[] = [];
  const columns = Array.isArray(cell.columns) ? cell.columns : [];
  const units = columns.map((c, i) => field(c?.unit, `${at}.columns[${i}].unit`, problems));
  return [{
    key: `${cell.id}/data`,
    cell: cell.id,
    defines: [{ name: cellRef(cell.id), path: `${at}.id` }],
    uses: [],
    allowsTime: false,
    allowsStates: false,
    signature: JSON.stringify(cell),
    problems,
    run: () => guarded(() => runData(cell, at, units as Field[])),
  }];
}

/** A column's unit; "1" (or an empty unit) is a plain number. */
function columnUnit(f: Field): DisplayUnit {
  if (f.text.trim() === '1') return [];
  return unitOf(f);
}

function runData(cell: DataCell, at: string, unitFields: Field[]): Outcome<NodeOutput<'data'>> {
  const units = unitFields.map(columnUnit);
  const names = cell.columns.map((c) => c.name);
  const raw = cell.csv !== undefined ? readCsv(cell.csv, names, `${at}.csv`) : (cell.rows ?? []);
  const missing: string[] = [];
  let last = -Infinity;
  const rows = raw.map((row, r) => {
    const path = cell.csv !== undefined ? `${at}.csv` : `${at}.rows[${r}]`;
    if (!Array.isArray(row) || row.length !== names.length) throw new FieldError({ kind: 'invalid', path, message: `row ${r + 1} has ${Array.isArray(row) ? row.length : 0} values; the table has ${names.length} columns (${names.join(', ')})` });
    return row.map((v, c) => {
      if (v === null) {
        if (c === 0) throw new FieldError({ kind: 'invalid', path, message: `row ${r + 1} has no time (${names[0]})` });
        missing.push(`row ${r + 1}, ${names[c]}`);
        return null;
      }
      if (typeof v !== 'number' || !Number.isFinite(v)) throw new FieldError({ kind: 'invalid', path, message: `row ${r + 1}, ${names[c]}: ${JSON.stringify(v)} is not a number` });
      if (c === 0) {
        if (v < last) throw new FieldError({ kind: 'invalid', path, message: `row ${r + 1}: the time ${v} goes backwards (the row before has ${last})` });
        last = v;
      }
      return fromUnit(v, units[c]).si;
    });
  });
  if (rows.length === 0) throw new FieldError({ kind: 'invalid', path: `${at}.rows`, message: 'the table has no rows' });
  const table = { columns: names.map((name, i) => ({ name, unit: units[i] })), rows };
  const binding: Binding = { kind: 'data', cell: cell.id, table, sig: JSON.stringify([names, units, rows]) };
  return {
    ok: true,
    bindings: new Map([[cellRef(cell.id), binding]]),
    output: {
      columns: names.map((name, i) => ({ name, unit: formatUnit(units[i]) })),
      rowCount: rows.length,
      ...(missing.length ? { missing, note: `${missing.length} missing value${missing.length === 1 ? '' : 's'}: ${missing.slice(0, 5).join('; ')}${missing.length > 5 ? '; …' : ''}` } : {}),
    },
  };
}

/**
 * Reads CSV text with a header row of column names (comma, tab or semicolon separated, as a
 * spreadsheet pastes it) into rows in the order of `names`. Empty entries are missing values;
 * anything else that is not a number stays as text, for the caller to report with its row.
 */
export function readCsv(text: string, names: readonly string[], path: string): Array<Array<number | string | null>> {
  const parsed = Papa.parse<string[]>(text.trim(), { delimitersToGuess: [',', '\t', ';'], skipEmptyLines: 'greedy' });
  if (parsed.errors.length) {
    const e = parsed.errors[0];
    throw new FieldError({ kind: 'invalid', path, message: `the CSV text cannot be read${e.row !== undefined ? ` (row ${e.row + 1})` : ''}: ${e.message}` });
  }
  const [header, ...body] = parsed.data;
  if (!header) throw new FieldError({ kind: 'invalid', path, message: 'the CSV text is empty: give a header row of column names, then the rows' });
  const index = names.map((n) => header.findIndex((h) => h.trim() === n));
  const absent = names.filter((_, i) => index[i] < 0);
  if (absent.length) throw new FieldError({ kind: 'invalid', path, message: `the CSV header (${header.join(', ')}) has no column ${absent.map((a) => `"${a}"`).join(', ')}` });
  return body.map((cells) => index.map((i) => {
    const s = (cells[i] ?? '').trim();
    if (s === '') return null;
    const v = Number(s);
    return Number.isFinite(v) && /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(s) ? v : s;
  }));
}

/**
 * CSV text as table rows for the app's "turn into a table": numbers, null for empty entries,
 * text left as typed (the data cell then flags its row). Never throws.
 */
export function tableFromCsv(text: string, names: readonly string[]): { ok: true; rows: Array<Array<number | string | null>> } | { ok: false; message: string } {
  try {
    return { ok: true, rows: readCsv(text, names, '') };
  } catch (err) {
    return { ok: false, message: err instanceof FieldError ? err.error.message : String(err) };
  }
}
