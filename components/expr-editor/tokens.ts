/**
 * Splits expression text into tokens for display: numbers, words, operators, the keywords
 * of logic and the two halves of a conditional. Display only: the engine's parser decides
 * what the text means, and the tokenizer never refuses anything (unknown characters become
 * 'other').
 */
import { constantNames, functionNames, lookupUnit } from '../../src/index.ts';

export type TokenKind = 'number' | 'word' | 'operator' | 'conditional' | 'bracket' | 'comma' | 'other';

export interface Token {
  readonly kind: TokenKind;
  readonly from: number;
  readonly to: number;
}

const NUMBER = /(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?/y;
const WORD = /[\p{L}_$][\p{L}\p{N}_$]*/uy;
const OPERATOR = /<=|>=|==|!=|[-+*/^<>=!%']/y;
const SPACE = /\s+/y;

/** The tokens of `text`, in order, spaces left out. Cost: linear in the text. */
export function tokenize(text: string): Token[] {
  const out: Token[] = [];
  let at = 0;
  const take = (re: RegExp): number => {
    re.lastIndex = at;
    return re.test(text) ? re.lastIndex : at;
  };
  while (at < text.length) {
    let end = take(SPACE);
    if (end > at) {
      at = end;
      continue;
    }
    let kind: TokenKind;
    if ((end = take(NUMBER)) > at) kind = 'number';
    else if ((end = take(WORD)) > at) kind = 'word';
    else if ((end = take(OPERATOR)) > at) kind = 'operator';
    else {
      const c = text[at];
      end = at + 1;
      kind = c === '?' || c === ':' ? 'conditional' : c === '(' || c === ')' ? 'bracket' : c === ',' ? 'comma' : 'other';
    }
    out.push({ kind, from: at, to: end });
    at = end;
  }
  return out;
}

/** What a word stands for, in the order the engine resolves names. */
export type WordRole = 'keyword' | 'function' | 'name' | 'constant' | 'unit' | 'unknown';

const KEYWORDS = new Set(['and', 'or', 'not', 'true', 'false']);
const FUNCTIONS = new Set(functionNames());
const CONSTANTS = new Set(constantNames());

/**
 * The role of a word: a keyword; a function when it is called (`min(` is the function,
 * `5 min` the unit); a name the study defines (which hides a constant or unit of that name);
 * a constant; a unit `lookupUnit` knows (so "ks" counts even though no list offers it); else
 * unknown.
 */
export function wordRole(word: string, called: boolean, studyNames: { has(name: string): boolean }): WordRole {
  if (KEYWORDS.has(word)) return 'keyword';
  if (called && FUNCTIONS.has(word)) return 'function';
  if (studyNames.has(word)) return 'name';
  if (CONSTANTS.has(word)) return 'constant';
  if (lookupUnit(word) && word !== 't') return 'unit';
  return 'unknown';
}

/** Whether the word ending at `to` is followed, after spaces, by "(". */
export function isCalled(text: string, to: number): boolean {
  let i = to;
  while (i < text.length && /\s/.test(text[i])) i++;
  return text[i] === '(';
}

/** The word token that contains or touches `pos`, if any (a word right before the cursor counts). */
export function wordAt(text: string, pos: number): { from: number; to: number; word: string } | undefined {
  for (const t of tokenize(text)) {
    if (t.from > pos) break;
    if (t.kind === 'word' && t.to >= pos) return { from: t.from, to: t.to, word: text.slice(t.from, t.to) };
  }
  return undefined;
}
