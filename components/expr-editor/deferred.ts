/**
 * Editors made only when needed. A study of hundreds of cells would make hundreds of CodeMirror
 * views at once, each measuring the page: seconds of one task. In a large study (the study
 * view says so: `deferEditors`), a field shows its text in a plain focusable box instead, and
 * gets its editor when it comes within `NEAR_PX` of the viewport or takes focus (keyboard or
 * pointer). Editors woken together are made a few per task, those first in the page first,
 * and new props for editors without focus (names, errors: a new report) are given a few per
 * task too.
 * In other studies, and in the tests, every field gets its editor at once.
 */

import { readyUnitsSlice } from '../ready-units.ts';

/** How near the viewport (CSS px, above and below) a waiting field gets its editor. */
export const NEAR_PX = 600;
/**
 * Time for making woken editors in one task (ms); the rest wait until the page has drawn a
 * frame, since each new editor measures itself in the next animation frame: editors made over
 * several tasks before one frame would all measure in that frame's one task.
 */
const WAKE_BUDGET_MS = 15;
/** The longest wait for that frame (ms): a page in the background draws none. */
const FRAME_WAIT_MS = 100;

let deferring = false;

/** Whether new fields wait for their editors (true while a large study is shown). */
export function deferEditors(on: boolean): void {
  deferring = on;
}

/** Whether a new field should wait for its editor. */
export function shouldWait(): boolean {
  return deferring;
}

const wakers = new WeakMap<Element, () => void>();
let observer: IntersectionObserver | undefined;
/** Fields that came near the viewport, in page order, waiting for their turn. */
const due: Element[] = [];
let draining: ReturnType<typeof setTimeout> | undefined;

function near(): IntersectionObserver {
  observer ??= new IntersectionObserver((entries) => {
    for (const e of entries) {
      if (!e.isIntersecting) continue;
      observer!.unobserve(e.target);
      due.push(e.target);
    }
    drain();
  }, { rootMargin: `${NEAR_PX}px 0px` });
  return observer;
}

/**
 * Makes the due editors, for about WAKE_BUDGET_MS, then leaves the rest to the next task. An
 * editor looks up units as it highlights: until the unit table is ready, a task readies a
 * part of it instead, so that no one task builds it all.
 */
function drain(): void {
  if (due.length && !readyUnitsSlice()) {
    draining ??= setTimeout(() => { draining = undefined; drain(); }, 0);
    return;
  }
  const started = performance.now();
  while (due.length && performance.now() - started < WAKE_BUDGET_MS) {
    const el = due.shift()!;
    const wake = wakers.get(el);
    wakers.delete(el);
    wake?.();
  }
  if (due.length && draining === undefined) draining = afterFrame(() => { draining = undefined; drain(); });
}

/** Calls `next` in a task after the next frame is drawn (or after FRAME_WAIT_MS without one). */
function afterFrame(next: () => void): ReturnType<typeof setTimeout> {
  let done = false;
  const once = () => { if (!done) { done = true; clearTimeout(fallback); next(); } };
  const fallback = setTimeout(once, FRAME_WAIT_MS);
  requestAnimationFrame(() => setTimeout(once, 0));
  return fallback;
}

/**
 * Updates of editors without focus, put off in a large study: the newest per editor, made for
 * about WAKE_BUDGET_MS per task. A report reaching dozens of editors at once would otherwise
 * update them all in one task, and each update of an editor reads the page's selection, which
 * makes the browser lay the page out again after the previous editor changed it.
 */
const putOff = new Map<object, () => void>();
let puttingOff: ReturnType<typeof setTimeout> | undefined;

/** Makes `update` for the editor `key` in a later task (replacing one still waiting for it). */
export function putOffUpdate(key: object, update: () => void): void {
  putOff.set(key, update);
  puttingOff ??= setTimeout(runPutOff, 0);
}

/** Makes the editor's waiting update now (it took focus), if there is one. */
export function updateNow(key: object): void {
  const update = putOff.get(key);
  putOff.delete(key);
  update?.();
}

/** Drops the editor's waiting update (the editor is gone). */
export function dropUpdate(key: object): void {
  putOff.delete(key);
}

function runPutOff(): void {
  puttingOff = undefined;
  const started = performance.now();
  for (const [key, update] of putOff) {
    if (performance.now() - started >= WAKE_BUDGET_MS) break;
    putOff.delete(key);
    update();
  }
  if (putOff.size) puttingOff = setTimeout(runPutOff, 0);
}

/** Calls `wake` once `el` comes near the viewport (at once, in the next frame, if it is). */
export function wakeWhenNear(el: Element, wake: () => void): void {
  wakers.set(el, wake);
  near().observe(el);
}

/** Stops watching `el`. */
export function stopWatching(el: Element): void {
  wakers.delete(el);
  const i = due.indexOf(el);
  if (i >= 0) due.splice(i, 1);
  observer?.unobserve(el);
}

/** What the waiting box shows and says: the field's text, and its accessible name and state. */
export interface WaitingView {
  readonly text: string;
  readonly label: string;
  readonly readonly: boolean;
  readonly invalid: boolean;
  readonly describedBy?: string;
}

/** Brings the waiting box `box` in line with `v` (a text box to assistive technology, like the editor's). */
export function showWaiting(box: HTMLElement, v: WaitingView): void {
  if (box.textContent !== v.text) box.textContent = v.text;
  const attrs: Record<string, string | undefined> = {
    role: 'textbox', tabindex: '0', 'aria-label': v.label, 'aria-multiline': 'false',
    'aria-readonly': v.readonly ? 'true' : undefined, 'aria-invalid': v.invalid ? 'true' : undefined, 'aria-describedby': v.describedBy,
  };
  for (const [name, value] of Object.entries(attrs)) {
    if (value === undefined) box.removeAttribute(name);
    else if (box.getAttribute(name) !== value) box.setAttribute(name, value);
  }
}
