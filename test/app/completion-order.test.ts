// Which kind of word completion offers first, from the text before the word. The readings are
// those of everyday unit notation (common practice): a number followed by a unit symbol is a
// quantity ("1 g", "2 h"), and a unit continues through "/" and "*" ("100 L / min",
// "3 m^2 / s"); an operator written straight after a number is arithmetic ("0.3 * k").
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { inUnitPlace, offerOrder, NAME_PLACE_ORDER, UNIT_PLACE_ORDER } from '../../components/expr-editor/completion-order.ts';

const NONE = new Set<string>();
const STUDY = new Set(['k', 'V', 'tau']);

it('reads a word right after a number as a unit', () => {
  for (const before of ['1 ', '2 ', '1e-3 ', '0.35', 'k * 2 ', 'exp(-2 ', '5 h + 3 ']) {
    assert.equal(inUnitPlace(before, STUDY), true, before);
  }
});

it('reads a word after a unit and "/" or "*" that follow a number as a unit', () => {
  for (const before of ['100 L / ', '100 L /', '3 m^2 / ', '5 kg * ', '5 kg ', '2 mg / L / ', '1 g*']) {
    assert.equal(inUnitPlace(before, STUDY), true, before);
  }
});

it('reads "*" or "/" straight after a number as arithmetic, so the study\'s names come first', () => {
  assert.deepEqual(offerOrder('0.3 * ', STUDY), NAME_PLACE_ORDER);
  assert.deepEqual(offerOrder('0.693 / ', STUDY), NAME_PLACE_ORDER);
});

it('does not read a unit place after names, other operators, brackets or an exponent', () => {
  for (const before of ['', 'k * ', '1 g + ', '2 ^ ', 'x^2 ', '2^3 ', '(', 'min(1, ', 'k ', '2 h > ', 't < 2 h ? ']) {
    assert.equal(inUnitPlace(before, STUDY), false, before);
  }
});

it('takes a study name spelled like a unit as the name it is', () => {
  // "V" is the volt, but a study that defines V means its own V: "100 mg / V" divides by it
  assert.equal(inUnitPlace('100 mg / V * ', NONE), true);
  assert.equal(inUnitPlace('100 mg / V * ', STUDY), false);
  // "t" is always time in a study, never the tonne
  assert.equal(inUnitPlace('2 t / ', NONE), false);
});

it('lists units first in a unit place and the study\'s names first elsewhere', () => {
  assert.deepEqual(offerOrder('1 ', STUDY), ['unit', 'name', 'function', 'constant']);
  assert.deepEqual(offerOrder('100 L / ', STUDY), UNIT_PLACE_ORDER);
  assert.deepEqual(offerOrder('', STUDY), ['name', 'function', 'constant', 'unit']);
  assert.deepEqual(offerOrder('1 g + ', STUDY), NAME_PLACE_ORDER);
});
