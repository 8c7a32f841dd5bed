/**
 * Saving a study a moment after the user stops changing it: a small state machine that
 * coalesces rapid changes into one save and tells the UI whether its work is safe.
 *
 * It never touches storage itself: it calls the `save` function it is given (normally
 * `saveStudy` from `store.ts`), one call at a time, always with the newest document.
 */

/** The states of an autosaver, in the order a change normally passes through them. */
export const AutosaveStates = {
  /** Everything scheduled so far has been saved (also the starting state). */
  saved: 'saved',
  /** A change is waiting for the quiet period to end. */
  pending: 'pending',
  /** A save is in flight. */
  saving: 'saving',
  /** The last save failed; `error` says why. The document is kept and retried: by itself after a growing wait (unless the failure says not to), and on the next `schedule` or `flush`. */
  error: 'error',
} as const;
export type AutosaveState = (typeof AutosaveStates)[keyof typeof AutosaveStates];

/**
 * How long a change may wait while changes keep coming, as a multiple of the quiet period:
 * someone typing steadily still gets a save every few seconds.
 */
const MAX_WAIT_FACTOR = 10;

export interface Autosaver<D> {
  /**
   * Records `doc` as the newest version to save. The save starts `delayMs` after the last call
   * (and never later than ten quiet periods after the first unsaved change); only the newest
   * document is saved. Cheap: no copy is made, so pass a document you will not mutate.
   */
  schedule(doc: D): void;
  /**
   * Saves the newest scheduled document now (after any save in flight) and resolves when
   * nothing is left to save: with 'saved', or 'error' when that save failed. Never rejects.
   */
  flush(): Promise<'saved' | 'error'>;
  /** The current state. */
  readonly state: AutosaveState;
  /** Why the last save failed, while `state` is 'error'. */
  readonly error: string | undefined;
  /** Called on every change of `state` (never twice in a row with the same state). */
  onchange: ((state: AutosaveState, error?: string) => void) | undefined;
}

/**
 * Makes an autosaver around `save`. Saves never overlap: a change scheduled during a save is
 * saved after it, so an older document can never land after a newer one. A rejected save puts
 * the autosaver in 'error' with the rejection's message and keeps the unsaved document.
 */
/** The first wait before a failed save is tried again, and the longest (ms): the wait doubles after each failure. */
const RETRY_FIRST_MS = 1000;
const RETRY_MAX_MS = 16000;

export interface AutosaverOptions {
  /** Whether a failure is worth retrying by itself (default: every failure is). */
  readonly retry?: (err: unknown) => boolean;
}

export function createAutosaver<D>(save: (doc: D) => Promise<void>, delayMs = 600, options: AutosaverOptions = {}): Autosaver<D> {
  if (!(delayMs >= 0)) throw new RangeError(`createAutosaver: delayMs must be 0 or more, not ${delayMs}`);
  let failures = 0;
  let retryable = false;
  let state: AutosaveState = 'saved';
  let error: string | undefined;
  let unsaved: { doc: D } | undefined; // the newest document not yet handed to `save`
  let firstUnsavedAt = 0;
  let timer: ReturnType<typeof setTimeout> | undefined;
  let inFlight: Promise<void> | undefined;
  let waiters: Array<(s: 'saved' | 'error') => void> = [];

  const saver: Autosaver<D> = {
    get state() { return state; },
    get error() { return error; },
    onchange: undefined,
    schedule(doc) {
      if (!unsaved) firstUnsavedAt = Date.now();
      unsaved = { doc };
      if (!inFlight) setState('pending');
      clearTimeout(timer);
      const latest = firstUnsavedAt + delayMs * MAX_WAIT_FACTOR;
      timer = setTimeout(onQuiet, Math.max(0, Math.min(delayMs, latest - Date.now())));
    },
    flush() {
      clearTimeout(timer);
      timer = undefined;
      if (!unsaved && !inFlight) return Promise.resolve(state === 'error' ? 'error' : 'saved');
      const done = new Promise<'saved' | 'error'>((resolve) => waiters.push(resolve));
      if (!inFlight) start();
      return done;
    },
  };

  function setState(next: AutosaveState, why?: string) {
    error = next === 'error' ? why : undefined;
    if (next === state) return;
    state = next;
    try {
      saver.onchange?.(state, error);
    } catch (err) {
      console.error('autosaver: the onchange callback threw', err); // logged, never breaks saving
    }
  }

  function onQuiet() {
    timer = undefined;
    if (!inFlight) start(); // otherwise the save in flight starts the next one when it ends
  }

  function start() {
    const job = unsaved;
    if (!job) return;
    unsaved = undefined;
    setState('saving');
    inFlight = (async () => {
      let failure: string | undefined;
      try {
        await save(job.doc);
        failures = 0;
      } catch (err) {
        failure = err instanceof Error ? err.message : String(err);
        failures++;
        retryable = options.retry ? options.retry(err) : true;
        unsaved ??= job; // keep the document that failed unless a newer one is waiting
        firstUnsavedAt = Date.now(); // retries wait a quiet period: no save per keystroke while failing
      }
      inFlight = undefined;
      finish(failure);
    })();
  }

  function finish(failure: string | undefined) {
    const flushing = waiters.length > 0;
    if (failure === undefined && unsaved && (flushing || timer === undefined)) {
      start(); // a newer document is due (its quiet period ended, or someone is flushing)
      return;
    }
    if (failure !== undefined) {
      setState('error', failure);
      if (retryable && timer === undefined) timer = setTimeout(onQuiet, Math.min(RETRY_MAX_MS, RETRY_FIRST_MS * 2 ** (failures - 1)));
    }
    else setState(unsaved ? 'pending' : 'saved');
    if (flushing && (failure !== undefined || !unsaved)) {
      const resolveAll = waiters;
      waiters = [];
      for (const resolve of resolveAll) resolve(failure === undefined ? 'saved' : 'error');
    }
  }

  return saver;
}
