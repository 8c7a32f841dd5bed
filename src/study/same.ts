/**
 * Whether two study documents (or any two values within the bounds of `limits.ts`) hold the
 * same content: what `JSON.stringify` would write for each, compared without writing it.
 * Parts shared by both (the cells an edit did not touch) are the same object and are not
 * walked; the walk stops at the first difference (a 10,000-row table against its CSV text
 * is told apart at once). Object keys may come in any order; a key whose value is undefined
 * counts as absent, and a number that is not finite as null, as in JSON.
 * Recursion is safe: the nesting of a document is bounded (`valueLimitProblem`).
 */
export function sameContent(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  const objA = typeof a === 'object' && a !== null;
  const objB = typeof b === 'object' && b !== null;
  if (!objA || !objB) return !objA && !objB && asJson(a) === asJson(b);
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  if (Array.isArray(a)) {
    const y = b as unknown[];
    if (a.length !== y.length) return false;
    for (let i = 0; i < a.length; i++) if (!sameContent(a[i], y[i])) return false;
    return true;
  }
  const x = a as Record<string, unknown>;
  const y = b as Record<string, unknown>;
  let count = 0;
  for (const k of Object.keys(x)) {
    if (x[k] === undefined) continue;
    count++;
    if (!Object.prototype.hasOwnProperty.call(y, k) || !sameContent(x[k], y[k])) return false;
  }
  for (const k of Object.keys(y)) if (y[k] !== undefined) count--;
  return count === 0;
}

/** A value that is not an object as JSON would write it (in a list: undefined and functions as null). */
function asJson(v: unknown): unknown {
  if (typeof v === 'number') return Number.isFinite(v) ? v : null;
  if (v === undefined || typeof v === 'function' || typeof v === 'symbol') return null;
  return v;
}
