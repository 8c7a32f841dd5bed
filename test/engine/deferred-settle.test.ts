// A session that defers its Monte Carlo cells (as the app's worker does): which deferred work an
// edit holds back, and what a pending cell shows meanwhile. The study is the trough template
// (invented numbers) with fewer samples; the reference for every figure is the unsliced
// evaluation of the same document with the same seed, equal bit for bit (the report's JSON).
// - Work whose inputs an edit changed does not start until the `startable` time passes the edit
//   (the worker gives "100 ms ago"); work the edit did not reach goes on, or starts, at once.
// - A pending cell never shows a failure of its previous inputs, and a cell that fails on its
//   own or on a failed input that is not pending is not left pending: its error shows at once.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { openStudy, type Cell, type CellReport, type Report, type StudySession } from '../../src/index.ts';

type Doc = { format: string; version: number; title: string; cells: Cell[] };
const MC = 'between-patients';

/** The template with `samples` samples, and the cells in `extra` at its end. */
function study(samples: number, extra: Cell[] = []): Doc {
  const d = JSON.parse(readFileSync(new URL('../../examples/trough-in-range-probability.ratebook.json', import.meta.url), 'utf8')) as Doc;
  d.cells = [...d.cells.map((c) => (c.kind === 'uncertainty' ? { ...c, samples } : c)), ...extra];
  return d;
}

/** A second Monte Carlo on an input of its own (invented), which reads nothing of the regimen. */
const OTHER: Cell[] = [
  { id: 'mass', kind: 'parameters', items: [{ name: 'w', value: '70 kg', spread: { distribution: 'lognormal', cv: 0.1 } }, { name: 'w2', value: 'w * 2' }] } as Cell,
  { id: 'mc-mass', kind: 'uncertainty', of: ['w2'], samples: 80 } as Cell,
];
/** A cell reading the Monte Carlo's names. */
const AFTER: Extract<Cell, { kind: 'parameters' }> = { id: 'after', kind: 'parameters', items: [{ name: 'margin', value: '1 mg / L' }, { name: 'upper', value: 'trough_p975 + margin' }] };

function open(doc: Doc, defer = true): StudySession {
  const o = openStudy(doc, { defer });
  assert.ok(o.ok);
  return o.session;
}

const json = (r: Report) => JSON.stringify(r);
const cellOf = (r: Report, id: string): CellReport => r.cells.find((c) => c.id === id)!;

/** The document with a regimen item's value replaced. */
function withItem(doc: Doc, name: string, value: string): Doc {
  return { ...doc, cells: doc.cells.map((c) => (c.id === 'regimen' && c.kind === 'parameters' ? { ...c, items: c.items.map((it) => (it.name === name ? { ...it, value } : it)) } : c)) };
}
const regimen = (doc: Doc) => doc.cells.find((c) => c.id === 'regimen')!;
const cell = (doc: Doc, id: string) => doc.cells.find((c) => c.id === id)!;

/** Runs the deferred work to the end, whatever its stamps. */
function finish(s: StudySession): void {
  while (s.work(0));
}

describe('deferred work an edit did not reach goes on; work it reached waits for the pause', () => {
  it('an edit of the note mid-run: the samples go on at once, whatever the startable time', () => {
    const doc = study(120);
    const s = open(doc);
    for (let k = 0; k < 30; k++) s.work(0, -Infinity);
    const note = cell(doc, 'caution') as Extract<Cell, { kind: 'note' }>;
    const edited = { ...note, text: `${note.text} More.` };
    assert.ok(s.apply({ type: 'replace', cell: edited }).ok);
    // the startable time is before the edit, as in the worker 100 ms after it
    const w = s.work(0, performance.now() - 100)!;
    assert.equal(w.notBefore, undefined);
    assert.equal(w.progress!.done, 31);
    finish(s);
    assert.equal(json(s.report()), json(open({ ...doc, cells: doc.cells.map((c) => (c === note ? edited : c)) }, false).report()));
  });

  it('an edit of CL: nothing starts before the startable time passes the edit; then it starts from its first sample', () => {
    const doc = study(100);
    const s = open(doc);
    for (let k = 0; k < 30; k++) s.work(0);
    const before = performance.now();
    const next = withItem(doc, 'CL', '5 L / h');
    assert.ok(s.apply({ type: 'replace', cell: regimen(next) }).ok);
    const after = performance.now();
    const held = s.work(0, before - 100)!;
    assert.ok(held.notBefore! >= before && held.notBefore! <= after, 'the edit\'s time');
    assert.equal(held.progress, undefined);
    assert.equal(s.work(0, held.notBefore! - 1)!.notBefore, held.notBefore, 'still held just before it');
    assert.equal(s.work(0, held.notBefore!)!.progress!.done, 1);
    finish(s);
    assert.equal(json(s.report()), json(open(next, false).report()));
  });

  it('two Monte Carlo cells, CL edited: the one on CL waits, the other starts at once, and the first follows', () => {
    const doc = study(60, OTHER);
    const s = open(doc);
    assert.deepEqual(s.pending(), [MC, 'mc-mass']);
    s.work(0);
    assert.equal(s.progress()!.cell, MC);
    const next = withItem(doc, 'CL', '6 L / h');
    const at = performance.now();
    assert.ok(s.apply({ type: 'replace', cell: regimen(next) }).ok);
    const early = at - 100;
    const w = s.work(0, early)!;
    assert.equal(w.progress!.cell, 'mc-mass', 'the cell the edit did not reach starts');
    let n = 1;
    while (s.pending().includes('mc-mass')) { assert.equal(s.work(0, early)!.notBefore, undefined); n++; }
    assert.equal(n, 80, 'one sample a slice, then its result');
    assert.deepEqual(s.pending(), [MC]);
    assert.ok(s.work(0, early)!.notBefore! >= at, 'then the edited one waits for the pause');
    finish(s);
    assert.equal(json(s.report()), json(open(next, false).report()));
  });

  it('a cell reading the Monte Carlo\'s names never starts before it, even while it waits for the pause', () => {
    const doc = study(50, [AFTER]);
    const s = open(doc);
    finish(s);
    const upper = () => (cellOf(s.report(), 'after') as { values: Record<string, unknown> }).values.upper;
    const old = upper();
    const at = performance.now();
    assert.ok(s.apply({ type: 'replace', cell: regimen(withItem(doc, 'CL', '3 L / h')) }).ok);
    assert.deepEqual(s.pending(), [MC, 'after']);
    assert.ok(s.work(0, at - 100)!.notBefore! >= at);
    assert.deepEqual(upper(), old, 'the reader keeps its value, pending');
    assert.deepEqual(s.pending(), [MC, 'after']);
  });
});

describe('what a pending cell shows', () => {
  it('a reader of pending names with a mistake of its own shows it at once, not when the Monte Carlo ends', () => {
    const doc = study(40, [AFTER]);
    const s = open(doc);
    assert.deepEqual(s.pending(), [MC, 'after']);
    const typo = { ...AFTER, items: [AFTER.items[0], { name: 'upper', value: 'trough_p975 + margn' }] } as Cell;
    const r = s.apply({ type: 'replace', cell: typo });
    assert.ok(r.ok);
    assert.deepEqual(s.pending(), [MC]);
    const after = cellOf(r.report, 'after');
    assert.equal(after.ok, false);
    assert.match(after.error!.message, /margn/);
    assert.equal(after.error!.path, 'cells[6].items[1].value');
    finish(s);
    assert.equal(json(s.report()), json(open({ ...doc, cells: doc.cells.map((c) => (c.id === 'after' ? typo : c)) }, false).report()));
  });

  it('the Monte Carlo fails on its inputs (no spread left): its error once it has run; spreads back: pending with that error not shown, then its figures', () => {
    const doc = study(40);
    const s = open(doc);
    finish(s);
    const r0 = regimen(doc) as Extract<Cell, { kind: 'parameters' }>;
    const plain = { ...r0, items: r0.items.map(({ spread: _s, ...it }) => it) };
    const bad = { ...doc, cells: doc.cells.map((c) => (c === r0 ? plain : c)) };
    assert.ok(s.apply({ type: 'replace', cell: plain }).ok);
    finish(s);
    const failed = cellOf(s.report(), MC);
    assert.equal(failed.ok, false);
    assert.match(failed.error!.message, /no value with a spread/);
    assert.equal(json(s.report()), json(open(bad, false).report()));
    // CL fixed: pending again, and its failure on the old CL is not shown meanwhile
    const fixed = s.apply({ type: 'replace', cell: regimen(doc) });
    assert.ok(fixed.ok);
    assert.deepEqual(s.pending(), [MC]);
    const shown = cellOf(fixed.report, MC);
    assert.deepEqual(shown, { id: MC, kind: 'uncertainty', ...(shown.title ? { title: shown.title } : {}), ok: true });
    assert.ok(fixed.changed.includes(MC));
    finish(s);
    assert.equal(json(s.report()), json(open(doc, false).report()));
  });

  it('a pending reader that also reads a failed name that is not pending fails at once with the wait', () => {
    const doc = study(40, [AFTER, { id: 'other', kind: 'parameters', items: [{ name: 'extra', value: '2 mg / L' }] } as Cell]);
    const s = open(doc);
    const reader = { ...AFTER, items: [AFTER.items[0], { name: 'upper', value: 'trough_p975 + extra' }] } as Cell;
    // moved after 'other', which then fails
    const edited = { ...doc, cells: [...doc.cells.filter((c) => c.id !== 'after'), reader] };
    assert.ok(s.apply({ type: 'document', study: edited }).ok);
    assert.deepEqual(s.pending(), [MC, 'after']);
    const broken = { ...edited, cells: edited.cells.map((c) => (c.id === 'other' ? { ...c, items: [{ name: 'extra', value: '2 mg /' }] } as Cell : c)) };
    const r = s.apply({ type: 'replace', cell: cell(broken, 'other') });
    assert.ok(r.ok);
    assert.deepEqual(s.pending(), [MC]);
    const after = cellOf(r.report, 'after');
    assert.deepEqual(after.waitsOn, ['other']);
    finish(s);
    assert.equal(json(s.report()), json(open(broken, false).report()));
  });

  it('the Monte Carlo cell\'s own field error, then fixed: pending with the error gone, not kept until it finishes', () => {
    const doc = study(40);
    const s = open(doc);
    const mc = cell(doc, MC);
    const r = s.apply({ type: 'replace', cell: { ...mc, samples: 200_000 } as Cell });
    assert.ok(r.ok);
    assert.deepEqual(s.pending(), []);
    assert.equal(cellOf(r.report, MC).ok, false);
    assert.match(cellOf(r.report, MC).error!.path, /samples$/);
    const back = s.apply({ type: 'replace', cell: mc });
    assert.ok(back.ok);
    assert.deepEqual(s.pending(), [MC]);
    assert.equal(cellOf(back.report, MC).ok, true);
    assert.equal(cellOf(back.report, MC).error, undefined);
    finish(s);
    assert.equal(json(s.report()), json(open(doc, false).report()));
  });
});
