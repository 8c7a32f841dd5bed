// The whole-document edit: what undo and redo send. applyEdit checks it like a study being
// opened; the session re-runs only the cells whose text differs from what it holds.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { applyEdit, openStudy, runStudy, type Report, type Study, type StudySession } from '../../src/index.ts';
import { near } from './helpers.ts';

const cells = () => [
  { id: 'inputs', kind: 'parameters', items: [{ name: 'k', value: '0.35 / h' }, { name: 'Ta', value: '4 degC' }] },
  { id: 'other', kind: 'parameters', items: [{ name: 'z', value: '5 kg' }] },
  { id: 'derived', kind: 'parameters', items: [{ name: 't_half', value: 'log(2) / k' }] },
  { id: 'cooling', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '70 degC' },
  { id: 'n', kind: 'note', text: 'a note' },
];

const doc = (over: Partial<Study> = {}): Study => ({ format: 'ratebook-study', version: 1, title: 'before', cells: cells(), ...over } as Study);

function open(study: Study = doc()): StudySession {
  const o = openStudy(structuredClone(study));
  assert.ok(o.ok);
  return (o as { session: StudySession }).session;
}

function fresh(study: Study): Report {
  const r = runStudy(structuredClone(study));
  assert.ok(r.ok);
  return (r as { report: Report }).report;
}

const tHalf = (r: Report) => (r.cells.find((c) => c.id === 'derived')!.values as Record<string, { si: number }>).t_half.si;

describe('applyEdit with a whole document', () => {
  it('replaces title, author, description and cells, leaving its input alone', () => {
    const next = doc({ title: 'after', author: 'A. Reviewer', description: 'why', cells: cells().slice(0, 2) as Study['cells'] });
    const before = doc();
    const out = applyEdit(before, { type: 'document', study: next });
    assert.ok(out.ok);
    if (!out.ok) return;
    assert.equal(out.study.title, 'after');
    assert.equal(out.study.author, 'A. Reviewer');
    assert.equal(out.study.description, 'why');
    assert.deepEqual(out.study.cells.map((c) => c.id), ['inputs', 'other']);
    assert.equal(before.title, 'before');
    assert.equal(before.cells.length, 5);
    // a copy: changing the result does not reach the edit's own document
    (out.study.cells[0] as { title?: string }).title = 'changed';
    assert.equal((next.cells[0] as { title?: string }).title, undefined);
  });

  it('refuses what is not a study, naming the path, as opening one would', () => {
    const cases: Array<[unknown, string, RegExp]> = [
      [{ ...doc(), format: 'other' }, 'format', /not a Ratebook study/],
      [{ ...doc(), cells: [...cells(), { id: 'inputs', kind: 'note', text: '' }] }, 'cells[5].id', /used twice/],
      [{ ...doc(), cells: [{ id: 'x', kind: 'spreadsheet' }] }, 'cells[0].kind', /unknown cell kind/],
      [{ ...doc(), version: 99 }, 'version', /newer Ratebook/],
      [{ ...doc(), title: () => 'x' }, '', /plain data/],
      ['not an object', '', /JSON|object/],
    ];
    for (const [study, path, message] of cases) {
      const out = applyEdit(doc(), { type: 'document', study });
      assert.equal(out.ok, false, path);
      if (out.ok) continue;
      assert.equal(out.error.path, path);
      assert.match(out.error.message, message);
    }
  });

  it('lists the field problems of the new document\'s cells', () => {
    const bad = cells();
    (bad[3] as Record<string, unknown>).unit = 7;
    const out = applyEdit(doc(), { type: 'document', study: doc({ cells: bad as Study['cells'] }) });
    assert.ok(out.ok && out.problems);
    if (!out.ok) return;
    assert.deepEqual([...out.problems!.keys()], ['cooling']);
    assert.match(out.problems!.get('cooling')![0].path, /^cells\[3\]\.unit$/);
  });
});

describe('a session given a whole document', () => {
  it('re-runs only the cells whose text changed, and their users', () => {
    const s = open();
    const next = cells();
    next[0].items![0].value = '0.5 / h';
    const r = s.apply({ type: 'document', study: doc({ cells: next as Study['cells'] }) });
    assert.ok(r.ok);
    if (!r.ok) return;
    assert.deepEqual(r.rerun, ['inputs', 'derived', 'cooling']);
    // closed form: t_half = ln 2 / k = ln 2 / (0.5 / h) = 1.386 h = 4990.7 s
    near(tHalf(r.report), Math.LN2 / 0.5 * 3600);
  });

  it('a document equal to the one it holds re-runs nothing', () => {
    const s = open();
    const r = s.apply({ type: 'document', study: doc() });
    assert.ok(r.ok);
    if (!r.ok) return;
    assert.deepEqual(r.rerun, []);
    assert.deepEqual(r.changed, []);
  });

  it('going back to an earlier document gives the report of that document from scratch', () => {
    const s = open();
    const first = s.document();
    const edited = structuredClone(first);
    (edited.cells[0] as { items: Array<{ value: string }> }).items[0].value = '0.7 / h';
    edited.cells.splice(1, 1);
    edited.title = 'edited';
    s.apply({ type: 'document', study: edited });
    // closed form: ln 2 / (0.7 / h) = 0.990 h = 3564.7 s
    near(tHalf(s.report()), Math.LN2 / 0.7 * 3600);
    const back = s.apply({ type: 'document', study: first });
    assert.ok(back.ok);
    if (!back.ok) return;
    assert.deepEqual(back.rerun, ['inputs', 'other', 'derived', 'cooling']);
    assert.deepEqual(s.document(), first);
    assert.deepEqual(s.report(), fresh(first));
    assert.equal(s.report().title, 'before');
  });

  it('a cell with a field problem carries it, and loses it when the document mends it', () => {
    const s = open();
    const bad = cells();
    (bad[3] as Record<string, unknown>).unit = 7;
    s.apply({ type: 'document', study: doc({ cells: bad as Study['cells'] }) });
    const broken = s.report().cells.find((c) => c.id === 'cooling')!;
    assert.equal(broken.ok, false);
    assert.equal(broken.error?.path, 'cells[3].unit');
    s.apply({ type: 'document', study: doc() });
    assert.deepEqual(s.report(), fresh(doc()));
  });

  it('a refused document changes nothing', () => {
    const s = open();
    const before = JSON.stringify(s.report());
    const r = s.apply({ type: 'document', study: { ...doc(), cells: 'none' } });
    assert.equal(r.ok, false);
    assert.equal(JSON.stringify(s.report()), before);
  });
});
