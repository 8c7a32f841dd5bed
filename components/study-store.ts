/**
 * A store of studies in IndexedDB (through idb-keyval, in its own database): the one module
 * that touches the browser's storage. The app reaches its store through `store.ts`; tests open
 * stores of their own with `createStudyStore`.
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
import { metaProblem, docProblem, damaged, keyId } from './store-records.ts';
import { StoreError, UNTITLED, blankStudy, type StoreOptions, type StudyInfo, type StudyStore, type StudySummary } from './store-contract.ts';

/** The title a list shows for a document's title: trimmed, and never blank. */
function listedTitle(title: string): string {
  return title.trim() || UNTITLED;
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
