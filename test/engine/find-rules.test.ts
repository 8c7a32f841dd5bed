// Questions of a simulate cell as a document: changing a question's kind keeps what carries
// over and gives the new kind what it needs, so the result is a valid question (the study
// format's own check) that the engine answers correctly (closed forms of Newton cooling).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import {
  FIND_KINDS, findKindOf, needsLevel, switchFind, withFindState, withFindUnit, withFindField, freshFindName, readStudy, runStudy,
  type FindKind, type FindQuery, type Report,
} from '../../src/index.ts';
import { near } from './helpers.ts';

/** Newton cooling from 80 degC toward 20 degC with k = 0.5 / h, run for 10 h. */
function cooling(find: FindQuery[]) {
  return {
    format: 'ratebook-study', version: 1, title: 'cooling',
    cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }] },
      { id: 'c', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - 20 degC)', initial: '80 degC' },
      { id: 'run', kind: 'simulate', rates: ['c'], from: '0 h', to: '10 h', find },
    ],
  };
}

function answer(find: FindQuery): { value: number; unit: string; si: number } {
  const r = runStudy(cooling([find]));
  assert.ok(r.ok);
  const run = (r as { report: Report }).report.cells.find((c) => c.id === 'run')!;
  assert.equal(run.ok, true, JSON.stringify(run.error));
  return (run.results as Record<string, { value: number; unit: string; si: number }>)[find.name];
}

/** A question from a literal (a literal's inherited valueOf hides the optional field of that name from the type checker). */
const q = (o: object): FindQuery => o as FindQuery;

const crossing = q({ name: 't_50', crossing: 'T', level: '50 degC', direction: 'down', occurrence: 1, unit: 'min', from: '0 h', to: '10 h' });

describe('question rules', () => {
  it('uses the one list of kinds the study format defines', () => {
    assert.deepEqual([...FIND_KINDS], ['crossing', 'maximum', 'minimum', 'timeOfMaximum', 'timeOfMinimum', 'valueOf', 'integralOf', 'timeAbove', 'timeBelow']);
  });

  it('reads a question\'s kind from its own field, never an inherited one', () => {
    assert.equal(findKindOf(crossing), 'crossing');
    assert.equal(findKindOf(q({ name: 'm', maximum: 'T' })), 'maximum');
    // every object inherits valueOf: only an own field counts
    assert.equal(findKindOf({ name: 'x' } as FindQuery), 'crossing');
    assert.equal(findKindOf({ name: 'v', valueOf: 'T', at: '1 h' }), 'valueOf');
    assert.deepEqual(FIND_KINDS.filter(needsLevel), ['crossing', 'timeAbove', 'timeBelow']);
  });

  it('from every kind to every kind, the result is a valid question of the new kind', () => {
    const start: Record<FindKind, FindQuery> = Object.fromEntries(FIND_KINDS.map((k) => [k, switchFind(crossing, k)])) as Record<FindKind, FindQuery>;
    for (const from of FIND_KINDS) {
      for (const to of FIND_KINDS) {
        const before = structuredClone(start[from]);
        const f = switchFind(start[from], to);
        assert.deepEqual(start[from], before, 'the input is left alone');
        assert.equal(findKindOf(f), to);
        assert.deepEqual(FIND_KINDS.filter((k) => Object.prototype.hasOwnProperty.call(f, k)), [to], `${from} → ${to}: one kind field`);
        assert.equal(f[to], 'T', 'the state carries over');
        assert.equal(f.name, 't_50', 'the name carries over');
        assert.deepEqual([f.from, f.to], ['0 h', '10 h'], 'the window carries over');
        const read = readStudy(cooling([f]));
        assert.ok(read.ok);
        assert.equal(read.ok && read.cellProblems.size, 0, `${from} → ${to}: ${JSON.stringify(read.ok && [...read.cellProblems])}`);
      }
    }
  });

  it('keeps the level between kinds that compare with one, and the answer\'s unit while it stays a time', () => {
    const above = switchFind(crossing, 'timeBelow');
    assert.deepEqual(above, { name: 't_50', timeBelow: 'T', level: '50 degC', unit: 'min', from: '0 h', to: '10 h' });
    // closed form: T = 20 + 60 e^(-t/2h) falls through 50 degC at t = 2 ln 2 h = 83.18 min,
    // and stays below for the rest of the 10 h run: 600 - 83.18 = 516.82 min
    near(answer(crossing).value, 120 * Math.LN2, 1e-6);
    assert.equal(answer(above).unit, 'min');
    near(answer(above).value, 600 - 120 * Math.LN2, 1e-6);
    const back = switchFind(above, 'crossing');
    assert.deepEqual(back, { name: 't_50', crossing: 'T', level: '50 degC', unit: 'min', from: '0 h', to: '10 h' });
  });

  it('drops what the new kind does not read, and fills in what it needs', () => {
    const max = switchFind(crossing, 'maximum');
    assert.deepEqual(max, { name: 't_50', maximum: 'T', from: '0 h', to: '10 h' }, 'no level, direction, occurrence, nor a unit of time for a temperature');
    // closed form: the largest value of a falling curve is its start, 80 degC
    near(answer(max).value, 80, 1e-9);
    const at = switchFind(max, 'valueOf');
    assert.equal(at.at, '0 h');
    near(answer({ ...at, at: '2 h' }).value, 20 + 60 * Math.exp(-1), 1e-6); // closed form: 20 + 60 e^-1 = 42.07 degC
    const min = switchFind({ ...at, unit: 'degF' }, 'minimum');
    assert.equal(min.unit, 'degF', 'a temperature stays a temperature');
    assert.equal(min.at, undefined);
    // closed form: T(10 h) = 20 + 60 e^-5 degC, in degF: x 9/5 + 32
    near(answer(min).value, (20 + 60 * Math.exp(-5)) * 9 / 5 + 32, 1e-6);
    const crossed = switchFind(max, 'crossing');
    assert.equal(crossed.level, '0', 'a level to replace');
  });

  it('changes the state asked about, the unit shown, and names new questions', () => {
    assert.deepEqual(withFindState(q({ name: 'a', integralOf: 'T' }), 'C'), { name: 'a', integralOf: 'C' });
    assert.deepEqual(withFindUnit(crossing, 'h').unit, 'h');
    assert.equal('unit' in withFindUnit(crossing, undefined), false);
    assert.equal(freshFindName([]), 'q1');
    assert.equal(freshFindName([q({ name: 'q2', maximum: 'T' }), q({ name: 'q3', minimum: 'T' })]), 'q4');
    assert.equal(freshFindName([q({ name: 'q1', maximum: 'T' })]), 'q2');
  });
});

describe('a question\'s optional fields', () => {
  it('sets a window end, and a blank one is removed (the run\'s own end)', () => {
    const q = { name: 'lo', minimum: 'T' } as FindQuery;
    const windowed = withFindField(withFindField(q, 'from', '2 h'), 'to', '4 h');
    assert.deepEqual(windowed, { name: 'lo', minimum: 'T', from: '2 h', to: '4 h' });
    assert.deepEqual(withFindField(windowed, 'to', ''), { name: 'lo', minimum: 'T', from: '2 h' });
    assert.deepEqual(q, { name: 'lo', minimum: 'T' }, 'the input is never changed');
    // closed form: the smallest T over 2-4 h is at 4 h, 20 + 60 e^{-2} degC
    near(answer(windowed).value, 20 + 60 * Math.exp(-2), 1e-6);
  });

  it('sets glance when ticked and removes it when not (false is its default)', () => {
    const q = { name: 'lo', minimum: 'T' } as FindQuery;
    assert.equal(withFindField(q, 'glance', true).glance, true);
    assert.equal('glance' in withFindField({ ...q, glance: true } as FindQuery, 'glance', false), false);
  });

  it('sets an occurrence, valid for the format\'s check', () => {
    const q = withFindField({ name: 'x', crossing: 'T', level: '50 degC' } as FindQuery, 'occurrence', 1);
    const r = readStudy(cooling([q]));
    assert.ok(r.ok && r.cellProblems.size === 0);
  });
});
