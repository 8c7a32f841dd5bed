/**
 * The bounds on a study file, checked before anything walks it: how long its text may be, how
 * deeply its lists and objects may nest, and how many values it may hold. Both checks are
 * loops with their own stack, never recursion, so a hostile file (10,000 nested lists) gets a
 * message with the path where it went too deep instead of overflowing the call stack in a
 * later reader (`JSON.stringify`, `structuredClone`, the document check).
 *
 * The app and the command line read files by the same rules (`readStudy`): a leading
 * byte-order mark is dropped, as a browser's `File.text()` drops it.
 */
import type { Problem } from './validate.ts';

/**
 * Deepest nesting of lists and objects, the document itself being level 1. A study needs 6
 * (`cells[0].events[0].add.D`, a data row's value); the rest is headroom.
 */
export const MAX_NESTING = 32;
/** Longest study text, in characters (64 Mi): a 100,000-row data table takes about 4 Mi. */
export const MAX_TEXT_LENGTH = 64 * 1024 * 1024;
/** Most values (texts, numbers, lists, objects...) in a study: 4 Mi. */
export const MAX_VALUES = 4 * 1024 * 1024;

/** The text with a leading byte-order mark removed. */
export function withoutByteOrderMark(text: string): string {
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

/** A path segment: `.name` for a plain key, `["a b"]` otherwise, `[3]` for a list entry. */
function segment(key: string | number): string {
  if (typeof key === 'number') return `[${key}]`;
  return /^[A-Za-z_$][A-Za-z0-9_$]*$/.test(key) ? `.${key}` : `[${JSON.stringify(key.length > 40 ? `${key.slice(0, 40)}…` : key)}]`;
}

function pathOf(keys: ReadonlyArray<string | number>): string {
  return keys.map(segment).join('').replace(/^\./, '');
}

function tooDeep(keys: ReadonlyArray<string | number>): Problem {
  return { path: pathOf(keys), message: `lists and objects are nested more than ${MAX_NESTING} levels deep here; a study needs fewer than 10` };
}

/**
 * The first bound the text breaks, before it is parsed: its length, or its nesting (found by
 * a scan of its brackets outside strings, with the path to the place). Cost: linear in the
 * text, no recursion. Undefined when within bounds (the text may still not be JSON).
 */
export function textLimitProblem(text: string): Problem | undefined {
  if (text.length > MAX_TEXT_LENGTH) {
    return { path: '', message: `the file is too large (${(text.length / 1048576).toFixed(1)} M characters; at most ${MAX_TEXT_LENGTH / 1048576} M)` };
  }
  // one frame per open list or object: the key (or index) of the value being read in it
  const keys: Array<string | number> = [];
  const isList: boolean[] = [];
  let lastString = '';
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 0x22) { // "
      let j = i + 1;
      while (j < text.length && text.charCodeAt(j) !== 0x22) j += text.charCodeAt(j) === 0x5c ? 2 : 1;
      lastString = text.slice(i, j + 1);
      i = j;
    } else if (c === 0x5b || c === 0x7b) { // [ {
      if (keys.length >= MAX_NESTING) return tooDeep(keys);
      keys.push(c === 0x5b ? 0 : '');
      isList.push(c === 0x5b);
    } else if (c === 0x5d || c === 0x7d) { // ] }
      keys.pop();
      isList.pop();
    } else if (c === 0x2c && isList[isList.length - 1]) { // , in a list
      (keys[keys.length - 1] as number)++;
    } else if (c === 0x3a && keys.length && !isList[isList.length - 1]) { // : in an object
      let key: unknown = '';
      try { key = JSON.parse(lastString); } catch { /* not JSON: the parser will say where */ }
      keys[keys.length - 1] = typeof key === 'string' ? key : '';
    }
  }
  return undefined;
}

/**
 * The first bound a parsed value breaks: its nesting (with the path to the place) or its
 * number of values. Cost: linear in the values, no recursion; a value reached twice (shared
 * or circular, possible in a value handed over in memory) is counted each time, so the count
 * bound also ends a circular walk.
 */
export function valueLimitProblem(value: unknown): Problem | undefined {
  interface Visit { readonly v: unknown; readonly key?: string | number; readonly parent?: Visit; readonly depth: number }
  const keysOf = (at: Visit): Array<string | number> => {
    const keys: Array<string | number> = [];
    for (let x: Visit | undefined = at; x?.parent; x = x.parent) keys.unshift(x.key!);
    return keys;
  };
  const stack: Visit[] = [{ v: value, depth: 0 }];
  let values = 0;
  while (stack.length) {
    const at = stack.pop()!;
    const { v, depth } = at;
    if (++values > MAX_VALUES) return { path: pathOf(keysOf(at)), message: `the study holds more than ${MAX_VALUES} values (texts, numbers, lists and objects)` };
    if (typeof v !== 'object' || v === null) continue;
    if (depth >= MAX_NESTING) return tooDeep(keysOf(at));
    if (Array.isArray(v)) {
      for (let i = v.length - 1; i >= 0; i--) {
        const x: unknown = v[i];
        // a number or text in a list (a table's entries) is counted here, not visited: no object per entry
        if ((typeof x !== 'object' || x === null) && values < MAX_VALUES) values++;
        else if (depth + 1 < MAX_NESTING && flatList(x) && values + 1 + x.length <= MAX_VALUES) values += 1 + x.length;
        else stack.push({ v: x, key: i, parent: at, depth: depth + 1 });
      }
    } else {
      const names = Object.keys(v);
      for (let i = names.length - 1; i >= 0; i--) stack.push({ v: (v as Record<string, unknown>)[names[i]], key: names[i], parent: at, depth: depth + 1 });
    }
  }
  return undefined;
}

/** A list of numbers, texts and nulls only (a table's row): counted without a visit of its own. */
function flatList(x: unknown): x is unknown[] {
  if (!Array.isArray(x)) return false;
  for (let i = 0; i < x.length; i++) if (typeof x[i] === 'object' && x[i] !== null) return false;
  return true;
}

/**
 * A copy of a value within the bounds above: lists and plain objects copied, numbers, texts,
 * booleans and null as they are. Anything else (a date, a map, a function) is copied by
 * `structuredClone`, which refuses what cannot be copied by throwing. Many times faster than
 * `structuredClone` on a table of 10,000 rows (no serialising). Recursion is safe: the value's
 * nesting is bounded (`valueLimitProblem` first).
 */
export function copyPlain<T>(value: T): T {
  if (typeof value !== 'object' || value === null) return typeof value === 'function' || typeof value === 'symbol' ? structuredClone(value) : value;
  if (Array.isArray(value)) {
    const out = new Array(value.length);
    for (let i = 0; i < value.length; i++) {
      const x: unknown = value[i];
      out[i] = typeof x === 'object' && x !== null ? copyPlain(x) : x === undefined || typeof x === 'number' || typeof x === 'string' || typeof x === 'boolean' ? x : structuredClone(x);
    }
    return out as T;
  }
  const proto = Object.getPrototypeOf(value);
  if (proto !== Object.prototype && proto !== null) return structuredClone(value);
  const out: Record<string, unknown> = {};
  for (const k of Object.keys(value)) out[k] = copyPlain((value as Record<string, unknown>)[k]);
  return out as T;
}

/**
 * A value as a message quotes it: its JSON, cut to `max` characters (a message never grows
 * with the file). The value must be within the bounds above.
 */
export function shortJson(v: unknown, max = 60): string {
  const text = JSON.stringify(v) ?? String(v);
  return text.length > max ? `${text.slice(0, max)}…` : text;
}
