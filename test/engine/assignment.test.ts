// `name = value` typed where a parameter's name goes: the name before the first "=" (the study
// format's name rule, docs/study-format.md: [A-Za-z_][A-Za-z0-9_]*) and the value
// after it. A comparison ("==") or a text that is no name before "=" stays a name, for the
// name check to word.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { splitAssignment } from '../../src/index.ts';

describe('splitAssignment', () => {
  it('reads a name and its value', () => {
    assert.deepEqual(splitAssignment('k = 0.35 / h'), { name: 'k', value: '0.35 / h' });
    assert.deepEqual(splitAssignment('  T_a=4 degC'), { name: 'T_a', value: '4 degC' });
    assert.deepEqual(splitAssignment('t_half = log(2) / k'), { name: 't_half', value: 'log(2) / k' });
    assert.deepEqual(splitAssignment('k ='), { name: 'k', value: '' }, 'the value still to come');
  });

  it('leaves alone what is no name and its value', () => {
    for (const text of ['k', 'k == 1', '2k = 1', 'dT/dt = -k', ' = 1', 'a b = 1']) assert.equal(splitAssignment(text), undefined, text);
  });
});
