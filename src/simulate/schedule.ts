
/**
 * Schedules: a simulate cell's events expanded into a timeline of actions at exact times,
 * so that integration can stop and restart at each one and never step across a jump.
 * Pure numbers (SI seconds and SI magnitudes).
 */
import { charge } from '../numerics/work-meter.ts';

/**
 * Units of work charged for each action of a schedule: each one restarts the integration and
 * adds a piece to the solution, its samples and its plot (about 250 evaluations' worth).
 */
const ACTION_WORK = 200;

export type ActionKind = 'add' | 'set' | 'infuse-start' | 'infuse-stop';

export interface ScheduledEvent {
  /** Index of the event in the cell, for messages. */
  readonly index: number;
  readonly at: number;
  readonly every?: number;
  readonly count?: number;
  /** Infusion duration. */
  readonly duration?: number;
  readonly kind: 'add' | 'set' | 'infuse';
  /** Target name (a state for add/infuse, a parameter for set) and its SI amount or rate. */
  readonly targets: ReadonlyArray<{ readonly name: string; readonly value: number }>;
}

export interface Action {
  readonly time: number;
  readonly kind: ActionKind;
  readonly event: number;
  /** Which repetition of the event (0-based). */
  readonly repeat: number;
  readonly targets: ReadonlyArray<{ readonly name: string; readonly value: number }>;
}

/** The most actions a schedule may expand to: a bound that keeps a typo from hanging the run. */
export const MAX_ACTIONS = 200_000;

/**
 * Expands events into actions inside [from, to], sorted by time. Within one time, infusion
 * stops come first, then parameter changes, then jumps, then infusion starts, so back-to-back
 * infusions hand over cleanly. An event with `every` and no `count` repeats to the end.
 * Returns a message instead when the schedule is unusable.
 */
export function expandSchedule(events: readonly ScheduledEvent[], from: number, to: number): Action[] | { error: string; event: number } {
  const actions: Action[] = [];
  for (const e of events) {
    if (e.every !== undefined && !(e.every > 0)) return { error: 'the repeat interval "every" must be longer than zero', event: e.index };
    if (e.duration !== undefined && !(e.duration > 0)) return { error: 'an infusion must last longer than zero ("for")', event: e.index };
    const count = e.count ?? (e.every !== undefined ? Math.floor((to - e.at) / e.every + 1e-9) + 1 : 1);
    if (count > MAX_ACTIONS) return { error: `this event repeats ${count} times in the run; at most ${MAX_ACTIONS} are allowed`, event: e.index };
    for (let r = 0; r < count; r++) {
      charge(ACTION_WORK);
      const time = e.at + r * (e.every ?? 0);
      if (time > to) break;
      if (e.kind === 'infuse') {
        const end = time + e.duration!;
        if (end <= from) continue;
        actions.push({ time: Math.max(time, from), kind: 'infuse-start', event: e.index, repeat: r, targets: e.targets });
        if (end < to) actions.push({ time: end, kind: 'infuse-stop', event: e.index, repeat: r, targets: e.targets });
      } else if (time >= from || e.kind === 'set') {
        actions.push({ time: Math.max(time, from), kind: e.kind, event: e.index, repeat: r, targets: e.targets });
      }
      if (actions.length > MAX_ACTIONS) return { error: `the schedule has more than ${MAX_ACTIONS} actions`, event: e.index };
    }
  }
  const rank: Record<ActionKind, number> = { 'infuse-stop': 0, set: 1, add: 2, 'infuse-start': 3 };
  actions.sort((a, b) => a.time - b.time || rank[a.kind] - rank[b.kind] || a.event - b.event || a.repeat - b.repeat);
  return actions;
}

/**
 * How many times each event acts within the run, by event index (`events` entries): the
 * distinct repetitions that made an action (an infusion counts by its starts). An `add` before
 * the run is not counted; a `set` before it is, as it applies from the start. Cost: linear.
 */
export function timesInRun(actions: readonly Action[], events: number): number[] {
  const seen = Array.from({ length: events }, () => new Set<number>());
  for (const a of actions) if (a.kind !== 'infuse-stop') seen[a.event]?.add(a.repeat);
  return seen.map((s) => s.size);
}
