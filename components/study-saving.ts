/**
 * How the open study is saved safely: every edit goes to the journal first (synchronously,
 * see `journal.ts`), then to the store a moment later as a compare-and-set on the revision
 * this page knows, so a page whose study was saved elsewhere since never overwrites it.
 * Tells the shell, in words, when a save failed, when saving works again, when the study
 * was saved elsewhere, and when it was moved to the trash or removed elsewhere (a save into
 * the trash is refused by the store, so an edit never lands there unseen). Computes nothing; the shell renders what it says.
 */
import type { Study } from '../src/index.ts';
import * as store from './store.ts';
import { clearJournal, rebaseJournal, writeJournal } from './journal.ts';

export interface SavingEvents {
  /** A save landed: the new revision. `recovered` when earlier saves had failed. */
  saved(info: store.StudyInfo, recovered: boolean): void;
  /** The study was saved elsewhere since this page opened it: nothing was overwritten. */
  conflict(message: string): void;
  /** The study was moved to the trash, or removed for good, elsewhere: nothing was saved (the edits stay here and in the journal). */
  gone(where: 'trash' | 'removed'): void;
  /** A save failed (other than by a conflict or the study gone): why, in words. */
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
      const code = err instanceof store.StoreError ? err.code : undefined;
      if (code === 'conflict') this.events.conflict((err as Error).message);
      else if (code === 'trashed' || code === 'not-found') this.events.gone(code === 'trashed' ? 'trash' : 'removed');
      else this.events.failed(err instanceof Error ? err.message : String(err));
      throw err;
    }
  };

  /** Whether a failed save is worth retrying by itself: not a conflict, a document the store refuses, nor a study gone to the trash or removed (the user chooses). */
  retry = (err: unknown): boolean => !(err instanceof store.StoreError && ['conflict', 'invalid', 'trashed', 'not-found'].includes(err.code));

  /** Drops this page's unsaved changes (the user chose the version saved elsewhere, or kept theirs as a copy). */
  discard(): void {
    this.closed = true;
    clearJournal(this.id);
  }
}
