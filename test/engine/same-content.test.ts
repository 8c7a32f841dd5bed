// Two documents with the same content (src/study/same.ts), told without writing them out, and a
// document copied without serialising (src/study/limits.ts `copyPlain`). The reference for both
// is the platform: `JSON.stringify` with its keys sorted (ECMA-262's JSON serialisation) for
// sameness, and `structuredClone` (the HTML standard's structured clone) for copies, over
// random JSON values from the fixed seed.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { sameContent } from '../../src/index.ts';
import { copyPlain, valueLimitProblem, MAX_VALUES } from '../../src/study/limits.ts';

/** JSON with every object's keys in sorted order: equal texts, same content. */
function canonical(v: unknown): string {
  return JSON.stringify(v, (_k, x) => (x && typeof x === 'object' && !Array.isArray(x) ? Object.fromEntries(Object.keys(x).sort().map((k) => [k, x[k]])) : x));
}

describe('sameContent', () => {
  it('agrees with sorted JSON on random pairs, and on a value and its copy', () => {
    fc.assert(fc.property(fc.jsonValue(), fc.jsonValue(), (a, b) => {
      assert.equal(sameContent(a, b), canonical(a) === canonical(b));
      assert.equal(sameContent(a, JSON.parse(JSON.stringify(a))), true);
    }), { numRuns: 500 });
  });

  it('tells apart values that differ in one place deep inside', () => {
    fc.assert(fc.property(fc.jsonValue(), fc.jsonValue(), (a, x) => {
      const doc = { cells: [{ id: 'd', rows: [[1, 2], [3, a]] }] };
      const other = { cells: [{ id: 'd', rows: [[1, 2], [3, x]] }] };
      assert.equal(sameContent(doc, other), canonical(a) === canonical(x));
    }), { numRuns: 300 });
  });

  it('hand-worked: key order does not matter, an undefined key counts as absent, a table against its text differs', () => {
    assert.equal(sameContent({ a: 1, b: [2, 3] }, { b: [2, 3], a: 1 }), true);
    assert.equal(sameContent({ a: 1, c: undefined }, { a: 1 }), true);
    assert.equal(sameContent({ a: 1 }, { a: 1, b: null }), false);
    assert.equal(sameContent([1, 2], { 0: 1, 1: 2 }), false);
    const rows = Array.from({ length: 10_000 }, (_, i) => [i, 2 * i]);
    assert.equal(sameContent({ csv: 't,T\n0,0' }, { rows }), false);
    assert.equal(sameContent({ rows }, { rows: rows.map((r) => [...r]) }), true);
  });
});

describe('copyPlain', () => {
  it('copies like structuredClone and shares no list or object with the original', () => {
    fc.assert(fc.property(fc.jsonValue(), (v) => {
      const c = copyPlain(v);
      assert.deepEqual(c, structuredClone(v));
      const shared = (a: unknown, b: unknown): boolean => typeof a === 'object' && a !== null && (a === b || Object.keys(a).some((k) => shared((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k])));
      assert.equal(shared(v, c), false);
    }), { numRuns: 500 });
  });

  it('refuses what structuredClone refuses (a function inside)', () => {
    assert.throws(() => copyPlain({ a: [1, () => 2] }));
  });
});

describe('valueLimitProblem on tables', () => {
  // hand-worked: a document object (1) holding a list (1) of n rows of 3 numbers counts 2 + 4n values
  it('counts a row and its entries without visiting them one by one, and still stops past the bound', () => {
    const rowsFor = (n: number) => ({ rows: Array.from({ length: n }, () => [1, 2, 3]) });
    const fits = Math.floor((MAX_VALUES - 2) / 4);
    assert.equal(valueLimitProblem(rowsFor(fits)), undefined);
    const over = valueLimitProblem(rowsFor(fits + 1));
    assert.ok(over && /more than/.test(over.message), JSON.stringify(over));
  });
});
