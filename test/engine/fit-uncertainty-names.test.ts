// Each estimate's uncertainty as names downstream: `<as>_se`, `<as>_lo`, `<as>_hi` are the
// report's standardError and the two ends of its ci95, to the last bit (the report is the
// source: the fit's covariance and Student's t, test/engine/least-squares.test.ts checks those
// against reference values). All numbers are invented for the tests.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { runStudy, type CellReport } from '../../src/index.ts';

type Q = { value: number; unit: string; si: number };
type Est = Record<string, { value: Q; standardError: Q; ci95: Q[] }>;

function report(cells: unknown[]): CellReport[] {
  const r = runStudy({ format: 'ratebook-study', version: 1, title: 'names', cells });
  assert.ok(r.ok, JSON.stringify(r));
  return (r as { report: { cells: CellReport[] } }).report.cells;
}

describe('an estimate\'s standard error and 95% bounds as names', () => {
  it('a parameter cell below reads them, equal to the report\'s standardError and ci95 (a fit on laws)', () => {
    // Newton cooling T = Ta + (T0 - Ta) e^{-kt}, k = 0.8/h, T0 = 74 degC, Ta = 4 degC (closed form), with invented noise
    const noise = [0.3, -0.2, 0.1, -0.4, 0.2, 0.0, -0.1, 0.3, -0.2];
    const rows = [0, 15, 30, 45, 60, 90, 120, 180, 240].map((t, i) => [t, 4 + 70 * Math.exp(-0.8 * t / 60) + noise[i]]);
    const cells = report([
      { id: 'logger', kind: 'data', columns: [{ name: 't', unit: 'min' }, { name: 'T', unit: 'degC' }], rows },
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }, { name: 'Ta', value: '4 degC' }] },
      { id: 'cooling', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '70 degC' },
      { id: 'fitk', kind: 'fit', rates: ['cooling'], data: 'logger', time: 't', observe: { T: 'T' },
        estimate: [{ parameter: 'k', as: 'k_hat', guess: '0.3 / h' }, { parameter: 'T', as: 'T0_hat', guess: '60 degC' }] },
      { id: 'below', kind: 'parameters', items: [
        { name: 'k_se', value: 'k_hat_se' }, { name: 'k_low', value: 'k_hat_lo' }, { name: 'k_high', value: 'k_hat_hi' },
        { name: 'T0_se', value: 'T0_hat_se' }, { name: 'T0_low', value: 'T0_hat_lo' }, { name: 'T0_high', value: 'T0_hat_hi' },
        { name: 'half_width', value: '(k_hat_hi - k_hat_lo) / 2' }] },
    ]);
    const est = cells[3].estimates as Est;
    const v = cells[4].values as Record<string, Q>;
    assert.equal(cells[4].ok, true, JSON.stringify(cells[4].error));
    assert.equal(v.k_se.si, est.k_hat.standardError.si);
    assert.equal(v.k_low.si, est.k_hat.ci95[0].si);
    assert.equal(v.k_high.si, est.k_hat.ci95[1].si);
    assert.equal(v.k_se.unit, est.k_hat.standardError.unit);
    assert.equal(v.T0_se.si, est.T0_hat.standardError.si);
    assert.equal(v.T0_se.unit, 'K'); // a standard error of a temperature is a difference (kelvin)
    assert.equal(v.T0_low.si, est.T0_hat.ci95[0].si);
    assert.equal(v.T0_high.si, est.T0_hat.ci95[1].si);
    assert.ok(v.T0_low.si < est.T0_hat.value.si && est.T0_hat.value.si < v.T0_high.si);
    // hand-worked: the interval is symmetric, p ± t·SE, so its half-width over the SE is t(0.975, 7) = 2.3646 (Student's t table)
    assert.ok(Math.abs(v.half_width.si / v.k_se.si - 2.364624) < 1e-5, `${v.half_width.si / v.k_se.si}`);
  });

  it('through a run: the same names, equal to the report', () => {
    const K = 0.1;
    const bolus = (t: number) => [0, 12, 24, 36, 48, 60, 72, 84].filter((ti) => ti <= t).reduce((s, ti) => s + 20 * Math.exp(-K * (t - ti)), 0);
    const noise = [0.4, -0.3, 0.2, -0.1];
    const rows = [72.5, 78, 84.5, 95].map((t, i) => [t, bolus(t) + noise[i]]);
    const cells = report([
      { id: 'p', kind: 'parameters', items: [{ name: 'CL', value: '5 L/h' }, { name: 'V', value: '50 L' }, { name: 'dose', value: '1000 mg' }] },
      { id: 'elim', kind: 'rate', state: 'C', unit: 'mg/L', rate: '-CL / V * C', initial: '0 mg/L' },
      { id: 'regimen', kind: 'simulate', rates: ['elim'], from: '0 h', to: '96 h', events: [{ at: '0 h', every: '12 h', count: 8, add: { C: 'dose / V' } }] },
      { id: 'levels', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg/L' }], rows },
      { id: 'fit', kind: 'fit', run: 'regimen', data: 'levels', time: 't', observe: { C: 'C' },
        estimate: [{ parameter: 'CL', as: 'CL_i', guess: '3 L/h' }, { parameter: 'V', as: 'V_i', guess: '30 L', unit: 'mL' }] },
      { id: 'below', kind: 'parameters', items: [{ name: 'a', value: 'CL_i_se' }, { name: 'b', value: 'V_i_lo' }, { name: 'c', value: 'V_i_hi' }] },
    ]);
    const est = cells[4].estimates as Est;
    const v = cells[5].values as Record<string, Q>;
    assert.equal(cells[5].ok, true, JSON.stringify(cells[5].error));
    assert.equal(v.a.si, est.CL_i.standardError.si);
    assert.equal(v.b.si, est.V_i.ci95[0].si);
    assert.equal(v.c.si, est.V_i.ci95[1].si);
    assert.ok(est.CL_i.standardError.si > 0);
  });
});
