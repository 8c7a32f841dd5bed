// The study store against the real IndexedDB of Chromium: each test opens its own database,
// and a hand-driven clock makes the times exact.
import { expect } from 'chai';
import exampleText from '../../examples/cooling-stock-pot.ratebook.json?raw';
import {
  createStudyStore, exportStudy, studyFileName, exportSeriesCsv, createAutosaver, StoreError,
  listStudies, createStudy, loadStudy, deleteStudy, purgeTrash, listTrash,
  type StudyStore, type AutosaveState,
} from '../../components/store.ts';
import type { Study } from '../../src/index.ts';

let clock = 0;
let runs = 0;
const runId = `${Date.now()}-${Math.random().toString(36).slice(2)}`;

/** A store in a database of its own, on the test clock. */
function freshStore(): StudyStore {
  clock = 1_000_000;
  return createStudyStore({ dbName: `ratebook-test-${runId}-${++runs}`, now: () => clock });
}

function study(title: string, cells: Study['cells'] = []): Study {
  return { format: 'ratebook-study', version: 1, title, cells };
}

const note = (id: string, text = 'plain text'): Study['cells'][number] => ({ id, kind: 'note', text });

/** The rejection of `p` (fails the test when it resolves). */
async function rejection(p: Promise<unknown>): Promise<Error> {
  try {
    await p;
  } catch (err) {
    return err as Error;
  }
  throw new Error('expected the promise to reject, but it resolved');
}

/** Everything a user could see of a store: both lists. */
async function everything(store: StudyStore) {
  return { studies: await store.listStudies(), trash: await store.listTrash() };
}

describe('study store', () => {
  it('creates a blank study at revision 1 with the contract\'s empty document', async () => {
    const store = freshStore();
    const info = await store.createStudy();
    expect(info).to.include({ title: 'Untitled study', cells: 0, revision: 1, created: 1_000_000, updated: 1_000_000 });
    expect(info.id).to.match(/^[a-z2-9]{12}$/);
    const loaded = await store.loadStudy(info.id);
    expect(loaded?.doc).to.deep.equal({ format: 'ratebook-study', version: 1, title: 'Untitled study', cells: [] });
    expect(await store.listStudies()).to.deep.equal([{ id: info.id, title: 'Untitled study', updated: 1_000_000, cells: 0 }]);
  });

  it('creates a study from a template document, as a copy of it', async () => {
    const store = freshStore();
    const template = JSON.parse(exampleText) as Study;
    const info = await store.createStudy(template);
    expect(info.title).to.equal(template.title);
    expect(info.cells).to.equal(template.cells.length);
    template.title = 'changed after creating';
    expect((await store.loadStudy(info.id))?.doc.title).to.equal('Cooling a stock pot: bench, then walk-in');
  });

  it('refuses a template the engine refuses, naming the path, and stores nothing', async () => {
    const store = freshStore();
    const bad = { format: 'ratebook-study', version: 1, title: 'x', cells: [{ id: 'a', kind: 'sorcery' }] } as unknown as Study;
    const err = await rejection(store.createStudy(bad));
    expect(err).to.be.instanceOf(StoreError);
    expect((err as StoreError).code).to.equal('invalid');
    expect(err.message).to.contain('unknown cell kind "sorcery"').and.to.contain('cells[0].kind');
    expect(await everything(store)).to.deep.equal({ studies: [], trash: [] });
  });

  it('stamps each save with the time and one more revision', async () => {
    const store = freshStore();
    const { id } = await store.createStudy();
    clock = 2_000_000;
    const first = await store.saveStudy(id, study('Walk-in', [note('n1')]));
    expect(first).to.include({ id, title: 'Walk-in', cells: 1, revision: 2, created: 1_000_000, updated: 2_000_000 });
    clock = 3_000_000;
    const second = await store.saveStudy(id, study('Walk-in', [note('n1'), note('n2')]));
    expect(second).to.include({ revision: 3, updated: 3_000_000, cells: 2 });
    const loaded = await store.loadStudy(id);
    expect(loaded).to.include({ revision: 3, updated: 3_000_000, created: 1_000_000 });
    expect(loaded?.doc.cells.map((c) => c.id)).to.deep.equal(['n1', 'n2']);
  });

  it('counts every one of several saves started together (one transaction each)', async () => {
    const store = freshStore();
    const { id } = await store.createStudy();
    await Promise.all([1, 2, 3, 4, 5].map((n) => store.saveStudy(id, study(`v${n}`))));
    expect((await store.loadStudy(id))?.revision).to.equal(6);
  });

  it('refuses to save a document the engine refuses and keeps the stored one', async () => {
    const store = freshStore();
    const { id } = await store.createStudy(study('Kept', [note('n1')]));
    const bad = study('Lost', [note('n1'), note('n1')]);
    const err = await rejection(store.saveStudy(id, bad));
    expect((err as StoreError).code).to.equal('invalid');
    expect(err.message).to.contain('"n1" is used twice').and.to.contain('cells[1].id');
    const loaded = await store.loadStudy(id);
    expect(loaded).to.include({ title: 'Kept', revision: 1 });
  });

  it('rolls back a save that the browser cannot store, with a message for the user', async () => {
    const store = freshStore();
    const { id } = await store.createStudy(study('Kept', [note('n1')]));
    const unstorable = study('Lost', [{ ...note('n1'), extra: () => 1 } as unknown as Study['cells'][number]]);
    const err = await rejection(store.saveStudy(id, unstorable));
    expect(err).to.be.instanceOf(StoreError);
    expect((err as StoreError).code).to.equal('storage');
    expect(err.message).to.equal('Could not save the study: the study holds something that cannot be stored (not plain JSON data).');
    expect(await store.loadStudy(id)).to.include({ title: 'Kept', revision: 1 });
  });

  it('rejects operations on a study that does not exist with a not-found error', async () => {
    const store = freshStore();
    for (const op of [
      store.saveStudy('nosuchstudy', study('x')),
      store.renameStudy('nosuchstudy', 'x'),
      store.duplicateStudy('nosuchstudy'),
      store.deleteStudy('nosuchstudy'),
      store.restoreStudy('nosuchstudy'),
    ]) {
      const err = await rejection(op);
      expect((err as StoreError).code).to.equal('not-found');
      expect(err.message).to.contain('"nosuchstudy"');
    }
    expect(await store.loadStudy('nosuchstudy')).to.equal(undefined);
  });

  it('lists studies most recently changed first', async () => {
    const store = freshStore();
    const a = await store.createStudy(study('A'));
    clock += 10;
    const b = await store.createStudy(study('B'));
    clock += 10;
    const c = await store.createStudy(study('C'));
    expect((await store.listStudies()).map((s) => s.title)).to.deep.equal(['C', 'B', 'A']);
    clock += 10;
    await store.saveStudy(a.id, study('A', [note('n')]));
    expect((await store.listStudies()).map((s) => s.id)).to.deep.equal([a.id, c.id, b.id]);
  });

  it('renames a study in its document and its list entry, as a new revision', async () => {
    const store = freshStore();
    const { id } = await store.createStudy(study('Old', [note('n1')]));
    clock += 5;
    expect(await store.renameStudy(id, '  Chiller loop  ')).to.include({ title: 'Chiller loop', revision: 2, updated: 1_000_005 });
    const loaded = await store.loadStudy(id);
    expect(loaded?.doc.title).to.equal('Chiller loop');
    expect(loaded?.doc.cells).to.deep.equal([note('n1')]);
    expect((await store.listStudies())[0].title).to.equal('Chiller loop');
    expect((await store.renameStudy(id, '   ')).title).to.equal('Untitled study');
  });

  it('a saved document with a new title renames its list entry; a blank one is listed as untitled, kept as typed', async () => {
    const store = freshStore();
    const { id } = await store.createStudy(study('Old', [note('n1')]));
    expect((await store.saveStudy(id, study('Walk-in check', [note('n1')]))).title).to.equal('Walk-in check');
    expect((await store.listStudies())[0].title).to.equal('Walk-in check');
    expect((await store.saveStudy(id, study('  ', [note('n1')]))).title).to.equal('Untitled study');
    expect((await store.listStudies())[0].title).to.equal('Untitled study');
    expect((await store.loadStudy(id))?.doc.title).to.equal('  ');
  });

  it('duplicates a study under a new id with "(copy)" after its title, leaving the original alone', async () => {
    const store = freshStore();
    const original = await store.createStudy(study('Tank flush', [note('n1'), note('n2')]));
    await store.saveStudy(original.id, study('Tank flush', [note('n1'), note('n2')]));
    clock += 1;
    const copy = await store.duplicateStudy(original.id);
    expect(copy.id).to.not.equal(original.id);
    expect(copy).to.include({ title: 'Tank flush (copy)', cells: 2, revision: 1 });
    expect((await store.loadStudy(copy.id))?.doc.cells).to.deep.equal([note('n1'), note('n2')]);
    expect(await store.loadStudy(original.id)).to.include({ title: 'Tank flush', revision: 2 });
    expect((await store.listStudies()).map((s) => s.title)).to.deep.equal(['Tank flush (copy)', 'Tank flush']);
  });

  it('moves a deleted study to the trash with its time, and restores it as it was', async () => {
    const store = freshStore();
    const keep = await store.createStudy(study('Keep'));
    const gone = await store.createStudy(study('Gone', [note('n1')]));
    clock = 1_500_000;
    expect(await store.deleteStudy(gone.id)).to.deep.equal({ id: gone.id, title: 'Gone', updated: 1_000_000, cells: 1, deleted: 1_500_000 });
    expect((await store.listStudies()).map((s) => s.id)).to.deep.equal([keep.id]);
    expect(await store.listTrash()).to.deep.equal([{ id: gone.id, title: 'Gone', updated: 1_000_000, cells: 1, deleted: 1_500_000 }]);
    expect(await store.loadStudy(gone.id)).to.include({ deleted: 1_500_000, title: 'Gone' });

    clock = 1_600_000;
    expect((await store.deleteStudy(gone.id)).deleted).to.equal(1_500_000); // the first time is kept

    const restored = await store.restoreStudy(gone.id);
    expect(restored).to.not.have.property('deleted');
    expect(restored).to.include({ revision: 1, updated: 1_000_000 });
    expect(await store.listTrash()).to.deep.equal([]);
    expect((await store.listStudies()).map((s) => s.title).sort()).to.deep.equal(['Gone', 'Keep']);
    expect((await store.loadStudy(gone.id))?.doc.cells).to.deep.equal([note('n1')]);
  });

  it('lists the trash most recently deleted first', async () => {
    const store = freshStore();
    const a = await store.createStudy(study('A'));
    const b = await store.createStudy(study('B'));
    clock = 2_000_000;
    await store.deleteStudy(b.id);
    clock = 3_000_000;
    await store.deleteStudy(a.id);
    expect((await store.listTrash()).map((s) => s.title)).to.deep.equal(['A', 'B']);
  });

  it('purges from the trash only the studies deleted at least the given time ago', async () => {
    const store = freshStore();
    const old = await store.createStudy(study('Old'));
    const recent = await store.createStudy(study('Recent'));
    const live = await store.createStudy(study('Live'));
    clock = 1_000_010;
    await store.deleteStudy(old.id);
    clock = 1_000_050;
    await store.deleteStudy(recent.id);
    clock = 1_000_100;
    // hand-worked: Old was deleted 90 ms ago (>= 60), Recent 50 ms ago (< 60)
    expect(await store.purgeTrash(60)).to.deep.equal([old.id]);
    expect(await store.loadStudy(old.id)).to.equal(undefined);
    expect((await store.listTrash()).map((s) => s.id)).to.deep.equal([recent.id]);
    expect(await store.purgeTrash(0)).to.deep.equal([recent.id]);
    expect(await everything(store)).to.deep.equal({ studies: [{ id: live.id, title: 'Live', updated: 1_000_000, cells: 0 }], trash: [] });
    const err = await rejection(store.purgeTrash(-1));
    expect(err).to.be.instanceOf(RangeError);
  });
});

describe('study files', () => {
  it('refuses a garbage file with a clear message and a path, and changes nothing', async () => {
    const store = freshStore();
    const { id } = await store.createStudy(study('Existing', [note('n1')]));
    await store.deleteStudy((await store.createStudy(study('Binned'))).id);
    const before = await everything(store);

    const garbage = await store.importStudy('\u0000\u00ffPK\u0003\u0004 not a study at all');
    expect(garbage.ok).to.equal(false);
    if (garbage.ok) return;
    expect(garbage.message).to.match(/^the file is not valid JSON: /);
    expect(garbage.path).to.equal('');

    const notStudy = await store.importStudy('{"format": "something-else", "cells": []}');
    expect(notStudy).to.deep.equal({ ok: false, path: 'format', message: 'this is not a Ratebook study: "format" must be "ratebook-study", not "something-else"' });

    const corrupt = await store.importStudy(JSON.stringify(study('Corrupt', [note('n1'), { id: 'x', kind: 'teleport' } as unknown as Study['cells'][number]])));
    expect(corrupt.ok).to.equal(false);
    if (corrupt.ok) return;
    expect(corrupt.path).to.equal('cells[1].kind');
    expect(corrupt.message).to.contain('unknown cell kind "teleport"');

    const truncated = await store.importStudy(exportedText(JSON.parse(exampleText)).slice(0, 200));
    expect(truncated.ok).to.equal(false);

    expect(await everything(store)).to.deep.equal(before);
    expect((await store.loadStudy(id))?.doc.title).to.equal('Existing');
  });

  it('exports a study as indented JSON with a file name from its title', async () => {
    const doc = JSON.parse(exampleText) as Study;
    const file = exportStudy(doc);
    expect(file.fileName).to.equal('cooling-a-stock-pot-bench-then-walk-in.ratebook.json');
    expect(file.blob.type).to.equal('application/json');
    const text = await file.blob.text();
    expect(JSON.parse(text)).to.deep.equal(doc);
    expect(text.split('\n')[1]).to.equal('  "format": "ratebook-study",');
  });

  it('imports an exported study back as a new study equal to the original', async () => {
    const store = freshStore();
    const original = await store.createStudy(JSON.parse(exampleText) as Study);
    const stored = await store.loadStudy(original.id);
    const text = await exportStudy(stored!.doc).blob.text();

    const first = await store.importStudy(text);
    const second = await store.importStudy(text);
    expect(first.ok && second.ok).to.equal(true);
    if (!first.ok || !second.ok) return;
    expect(new Set([original.id, first.id, second.id]).size).to.equal(3); // never overwrites
    expect(first.summary).to.deep.equal({ id: first.id, title: stored!.title, updated: 1_000_000, cells: stored!.cells });
    expect((await store.loadStudy(first.id))?.doc).to.deep.equal(stored!.doc);
    expect((await store.loadStudy(first.id))?.revision).to.equal(1);
    expect((await store.listStudies()).length).to.equal(3);
  });

  it('makes file names from titles in plain lower-case ASCII', () => {
    expect(studyFileName('Crème brûlée: 74 °C for 2 h!')).to.equal('creme-brulee-74-c-for-2-h.ratebook.json');
    expect(studyFileName('   ')).to.equal('study.ratebook.json');
    expect(studyFileName('冷却')).to.equal('study.ratebook.json');
    const long = studyFileName('a'.repeat(59) + ' b c');
    expect(long).to.equal(`${'a'.repeat(59)}.ratebook.json`); // cut at 60 characters, no dash left at the end
  });
});

function exportedText(doc: Study): string {
  return `${JSON.stringify(doc, null, 2)}\n`;
}

describe('series as CSV', () => {
  it('writes a header row of labels and one row per time, numbers exactly as given', () => {
    const csv = exportSeriesCsv(
      { t: [0, 0.5, 1], T: [74, 0.1 + 0.2, -1.25e-7], C: new Float64Array([1, 2, 3]) },
      [{ key: 't', label: 't (h)' }, { key: 'T', label: 'T (degC)' }],
    );
    expect(csv).to.equal('t (h),T (degC)\r\n0,74\r\n0.5,0.30000000000000004\r\n1,-1.25e-7\r\n');
    const back = csv.trim().split('\r\n').slice(1).map((line) => line.split(',').map(Number));
    expect(back.map((row) => row[1])).to.deep.equal([74, 0.1 + 0.2, -1.25e-7]);
  });

  it('quotes labels with commas or quotes and defuses labels a spreadsheet would run', () => {
    const csv = exportSeriesCsv({ t: [1], a: [2], b: [3], c: [4] }, [
      { key: 't', label: 'time, h' }, { key: 'a', label: 'say "hi"' }, { key: 'b', label: '=1+2' }, { key: 'c', label: '-k' },
    ]);
    expect(csv.split('\r\n')[0]).to.equal('"time, h","say ""hi""",\'=1+2,\'-k');
  });

  it('names the column when a key is missing, a length differs or a value is not a number', () => {
    expect(() => exportSeriesCsv({ t: [1, 2] }, [{ key: 'T', label: 'T' }])).to.throw(RangeError, 'no column "T"');
    expect(() => exportSeriesCsv({ t: [1, 2], T: [1] }, [{ key: 'T', label: 'T' }])).to.throw(RangeError, 'column "T" has 1 values, but t has 2');
    expect(() => exportSeriesCsv({ t: [1], T: ['1' as unknown as number] }, [{ key: 'T', label: 'T' }])).to.throw(RangeError, 'column "T" row 0');
    expect(() => exportSeriesCsv({ t: [1] }, [{ key: 'toString', label: 'x' }])).to.throw(RangeError, 'no column "toString"');
  });
});

/** A save function whose calls the test settles by hand. */
function manualSave() {
  const calls: Array<{ doc: number; resolve: () => void; reject: (e: Error) => void }> = [];
  let running = 0;
  let maxRunning = 0;
  let arrived: (() => void) | undefined;
  const save = (doc: number) => new Promise<void>((resolve, reject) => {
    running++;
    maxRunning = Math.max(maxRunning, running);
    const done = () => { running--; };
    calls.push({ doc, resolve: () => { done(); resolve(); }, reject: (e) => { done(); reject(e); } });
    arrived?.();
  });
  /** Resolves when the save function has been called `n` times in all. */
  const called = (n: number) => new Promise<void>((resolve) => {
    const check = () => { if (calls.length >= n) { arrived = undefined; resolve(); } };
    arrived = check;
    check();
  });
  return { save, calls, called, maxRunning: () => maxRunning };
}

/** Resolves when the autosaver next reaches `state`. */
function reach(states: AutosaveState[], target: AutosaveState, saver: { onchange: unknown }) {
  return new Promise<void>((resolve) => {
    saver.onchange = (s: AutosaveState) => {
      states.push(s);
      if (s === target) resolve();
    };
  });
}

describe('autosaver', () => {
  it('coalesces rapid changes into one save of the newest document and reports states in order', async () => {
    const saved: number[] = [];
    const saver = createAutosaver(async (doc: number) => { saved.push(doc); }, 1000);
    const states: AutosaveState[] = [];
    const done = reach(states, 'saved', saver);
    expect(saver.state).to.equal('saved');
    for (let n = 1; n <= 5; n++) {
      saver.schedule(n);
      await new Promise((r) => setTimeout(r, 0)); // a turn of the event loop between edits, as typing gives
    }
    expect(saver.state).to.equal('pending');
    await done;
    expect(saved).to.deep.equal([5]);
    expect(states).to.deep.equal(['pending', 'saving', 'saved']);
  });

  it('saves a change made during a save after it, never two at once', async () => {
    const m = manualSave();
    const saver = createAutosaver(m.save, 10);
    const states: AutosaveState[] = [];
    saver.onchange = (s) => states.push(s);
    saver.schedule(1);
    await m.called(1);
    expect(saver.state).to.equal('saving');
    saver.schedule(2);
    saver.schedule(3);
    expect(saver.state).to.equal('saving');
    const flushed = saver.flush();
    m.calls[0].resolve();
    await m.called(2);
    expect(m.calls.map((c) => c.doc)).to.deep.equal([1, 3]);
    m.calls[1].resolve();
    expect(await flushed).to.equal('saved');
    expect(m.maxRunning()).to.equal(1);
    expect(states).to.deep.equal(['pending', 'saving', 'saved']);
  });

  it('reports a failed save, keeps the document and saves it on the next flush', async () => {
    const m = manualSave();
    const saver = createAutosaver(m.save, 10);
    const states: AutosaveState[] = [];
    const failed = reach(states, 'error', saver);
    saver.schedule(7);
    await m.called(1);
    m.calls[0].reject(new Error('the browser has no more storage space for this site.'));
    await failed;
    expect(saver.error).to.equal('the browser has no more storage space for this site.');
    const retry = saver.flush();
    await m.called(2);
    expect(m.calls[1].doc).to.equal(7);
    m.calls[1].resolve();
    expect(await retry).to.equal('saved');
    expect(saver.error).to.equal(undefined);
    expect(states).to.deep.equal(['pending', 'saving', 'error', 'saving', 'saved']);
  });

  it('flush resolves at once when nothing is waiting, and with "error" when the save fails', async () => {
    const saver = createAutosaver(async (_doc: string) => { throw new Error('nope'); }, 1000);
    expect(await saver.flush()).to.equal('saved');
    saver.schedule('x');
    expect(await saver.flush()).to.equal('error');
    expect(saver.state).to.equal('error');
    expect(saver.error).to.equal('nope');
  });

  it('drives the store: many quick edits become one new revision', async () => {
    const store = freshStore();
    const { id } = await store.createStudy(study('Draft'));
    const saver = createAutosaver((doc: Study) => store.saveStudy(id, doc).then(() => undefined), 20);
    const states: AutosaveState[] = [];
    const done = reach(states, 'saved', saver);
    const cells: Study['cells'] = [];
    for (let n = 1; n <= 10; n++) {
      cells.push(note(`n${n}`));
      saver.schedule(study('Draft', [...cells]));
    }
    await done;
    const loaded = await store.loadStudy(id);
    expect(loaded?.revision).to.equal(2);
    expect(loaded?.cells).to.equal(10);
  });
});

describe('the app\'s store', () => {
  it('keeps studies in the "ratebook" database through the module-level functions', async () => {
    const title = `module test ${runId}`;
    const { id } = await createStudy(study(title));
    try {
      expect((await listStudies()).some((s) => s.id === id && s.title === title)).to.equal(true);
      expect((await loadStudy(id))?.doc.title).to.equal(title);
      const names = (await indexedDB.databases()).map((d) => d.name);
      expect(names).to.include('ratebook');
    } finally {
      await deleteStudy(id);
      await purgeTrash(0);
    }
    expect((await listTrash()).some((s) => s.id === id)).to.equal(false);
  });
});
