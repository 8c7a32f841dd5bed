/**
 * The journal of edits not yet in IndexedDB: on every edit the open study is written to
 * `localStorage` synchronously, so an edit the page has shown is on disk before the next
 * event, whatever happens to the page after it (a reload, a closed window, a crash). The
 * entry is removed once the store has the same document, and replayed into the store the
 * next time the app opens (`replayJournals`). IndexedDB writes started while the page goes
 * away are not guaranteed to finish; a `localStorage` write is done when it returns.
 *
 * Each entry records the revision its edits started from (`base`) and the tab that wrote it.
 * A tab holds a Web Lock named after itself while it lives, so the replay leaves alone the
 * entries of tabs that are still open.
 */
import type { Study } from '../src/index.ts';
import type { StoredStudy, StudyInfo } from './store.ts';

const PREFIX = 'ratebook-journal:';
const LOCK_PREFIX = 'ratebook-tab:';

export interface JournalEntry {
  readonly id: string;
  /** The stored revision the edits were made on. */
  readonly base: number;
  readonly doc: Study;
  /** The tab that wrote it. */
  readonly tab: string;
  /** When (ms since the epoch). */
  readonly at: number;
}

/** This tab's name, and its lock held while the page lives. */
export const TAB_ID = typeof crypto !== 'undefined' && 'randomUUID' in crypto ? crypto.randomUUID() : `${Date.now()}-${Math.random()}`;
if (typeof navigator !== 'undefined' && navigator.locks) {
  void navigator.locks.request(LOCK_PREFIX + TAB_ID, () => new Promise<void>(() => {})).catch(() => {});
}

/** Writes the study's newest document; false when `localStorage` refused it (full or unavailable). */
export function writeJournal(id: string, base: number, doc: Study): boolean {
  try {
    const entry: JournalEntry = { id, base, doc, tab: TAB_ID, at: Date.now() };
    localStorage.setItem(PREFIX + id, JSON.stringify(entry));
    return true;
  } catch {
    return false;
  }
}

/** The study's entry, or undefined (none, or unreadable). */
export function readJournal(id: string): JournalEntry | undefined {
  try {
    const text = localStorage.getItem(PREFIX + id);
    if (text === null) return undefined;
    const e = JSON.parse(text) as JournalEntry;
    return e && typeof e === 'object' && e.id === id && typeof e.base === 'number' && e.doc && typeof e.doc === 'object' ? e : undefined;
  } catch {
    return undefined;
  }
}

/** Removes the study's entry. */
export function clearJournal(id: string): void {
  try { localStorage.removeItem(PREFIX + id); } catch { /* nothing to remove */ }
}

/** Records that the entry's edits now start from `base` (an older document of this tab was saved as `base`). */
export function rebaseJournal(id: string, base: number): void {
  const e = readJournal(id);
  if (!e) return;
  try { localStorage.setItem(PREFIX + id, JSON.stringify({ ...e, base })); } catch { /* the old base stays: replay then keeps a copy */ }
}

/** The ids with an entry. */
function journalIds(): string[] {
  try {
    const ids: string[] = [];
    for (let i = 0; i < localStorage.length; i++) {
      const k = localStorage.key(i);
      if (k?.startsWith(PREFIX)) ids.push(k.slice(PREFIX.length));
    }
    return ids;
  } catch {
    return [];
  }
}

/** What the replay needs of the store. */
export interface JournalStore {
  loadStudy(id: string): Promise<StoredStudy | undefined>;
  saveStudy(id: string, doc: Study, expectedRevision?: number): Promise<StudyInfo>;
  createStudy(doc?: Study): Promise<StudyInfo>;
}

/** What the replay did, in words for the user (empty when there was nothing to do). */
export interface ReplayOutcome {
  readonly restored: string[];
  readonly problems: string[];
}

/**
 * Puts the entries of closed tabs into the store: an entry made on the stored revision is
 * saved over it (compare-and-set); one made on an older revision (another tab saved since)
 * becomes a new study "<title> (recovered)", so neither version is lost; so does one whose
 * study is in the trash or gone (never saved into the trash). An entry that
 * could not be stored stays for the next time.
 */
export async function replayJournals(store: JournalStore): Promise<ReplayOutcome> {
  const restored: string[] = [];
  const problems: string[] = [];
  const live = await liveTabs();
  for (const id of journalIds()) {
    const e = readJournal(id);
    if (!e) { clearJournal(id); continue; }
    if (live.has(e.tab)) continue;
    try {
      const stored = await store.loadStudy(id);
      if (stored && JSON.stringify(stored.doc) === JSON.stringify(e.doc)) { clearJournal(id); continue; }
      if (stored && stored.revision === e.base && stored.deleted === undefined) {
        await store.saveStudy(id, e.doc, e.base);
        restored.push(`"${e.doc.title}": the last changes made before the page closed were saved.`);
      } else {
        await store.createStudy({ ...e.doc, title: `${e.doc.title} (recovered)` });
        restored.push(`"${e.doc.title}": changes made before the page closed were kept as a new study "${e.doc.title} (recovered)", because the study ${!stored ? 'is no longer here' : stored.deleted !== undefined ? 'is in the trash' : 'was saved elsewhere since'}.`);
      }
      clearJournal(id);
    } catch (err) {
      problems.push(`Changes to "${e.doc.title}" made before the page closed are kept on this device but could not be stored yet: ${err instanceof Error ? err.message : String(err)}`);
    }
  }
  return { restored, problems };
}

async function liveTabs(): Promise<Set<string>> {
  try {
    const q = await navigator.locks.query();
    return new Set((q.held ?? []).map((l) => l.name ?? '').filter((n) => n.startsWith(LOCK_PREFIX)).map((n) => n.slice(LOCK_PREFIX.length)));
  } catch {
    return new Set();
  }
}
