// A solve cell whose wanted value ("equals") is empty: the message gives an example in the
// target's own unit, its value now, not a rate constant. The values are checked against closed
// forms: a bolus regimen's trough by superposition of first-order decays, and Newton cooling,
// T(t) = Ta + (T0 - Ta) e^{-kt}, shown in degrees Celsius (T/°C = T/K - 273.15, SI Brochure,
// 9th ed., 2.3.4). Invented numbers.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { openStudy, type ReportOf } from '../../src/index.ts';
import { near } from './helpers.ts';

function solveError(cells: object[], solve: object) {
  const o = openStudy({ format: 'ratebook-study', version: 1, title: 'empty equals', cells: [...cells, { id: 's', kind: 'solve', ...solve }] });
  assert.ok(o.ok);
  const r = o.session.report().cells.find((c) => c.id === 's') as ReportOf<'solve'>;
  assert.equal(r.ok, false);
  const e = r.errors?.find((x) => x.path.endsWith('.target.equals')) ?? r.error;
  assert.ok(e && e.path.endsWith('.target.equals'), JSON.stringify(r.errors ?? r.error));
  return e;
}

/** The example quoted in the message: its number and its unit text. */
function example(message: string): { value: number; unit: string } {
  const m = /such as "([-0-9.e]+) ([^"]+)"/.exec(message);
  assert.ok(m, message);
  return { value: Number(m[1]), unit: m[2] };
}

const regimen = [
  { id: 'p', kind: 'parameters', items: [{ name: 'dose', value: '1000 mg' }, { name: 'V', value: '50 L' }, { name: 'k', value: '0.1 / h' }] },
  { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
  { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '96 h', events: [{ at: '0 h', every: '12 h', count: 8, add: { C: 'dose / V' } }],
    find: [{ name: 'trough', valueOf: 'C', at: '96 h' }] },
];

const cooling = [
  { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }, { name: 'Ta', value: '4 degC' }] },
  { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '74 degC' },
  { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '3 h', find: [{ name: 'T2', valueOf: 'T', at: '2 h' }] },
];

describe('solve: an empty wanted value', () => {
  it('a trough target: the example is the trough now, in mg / L (superposition closed form)', () => {
    const e = solveError(regimen, { vary: { parameter: 'dose', as: 'dose_new', min: '100 mg', max: '5000 mg' }, target: { value: 'trough', equals: '' } });
    // closed form: (dose / V) Σ_j exp(-k (96 h - 12 h j)), j = 0..7
    let trough = 0;
    for (let j = 0; j < 8; j++) trough += (1000 / 50) * Math.exp(-0.1 * (96 - 12 * j));
    const x = example(e.message);
    assert.equal(x.unit, 'mg / L');
    near(x.value, trough, 5e-4, 'example trough (4 significant digits)');
    assert.match(e.message, /trough must equal/);
    assert.doesNotMatch(e.message, /0\.35 \/ h/);
  });

  it('a temperature target: the example is in degC, not kelvin (Newton cooling closed form)', () => {
    const e = solveError(cooling, { vary: { parameter: 'k', as: 'k_new', min: '0.1 / h', max: '2 / h' }, target: { value: 'T2', equals: '  ' } });
    const x = example(e.message);
    assert.equal(x.unit, 'degC');
    // 4 degC + 70 K e^{-1} = 29.75 degC (302.90 K less 273.15)
    near(x.value, 4 + 70 * Math.exp(-1), 5e-4, 'example temperature');
  });

  it('a target with no finite value now: the field is said to be empty, without a value', () => {
    const none = solveError(regimen, { vary: { parameter: 'dose', as: 'dose_new', min: '100 mg', max: '5000 mg' }, target: { value: 'trough / 0 (mg / L)', equals: '' } });
    assert.equal(none.message, "equals is empty: write the value the target must equal, in the target's unit");
    assert.doesNotMatch(none.message, /0\.35 \/ h/);
  });
});
