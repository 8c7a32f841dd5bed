// Showing a value in another unit (a parameter's or an answer's `unit`): the conversions
// against the factors of NIST SP 811 (Guide for the Use of the SI, appendix B), and errors on
// the right field for a unit that is not one or of the wrong dimension.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { runStudy, unitChoicesFor, TRADE_UNITS, type CellReport } from '../../src/index.ts';
import { unitFromText } from '../../src/expression/unit-text.ts';

type Q = { value: number; unit: string; si: number };

function cells(items: Array<Record<string, string>>, extra: unknown[] = []): CellReport[] {
  const r = runStudy({ format: 'ratebook-study', version: 1, title: 'units', cells: [{ id: 'p', kind: 'parameters', items }, ...extra] });
  assert.ok(r.ok);
  return (r as { report: { cells: CellReport[] } }).report.cells;
}

function shown(value: string, unit: string): Q {
  const cs = cells([{ name: 'x', value, unit }]);
  assert.ok(cs[0].ok, cs[0].error?.message);
  return (cs[0].values as Record<string, Q>).x;
}

const close = (a: number, b: number, rel = 1e-9) => assert.ok(Math.abs(a - b) <= rel * Math.abs(b), `${a} vs ${b}`);

describe('a value shown in a unit the user picked', () => {
  it('flows: litres per hour and minute, US gallons per minute, cubic metres per second', () => {
    // NIST SP 811 B.9: 1 gal (US) = 3.785 411 784 L exactly
    close(shown('2 L / min', 'gal / min').value, 2 / 3.785411784);
    close(shown('2 L / min', 'L / h').value, 120);
    close(shown('2 L / min', 'mL / min').value, 2000);
    close(shown('2 L / min', 'm^3 / s').value, 2e-3 / 60);
  });

  it('concentrations: mg/L equals ug/mL', () => {
    // definition of the prefixes (SI brochure): 1 mg/L = 1e-3 g / 1e-3 m^3... = 1 ug/mL
    close(shown('12.5 mg / L', 'ug / mL').value, 12.5);
  });

  it('temperatures: a reading in degC shown in degF and K', () => {
    // NIST SP 811 B.9: t/degF = 1.8 t/degC + 32; T/K = t/degC + 273.15
    close(shown('74 degC', 'degF').value, 165.2);
    close(shown('74 degC', 'K').value, 347.15);
    close(shown('41 degF', 'degC').value, 5);
  });

  it('powers and energies: W, BTU/h, kJ', () => {
    // NIST SP 811 B.9: 1 Btu_IT = 1055.055 852 62 J; 1 Btu_IT/h = 0.293 071 1 W
    close(shown('3 kW', 'BTU / h').value, 3000 * 3600 / 1055.05585262);
    close(shown('2 BTU', 'kJ').value, 2 * 1.05505585262);
  });

  it('lengths and times: feet, inches, minutes, days', () => {
    // NIST SP 811 B.9: 1 ft = 0.3048 m, 1 in = 0.0254 m exactly
    close(shown('1 m', 'ft').value, 1 / 0.3048);
    close(shown('1 m', 'in').value, 1 / 0.0254);
    close(shown('36 h', 'd').value, 1.5);
    close(shown('1.5 h', 'min').value, 90);
  });

  it('keeps the SI value and the unit name as picked, and downstream values see the same quantity', () => {
    const cs = cells([{ name: 'Q', value: '2 L / min', unit: 'gal / min' }, { name: 'V', value: '100 L' }, { name: 'tau', value: 'V / Q', unit: 'min' }]);
    const v = cs[0].values as Record<string, Q>;
    assert.equal(v.Q.unit, 'gal / min');
    close(v.Q.si, 2e-3 / 60);
    close(v.tau.value, 50);
  });

  it('an answer of a run shown in another unit', () => {
    // Newton cooling closed form: t = ln((T0 - Ta)/(T - Ta))/k = ln(5) / (0.5 / h)
    const cs = cells([{ name: 'k', value: '0.5 / h' }], [
      { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - 20 degC)', initial: '70 degC' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '10 h', find: [{ name: 't30', crossing: 'T', level: '30 degC', unit: 'min' }, { name: 'T2', valueOf: 'T', at: '2 h', unit: 'degF' }] },
    ]);
    const r = cs[2].results as Record<string, Q>;
    assert.equal(r.t30.unit, 'min');
    close(r.t30.value, (Math.log(5) / 0.5) * 60, 1e-6);
    assert.equal(r.T2.unit, 'degF');
    close(r.T2.value, (20 + 50 * Math.exp(-1)) * 1.8 + 32, 1e-6);
  });

  it('a unit of another dimension is an error on that field, saying both dimensions', () => {
    const cs = cells([{ name: 'P', value: '3 kW', unit: 'mg' }]);
    assert.equal(cs[0].ok, false);
    assert.equal(cs[0].error?.path, 'cells[0].items[0].unit');
    assert.match(cs[0].error!.message, /cannot be shown in mg: it is power, and mg is mass/);
  });

  it('a text that is not a unit is an error on that field', () => {
    const cs = cells([{ name: 'x', value: '1 h', unit: 'hours please' }]);
    assert.equal(cs[0].error?.path, 'cells[0].items[0].unit');
    assert.match(cs[0].error!.message, /is not a unit/);
  });
});

describe('units offered in the picker', () => {
  it('every offered unit reads as a unit', () => {
    for (const u of TRADE_UNITS) assert.ok(unitFromText(u), u);
  });

  it('offers the units of the same dimension, and none for a plain number', () => {
    assert.deepEqual([...unitChoicesFor('h')], ['s', 'min', 'd', 'week', 'year']);
    assert.ok(unitChoicesFor('mg / L').includes('ug / mL'));
    assert.ok(unitChoicesFor('L / h').includes('gal / min'));
    assert.deepEqual([...unitChoicesFor('degC')], ['degF', 'K']);
    assert.ok(unitChoicesFor('W').includes('BTU / h'));
    assert.deepEqual([...unitChoicesFor('')], []);
  });
});

describe('fit estimates and profile values in a picked unit', () => {
  const samples = { id: 'samples', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: [[0.5, 9.05], [1, 8.19], [2, 6.70], [4, 4.49], [8, 2.02], [12, 0.91]] };

  it('a profile summary shows CL in mL/min when asked, the same clearance as in L/h', () => {
    // 1 L/h = 1000 mL / 60 min (definition of the units)
    const base = { id: 'nca', kind: 'nca', data: 'samples', time: 't', concentration: 'C', dose: '500 mg', route: 'iv-bolus' };
    const run = (extra: Record<string, unknown>) => {
      const r = runStudy({ format: 'ratebook-study', version: 1, title: 'n', cells: [samples, { ...base, ...extra }] });
      assert.ok(r.ok);
      return (r as { report: { cells: CellReport[] } }).report.cells[1];
    };
    const plain = (run({}).values as Record<string, Q>).CL;
    const picked = run({ units: { CL: 'mL / min' } });
    const cl = (picked.values as Record<string, Q>).CL;
    assert.equal(cl.unit, 'mL / min');
    close(cl.si, plain.si, 1e-12);
    close(cl.value, plain.si * 1e6 * 60, 1e-9);
    const wrong = run({ units: { CL: 'h' } });
    assert.equal(wrong.error?.path, 'cells[1].units.CL');
    const unknown = runStudy({ format: 'ratebook-study', version: 1, title: 'n', cells: [samples, { ...base, units: { Cmean: 'mg / L' } }] });
    assert.ok(unknown.ok);
    assert.match((unknown as { report: { cells: CellReport[] } }).report.cells[1].error!.message, /"Cmean" is not a result/);
  });

  it('a fit estimate shown in another unit keeps its value, standard error and interval consistent', () => {
    const cellsOf = (unit?: string) => [
      samples,
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.2 / h' }, { name: 'C0', value: '10 mg / L' }] },
      { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: 'C0' },
      { id: 'fit', kind: 'fit', rates: ['law'], data: 'samples', time: 't', observe: { C: 'C' }, estimate: [{ parameter: 'k', as: 'k_fit', guess: '0.1 / h', ...(unit ? { unit } : {}) }, { parameter: 'C', as: 'C0_fit', guess: '8 mg / L' }] },
    ];
    const est = (unit?: string) => {
      const r = runStudy({ format: 'ratebook-study', version: 1, title: 'f', cells: cellsOf(unit) });
      assert.ok(r.ok);
      const c = (r as { report: { cells: CellReport[] } }).report.cells[3];
      assert.ok(c.ok, c.error?.message);
      return (c.estimates as Record<string, { value: Q; standardError: Q; ci95: [Q, Q] }>).k_fit;
    };
    const h = est();
    const d = est('1 / d');
    assert.equal(d.value.unit, '1 / d');
    close(d.value.si, h.value.si, 1e-9);
    close(d.value.value, h.value.value * 24, 1e-9);
    close(d.standardError.value, h.standardError.value * 24, 1e-9);
    close(d.ci95[1].value, h.ci95[1].value * 24, 1e-9);
  });
});
