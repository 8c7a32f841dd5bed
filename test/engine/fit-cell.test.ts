// The fit cell through the engine: estimates from measurements, defined downstream.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { runStudy, type CellReport } from '../../src/index.ts';

type Q = { value: number; unit: string; si: number };

function cells(rows: number[][], extra: Record<string, unknown> = {}): CellReport[] {
  const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [
    { id: 'logger', kind: 'data', columns: [{ name: 't', unit: 'min' }, { name: 'T', unit: 'degC' }], rows },
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }, { name: 'Ta', value: '4 degC' }, { name: 'T0', value: '70 degC' }] },
    { id: 'cooling', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: 'T0' },
    { id: 'fitk', kind: 'fit', rates: ['cooling'], data: 'logger', time: 't', observe: { T: 'T' },
      estimate: [{ parameter: 'k', as: 'k_hat', guess: '0.3 / h', min: '0 / h' }, { parameter: 'T', as: 'T0_hat', guess: '60 degC' }], ...extra },
    { id: 'pred', kind: 'parameters', items: [{ name: 't_to_21', value: 'log((T0_hat - Ta) / (21 degC - Ta)) / k_hat' }] },
  ] });
  assert.ok(r.ok);
  return (r as { report: { cells: CellReport[] } }).report.cells;
}

// noise-free Newton cooling T = Ta + (T0 - Ta) e^{-kt} with k = 0.8/h, T0 = 74 degC (closed form, common practice)
const exact = (tMin: number) => 4 + 70 * Math.exp(-0.8 * tMin / 60);
const times = [0, 15, 30, 45, 60, 90, 120, 180, 240];

describe('fit cells', () => {
  it('recover the parameters of noise-free data to 1e-6 relative', () => {
    const [, , , fit, pred] = cells(times.map((t) => [t, exact(t)]));
    assert.equal(fit.ok, true, JSON.stringify(fit.error));
    const est = fit.estimates as Record<string, { value: Q; standardError?: Q; ci95?: Q[] }>;
    assert.ok(Math.abs(est.k_hat.value.value - 0.8) < 0.8e-6, `${est.k_hat.value.value}`);
    assert.equal(est.k_hat.value.unit, '1 / h');
    assert.ok(Math.abs(est.T0_hat.value.si - 347.15) < 347.15e-6 * 0.1, `${est.T0_hat.value.si}`);
    assert.equal(fit.converged, true);
    assert.equal(fit.n, times.length);
    assert.equal(fit.dof, times.length - 2);
    // the prediction below follows: ln(70/17)/0.8 h (closed form)
    assert.ok(Math.abs((pred.values as Record<string, Q>).t_to_21.si / 3600 - Math.log(70 / 17) / 0.8) < 1e-5);
  });

  it('give standard errors, 95% intervals and the residual SD in the data\'s unit', () => {
    const noisy = times.map((t, i) => [t, exact(t) + [0.3, -0.2, 0.1, -0.4, 0.2, 0.0, -0.1, 0.3, -0.2][i]]);
    const [, , , fit] = cells(noisy);
    const est = fit.estimates as Record<string, { value: Q; standardError: Q; ci95: Q[] }>;
    assert.ok(est.k_hat.standardError.si > 0);
    assert.ok(est.k_hat.ci95[0].si < est.k_hat.value.si && est.k_hat.value.si < est.k_hat.ci95[1].si);
    assert.equal((fit.residualSD as Q).unit, 'K');
    assert.ok((fit.residualSD as Q).value > 0.05 && (fit.residualSD as Q).value < 1);
  });

  it('say clearly when there are fewer points than parameters', () => {
    const [, , , fit, pred] = cells([[0, 74]]);
    assert.equal(fit.ok, false);
    assert.match(fit.error!.message, /fewer data points than parameters to estimate \(1 data points cannot determine 2 parameters\)/);
    assert.match(pred.error!.message, /^waits on cell "fitk"/);
  });

  it('refuse to estimate a name the laws do not read', () => {
    const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [
      { id: 'logger', kind: 'data', columns: [{ name: 't', unit: 'min' }, { name: 'T', unit: 'degC' }], rows: [[0, 70], [10, 60]] },
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }, { name: 'z', value: '3' }] },
      { id: 'cooling', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - 4 degC)', initial: '70 degC' },
      { id: 'f', kind: 'fit', rates: ['cooling'], data: 'logger', time: 't', observe: { T: 'T' }, estimate: [{ parameter: 'z', as: 'z_hat', guess: '1' }] },
    ] });
    assert.ok(r.ok);
    if (r.ok) assert.match(r.report.cells[3].error!.message, /do not read "z"/);
  });
});

describe('measurements on simulation plots', () => {
  it('a simulation of an observed state shows the fit\'s measurements as points, in its own units', () => {
    const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [
      { id: 'logger', kind: 'data', columns: [{ name: 't', unit: 'min' }, { name: 'T', unit: 'degF' }], rows: [[0, 158], [60, 120], [120, 95]] },
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }, { name: 'Ta', value: '4 degC' }] },
      { id: 'cooling', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '70 degC' },
      { id: 'fitk', kind: 'fit', rates: ['cooling'], data: 'logger', time: 't', observe: { T: 'T' }, estimate: [{ parameter: 'k', as: 'k_hat', guess: '0.5 / h' }] },
      { id: 'run', kind: 'simulate', rates: ['cooling'], from: '0 h', to: '3 h' },
    ] });
    assert.ok(r.ok);
    if (!r.ok) return;
    const plot = r.report.cells[4].plot as { points: Array<{ state: string; t: number[]; values: number[] }> };
    // 60 min = 1 h; 158 degF = 70 degC, 95 degF = 35 degC (NIST SP 811 conversion)
    assert.deepEqual(plot.points[0].state, 'T');
    assert.deepEqual(plot.points[0].t.map((x) => Math.round(x * 1e9) / 1e9), [0, 1, 2]);
    assert.ok(Math.abs(plot.points[0].values[0] - 70) < 1e-9 && Math.abs(plot.points[0].values[2] - 35) < 1e-9);
  });
});

describe('measurements on simulation plots, incrementally', () => {
  it('appear when a fit is added and go when it is removed', async () => {
    const { openStudy } = await import('../../src/index.ts');
    const o = openStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [
      { id: 'logger', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'T', unit: 'degC' }], rows: [[0, 70], [1, 50], [2, 36]] },
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }] },
      { id: 'cooling', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - 4 degC)', initial: '70 degC' },
      { id: 'run', kind: 'simulate', rates: ['cooling'], from: '0 h', to: '3 h' },
    ] });
    assert.ok(o.ok);
    if (!o.ok) return;
    const s = o.session;
    const points = () => (s.report().cells.find((c) => c.id === 'run')!.plot as { points?: unknown[] }).points;
    assert.equal(points(), undefined);
    s.apply({ type: 'insert', index: 4, cell: { id: 'f', kind: 'fit', rates: ['cooling'], data: 'logger', time: 't', observe: { T: 'T' }, estimate: [{ parameter: 'k', as: 'k_hat', guess: '0.5 / h' }] } });
    assert.equal(points()?.length, 1);
    s.apply({ type: 'remove', id: 'f' });
    assert.equal(points(), undefined);
  });
});
