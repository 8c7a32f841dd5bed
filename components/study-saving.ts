/**
 * How the open study is saved safely: every edit goes to the journal first (synchronously,
 * see `journal.ts`), then to the store a moment later as a compare-and-set on the revision
 * this page knows, so a page whose study was saved elsewhere since never overwrites it.
 * Tells the shell, in words, when a save failed, when saving works again, and when the study
 * was saved elsewhere. Computes nothing; the shell renders what it says.
 */
import type { Study } from '../src/index.ts';
import * as store from './store.ts';
import { clearJournal, rebaseJournal, writeJournal } from './journal.ts';

export interface SavingEvents {
  /** A save landed: the new revision. `recovered` when earlier saves had failed. */
  saved(info: store.StudyInfo, recovered: boolean): void;
  /** The study was saved elsewhere since this page opened it: nothing was overwritten. */
  conflict(message: string): void;
  /** A save failed (other than by a conflict): why, in words. */
  failed(message: string): void;
}

export class StudySaving {
  /** False after the journal refused an edit (local storage full or unavailable). */
  journaled = true;
  private seq = 0;
  private failing = false;
  private closed = false;

  constructor(private readonly id: string, private revision: number, private readonly events: SavingEvents) {}

  /** The stored revision this page's study is based on (its last save, or the one it opened). */
  get base(): number {
    return this.revision;
  }

  /** The journal: called on every edit, before anything else. */
  journal = (id: string, doc: Study): void => {
    this.seq++;
    this.journaled = writeJournal(id, this.revision, doc);
  };

  /** The autosaver's save: compare-and-set on the revision this page knows. */
  save = async (id: string, doc: Study): Promise<void> => {
    if (this.closed) throw new Error('this page no longer saves the study (the user chose another version)');
    const seq = this.seq;
    try {
      const info = await store.saveStudy(id, doc, this.revision);
      this.revision = info.revision;
      if (this.seq === seq) clearJournal(id);
      else rebaseJournal(id, info.revision);
      const recovered = this.failing;
      this.failing = false;
      this.events.saved(info, recovered);
    } catch (err) {
      this.failing = true;
      if (this.closed) throw err;
      if (err instanceof store.StoreError && err.code === 'conflict') this.events.conflict(err.message);
      else this.events.failed(err instanceof Error ? err.message : String(err));
      throw err;
    }
  };

  /** Whether a failed save is worth retrying: not a conflict, nor a document the store refuses. */
  retry = (err: unknown): boolean => !(err instanceof store.StoreError && (err.code === 'conflict' || err.code === 'invalid'));

  /** Drops this page's unsaved changes (the user chose the version saved elsewhere, or kept theirs as a copy). */
  discard(): void {
    this.closed = true;
    clearJournal(this.id);
  }
}
