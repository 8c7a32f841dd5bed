/**
 * The engine's unit table and expression parser (mathjs, on the page for editors' highlighting
 * and completion and for the unit menus) readied a few milliseconds per task. mathjs builds
 * them on first use, some sixty parts in one go: tens of milliseconds in whichever task first
 * needs a unit, such as the one making the first editor. From the moment a study view is shown
 * they are built in short tasks of their own instead; a use before the end builds the rest at
 * once, as before.
 */
import { prepareMathjs } from '../src/index.ts';

/** Time for building parts in one task (ms); a part takes from well under one to a few. */
const SLICE_MS = 5;

let ready = false;

/** Builds parts for about SLICE_MS; true once all are built. */
export function readyUnitsSlice(): boolean {
  ready ||= prepareMathjs(SLICE_MS);
  return ready;
}

let started = false;

/** Builds the parts in tasks of about SLICE_MS each, one after another, until all are built (once: later calls do nothing). */
export function readyUnitsInBackground(): void {
  if (started) return;
  started = true;
  const step = () => { if (!readyUnitsSlice()) setTimeout(step, 0); };
  setTimeout(step, 0);
}
