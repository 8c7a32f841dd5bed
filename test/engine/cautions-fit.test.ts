// The dose caution on a fit of a drug's levels (src/study/cautions.ts). Common practice:
// material that concerns a patient's drug levels defers to licensed professionals.
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { runStudy } from '../../src/index.ts';

/** A fit of a concentration state from three invented levels; the data's `title`, the unit and `prior` vary. */
const kinds = (title: string, unit: string, prior: boolean): string[] => {
  const r = runStudy({ format: 'ratebook-study', version: 1, title, cells: [
    { id: 'obs', kind: 'data', title, columns: [{ name: 't', unit: 'h' }, { name: 'C', unit }], rows: [[1, 8], [4, 5], [8, 3]] },
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.1 / h' }] },
    { id: 'law', kind: 'rate', state: 'C', unit, rate: '-k * C', initial: `10 ${unit}` },
    { id: 'f', kind: 'fit', rates: ['law'], data: 'obs', time: 't', observe: { C: 'C' },
      estimate: [{ parameter: 'k', as: 'k_hat', guess: '0.1 / h', ...(prior ? { prior: { median: '0.1 / h', omega: 0.3 } } : {}) }],
      ...(prior ? { error: { proportional: 0.1 } } : {}) },
  ] });
  assert.ok(r.ok);
  return r.ok ? r.report.cautions.map((c) => c.kind) : [];
};

it('a Bayesian fit of levels in mg/L carries the dose caution, though no word speaks of doses', () => {
  assert.deepEqual(kinds('Levels', 'mg / L', true), ['dosing']);
});

it('a least-squares fit of plasma levels carries it too', () => {
  assert.deepEqual(kinds('Plasma levels', 'ug / mL', false), ['dosing']);
});

it('a least-squares fit of a tank\'s concentration carries none', () => {
  assert.deepEqual(kinds('Salt in the rinse tank', 'mg / L', false), []);
});
