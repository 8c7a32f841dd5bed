/**
 * What a store of studies is: the records a list shows and a study is loaded as, the
 * operations (`StudyStore`, each one transaction), the errors they reject with, and the blank
 * study. The store itself is `study-store.ts`; the app's is reached through `store.ts`.
 */
import type { Study } from '../src/index.ts';
import type { DamagedStudy } from './store-records.ts';

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
