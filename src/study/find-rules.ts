/**
 * Rules for a simulate cell's questions (`find` entries) as a document: which kind a question
 * is, what changing its kind keeps, and new names. Pure: inputs are never changed. The
 * app's simulate cell only calls these.
 */
import { FIND_KINDS, type FindKind, type FindQuery } from './types.ts';

export { FIND_KINDS, type FindKind, type FindQuery } from './types.ts';

/** Kinds whose answer is a time (the others give a value of the state, or its area). */
const TIME_ANSWERS: ReadonlySet<FindKind> = new Set(['crossing', 'timeOfMaximum', 'timeOfMinimum', 'timeAbove', 'timeBelow']);
/** Kinds that compare the state with a `level`. */
const LEVEL_KINDS: ReadonlySet<FindKind> = new Set(['crossing', 'timeAbove', 'timeBelow']);
/** A level given to a question that had none: plain zero, for the user to replace. */
const NEW_LEVEL = '0';
/** A time given to a "value at" question that had none. */
const NEW_AT = '0 h';

/** The kind of a question: its one kind field that is present (own, never inherited); `crossing` when none is. */
export function findKindOf(f: FindQuery): FindKind {
  return FIND_KINDS.find((k) => Object.prototype.hasOwnProperty.call(f, k)) ?? 'crossing';
}

/** True when the kind compares the state with a `level` (crossing, time above, time below). */
export function needsLevel(kind: FindKind): boolean {
  return LEVEL_KINDS.has(kind);
}

/** What kind of quantity a kind answers with: a time, a value of the state, or an area under it. */
function answerOf(kind: FindKind): 'time' | 'value' | 'area' {
  return TIME_ANSWERS.has(kind) ? 'time' : kind === 'integralOf' ? 'area' : 'value';
}

/**
 * The question asked as another kind, keeping what carries over: its name, the state it asks
 * about, its window (`from`, `to`), its level between kinds that use one, its time for
 * "value at", and the unit of its answer while the answer stays the same kind of quantity.
 * A level or time the new kind needs and the old one lacked is filled in (`0`, `0 h`); what
 * the new kind does not read (a level, a direction, an occurrence, a time) is dropped.
 */
export function switchFind(f: FindQuery, to: FindKind): FindQuery {
  const from = findKindOf(f);
  if (from === to) return { ...f };
  const copy = { ...f } as Record<string, unknown>;
  const state = copy[from];
  delete copy[from];
  copy[to] = state;
  if (needsLevel(to)) copy.level ??= NEW_LEVEL;
  else delete copy.level;
  if (to === 'valueOf') copy.at ??= NEW_AT;
  else delete copy.at;
  if (to !== 'crossing') {
    delete copy.direction;
    delete copy.occurrence;
  }
  if (answerOf(from) !== answerOf(to)) delete copy.unit;
  return copy as unknown as FindQuery;
}

/** The question with the state it asks about changed. */
export function withFindState(f: FindQuery, state: string): FindQuery {
  return { ...f, [findKindOf(f)]: state };
}

/** The question with the unit its answer is shown in set, or cleared when `unit` is undefined. */
export function withFindUnit(f: FindQuery, unit: string | undefined): FindQuery {
  const { unit: _old, ...rest } = f;
  return unit === undefined ? rest : { ...rest, unit };
}

/** A name for a new question not used by the others: `q<n>`, n from the count plus one. */
export function freshFindName(finds: readonly FindQuery[]): string {
  const used = new Set(finds.map((f) => f.name));
  let n = finds.length + 1;
  while (used.has(`q${n}`)) n++;
  return `q${n}`;
}

/** The optional fields of a question that the editor sets or clears one at a time. */
export type FindOption = 'from' | 'to' | 'level' | 'at' | 'direction' | 'occurrence' | 'glance';

/**
 * The question with one optional field set, or removed when `value` is blank text or
 * undefined (a window end left blank is the run's own end; `glance` false is its default).
 */
export function withFindField<K extends FindOption>(f: FindQuery, key: K, value: FindQuery[K] | '' | undefined): FindQuery {
  const copy = { ...f };
  if (value === '' || value === undefined || (key === 'glance' && value === false)) delete copy[key];
  else copy[key] = value as FindQuery[K];
  return copy;
}
