/**
 * The open study moved to the trash, or removed for good, by another tab: where the store
 * has it now, and what the page says about it. The page changes nothing until the user
 * chooses (restore it from the trash, or keep the page's version as a new study); saves into
 * the trash are refused by the store meanwhile (`saveStudy`'s code 'trashed'), and each edit
 * stays in the page and in the journal.
 */
import * as store from './store.ts';

/** Where the study went: to the trash, or out of the store altogether. */
export type Gone = 'trash' | 'removed';

/** Where the study stands in the store: gone, or undefined while it is an ordinary (live) study. Rejects as the store does. */
export async function whereGone(id: string): Promise<Gone | undefined> {
  const stored = await store.loadStudy(id);
  return stored === undefined ? 'removed' : stored.deleted !== undefined ? 'trash' : undefined;
}

/** What the page says, in words, while the study is gone. */
export function goneWords(where: Gone): string {
  const kept = 'This page still shows it, and keeps what is typed here (on the page and in this browser\'s journal of unsaved edits)';
  return where === 'trash'
    ? `This study was moved to the trash in another tab. ${kept}, but saves nothing into the trash until you choose.`
    : `This study was deleted for good in another tab (the trash was emptied, or it was deleted from the trash). ${kept}; it is stored nowhere else now.`;
}

/** The words after the user restored it. */
export const RESTORED = 'The study is restored from the trash; editing and saving go on as before.';
