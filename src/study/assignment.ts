import { NAME_PATTERN } from './types.ts';

/** A name and the start of its value, read from `name = value` typed where a name goes. */
export interface Assignment {
  readonly name: string;
  /** What follows the `=`, leading spaces dropped: possibly empty (`k =` typed so far). */
  readonly value: string;
}

/**
 * Reads `k = 0.35 / h` (or `k =` so far) typed or pasted into a parameter's name field as
 * the name and its value. Undefined unless the text before the first `=` is a valid name
 * (`NAME_PATTERN`) and that `=` is not the start of `==`: anything else stays a name for
 * the name check to word. Cost: one scan of the text.
 */
export function splitAssignment(text: string): Assignment | undefined {
  const at = text.indexOf('=');
  if (at < 0 || text[at + 1] === '=') return undefined;
  const name = text.slice(0, at).trim();
  if (!NAME_PATTERN.test(name)) return undefined;
  return { name, value: text.slice(at + 1).trimStart() };
}
