/**
 * A node's run done in slices: a long cell (a Monte Carlo uncertainty cell) that the session
 * of the app's worker runs after every other cell, a slice at a time between messages, so an
 * edit's report never waits for it (`SessionOptions.defer`, engine/session.ts). A node that
 * has `slices` gives the same outcome from `run` as from its slices run to the end, bit for
 * bit: the slices only decide where the work pauses, never what it computes.
 */
import type { Outcome } from './node.ts';

export interface SlicedRun<O extends object = object> {
  /** Units of work done so far and in all, and what a unit is ("samples"), for progress. */
  readonly done: number;
  readonly total: number;
  readonly unit: string;
  /** Works until `until` (a performance.now() time) has passed, at least one unit; true when all is done. */
  step(until: number): boolean;
  /** The node's outcome, once `step` has returned true. */
  finish(): Outcome<O>;
}

/** How far a sliced run is, for the page's progress display. */
export interface Progress {
  readonly cell: string;
  readonly done: number;
  readonly total: number;
  readonly unit: string;
}

export function isSliced<O extends object>(x: Outcome<O> | SlicedRun<O>): x is SlicedRun<O> {
  return typeof (x as SlicedRun<O>).step === 'function';
}

/** The outcome of a start, with its slices run to the end at once (how `run` uses `slices`). */
export function runToEnd<O extends object>(start: Outcome<O> | SlicedRun<O>): Outcome<O> {
  if (!isSliced(start)) return start;
  start.step(Infinity);
  return start.finish();
}
