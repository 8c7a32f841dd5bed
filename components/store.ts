/**
 * Where studies live: the one module that touches the browser's storage (IndexedDB, through
 * idb-keyval, in its own database). Everything else asks this module.
 *
 * Layout of the object store (one database, one object store, array keys):
 * - `['doc', id]`: the study document exactly as the contract describes it (as the engine's
 *   `readStudy` reads it: current version, checked), and nothing else;
 * - `['meta', id]`: beside it, a {@link StudyInfo} record: title, cell count, creation and
 *   update times, the revision counter, and the time it went to the trash.
 * Listing reads the `meta` records only. Every change to a study is one transaction over both
 * records, so a document and its metadata never disagree.
 *
 * Errors: a file that is not a study is a result (`importStudy`); a study that does not exist,
 * a document that the engine refuses, or a storage failure (quota, a browser without
 * IndexedDB) rejects with a {@link StoreError} whose message can be shown to the user.
 */
import { createStore, promisifyRequest, type UseStore } from 'idb-keyval';
import { readStudy, type Study } from '../src/index.ts';
import { metaProblem, docProblem, damaged, keyId, type DamagedStudy } from './store-records.ts';
import { announced, type SaveNews } from './save-news.ts';

export type { DamagedStudy } from './store-records.ts';

export { createAutosaver, AutosaveStates, type Autosaver, type AutosaveState } from './autosaver.ts';
export { exportSeriesCsv, type SeriesColumn, type SeriesData } from './series-csv.ts';

/** What a list of studies shows: one entry per study. `updated` is in ms since the epoch. */
export interface StudySummary {
  readonly id: string;
  readonly title: string;
  readonly updated: number;
  readonly cells: number;
}

/** The metadata kept beside a study's document. `revision` is 1 when created and goes up by one on each change. */
export interface StudyInfo extends StudySummary {
  readonly created: number;
  readonly revision: number;
  /** When it was moved to the trash (ms since the epoch); absent when it is not in the trash. */
  readonly deleted?: number;
}

/** A study as loaded: its document and its metadata. */
export interface StoredStudy extends StudyInfo {
  readonly doc: Study;
}

/** An entry of the trash. */
export interface TrashedStudy extends StudySummary {
  readonly deleted: number;
}

/** The outcome of importing a file: a new study, or why the file was refused and where. */
export type ImportResult =
  | { readonly ok: true; readonly id: string; readonly summary: StudySummary; readonly notes: readonly string[] }
  | { readonly ok: false; readonly message: string; readonly path: string };

/** A study ready to download: the file's content and a suggested name (`<slug>.ratebook.json`). */
export interface StudyFile {
  readonly blob: Blob;
  readonly fileName: string;
}

/** Why a store operation failed. `code` tells the kinds apart; `message` is for the user. */
export class StoreError extends Error {
  override name = 'StoreError';
  readonly code: 'not-found' | 'invalid' | 'storage' | 'conflict' | 'damaged' | 'trashed';
  constructor(code: StoreError['code'], message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.code = code;
  }
}

/** Where a store keeps its data; tests use their own database name. `now` is the clock (ms). */
export interface StoreOptions {
  readonly dbName?: string;
  readonly storeName?: string;
  readonly now?: () => number;
}

/** The title given to a study that has none. */
export const UNTITLED = 'Untitled study';

/** The title a list shows for a document's title: trimmed, and never blank. */
function listedTitle(title: string): string {
  return title.trim() || UNTITLED;
}

/** The document of a new, empty study. */
export function blankStudy(): Study {
  return { format: 'ratebook-study', version: 1, title: UNTITLED, cells: [] };
}

/** The operations on one database of studies. All are asynchronous and each is one transaction. */
export interface StudyStore {
  /** The studies not in the trash, most recently changed first. Reads metadata only. */
  listStudies(): Promise<StudySummary[]>;
  /** A study with its metadata (also when it is in the trash), or undefined when there is none with that id. */
  loadStudy(id: string): Promise<StoredStudy | undefined>;
  /**
   * Replaces the study's document, stamps `updated` and adds one to `revision`. The document
   * must pass `readStudy` (field problems in cells are kept, as the engine keeps them); a
   * refused one rejects with code 'invalid' and nothing changes. A study in the trash stays
   * there, with the new document. Rejects with code 'not-found' for an unknown id. With
   * `expectedRevision` it is a compare-and-set inside the one transaction: when the stored
   * revision is another (a newer save from another tab), it rejects with code 'conflict' and
   * nothing changes; when the study is in the trash (moved there by another tab while a page
   * edits it), it rejects with code 'trashed' and nothing changes.
   */
  saveStudy(id: string, doc: Study, expectedRevision?: number): Promise<StudyInfo>;
  /** Stores a new study under a new id: a copy of `doc` (which must pass `readStudy`), or a blank study. Revision 1. */
  createStudy(doc?: Study): Promise<StudyInfo>;
  /** Sets the title (trimmed; a blank one becomes "Untitled study") in the document and the metadata: a change, so a new revision. */
  renameStudy(id: string, title: string): Promise<StudyInfo>;
  /** A new study with a copy of the document, titled "<title> (copy)". */
  duplicateStudy(id: string): Promise<StudyInfo>;
  /** Moves a study to the trash, recording when. Deleting one already there keeps the first time. */
  deleteStudy(id: string): Promise<TrashedStudy>;
  /** Takes a study out of the trash, as it was. Its revision and `updated` are unchanged. */
  restoreStudy(id: string): Promise<StudyInfo>;
  /** The studies in the trash, most recently deleted first. */
  listTrash(): Promise<TrashedStudy[]>;
  /** Removes for good the studies that went to the trash at least `olderThanMs` ago (0: all of them). Returns their ids. */
  purgeTrash(olderThanMs: number): Promise<string[]>;
  /**
   * Reads a study file's text with `readStudy`. A refused file gives `{ok: false, message,
   * path}` and changes nothing; an accepted one becomes a new study (never replacing one),
   * stored in the current version (`notes` says what a migration changed).
   */
  importStudy(text: string): Promise<ImportResult>;
  /**
   * The records that cannot be listed or opened (a metadata record that is not one, a
   * document that is missing or not a study), each with what could be recovered. Reads every
   * record: called by the library after `listStudies`, which skips them.
   */
  listDamaged(): Promise<DamagedStudy[]>;
  /** Removes both records of a study for good, whatever their state (for a damaged one). */
  removeStudy(id: string): Promise<void>;
}


type MetaRecord = { -readonly [K in keyof StudyInfo]: StudyInfo[K] };

const metaKey = (id: string): IDBValidKey => ['meta', id];
const docKey = (id: string): IDBValidKey => ['doc', id];
/** Every `['meta', id]` key: arrays sort after strings, so `['meta', []]` is above them all. */
const allMeta = (): IDBKeyRange => IDBKeyRange.bound(['meta'], ['meta', []]);

/** Opens (lazily, on the first operation) a store of studies. The app's is `createStudyStore()`. */
export function createStudyStore(options: StoreOptions = {}): StudyStore {
  const dbName = options.dbName ?? 'ratebook';
  const storeName = options.storeName ?? 'studies';
  const now = options.now ?? Date.now;
  let idb: UseStore | undefined;

  /** Runs `work` in one transaction; a throw aborts it. Errors other than StoreError become storage errors. */
  async function transact<T>(mode: IDBTransactionMode, action: string, work: (os: IDBObjectStore) => Promise<T>): Promise<T> {
    try {
      if (typeof indexedDB === 'undefined') throw new StoreError('storage', 'this browser gives Ratebook no storage (IndexedDB is not available)');
      idb ??= createStore(dbName, storeName);
      return await idb(mode, async (os) => {
        const done = promisifyRequest(os.transaction);
        try {
          const value = await work(os);
          await done;
          return value;
        } catch (err) {
          done.catch(() => {}); // the abort below rejects it; the first error is the one to report
          try { os.transaction.abort(); } catch { /* already finished */ }
          throw err;
        }
      });
    } catch (err) {
      if (err instanceof StoreError) throw err;
      throw new StoreError('storage', `Could not ${action}: ${storageProblem(err)}`, { cause: err });
    }
  }

  async function getMeta(os: IDBObjectStore, id: string): Promise<MetaRecord> {
    const meta = (await promisifyRequest(os.get(metaKey(id)))) as MetaRecord | undefined;
    if (meta === undefined) throw new StoreError('not-found', `There is no study with id "${id}" (it may have been removed from the trash).`);
    const bad = metaProblem(meta, id);
    if (bad) throw new StoreError('damaged', `The study "${id}" is damaged: ${bad}.`);
    return meta;
  }

  async function getDoc(os: IDBObjectStore, id: string): Promise<Study> {
    const doc = (await promisifyRequest(os.get(docKey(id)))) as Study | undefined;
    if (doc === undefined) throw new StoreError('not-found', `The study "${id}" has no document.`);
    const bad = docProblem(doc);
    if (bad) throw new StoreError('damaged', `The study "${id}" is damaged: ${bad}.`);
    return doc;
  }

  async function freshId(os: IDBObjectStore): Promise<string> {
    for (;;) {
      const id = randomId();
      if ((await promisifyRequest(os.count(metaKey(id)))) === 0) return id;
    }
  }

  /** Stores a new study; `doc` has passed readStudy. */
  async function insert(os: IDBObjectStore, doc: Study): Promise<MetaRecord> {
    const id = await freshId(os);
    const t = now();
    const meta: MetaRecord = { id, title: listedTitle(doc.title), created: t, updated: t, revision: 1, cells: doc.cells.length };
    os.put(doc, docKey(id));
    os.put(meta, metaKey(id));
    return meta;
  }

  /**
   * Writes a changed document: new title and cell count, `updated` now, one more revision.
   * So the list follows the open study's title edits when the study is saved.
   */
  function change(os: IDBObjectStore, meta: MetaRecord, doc: Study): MetaRecord {
    const next: MetaRecord = { ...meta, title: listedTitle(doc.title), cells: doc.cells.length, updated: now(), revision: meta.revision + 1 };
    os.put(doc, docKey(meta.id));
    os.put(next, metaKey(meta.id));
    return next;
  }

  /** The metadata records that are sound (damaged ones are left to `listDamaged`). */
  async function allMetas(os: IDBObjectStore): Promise<MetaRecord[]> {
    const [keys, values] = await Promise.all([promisifyRequest(os.getAllKeys(allMeta())), promisifyRequest(os.getAll(allMeta()))]);
    return values.filter((m, i) => metaProblem(m, keyId(keys[i])) === undefined) as MetaRecord[];
  }

  return {
    listStudies: () => transact('readonly', 'list the studies', async (os) =>
      (await allMetas(os)).filter((m) => m.deleted === undefined).sort(newestFirst).map(summary)),

    loadStudy: (id) => transact('readonly', 'open the study', async (os) => {
      const [meta, doc] = await Promise.all([
        promisifyRequest(os.get(metaKey(id))) as Promise<unknown>,
        promisifyRequest(os.get(docKey(id))) as Promise<unknown>,
      ]);
      if (meta === undefined && doc === undefined) return undefined;
      const bad = (meta === undefined ? 'its metadata record is missing' : metaProblem(meta, id)) ?? (doc === undefined ? 'its document is missing' : docProblem(doc));
      if (bad) throw new StoreError('damaged', `This study is damaged (${bad}). It is listed as damaged on the home page, where it can be exported as it is or deleted; your other studies are not affected.`);
      return { ...(meta as MetaRecord), doc: doc as Study };
    }),

    saveStudy: async (id, doc, expectedRevision) => {
      const study = checked(doc, 'save the study');
      return transact('readwrite', 'save the study', async (os) => {
        const meta = await getMeta(os, id);
        if (expectedRevision !== undefined && meta.revision !== expectedRevision) {
          throw new StoreError('conflict', `This study was saved elsewhere (another tab or window) since it was opened here: revision ${meta.revision} is stored, this page has revision ${expectedRevision}. Nothing was overwritten.`);
        }
        if (expectedRevision !== undefined && meta.deleted !== undefined) {
          throw new StoreError('trashed', 'This study was moved to the trash (in another tab or window) since it was opened here. Nothing was saved into the trash.');
        }
        return change(os, meta, study);
      });
    },

    listDamaged: () => transact('readonly', 'check the studies', async (os) => {
      const all = IDBKeyRange.bound(['doc'], ['meta', []]);
      const [keys, values] = await Promise.all([promisifyRequest(os.getAllKeys(all)), promisifyRequest(os.getAll(all))]);
      const byId = new Map<string, { meta?: unknown; doc?: unknown }>();
      keys.forEach((k, i) => {
        const [kind, id] = k as [string, unknown];
        if (typeof id !== 'string' || (kind !== 'doc' && kind !== 'meta')) return;
        const entry = byId.get(id) ?? {};
        entry[kind] = values[i];
        byId.set(id, entry);
      });
      return [...byId].flatMap(([id, { meta, doc }]) => {
        const problem = (meta === undefined ? 'its metadata record is missing' : metaProblem(meta, id)) ?? (doc === undefined ? 'its document is missing' : docProblem(doc));
        return problem ? [damaged(id, problem, meta, doc)] : [];
      });
    }),

    removeStudy: (id) => transact('readwrite', 'delete the study', async (os) => {
      os.delete(metaKey(id));
      os.delete(docKey(id));
    }),

    createStudy: async (doc) => {
      const study = doc === undefined ? blankStudy() : checked(doc, 'create the study');
      return transact('readwrite', 'create a study', (os) => insert(os, study));
    },

    renameStudy: async (id, title) => {
      if (typeof title !== 'string') throw new StoreError('invalid', 'A title must be text.');
      const name = listedTitle(title);
      return transact('readwrite', 'rename the study', async (os) => {
        const meta = await getMeta(os, id);
        return change(os, meta, { ...(await getDoc(os, id)), title: name });
      });
    },

    duplicateStudy: (id) => transact('readwrite', 'duplicate the study', async (os) => {
      await getMeta(os, id);
      const doc = await getDoc(os, id);
      return insert(os, { ...doc, title: `${doc.title} (copy)` });
    }),

    deleteStudy: (id) => transact('readwrite', 'move the study to the trash', async (os) => {
      const meta = await getMeta(os, id);
      const deleted = meta.deleted ?? now();
      if (meta.deleted === undefined) os.put({ ...meta, deleted }, metaKey(id));
      return { ...summary(meta), deleted };
    }),

    restoreStudy: (id) => transact('readwrite', 'restore the study', async (os) => {
      const { deleted, ...meta } = await getMeta(os, id);
      if (deleted !== undefined) os.put(meta, metaKey(id));
      return meta;
    }),

    listTrash: () => transact('readonly', 'list the trash', async (os) =>
      (await allMetas(os))
        .filter((m): m is MetaRecord & { deleted: number } => m.deleted !== undefined)
        .sort((a, b) => b.deleted - a.deleted || newestFirst(a, b))
        .map((m) => ({ ...summary(m), deleted: m.deleted }))),

    purgeTrash: async (olderThanMs) => {
      if (!(olderThanMs >= 0)) throw new RangeError(`purgeTrash: olderThanMs must be 0 or more, not ${olderThanMs}`);
      return transact('readwrite', 'empty the trash', async (os) => {
        const t = now();
        const gone = (await allMetas(os)).filter((m) => m.deleted !== undefined && t - m.deleted >= olderThanMs).map((m) => m.id);
        for (const id of gone) {
          os.delete(metaKey(id));
          os.delete(docKey(id));
        }
        return gone;
      });
    },

    importStudy: async (text) => {
      if (typeof text !== 'string') return { ok: false, message: 'the file must be given as text', path: '' };
      const read = readStudy(text);
      if (!read.ok) return { ok: false, message: read.error.message, path: read.error.path };
      const meta = await transact('readwrite', 'import the study', (os) => insert(os, read.study));
      return { ok: true, id: meta.id, summary: summary(meta), notes: read.notes };
    },
  };
}

/** The document as the engine reads it, or a StoreError naming the problem and its path. */
function checked(doc: Study, action: string): Study {
  const read = readStudy(doc);
  if (read.ok) return read.study;
  const where = read.error.path ? ` (at ${read.error.path})` : '';
  throw new StoreError('invalid', `Could not ${action}: ${read.error.message}${where}`);
}

function summary(m: StudyInfo): StudySummary {
  return { id: m.id, title: m.title, updated: m.updated, cells: m.cells };
}

function newestFirst(a: StudyInfo, b: StudyInfo): number {
  return b.updated - a.updated || b.created - a.created || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0);
}

/** What went wrong with the storage, in words for the user. */
function storageProblem(err: unknown): string {
  const name = (err as { name?: unknown })?.name;
  if (name === 'QuotaExceededError') return 'the browser has no more storage space for this site. To free space: export the studies you want to keep (Export study), then delete studies you no longer need and empty the trash on the home page.';
  if (name === 'DataCloneError') return 'the study holds something that cannot be stored (not plain JSON data).';
  const text = err instanceof Error ? err.message : String(err);
  return `the browser's storage failed (${typeof name === 'string' ? `${name}: ` : ''}${text}).`;
}

const ID_ALPHABET = 'abcdefghijkmnpqrstuvwxyz23456789'; // 32 symbols, none easily confused

/** A new random study id: 12 symbols, 60 bits. */
function randomId(): string {
  const bytes = crypto.getRandomValues(new Uint8Array(12));
  let id = '';
  for (const b of bytes) id += ID_ALPHABET[b & 31];
  return id;
}

/**
 * A study as a downloadable file: indented JSON of the document (what `importStudy` reads
 * back) and a file name made from its title. Pure; touches no storage.
 */
export function exportStudy(doc: Study): StudyFile {
  const text = `${JSON.stringify(doc, null, 2)}\n`;
  return { blob: new Blob([text], { type: 'application/json' }), fileName: studyFileName(doc.title) };
}

/**
 * `<slug>.ratebook.json`: the title in lower-case ASCII letters and digits joined by "-"
 * (accents dropped, at most 60 characters), or `study.ratebook.json` when nothing is left.
 */
export function studyFileName(title: string | undefined): string {
  const slug = (title ?? '')
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+/, '')
    .slice(0, 60)
    .replace(/-+$/, '');
  return `${slug || 'study'}.ratebook.json`;
}

let appStore: StudyStore | undefined;
/** The news of a change that gives a revision (see `save-news.ts`: the app's store announces each change it makes). */
const info = (i: StudyInfo): SaveNews => ({ id: i.id, revision: i.revision });
/** The app's store (database "ratebook", object store "studies"), opened on first use. */
function app(): StudyStore {
  return (appStore ??= createStudyStore());
}

/** {@link StudyStore.listStudies} on the app's store. */
export function listStudies(): Promise<StudySummary[]> { return app().listStudies(); }
/** {@link StudyStore.loadStudy} on the app's store. */
export function loadStudy(id: string): Promise<StoredStudy | undefined> { return app().loadStudy(id); }
/** {@link StudyStore.saveStudy} on the app's store. */
export function saveStudy(id: string, doc: Study, expectedRevision?: number): Promise<StudyInfo> { return announced(app().saveStudy(id, doc, expectedRevision), info); }
/** {@link StudyStore.createStudy} on the app's store. */
export function createStudy(doc?: Study): Promise<StudyInfo> { return announced(app().createStudy(doc), info); }
/** {@link StudyStore.renameStudy} on the app's store. */
export function renameStudy(id: string, title: string): Promise<StudyInfo> { return announced(app().renameStudy(id, title), info); }
/** {@link StudyStore.duplicateStudy} on the app's store. */
export function duplicateStudy(id: string): Promise<StudyInfo> { return announced(app().duplicateStudy(id), info); }
/** {@link StudyStore.deleteStudy} on the app's store. */
export function deleteStudy(id: string): Promise<TrashedStudy> { return announced(app().deleteStudy(id), () => ({ id })); }
/** {@link StudyStore.restoreStudy} on the app's store. */
export function restoreStudy(id: string): Promise<StudyInfo> { return announced(app().restoreStudy(id), info); }
/** {@link StudyStore.listTrash} on the app's store. */
export function listTrash(): Promise<TrashedStudy[]> { return app().listTrash(); }
/** {@link StudyStore.purgeTrash} on the app's store. */
export function purgeTrash(olderThanMs: number): Promise<string[]> { return announced(app().purgeTrash(olderThanMs), (ids) => ids.map((id) => ({ id }))); }
/** {@link StudyStore.listDamaged} on the app's store. */
export function listDamaged(): Promise<DamagedStudy[]> { return app().listDamaged(); }
/** {@link StudyStore.removeStudy} on the app's store. */
export function removeStudy(id: string): Promise<void> { return announced(app().removeStudy(id), () => ({ id })); }
/** {@link StudyStore.importStudy} on the app's store. */
export function importStudy(text: string): Promise<ImportResult> { return announced(app().importStudy(text), (r) => (r.ok ? { id: r.id } : undefined)); }
