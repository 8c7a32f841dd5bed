// The nca cell through the engine: a profile from a data cell, results in the data's and the
// dose's units, defined downstream under their prefixed names.
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { runStudy, type CellReport } from '../../src/index.ts';

type Q = { value: number; unit: string; si: number };

function run(cells: unknown[]): CellReport[] {
  const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells });
  assert.ok(r.ok);
  return (r as { report: { cells: CellReport[] } }).report.cells;
}

// exact mono-exponential data C = 10 mg/L e^{-0.2 t/h} after a 500 mg IV bolus:
// AUCinf = C0/k = 50 mg h/L, CL = dose/AUCinf = 10 L/h, V = dose/C0 = 50 L, MRT = 1/k = 5 h,
// t_half = ln 2/k = 3.466 h (one-compartment closed forms, common practice)
const times = [0.5, 1, 2, 4, 6, 8, 12];
const samples = { id: 'samples', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'ug / mL' }], rows: times.map((t) => [t, 10 * Math.exp(-0.2 * t)]) };

it('summarises a profile in the units of its data and dose', () => {
  const [, pk, use] = run([samples,
    { id: 'pk', kind: 'nca', data: 'samples', time: 't', concentration: 'C', dose: '0.5 g', route: 'iv-bolus', prefix: 'iv_' },
    { id: 'use', kind: 'parameters', items: [{ name: 'k_check', value: 'iv_CL / iv_Vz' }] }]);
  assert.equal(pk.ok, true, JSON.stringify(pk.error));
  const v = pk.values as Record<string, Q>;
  assert.ok(Math.abs(v.iv_AUCinf.value - 50) < 1e-9 * 50, `${v.iv_AUCinf.value}`);
  assert.equal(v.iv_AUCinf.unit, 'ug * h / mL');
  assert.ok(Math.abs(v.iv_CL.si - 10e-3 / 3600) < 1e-9 * 10e-3 / 3600);
  assert.equal(v.iv_CL.unit, 'mL / h'); // grams over micrograms cancel into the first unit written
  assert.ok(Math.abs(v.iv_CL.value - 10000) < 1e-6);
  assert.ok(Math.abs(v.iv_Vz.si - 0.05) < 1e-9);
  assert.ok(Math.abs(v.iv_MRT.value - 5) < 1e-9);
  assert.ok(Math.abs(v.iv_lambda_z.value - 0.2) < 1e-12);
  assert.ok(Math.abs((use.values as Record<string, Q>).k_check.si - 0.2 / 3600) < 1e-12);
});

it('puts bad data on the right cell and says why', () => {
  const [, pk] = run([{ ...samples, rows: [[0.5, 9]] },
    { id: 'pk', kind: 'nca', data: 'samples', time: 't', concentration: 'C', dose: '500 mg', route: 'iv-bolus' }]);
  assert.equal(pk.ok, false);
  assert.equal(pk.error!.path, 'cells[1].data');
  const [, wrong] = run([samples, { id: 'pk', kind: 'nca', data: 'samples', time: 't', concentration: 'conc', dose: '500 mg', route: 'iv-bolus' }]);
  assert.match(wrong.error!.message, /no column "conc"/);
  assert.equal(wrong.error!.path, 'cells[1].concentration');
});

// A data cell of logger temperatures (a cooling curve) chosen as the concentration: NCA's
// areas, clearance and volume are defined on concentrations (common practice); the old report
// gave Cmax "347.25 degC", the kelvin reading of 74.1 degC (SI Brochure, 9th ed., table 4:
// T/K = t/degC + 273.15) labelled in degC. Now the cell says so on its concentration field.
it('refuses a temperature column as the concentration, on that field, with no figures', () => {
  const cooling = { id: 'log', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'T', unit: 'degC' }], rows: [[0, 74.1], [0.25, 69.8], [0.5, 65.9], [0.75, 62.2], [1, 58.8]] };
  for (const unit of ['degC', 'degF', 'K']) {
    const [, pk] = run([{ ...cooling, columns: [cooling.columns[0], { name: 'T', unit }] },
      { id: 'pk', kind: 'nca', data: 'log', time: 't', concentration: 'T', dose: '100 mg', route: 'iv-bolus' }]);
    assert.equal(pk.ok, false, unit);
    assert.equal(pk.error!.path, 'cells[1].concentration', unit);
    assert.match(pk.error!.message, new RegExp(`column "T" holds temperatures \\(${unit}\\)`), unit);
    assert.equal(Object.keys((pk.values as Record<string, Q> | undefined) ?? {}).length, 0, `no figures on ${unit}`);
  }
});
