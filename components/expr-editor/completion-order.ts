/**
 * The order in which completion offers the kinds of word, read from the text before the word.
 * A word that continues a quantity (`1 g`, `2 h`, `100 L / min`) is most likely a unit; any
 * other word most likely one of the study's names. Pure: no editor, no DOM.
 */
import { tokenize, wordRole } from './tokens.ts';

/** The kinds of word completion offers. */
export type OfferKind = 'name' | 'function' | 'constant' | 'unit';

/** Where a word continues a quantity: units, then the study's names, functions, constants. */
export const UNIT_PLACE_ORDER: readonly OfferKind[] = Object.freeze(['unit', 'name', 'function', 'constant']);
/** Anywhere else: the study's names, then functions, constants, units. */
export const NAME_PLACE_ORDER: readonly OfferKind[] = Object.freeze(['name', 'function', 'constant', 'unit']);

/**
 * Whether a word typed right after `before` continues a quantity, so stands for a unit: the
 * text before it ends in a number (`1 `, `exp(-2 `), or in a unit, `*` or `/` that follow a
 * number through units only (`100 L / `, `3 m^2 / `, `5 kg `). A `*` or `/` straight after a
 * number is arithmetic (`0.3 * k`, `0.693 / thalf`): the study's names come first there. A
 * word the study defines is a name, not a unit, even when a unit has its spelling.
 * Cost: linear in `before`.
 */
export function inUnitPlace(before: string, studyNames: { has(name: string): boolean }): boolean {
  const tokens = tokenize(before);
  const text = (i: number) => before.slice(tokens[i].from, tokens[i].to);
  let sawUnit = false;
  for (let i = tokens.length - 1; i >= 0; i--) {
    const kind = tokens[i].kind;
    if (kind === 'number') {
      if (i > 0 && text(i - 1) === '^') {
        i--; // an exponent of the unit before it (`m^2`)
        continue;
      }
      return i === tokens.length - 1 || sawUnit;
    }
    if (kind === 'word' && wordRole(text(i), false, studyNames) === 'unit') {
      sawUnit = true;
      continue;
    }
    if (kind === 'operator' && (text(i) === '*' || text(i) === '/')) continue;
    return false;
  }
  return false;
}

/** The kinds of word in the order completion lists them, for a word typed after `before`. */
export function offerOrder(before: string, studyNames: { has(name: string): boolean }): readonly OfferKind[] {
  return inUnitPlace(before, studyNames) ? UNIT_PLACE_ORDER : NAME_PLACE_ORDER;
}
