// Storage trouble against the real IndexedDB and localStorage of Chromium: compare-and-set
// saves, damaged records, the journal of unsaved edits and its replay, retries after a
// failed save. Each test has a database of its own. Expected values come from the rules in
// components/store.ts and components/journal.ts (the project's own contract for saving).
import { expect } from 'chai';
import { createStudyStore, createAutosaver, StoreError, type StudyStore, type AutosaveState } from '../../components/store.ts';
import { writeJournal, readJournal, clearJournal, replayJournals, TAB_ID } from '../../components/journal.ts';
import type { Study } from '../../src/index.ts';

const runId = `${Date.now()}-${Math.random().toString(36).slice(2)}`;
let runs = 0;
const dbNames: string[] = [];

function freshStore(): StudyStore {
  const name = `ratebook-safety-${runId}-${++runs}`;
  dbNames.push(name);
  return createStudyStore({ dbName: name });
}

const study = (title: string): Study => ({ format: 'ratebook-study', version: 1, title, cells: [] });

/** Writes raw records into a test store's database, as a damaged browser profile would hold them. */
function putRaw(records: Array<[unknown, IDBValidKey]>): Promise<void> {
  const name = dbNames.at(-1)!;
  return new Promise((resolve, reject) => {
    const open = indexedDB.open(name);
    open.onerror = () => reject(open.error);
    open.onsuccess = () => {
      const tx = open.result.transaction('studies', 'readwrite');
      for (const [value, key] of records) tx.objectStore('studies').put(value, key);
      tx.oncomplete = () => { open.result.close(); resolve(); };
      tx.onerror = () => reject(tx.error);
    };
  });
}

async function rejection(p: Promise<unknown>): Promise<StoreError> {
  try { await p; } catch (err) { return err as StoreError; }
  throw new Error('expected the promise to reject, but it resolved');
}

const meta = (id: string, title: unknown) => ({ id, title, created: 1, updated: 2, revision: 1, cells: 0 });

describe('compare-and-set saves', () => {
  it('saves on the expected revision and refuses a stale one, changing nothing', async () => {
    const store = freshStore();
    const { id } = await store.createStudy(study('first'));
    const a = await store.saveStudy(id, study('tab A'), 1);
    expect(a.revision).to.equal(2);
    const err = await rejection(store.saveStudy(id, study('tab B, stale'), 1));
    expect(err).to.be.instanceOf(StoreError);
    expect(err.code).to.equal('conflict');
    expect(err.message).to.match(/saved elsewhere.*revision 2 is stored.*revision 1/);
    const now = await store.loadStudy(id);
    expect(now?.doc.title).to.equal('tab A');
    expect(now?.revision).to.equal(2);
  });

  it('refuses a compare-and-set save into a study in the trash, changing nothing; a plain save still may', async () => {
    const store = freshStore();
    const { id } = await store.createStudy(study('first'));
    await store.deleteStudy(id);
    const err = await rejection(store.saveStudy(id, study('typed in a tab that had it open'), 1));
    expect(err).to.be.instanceOf(StoreError);
    expect(err.code).to.equal('trashed');
    expect(err.message).to.match(/moved to the trash.*Nothing was saved into the trash/);
    const now = await store.loadStudy(id);
    expect(now?.doc.title).to.equal('first');
    expect(now?.revision).to.equal(1);
    expect(now?.deleted).to.be.a('number');
    // without an expected revision (not a page's autosave) the trash keeps the new document, as before
    expect((await store.saveStudy(id, study('plain save'))).revision).to.equal(2);
    expect((await store.loadStudy(id))?.deleted).to.be.a('number');
  });
});

describe('damaged records', () => {
  it('lists the sound studies and, apart, each damaged one with what could be recovered', async () => {
    const store = freshStore();
    const good = await store.createStudy(study('Sound'));
    await putRaw([
      [null, ['meta', 'nullmeta']], [study('Doc beside a null meta'), ['doc', 'nullmeta']],
      [meta('objtitle', { bad: 1 }), ['meta', 'objtitle']], [study('From the document'), ['doc', 'objtitle']],
      [meta('broken', 'Broken doc'), ['meta', 'broken']], [{ format: 'other', cells: 3 }, ['doc', 'broken']],
      [meta('nodoc', 'No document'), ['meta', 'nodoc']],
    ]);
    // the list reads metadata only: a sound metadata record beside a broken document is listed (the library drops it)
    expect((await store.listStudies()).map((s) => s.id).sort()).to.deep.equal([good.id, 'broken', 'nodoc'].sort());
    expect(await store.listTrash()).to.deep.equal([]);
    const damaged = Object.fromEntries((await store.listDamaged()).map((d) => [d.id, d]));
    expect(Object.keys(damaged).sort()).to.deep.equal(['broken', 'nodoc', 'nullmeta', 'objtitle']);
    expect(damaged.nullmeta.problem).to.equal('its metadata record is null');
    expect(damaged.nullmeta.title).to.equal('Doc beside a null meta');
    expect(damaged.nullmeta.cells).to.equal(0);
    expect(damaged.objtitle.problem).to.equal('the title in its metadata is not text');
    expect(damaged.objtitle.title).to.equal('From the document');
    expect(damaged.broken.problem).to.match(/not a Ratebook study/);
    expect(damaged.broken.title).to.equal('Broken doc');
    expect(JSON.parse(damaged.broken.raw).doc).to.deep.equal({ format: 'other', cells: 3 });
    expect(damaged.nodoc.problem).to.equal('its document is missing');
  });

  it('refuses to open a damaged study with a message in words, and removes it for good on request', async () => {
    const store = freshStore();
    await store.createStudy(study('Sound'));
    await putRaw([[meta('broken', 'Broken doc'), ['meta', 'broken']], ['just text', ['doc', 'broken']]]);
    const err = await rejection(store.loadStudy('broken'));
    expect(err.code).to.equal('damaged');
    expect(err.message).to.match(/damaged \(its document is not a study \(string\)\).*exported.*deleted/);
    await store.removeStudy('broken');
    expect(await store.listDamaged()).to.deep.equal([]);
    expect(await store.loadStudy('broken')).to.equal(undefined);
    expect((await store.listStudies()).map((s) => s.title)).to.deep.equal(['Sound']);
  });
});

describe('the journal of unsaved edits', () => {
  afterEach(() => { for (const id of ['j1', 'j2', 'j3']) clearJournal(id); });

  /** An entry as a closed tab leaves it: written by another tab id, which holds no lock. */
  function orphan(id: string, base: number, doc: Study) {
    expect(writeJournal(id, base, doc)).to.equal(true);
    const e = readJournal(id)!;
    expect(e.tab).to.equal(TAB_ID);
    localStorage.setItem(`ratebook-journal:${id}`, JSON.stringify({ ...e, tab: 'a-closed-tab' }));
  }

  it('replays an entry made on the stored revision over it, and empties the journal', async () => {
    const store = freshStore();
    const { id } = await store.createStudy(study('before'));
    localStorage.removeItem(`ratebook-journal:${id}`);
    orphan(id, 1, study('typed just before the page closed'));
    const out = await replayJournals(store);
    expect(out.problems).to.deep.equal([]);
    expect(out.restored).to.have.length(1);
    const now = await store.loadStudy(id);
    expect(now?.doc.title).to.equal('typed just before the page closed');
    expect(now?.revision).to.equal(2);
    expect(readJournal(id)).to.equal(undefined);
    clearJournal(id);
  });

  it('keeps an entry made on an older revision as a new "(recovered)" study, leaving the newer save alone', async () => {
    const store = freshStore();
    const { id } = await store.createStudy(study('v1'));
    await store.saveStudy(id, study('saved in another tab'), 1);
    orphan(id, 1, study('edit on v1'));
    await replayJournals(store);
    expect((await store.loadStudy(id))?.doc.title).to.equal('saved in another tab');
    expect((await store.listStudies()).map((s) => s.title).sort()).to.deep.equal(['edit on v1 (recovered)', 'saved in another tab']);
    expect(readJournal(id)).to.equal(undefined);
    clearJournal(id);
  });

  it('keeps an entry whose study went to the trash as a new "(recovered)" study, saving nothing into the trash', async () => {
    const store = freshStore();
    const { id } = await store.createStudy(study('v1'));
    await store.deleteStudy(id);
    orphan(id, 1, study('typed before the page closed'));
    const out = await replayJournals(store);
    expect(out.problems).to.deep.equal([]);
    expect(out.restored.join(' ')).to.contain('is in the trash');
    const binned = await store.loadStudy(id);
    expect(binned?.doc.title).to.equal('v1');
    expect(binned?.deleted).to.be.a('number');
    expect((await store.listStudies()).map((s) => s.title)).to.deep.equal(['typed before the page closed (recovered)']);
    expect(readJournal(id)).to.equal(undefined);
  });

  it('leaves alone the entry of a tab that is still open (it holds its lock)', async () => {
    const store = freshStore();
    const { id } = await store.createStudy(study('v1'));
    expect(writeJournal(id, 1, study('this tab is still typing'))).to.equal(true);
    await replayJournals(store);
    expect((await store.loadStudy(id))?.doc.title).to.equal('v1');
    expect(readJournal(id)?.doc.title).to.equal('this tab is still typing');
    clearJournal(id);
  });

  it('keeps an entry that could not be stored, and says why', async () => {
    const store = freshStore();
    const { id } = await store.createStudy(study('v1'));
    orphan(id, 1, study('edit'));
    const put = IDBObjectStore.prototype.put;
    IDBObjectStore.prototype.put = function () { throw new DOMException('stubbed', 'QuotaExceededError'); };
    let out;
    try { out = await replayJournals(store); } finally { IDBObjectStore.prototype.put = put; }
    expect(out.problems.join(' ')).to.match(/kept on this device.*no more storage space.*export/i);
    expect(readJournal(id)?.doc.title).to.equal('edit');
    await replayJournals(store);
    expect((await store.loadStudy(id))?.doc.title).to.equal('edit');
    clearJournal(id);
  });
});

describe('retrying a failed save', () => {
  it('tries again by itself after a failure and reaches "saved" once the save works', async () => {
    let failing = true;
    const tried: number[] = [];
    const saver = createAutosaver(async (doc: number) => {
      tried.push(doc);
      if (failing) throw new Error('full');
    }, 5);
    const states: AutosaveState[] = [];
    const saved = new Promise<void>((resolve) => { saver.onchange = (s) => { states.push(s); if (s === 'error') failing = false; if (s === 'saved') resolve(); }; });
    saver.schedule(4);
    await saved; // the first retry comes about 1 s after the failure
    expect(tried).to.deep.equal([4, 4]);
    expect(states).to.deep.equal(['pending', 'saving', 'error', 'saving', 'saved']);
  });

  it('does not retry by itself a failure the caller says is final (a conflict)', async () => {
    let calls = 0;
    const saver = createAutosaver(async () => { calls++; throw new StoreError('conflict', 'saved elsewhere'); }, 5, { retry: (e) => !(e instanceof StoreError && e.code === 'conflict') });
    saver.schedule(1);
    expect(await saver.flush()).to.equal('error');
    await new Promise((r) => setTimeout(r, 1500));
    expect(calls).to.equal(1);
    expect(saver.state).to.equal('error');
  });
});
