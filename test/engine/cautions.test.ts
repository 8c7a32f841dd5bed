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
