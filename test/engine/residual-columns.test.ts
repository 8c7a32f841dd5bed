// A fit's residuals as columns (src/output/residual-columns.ts), the form the app's worker sends
// them in: turned back, they equal the report's residuals value for value (Float64Array holds a
// double exactly: IEEE 754 binary64). Checked on the fit of the cooling template and on random
// residuals from the fixed seed.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { runStudy, residualColumns, residualsFromColumns, residualBuffers, lazyResiduals, type FitResidual } from '../../src/index.ts';

describe('residual columns', () => {
  it('give back the cooling template fit\'s residuals exactly', () => {
    const doc = JSON.parse(readFileSync(new URL('../../examples/cooling-data-fit.ratebook.json', import.meta.url), 'utf8'));
    const run = runStudy(doc);
    assert.ok(run.ok);
    const fit = run.report.cells.find((c) => c.kind === 'fit') as { residuals?: FitResidual[] } | undefined;
    assert.ok(fit?.residuals?.length, 'the template has a fit with residuals');
    assert.deepEqual(residualsFromColumns(residualColumns(fit.residuals)), fit.residuals);
  });

  it('give back any residuals exactly, zeros, signs and units included', () => {
    const q = fc.record({ value: fc.double(), unit: fc.constantFrom('min', 'h', 'degC', 'delta degC', 'mg / L'), si: fc.double() });
    const residual = fc.record({ row: fc.integer({ min: 1, max: 100_000 }), state: fc.constantFrom('T', 'C', 'Ambient temperature'), time: q, residual: q });
    fc.assert(fc.property(fc.array(residual, { maxLength: 50 }), (rs) => {
      const back = residualsFromColumns(residualColumns(rs));
      assert.equal(back.length, rs.length);
      back.forEach((b, k) => {
        assert.equal(b.row, rs[k].row);
        assert.equal(b.state, rs[k].state);
        for (const part of ['time', 'residual'] as const) {
          assert.equal(b[part].unit, rs[k][part].unit);
          assert.ok(Object.is(b[part].value, rs[k][part].value) && Object.is(b[part].si, rs[k][part].si), `${part} of row ${b.row}`);
        }
      });
    }));
  });

  it('hold each text once, and their buffers can be transferred', () => {
    const rs: FitResidual[] = Array.from({ length: 1000 }, (_, i) => ({ row: i + 1, state: 'T', time: { value: i, unit: 'min', si: 60 * i }, residual: { value: 0.01, unit: 'delta degC', si: 0.01 } }));
    const c = residualColumns(rs);
    assert.deepEqual(c.texts, ['T', 'min', 'delta degC']);
    assert.equal(residualBuffers(c).length, 8);
    const { port1, port2 } = new MessageChannel();
    port1.postMessage(c, residualBuffers(c));
    assert.equal(c.time.length, 0, 'transferred: the sender\'s view is emptied');
    port1.close();
    port2.close();
  });

  it('read lazily: the report keeps its residuals property, made on first read', () => {
    const rs: FitResidual[] = [{ row: 3, state: 'C', time: { value: 2, unit: 'h', si: 7200 }, residual: { value: -0.5, unit: 'mg / L', si: -0.0005 } }];
    const target: { residuals?: FitResidual[] } = {};
    lazyResiduals(target, residualColumns(rs));
    assert.deepEqual(target.residuals, rs);
    assert.equal(target.residuals, target.residuals, 'made once');
    assert.deepEqual(JSON.parse(JSON.stringify(target)), { residuals: rs });
  });
});
