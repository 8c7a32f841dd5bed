// findWord: where a name stands in a field's text as a whole word (for underlining it).
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { findWord } from '../../src/expression/find-word.ts';

it('finds a name only where it stands alone, not inside a longer name', () => {
  // hand-worked: in "k_el * k", "k" first stands alone at index 7 (k_el occupies 0–3)
  assert.deepEqual(findWord('k_el * k', 'k'), [7, 8]);
  assert.equal(findWord('kk + k2', 'k'), undefined);
  assert.deepEqual(findWord('log(2) / t_half', 't_half'), [9, 15]);
});

it('treats the characters a regular expression gives meaning to as plain text', () => {
  // hand-worked: "a.b" is not a pattern matching "axb"
  assert.equal(findWord('axb', 'a.b'), undefined);
  assert.deepEqual(findWord('2 * #c1', '#c1'), [4, 7]);
});
