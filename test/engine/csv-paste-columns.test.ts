// A logger export pasted into a new, empty data cell: the header's columns take the place of
// the new cell's t (h) and C (mg / L); a cell with values typed, or columns set, keeps them.
// The exports are written for these tests (invented readings). SI values are checked against
// the definition of the degree Celsius, T/K = T/°C + 273.15 (SI Brochure, 9th ed., 2.3.4), and
// 1 min = 60 s, 1 h = 3600 s (SI Brochure, table 8).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { columnsFromPaste, isNewAndEmpty, NEW_DATA_COLUMNS, NEW_DATA_ROWS, readCsvTable } from '../../src/index.ts';
import { dataNodes } from '../../src/cells/data.ts';
import type { DataCell } from '../../src/study/types.ts';
import type { RunContext } from '../../src/engine/node.ts';
import { near } from './helpers.ts';

const fresh = (): DataCell => ({ id: 'd', kind: 'data', columns: NEW_DATA_COLUMNS.map((c) => ({ ...c })), rows: NEW_DATA_ROWS.map((r) => [...r]) });
/** The new cell after "Edit as CSV text": its header and placeholder rows as text. */
const freshAsText = (): DataCell => ({ id: 'd', kind: 'data', columns: NEW_DATA_COLUMNS.map((c) => ({ ...c })), csv: 't,C\n0,\n1,' });

/** The SI rows the data cell hands to fits, for `csv` read with `columns`. */
function siRows(columns: DataCell['columns'], csv: string): ReadonlyArray<ReadonlyArray<number | null>> {
  const out = dataNodes({ id: 'd', kind: 'data', columns, csv }, 'cells[0]')[0].run({} as RunContext);
  assert.ok(out.ok, out.ok ? '' : out.error.message);
  const b = out.bindings.get('#d');
  assert.ok(b && b.kind === 'data');
  return b.table.rows;
}

describe('a paste into a new data cell', () => {
  it('Elapsed (min);Temperatur (°C) with decimal commas: the header\'s names and units, read in SI', () => {
    const text = 'Elapsed (min);Temperatur (°C)\n0;74,0\n30;52,5\n60;38,1\n';
    for (const cell of [fresh(), freshAsText()]) {
      const got = columnsFromPaste(cell, text);
      assert.ok(got);
      assert.deepEqual(got.columns, [{ name: 'Elapsed', unit: 'min' }, { name: 'Temperatur', unit: 'degC' }]);
      assert.match(got.note, /take the place of the new cell's \(t in h, C in mg \/ L\): Elapsed in min, Temperatur in degC$/);
      const rows = siRows(got.columns, text);
      // 30 min = 1800 s; 74.0 °C = 347.15 K, 52.5 °C = 325.65 K, 38.1 °C = 311.25 K
      assert.deepEqual(rows.map((r) => r[0]), [0, 1800, 3600]);
      near(rows[0][1]!, 347.15, 1e-12, '74.0 degC in K');
      near(rows[1][1]!, 325.65, 1e-12, '52.5 degC in K');
      near(rows[2][1]!, 311.25, 1e-12, '38.1 degC in K');
    }
  });

  it('Time,Temp (°C): the time column has no unit in the header, so it keeps the new cell\'s h, and the note says so', () => {
    const text = 'Time,Temp (°C)\n0,70\n0.5,49.3\n';
    const got = columnsFromPaste(freshAsText(), text);
    assert.ok(got);
    assert.deepEqual(got.columns, [{ name: 'Time', unit: 'h' }, { name: 'Temp', unit: 'degC' }]);
    assert.match(got.note, /Time in h \(the header gives no unit; the new cell's if the file's is another\), Temp in degC/);
    const rows = siRows(got.columns, text);
    assert.equal(rows[1][0], 1800); // 0.5 h
    near(rows[1][1]!, 49.3 + 273.15, 1e-12, '49.3 degC in K');
  });

  it('clock times: the time column is minutes since the first row; a refused row still gives the columns', () => {
    const got = columnsFromPaste(freshAsText(), 'Clock,Temp (°C)\n10:00,70\n10:30,52.4,9\n');
    assert.ok(got);
    assert.deepEqual(got.columns, [{ name: 'Clock', unit: 'min' }, { name: 'Temp', unit: 'degC' }]);
  });

  it('keeps the cell\'s columns when it holds values, when its columns were set, or when the header already names them', () => {
    const text = 'Time,Temp (°C)\n0,70\n';
    assert.equal(columnsFromPaste({ ...fresh(), rows: [[0, 12.5], [1, null]] }, text), undefined);
    assert.equal(columnsFromPaste({ ...fresh(), rows: [[0.5, null]] }, text), undefined);
    assert.equal(columnsFromPaste({ ...freshAsText(), csv: 't,C\n0,3.2\n1,' }, text), undefined);
    assert.equal(columnsFromPaste({ ...fresh(), columns: [{ name: 't', unit: 'min' }, { name: 'C', unit: 'mg / L' }] }, text), undefined);
    assert.equal(columnsFromPaste(fresh(), 't,C (mg/L)\n0,1\n'), undefined);
    // one column, or a header entry with no name: nothing to take
    assert.equal(columnsFromPaste(fresh(), 'Temp (°C)\n70\n'), undefined);
    assert.equal(columnsFromPaste(fresh(), '(min),Temp (°C)\n0,70\n'), undefined);
    assert.equal(isNewAndEmpty({ columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg/L' }], rows: [] }), true);
  });
});

describe('a file imported, or the cell\'s own text turned into a table, in a new data cell', () => {
  /** A logger file longer than the lines the rule reads for the header: 0..499 min, 80 °C falling 0.1 °C a minute. */
  const file = ['Elapsed (min);Temp (°C)', ...Array.from({ length: 500 }, (_, i) => `${i};${(80 - i / 10).toFixed(1).replace('.', ',')}`)].join('\r\n');

  it('the whole file read as the CSV worker reads it, with the header\'s columns: every row, in SI', () => {
    const got = columnsFromPaste(fresh(), file, 'file');
    assert.ok(got);
    assert.deepEqual(got.columns, [{ name: 'Elapsed', unit: 'min' }, { name: 'Temp', unit: 'degC' }]);
    assert.equal(got.note, "the imported file's header columns take the place of the new cell's (t in h, C in mg / L): Elapsed in min, Temp in degC");
    // the worker's read: readCsvTable with the columns given and `adopt` (components/csv.worker.ts)
    const read = readCsvTable(file, got.columns, { adopt: true });
    assert.ok(read.ok);
    assert.deepEqual(read.columns.map((c) => ({ name: c.name, unit: c.unit })), got.columns);
    assert.equal(read.rows.length, 500);
    const rows = siRows(got.columns, file);
    // 499 min = 29,940 s; 80.0 °C = 353.15 K and 30.1 °C = 303.25 K (T/K = T/°C + 273.15)
    assert.equal(rows[499][0], 29_940);
    near(rows[0][1]!, 353.15, 1e-12, '80.0 degC in K');
    near(rows[499][1]!, 303.25, 1e-12, '30.1 degC in K');
  });

  it('"Turn into a table": the new cell is judged on its columns and rows, not on the text it turns', () => {
    const text = 'Time,Temp (°C)\n0,70\n0.5,49.3\n';
    const cell: DataCell = { ...freshAsText(), csv: text };
    const got = columnsFromPaste(cell, text, 'text');
    assert.ok(got);
    assert.deepEqual(got.columns, [{ name: 'Time', unit: 'h' }, { name: 'Temp', unit: 'degC' }]);
    assert.match(got.note, /^the text's header columns take the place of the new cell's \(t in h, C in mg \/ L\)/);
    // as a paste into that text it would not be new: it holds values
    assert.equal(columnsFromPaste(cell, text), undefined);
    // columns of the user's stay, in the text or a file
    const own: DataCell = { ...cell, columns: [{ name: 't', unit: 'min' }, { name: 'C', unit: 'mg / L' }] };
    assert.equal(columnsFromPaste(own, text, 'text'), undefined);
    assert.equal(columnsFromPaste({ ...fresh(), rows: [[0, 12.5], [1, null]] }, file, 'file'), undefined);
  });
});
