// The list of the study format's fields (src/study/format-fields.ts) against the types in
// src/study/types.ts: the checks below are types, compiled by `npm run typecheck`, so a field
// added to a cell type and not to the list fails the compile. The browser test
// test/browser/editor-fields.test.ts walks the list and finds each field's control.
import { it } from 'node:test';
import assert from 'node:assert/strict';
import type { Cell, CellKind } from '../../src/study/types.ts';
import { FORMAT_FIELDS, STUDY_FIELDS, fieldPathOf, fieldsIn, type FieldPath } from '../../src/study/format-fields.ts';
import type { Study } from '../../src/study/types.ts';

/** True when A and B are the same type (neither wider). */
type Equals<A, B> = (<T>() => T extends A ? 1 : 2) extends (<T>() => T extends B ? 1 : 2) ? true : false;
const check = <T extends true>(): T | undefined => undefined;
type Listed<K extends CellKind> = (typeof FORMAT_FIELDS)[K][number];
type Typed<K extends CellKind> = FieldPath<Extract<Cell, { kind: K }>>;

// each kind's list names exactly the fields its type has (neither fewer nor more)
check<Equals<Listed<'parameters'>, Typed<'parameters'>>>();
check<Equals<Listed<'rate'>, Typed<'rate'>>>();
check<Equals<Listed<'phase'>, Typed<'phase'>>>();
check<Equals<Listed<'simulate'>, Typed<'simulate'>>>();
check<Equals<Listed<'data'>, Typed<'data'>>>();
check<Equals<Listed<'fit'>, Typed<'fit'>>>();
check<Equals<Listed<'nca'>, Typed<'nca'>>>();
check<Equals<Listed<'note'>, Typed<'note'>>>();
check<Equals<keyof typeof FORMAT_FIELDS, CellKind>>();
// the study's own fields, every one
check<Equals<(typeof STUDY_FIELDS)[number], keyof Study>>();
// the paths are what the types say: a tuple, a list of names and a record are one field each
check<Equals<Extract<Typed<'parameters'>, `items[].range${string}`>, 'items[].range'>>();
check<Equals<Extract<Typed<'simulate'>, `tolerance${string}`>, 'tolerance.relative' | 'tolerance.absolute'>>();
check<Equals<Extract<Typed<'fit'>, `observe${string}`>, 'observe'>>();
// @ts-expect-error a field the types do not have cannot be listed
const wrong: ReadonlyArray<Typed<'rate'>> = ['rate', 'law'];
void wrong;

it('a field\'s path leaves out list positions', () => {
  assert.equal(fieldPathOf('find[2].from'), 'find[].from');
  assert.equal(fieldPathOf('items[0].range[1]'), 'items[].range');
  assert.equal(fieldPathOf('rows[3][1]'), 'rows');
});

it('finds the fields present in a cell document, down to the listed fields', () => {
  const run = {
    id: 'run', kind: 'simulate', rates: ['c'], from: '0 h', to: '72 h', tolerance: { absolute: '1e-6 mg / L' },
    events: [{ at: '0 h', every: '12 h', count: 'n', add: { C: '1 mg / L', D: '2 mg / L' } }],
    find: [{ name: 'x', minimum: 'C', from: '60 h', glance: true }],
  };
  assert.deepEqual(fieldsIn(run), [
    'id', 'kind', 'rates', 'from', 'to', 'tolerance.absolute',
    'events[0].at', 'events[0].every', 'events[0].count', 'events[0].add',
    'find[0].name', 'find[0].minimum', 'find[0].from', 'find[0].glance',
  ]);
  assert.deepEqual(fieldsIn({ id: 'p', kind: 'parameters', items: [{ name: 'k', value: '1', range: ['0', '2'], extra: 1 }] }),
    ['id', 'kind', 'items[0].name', 'items[0].value', 'items[0].range', 'items[0].extra']);
});
