/**
 * Tabs telling each other of their saves as they happen: each change this page makes to the
 * app's store is announced on the BroadcastChannel `ratebook-saves` as `{id, revision}` (the
 * study and its stored revision after the change; `revision` is absent for changes that do
 * not give one, such as a study moved to the trash or removed). Other pages of the same
 * origin hear it at once; the page that made the change does not (a BroadcastChannel never
 * delivers to the object that posted). Where BroadcastChannel is missing, nothing is said and
 * the store's compare-and-set still refuses a stale save.
 */

/** The channel's name. */
export const SAVES_CHANNEL = 'ratebook-saves';

/** What a page says after a change to a study. */
export interface SaveNews {
  readonly id: string;
  readonly revision?: number;
}

let channel: BroadcastChannel | null | undefined;
function open(): BroadcastChannel | null {
  if (channel === undefined) channel = typeof BroadcastChannel === 'function' ? new BroadcastChannel(SAVES_CHANNEL) : null;
  return channel;
}

/** Tells the other pages that study `id` changed (to `revision`, when the change gives one). */
export function announce(id: string, revision?: number): void {
  try {
    open()?.postMessage(revision === undefined ? { id } : { id, revision });
  } catch {
    // a closed or unusable channel: the other pages learn of the change on their next save
  }
}

/** Announces the change a store operation made, once it is made; the operation's outcome is passed on unchanged. */
export function announced<T>(work: Promise<T>, news: (value: T) => SaveNews | readonly SaveNews[] | undefined): Promise<T> {
  return work.then((value) => {
    const said = news(value);
    for (const n of said === undefined ? [] : Array.isArray(said) ? said : [said as SaveNews]) announce(n.id, n.revision);
    return value;
  });
}

/** Whether a message is news of a save (anything else on the channel is ignored). */
function isNews(data: unknown): data is SaveNews {
  if (typeof data !== 'object' || data === null) return false;
  const { id, revision } = data as Record<string, unknown>;
  return typeof id === 'string' && (revision === undefined || (typeof revision === 'number' && Number.isInteger(revision)));
}

/**
 * Calls `heard` for each change another page announces (this page's own announcements go out
 * on the same channel object, so they are not heard here). Returns the way to stop listening.
 */
export function listen(heard: (news: SaveNews) => void): () => void {
  const ch = open();
  if (!ch) return () => {};
  const onMessage = (e: MessageEvent) => { if (isNews(e.data)) heard({ id: e.data.id, revision: e.data.revision }); };
  ch.addEventListener('message', onMessage);
  return () => ch.removeEventListener('message', onMessage);
}
