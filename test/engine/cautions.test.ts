import { it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { runStudy } from '../../src/index.ts';

const kinds = (file: string) => {
  const r = runStudy(readFileSync(new URL(`../../examples/${file}`, import.meta.url), 'utf8'));
  assert.ok(r.ok);
  return r.ok ? r.report.cautions.map((c) => c.kind) : [];
};

// Common practice: material that concerns doses carries a caution deferring to licensed
// professionals; food temperature limits defer to the local food code.
it('a dosing study carries the dosing caution', () => {
  assert.deepEqual(kinds('iv-bolus-repeated.ratebook.json'), ['dosing']);
});

it('a cooling check against a limit carries the food-code caution', () => {
  assert.deepEqual(kinds('cooling-stock-pot.ratebook.json'), ['temperature-limits']);
});

it('a temperature check that is not about food carries the general caution, not the food code', () => {
  assert.deepEqual(kinds('convection-radiation-cooling.ratebook.json'), ['temperature-practice']);
  assert.deepEqual(kinds('heating-constant-power.ratebook.json'), ['temperature-practice']);
  assert.deepEqual(kinds('two-stage-cooling-check.ratebook.json'), ['temperature-limits']);
  assert.deepEqual(kinds('cooling-data-fit.ratebook.json'), ['temperature-limits'], 'a fitted cooling curve of food, with no level checked');
});

it('a study with neither carries none', () => {
  assert.deepEqual(kinds('mixing-tank-flush.ratebook.json'), []);
});

it('a solve cell that changes an amount given by a schedule carries the dosing caution, whatever the names', () => {
  assert.deepEqual(kinds('dose-for-target-trough.ratebook.json'), ['dosing']);
  // no word about doses anywhere: the schedule's amount is what makes it one
  const r = runStudy({
    format: 'ratebook-study', version: 1, title: 'amounts',
    cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'amt', value: '2 g' }, { name: 'vol', value: '10 L' }, { name: 'k', value: '0.2 / h' }] },
      { id: 'law', kind: 'rate', state: 'x', unit: 'g / L', rate: '-k * x', initial: '0 g / L' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '24 h', events: [{ at: '0 h', every: '6 h', count: 4, add: { x: 'amt / vol' } }], find: [{ name: 'low', valueOf: 'x', at: '24 h' }] },
      { id: 's', kind: 'solve', vary: { parameter: 'amt', as: 'amt_new', min: '0.1 g', max: '10 g' }, target: { value: 'low', equals: '0.1 g / L' } },
    ],
  });
  assert.ok(r.ok);
  if (r.ok) assert.deepEqual(r.report.cautions.map((c) => c.kind), ['dosing']);
});
