// How a session tells the cells an edit did not touch: by identity (its document is its own copy,
// and edits copy what they write), else by content. The reference for each check is a study
// evaluated afresh from the same document (what the report must equal, and the cautions it must
// carry), and the edit itself: cells whose content it left alone must not re-run.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { openStudy, type Cell, type StudySession } from '../../src/index.ts';

type Doc = { format: string; version: number; title: string; cells: Cell[] };
const template = (name: string): Doc => JSON.parse(readFileSync(new URL(`../../examples/${name}.ratebook.json`, import.meta.url), 'utf8'));

function open(doc: unknown): StudySession {
  const o = openStudy(doc);
  assert.ok(o.ok);
  return o.session;
}
const json = (s: StudySession) => JSON.stringify(s.report());

describe('a session\'s unchanged cells', () => {
  it('keeps its own copy of the document: the caller changing its objects afterwards changes nothing', () => {
    const doc = template('plasma-levels');
    const s = open(doc);
    const before = json(s);
    const fresh = json(open(template('plasma-levels')));
    assert.equal(before, fresh);
    // change every parameter in the caller's objects, in place
    for (const c of doc.cells) if (c.kind === 'parameters') for (const it of c.items) it.value = '1';
    const title = { type: 'retitle' as const, title: 'Renamed' };
    assert.ok(s.apply(title).ok);
    const expected = open({ ...template('plasma-levels'), title: 'Renamed' });
    assert.equal(json(s), json(expected));
  });

  it('a whole-document edit with every cell a new object of the same content re-runs nothing; one cell changed re-runs it and what reads it', () => {
    const doc = template('cooling-data-fit');
    const s = open(doc);
    const same = s.apply({ type: 'document', study: template('cooling-data-fit') });
    assert.ok(same.ok);
    assert.deepEqual(same.rerun, []);
    assert.deepEqual(same.changed, []);
    const changed = template('cooling-data-fit');
    const data = changed.cells.find((c) => c.kind === 'data') as Extract<Cell, { kind: 'data' }>;
    data.csv = (data.csv as string).replace('0,71.8', '0,72.4');
    const r = s.apply({ type: 'document', study: changed });
    assert.ok(r.ok);
    assert.ok(r.rerun.includes(data.id));
    assert.ok(r.rerun.length < changed.cells.length, 'the cells before the data did not re-run');
    assert.equal(json(s), json(open(changed)));
  });

  it('the cautions follow a note\'s words as a fresh evaluation of the same document gives them', () => {
    const doc = template('lake-first-order-decay');
    const s = open(doc);
    const dosing = () => s.report().cautions.some((c) => c.kind === 'dosing');
    assert.equal(dosing(), false);
    const note = { id: 'words', kind: 'note', text: 'A bolus of tracer.' } as Cell;
    assert.ok(s.apply({ type: 'insert', index: 0, cell: note }).ok);
    assert.equal(dosing(), true);
    const withNote = { ...doc, cells: [note, ...doc.cells] };
    assert.deepEqual(s.report().cautions, open(withNote).report().cautions);
    assert.ok(s.apply({ type: 'replace', cell: { ...note, text: 'A spill of tracer.' } }).ok);
    assert.equal(dosing(), false);
    assert.ok(s.apply({ type: 'remove', id: 'words' }).ok);
    assert.equal(json(s), json(open(doc)));
  });
});
