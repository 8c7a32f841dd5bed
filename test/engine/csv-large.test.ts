// The file import path at 100,000 rows: the CSV read into a table (with progress told as it
// goes), the table evaluated by the data cell, and the study written as a file and read back.
// The log is invented for this test: a concentration sampled every 0.001 h,
// C = 12 mg/L · exp(-0.25 / h · t), written to 9 significant digits.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { openStudy, readStudy, tableFromCsv, readCsvTable, roughRowCount, PASTE_ROW_LIMIT, type Study } from '../../src/index.ts';
import { PROGRESS_EVERY } from '../../src/csv/read.ts';
import { dataNodes } from '../../src/cells/data.ts';
import type { DataCell } from '../../src/study/types.ts';
import type { RunContext } from '../../src/engine/node.ts';

const ROWS = 100_000;
const time = (i: number) => i * 0.001; // h
const conc = (t: number) => 12 * Math.exp(-0.25 * t); // mg/L, the closed form of first-order decay

function bigCsv(): string {
  const lines = ['t (h),C (mg/L)'];
  for (let i = 0; i < ROWS; i++) lines.push(`${time(i).toFixed(3)},${conc(time(i)).toPrecision(9)}`);
  return lines.join('\r\n');
}

/** Rows checked: the ends, the middle and a spread between. */
const SPOTS = [0, 1, 2, 999, 12_345, 49_999, 50_000, 77_777, 99_998, 99_999];

describe('a 100,000-row CSV file', () => {
  const text = bigCsv();
  const columns = [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }];
  let read: ReturnType<typeof tableFromCsv> | undefined;
  /** The file read as the app's import reads it (once, for the tests below). */
  const imported = () => (read ??= tableFromCsv(text, columns));

  it('is read into a table, the progress told every few thousand rows', () => {
    const told: number[] = [];
    const r = readCsvTable(text, columns, { adopt: true, onProgress: (n) => told.push(n) });
    assert.ok(r.ok, r.ok ? '' : r.message);
    assert.equal(r.rows.length, ROWS);
    // hand-worked: a count is told each time 2,000 lines (the header among them) have been parsed
    assert.equal(told.length, Math.floor((ROWS + 1) / PROGRESS_EVERY));
    assert.deepEqual(told.slice(0, 2), [PROGRESS_EVERY - 1, 2 * PROGRESS_EVERY - 1]);
    assert.ok(told.every((n, k) => k === 0 || n > told[k - 1]), 'the counts grow');
  });

  it('gives every spot-checked row the generating formula\'s values', () => {
    const r = imported();
    assert.ok(r.ok, r.ok ? '' : r.message);
    assert.equal(r.rows.length, ROWS);
    assert.deepEqual(r.columns.map((c) => [c.name, c.unit]), [['t', 'h'], ['C', 'mg / L']]);
    for (const i of SPOTS) {
      const [t, c] = r.rows[i] as number[];
      assert.equal(t, Number(time(i).toFixed(3)), `row ${i + 1}, t`);
      // closed form C = 12 exp(-0.25 t); the file holds 9 significant digits, so within 5e-9 relative
      assert.ok(Math.abs(c - conc(t)) <= 5e-9 * conc(t), `row ${i + 1}: C = ${c}, the formula gives ${conc(t)}`);
    }
  });

  it('is converted to SI by the data cell, row for row', () => {
    const r = imported();
    assert.ok(r.ok);
    const cell: DataCell = { id: 'log', kind: 'data', columns, rows: r.rows as number[][] };
    const out = dataNodes(cell, 'cells[0]')[0].run({} as RunContext);
    assert.ok(out.ok, out.ok ? '' : out.error.message);
    const b = out.bindings.get('#log');
    assert.ok(b && b.kind === 'data');
    assert.equal(b.table.rows.length, ROWS);
    for (const i of SPOTS) {
      const [t, c] = b.table.rows[i] as number[];
      // hand-worked: 1 h = 3600 s; 1 mg/L = 1e-3 kg/m³
      assert.ok(Math.abs(t - time(i) * 3600) <= 1e-9 * Math.max(1, t), `row ${i + 1}, t in s`);
      assert.ok(Math.abs(c - conc(time(i)) * 1e-3) <= 5e-9 * conc(time(i)) * 1e-3, `row ${i + 1}, C in kg/m³`);
    }
  });

  it('makes a study that is written as a file, read back and evaluated alike', () => {
    const r = imported();
    assert.ok(r.ok);
    const study: Study = { format: 'ratebook-study', version: 1, title: 'Large log (invented)', cells: [{ id: 'log', kind: 'data', columns, rows: r.rows as number[][] }] };
    const opened = openStudy(study);
    assert.ok(opened.ok, opened.ok ? '' : opened.error.message);
    const report = opened.session.report();
    const first = report.cells[0];
    assert.ok(first.ok && first.kind === 'data' && first.rowCount === ROWS);
    // the app's file: JSON with two-space indent and a closing line break
    const file = `${JSON.stringify(study, null, 2)}\n`;
    const read = readStudy(file);
    assert.ok(read.ok, read.ok ? '' : read.error.message);
    assert.deepEqual(read.study, study);
    const again = openStudy(file);
    assert.ok(again.ok);
    assert.deepEqual(again.session.report(), report);
  });
});

describe('the paste limit', () => {
  it('counts rows as non-empty lines after the header', () => {
    // hand-worked: header + 3 rows; blank and white-space lines are not rows; \r\n and \r end lines too
    assert.equal(roughRowCount('t,T\n0,1\n\n1,2\r\n  \r2,3'), 3);
    assert.equal(roughRowCount('t,T\n'), 0);
    assert.equal(roughRowCount(''), 0);
  });

  it('is 20,000 rows, under the 100,000 the file import reads', () => {
    assert.equal(PASTE_ROW_LIMIT, 20_000);
    assert.ok(PASTE_ROW_LIMIT < ROWS);
  });
});
