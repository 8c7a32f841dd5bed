/**
 * Finding a name in the text of a field, for underlining it: a whole word only, so that `k`
 * is not found inside `k_el` or `kk`. Letters, digits and underscores make up a word, as in
 * the expression language's names.
 */

/** Escapes the characters a regular expression treats specially. */
function escapeForRegExp(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
}

/**
 * [start, end) of the first place `word` stands in `text` with no letter, digit or
 * underscore on either side; undefined when it does not. Cost: one regular-expression scan.
 */
export function findWord(text: string, word: string): readonly [number, number] | undefined {
  const m = new RegExp(`(?<![A-Za-z0-9_])${escapeForRegExp(word)}(?![A-Za-z0-9_])`).exec(text);
  return m ? [m.index, m.index + word.length] : undefined;
}
