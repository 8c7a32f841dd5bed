import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { runStudy, type CellReport } from '../../src/index.ts';

function dataCell(extra: Record<string, unknown>): CellReport {
  const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [
    { id: 'logger', kind: 'data', columns: [{ name: 't', unit: 'min' }, { name: 'T', unit: 'degF' }], ...extra },
  ] });
  assert.ok(r.ok);
  return (r as { report: { cells: CellReport[] } }).report.cells[0];
}

describe('data cells', () => {
  it('reads rows with a unit per column', () => {
    const c = dataCell({ rows: [[0, 165], [30, 132.5], [60, 110]] });
    assert.equal(c.ok, true);
    assert.equal(c.rowCount, 3);
    assert.deepEqual(c.columns, [{ name: 't', unit: 'min' }, { name: 'T', unit: 'degF' }]);
  });

  it('reads CSV pasted from a spreadsheet (tabs) with its header, in any column order', () => {
    const c = dataCell({ csv: 'T\tt\n165\t0\n132.5\t30\n\n110\t60\n' });
    assert.equal(c.ok, true, JSON.stringify(c.error));
    assert.equal(c.rowCount, 3);
  });

  it('lists missing values instead of dropping them', () => {
    const c = dataCell({ csv: 't,T\n0,165\n30,\n60,110' });
    assert.equal(c.ok, true);
    assert.deepEqual(c.missing, ['row 2, T']);
  });

  it('names the row with text where a number belongs', () => {
    const c = dataCell({ csv: 't,T\n0,165\n30,warm\n60,110' });
    assert.equal(c.ok, false);
    assert.match(c.error!.message, /row 2, T: "warm" is not a number/);
    assert.equal(c.error!.path, 'cells[0].csv');
  });

  it('names the row whose time goes backwards', () => {
    const c = dataCell({ rows: [[0, 165], [30, 132.5], [20, 110]] });
    assert.equal(c.ok, false);
    assert.match(c.error!.message, /row 3: the time 20 goes backwards/);
  });

  it('names a column the CSV header lacks', () => {
    const c = dataCell({ csv: 'time,T\n0,165' });
    assert.equal(c.ok, false);
    assert.match(c.error!.message, /no column "t"/);
  });
});
