import { it } from 'node:test';
import assert from 'node:assert/strict';
import { timeFactor, timeUnitChoices } from '../../components/plots/time-units.ts';

// Definitions of the units (SI brochure, non-SI units accepted for use with the SI):
// 1 min = 60 s, 1 h = 3600 s, 1 d = 86 400 s.
it('converts between the switch units by their definitions', () => {
  assert.equal(timeFactor('h', 'min'), 60);
  assert.equal(timeFactor('h', 's'), 3600);
  assert.equal(timeFactor('d', 'h'), 24);
  assert.equal(timeFactor('min', 'h'), 1 / 60);
  assert.equal(timeFactor('d', 'd'), 1);
});

it('has no factor for a unit outside the table', () => {
  assert.equal(timeFactor('week', 'd'), undefined);
  assert.equal(timeFactor('h', 'ms'), undefined);
});

it('offers the units in which the span reads between 0.5 and 10 000', () => {
  // hand-worked: 10 h = 600 min = 36 000 s (too many) = 0.4167 d (too few)
  assert.deepEqual(timeUnitChoices('h', 10), ['min', 'h']);
  // hand-worked: 48 h = 2880 min = 2 d; 172 800 s is too many
  assert.deepEqual(timeUnitChoices('h', 48), ['min', 'h', 'd']);
});

it('always offers the plot\'s own unit, and only it when the unit is not in the table', () => {
  // hand-worked: 0.001 h = 3.6 s; 0.06 min and 4.2e-5 d are too few, yet h stays
  assert.deepEqual(timeUnitChoices('h', 0.001), ['s', 'h']);
  assert.deepEqual(timeUnitChoices('week', 3), ['week']);
});
