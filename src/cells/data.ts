/**
 * A data cell: a table of measurements with a unit per column, given as rows or as CSV text
 * (read by `csv/read.ts`: logger headers with units, decimal commas, clock times). Values become SI magnitudes for the cells that use the table (fit,
 * nca). A row that is not numbers, or a time that goes backwards, is an error naming the
 * row; a missing value (an empty entry, or null) is allowed and listed, never dropped silently.
 */
import type { DataCell } from '../study/types.ts';
import type { Binding, CellError, GraphNode, Outcome } from '../engine/node.ts';
import { cellRef } from '../engine/node.ts';
import type { NodeOutput } from '../engine/report.ts';
import { type Field, field, unitOf, FieldError, guarded } from './fields.ts';
import { fromUnit } from '../units/quantity.ts';
import { type DisplayUnit, formatUnit } from '../units/units.ts';
import { unitFromText } from '../expression/unit-text.ts';
import { type CsvRead, type DeclaredColumn, readCsvTable } from '../csv/read.ts';
import { shortJson } from '../study/limits.ts';

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
  const read = cell.csv !== undefined ? readCsvTable(cell.csv, cell.columns) : undefined;
  if (read && !read.ok) {
    return { ok: false, error: { kind: 'invalid', path: `${at}.csv`, message: read.message }, output: { csv: { notes: read.notes, ...(read.problems.length ? { problems: read.problems } : {}) } } };
  }
  // CSV numbers are in the header's unit where it gives one (converted to SI all the same)
  const inUnits = read ? read.columns.map((c, i) => (c.unitFrom === 'cell' ? units[i] : unitFromText(c.unit) ?? units[i])) : units;
  const raw = read ? read.rows : (cell.rows ?? []);
  const missing: string[] = [];
  let last = -Infinity;
  const rows = raw.map((row, r) => {
    const path = read ? `${at}.csv` : `${at}.rows[${r}]`;
    if (!Array.isArray(row) || row.length !== names.length) throw new FieldError({ kind: 'invalid', path, message: `row ${r + 1} has ${Array.isArray(row) ? row.length : 0} values; the table has ${names.length} columns (${names.join(', ')})` });
    return row.map((v, c) => {
      if (v === null) {
        if (c === 0) throw new FieldError({ kind: 'invalid', path, message: `row ${r + 1} has no time (${names[0]})` });
        missing.push(`row ${r + 1}, ${names[c]}`);
        return null;
      }
      if (typeof v !== 'number' || !Number.isFinite(v)) throw new FieldError({ kind: 'invalid', path, message: `row ${r + 1}, ${names[c]}: ${shortJson(v)} is not a number` });
      if (c === 0) {
        if (v < last) throw new FieldError({ kind: 'invalid', path, message: `row ${r + 1}: the time ${v} goes backwards (the row before has ${last})` });
        last = v;
      }
      return fromUnit(v, inUnits[c]).si;
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
      ...(read && (read.notes.length || read.start !== undefined) ? { csv: { notes: read.notes, ...(read.start !== undefined ? { start: read.start } : {}) } } : {}),
    },
  };
}

/**
 * CSV text as a table for the app's "turn into a table": the cell's columns where the header
 * matches them (by name, else by position), otherwise the header's own names and units; the
 * rows as numbers in each column's unit, null for empty entries, text left as typed (the data
 * cell then flags its row); the notes of what was interpreted. Refused rows make it fail with
 * each row's problem, so nothing is dropped. Never throws.
 */
export function tableFromCsv(text: string, columns: readonly DeclaredColumn[]): CsvRead {
  return readCsvTable(text, columns, { adopt: true });
}
