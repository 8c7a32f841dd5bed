/**
 * Rules for a simulate cell's schedule events as a document: an event's action (add a dose,
 * set a parameter, infuse at a rate), its target and amount, what changing its action keeps,
 * and its optional fields. Pure: inputs are never changed. The app's simulate cell only
 * calls these.
 */
import type { ScheduleEvent } from './types.ts';

export type { ScheduleEvent } from './types.ts';

/** The actions an event can take, in the order a menu offers them. */
export const EVENT_ACTIONS = ['add', 'set', 'infuse'] as const;
export type EventAction = (typeof EVENT_ACTIONS)[number];

/** How long an event that becomes an infusion lasts when it had no duration. */
const NEW_DURATION = '1 h';

/** The action of an event: the first of add, set, infuse that it has (`infuse` when none). */
export function eventActionOf(ev: ScheduleEvent): EventAction {
  return ev.add ? 'add' : ev.set ? 'set' : 'infuse';
}

/** The event's first target (a state or parameter name) and its amount; empty text when it has none. */
export function eventTarget(ev: ScheduleEvent): readonly [name: string, amount: string] {
  const first = Object.entries(ev[eventActionOf(ev)] ?? {})[0];
  return first ? [first[0], first[1]] : ['', ''];
}

/**
 * The event with its first target renamed to `name` and given `amount`, in the same place;
 * any further targets of the action stay as they were.
 */
export function withTarget(ev: ScheduleEvent, name: string, amount: string): ScheduleEvent {
  const action = eventActionOf(ev);
  const rest = Object.entries(ev[action] ?? {}).slice(1).filter(([n]) => n !== name);
  return { ...ev, [action]: Object.fromEntries([[name, amount], ...rest]) };
}

/**
 * The event taking another action with the same targets and amounts, at the same times. An
 * infusion keeps its duration (or gets `1 h`); other actions have none, so it is dropped.
 */
export function switchAction(ev: ScheduleEvent, to: EventAction): ScheduleEvent {
  const from = eventActionOf(ev);
  const { add: _a, set: _s, infuse: _i, for: duration, ...rest } = ev;
  return { ...rest, [to]: { ...(ev[from] ?? {}) }, ...(to === 'infuse' ? { for: duration ?? NEW_DURATION } : {}) };
}

/** The event with an optional field (`every`, `count`, `for`) set, or removed when `value` is blank. */
export function withEventField<K extends 'every' | 'count' | 'for'>(ev: ScheduleEvent, key: K, value: ScheduleEvent[K] | ''): ScheduleEvent {
  const copy = { ...ev };
  if (value === '' || value === undefined) delete copy[key];
  else copy[key] = value as ScheduleEvent[K];
  return copy;
}

/** The event's targets under its action, in order, each as [name, amount]. */
export function eventTargets(ev: ScheduleEvent): Array<readonly [name: string, amount: string]> {
  return Object.entries(ev[eventActionOf(ev)] ?? {}).map(([n, v]) => [n, v] as const);
}

/**
 * The event with target i given `name` and `amount`, in the same place. A name another target
 * of the event already has would merge the two and lose one amount, so the event is then
 * returned as it was (`null` says so).
 */
export function withTargetAt(ev: ScheduleEvent, i: number, name: string, amount: string): ScheduleEvent | null {
  const action = eventActionOf(ev);
  const entries = eventTargets(ev);
  if (entries.some(([n], j) => j !== i && n === name)) return null;
  const next = entries.map((e, j) => (j === i ? [name, amount] as const : e));
  if (i >= entries.length) next.push([name, amount]);
  return { ...ev, [action]: Object.fromEntries(next) };
}

/** The event without target i (an event keeps at least its first target: one with none cannot run). */
export function withoutTargetAt(ev: ScheduleEvent, i: number): ScheduleEvent {
  const action = eventActionOf(ev);
  const entries = eventTargets(ev);
  if (entries.length <= 1) return ev;
  return { ...ev, [action]: Object.fromEntries(entries.filter((_, j) => j !== i)) };
}
