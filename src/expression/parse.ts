/**
 * The restricted parser: mathjs parses the text, then every node of its tree is either
 * translated into Ratebook's own tree (ast.ts) or refused with a message. Nothing outside the
 * allow-list survives, whatever the text contains.
 */
import { math } from '../units/mathjs.ts';
import type { BinaryOp, CompareOp, Expr } from './ast.ts';
import { FUNCTIONS, FUNCTION_NAMES, isFunctionName } from './functions.ts';
import { findWord } from './find-word.ts';

/** An error in an expression; `span` is [start, end) in the text when the parser knows it. */
export interface ExprProblem {
  readonly message: string;
  readonly span?: readonly [number, number];
}

export type ParseResult = { ok: true; expr: Expr } | { ok: false; error: ExprProblem };

/** Longest accepted expression text and deepest nesting: bounds that keep the checker safe. */
export const MAX_LENGTH = 4000;
const MAX_DEPTH = 200;

/**
 * "%" followed by something that can start a value. mathjs then tries to read that value to
 * tell a remainder from a percentage, and when the try fails it keeps the percentage and
 * drops the rest of the text unread ("5 % (2" would be 0.05).
 */
const PERCENT_BEFORE_TERM = /%\s*(?!(?:and|or)(?![A-Za-z0-9_$]))[A-Za-z0-9_$.(\[{"'+\-\u0080-\uffff]/;

const BINARY: Record<string, BinaryOp> = { add: '+', subtract: '-', multiply: '*', divide: '/', pow: '^' };
const COMPARE: Record<string, CompareOp> = {
  smaller: '<', larger: '>', smallerEq: '<=', largerEq: '>=', equal: '==', unequal: '!=',
};

class Refusal extends Error {
  constructor(message: string, readonly token?: string) {
    super(message);
  }
}

/**
 * Texts parsed lately and their results (which no one changes): the session, the study's units
 * and the sheet's TeX each parse every field of a study on an evaluation, so one parse serves
 * all three. Two generations of up to CACHE_LIMIT texts each: when the young one is full it
 * becomes the old one and the old one is dropped, and a text found in the old one moves to
 * the young. So a study of up to CACHE_LIMIT fields stays cached, at O(1) per look-up (a Map
 * emptied from its front one key at a time costs more the more keys it has lost).
 */
const CACHE_LIMIT = 20000;
let young = new Map<string, ParseResult>();
let old = new Map<string, ParseResult>();

/** Parses one expression. Never throws. Cost: linear in the text, a map look-up for a text parsed lately. */
export function parseExpression(text: unknown): ParseResult {
  if (typeof text !== 'string') return parseText(text);
  let r = young.get(text);
  if (r) return r;
  r = old.get(text) ?? parseText(text);
  if (young.size >= CACHE_LIMIT) {
    old = young;
    young = new Map();
  }
  young.set(text, r);
  return r;
}

function parseText(text: unknown): ParseResult {
  if (typeof text !== 'string') return fail(`must be an expression written as text; it is ${typeof text === 'number' ? `the number ${text} (write it as "${text}")` : describeJson(text)}`);
  if (text.trim() === '') return fail('is empty: write a value, such as "0.35 / h"');
  if (text.length > MAX_LENGTH) return fail(`is too long (${text.length} characters; at most ${MAX_LENGTH})`);
  const bad = /[;\n\r]/.exec(text);
  if (bad) return fail('must be a single expression (no ";" or line breaks)', [bad.index, bad.index + 1]);
  const percent = PERCENT_BEFORE_TERM.exec(text);
  if (percent) return fail('may not use "%" before a value: "%" is percent only after a number ("5%"), and there is no remainder operator', [percent.index, percent.index + 1]);
  const hash = text.indexOf('#');
  if (hash >= 0) return fail('may not contain "#": the parser would read the rest of the text as a comment and ignore it', [hash, hash + 1]);
  let node: any;
  try {
    node = math.parse(text);
  } catch (err) {
    return fail(syntaxMessage(err), syntaxSpan(err, text));
  }
  try {
    return { ok: true, expr: translate(node, 0) };
  } catch (err) {
    if (err instanceof Refusal) return fail(err.message, locate(text, err.token));
    if (err instanceof RangeError) return fail('is nested too deeply');
    return fail(`could not be read: ${(err as Error).message}`);
  }
}

function fail(message: string, span?: readonly [number, number]): ParseResult {
  return { ok: false, error: span ? { message, span } : { message } };
}

function describeJson(v: unknown): string {
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'a list';
  return typeof v === 'object' ? 'an object' : typeof v;
}

function syntaxMessage(err: unknown): string {
  const msg = String((err as Error)?.message ?? err);
  const m = /^(.*?)\s*\(char (\d+)\)\s*$/.exec(msg);
  return `has a syntax error: ${(m ? m[1] : msg).replace(/\.$/, '')}${m ? ` at character ${m[2]}` : ''}`;
}

function syntaxSpan(err: unknown, text: string): readonly [number, number] | undefined {
  const m = /\(char (\d+)\)/.exec(String((err as Error)?.message ?? ''));
  if (!m) return undefined;
  const at = Math.max(0, Math.min(text.length, Number(m[1]) - 1));
  return [at, Math.min(text.length, at + 1)];
}

/** Finds a refused token in the text so the editor can underline it. */
function locate(text: string, token?: string): readonly [number, number] | undefined {
  if (!token) return undefined;
  if (/^[A-Za-z_]/.test(token)) return findWord(text, token);
  const at = text.indexOf(token);
  return at >= 0 ? [at, at + token.length] : undefined;
}

function translate(n: any, depth: number): Expr {
  if (depth > MAX_DEPTH) throw new Refusal('is nested too deeply');
  const next = (c: any) => translate(c, depth + 1);
  switch (n.type) {
    case 'ConstantNode':
      if (typeof n.value === 'number') return { k: 'num', v: n.value };
      if (typeof n.value === 'boolean') return { k: 'bool', v: n.value };
      if (typeof n.value === 'string') throw new Refusal('may not contain text strings (quotes)', '"');
      throw new Refusal(`may not contain the value ${String(n.value)}`);
    case 'SymbolNode':
      return { k: 'sym', name: n.name };
    case 'ParenthesisNode':
      return next(n.content);
    case 'ConditionalNode':
      return { k: 'if', c: next(n.condition), a: next(n.trueExpr), b: next(n.falseExpr) };
    case 'RelationalNode':
      return { k: 'cmp', ops: n.conditionals.map((c: string) => compareOp(c)), args: n.params.map(next) };
    case 'OperatorNode':
      return operator(n, next);
    case 'FunctionNode':
      return call(n, next);
    case 'AssignmentNode':
      throw new Refusal('may not assign with "=": define names in a parameters cell (to compare, write "==")', '=');
    case 'FunctionAssignmentNode':
      throw new Refusal('may not define functions', '=');
    case 'AccessorNode':
    case 'IndexNode':
      throw new Refusal('may not use property access or indexing (a.b, a[1])', n.type === 'AccessorNode' && n.index?.dotNotation ? '.' : '[');
    case 'ArrayNode':
      throw new Refusal('may not contain lists or matrices ([...])', '[');
    case 'ObjectNode':
      throw new Refusal('may not contain objects ({...})', '{');
    case 'RangeNode':
      throw new Refusal('may not contain ranges (a:b)', ':');
    case 'BlockNode':
      throw new Refusal('must be a single expression');
    default:
      throw new Refusal(`may not contain ${String(n.type)}`);
  }
}

function compareOp(fn: string): CompareOp {
  const op = COMPARE[fn];
  if (!op) throw new Refusal(`may not use the comparison ${fn}`);
  return op;
}

function operator(n: any, next: (c: any) => Expr): Expr {
  const fn: string = n.fn;
  const args: any[] = n.args;
  if (BINARY[fn] && args.length === 2) {
    if (n.isPercentage) return { k: 'bin', op: '/', a: next(args[0]), b: { k: 'num', v: 100 } };
    return { k: 'bin', op: BINARY[fn], a: next(args[0]), b: next(args[1]) };
  }
  if (COMPARE[fn] && args.length === 2) return { k: 'cmp', ops: [COMPARE[fn]], args: [next(args[0]), next(args[1])] };
  if (fn === 'unaryMinus') return { k: 'neg', a: next(args[0]) };
  if (fn === 'unaryPlus') return next(args[0]);
  if (fn === 'and' || fn === 'or') return { k: 'logic', op: fn, a: next(args[0]), b: next(args[1]) };
  if (fn === 'not') return { k: 'not', a: next(args[0]) };
  if (fn === 'to') throw new Refusal('may not convert units with "to" or "in": a result is shown in the unit its cell asks for', n.op);
  const op = String(n.op);
  throw new Refusal(`may not use the operator "${op}"${fn === 'mod' ? ' (remainder)' : ''}`, op);
}

/**
 * mathjs reads a name before parentheses, `k (T - T_a)`, as a call of k, where a reader of
 * the law means k times the bracket: says how to write the product. Not for an argument no
 * product could take (text, an object) nor for several arguments.
 */
function multiplyHint(name: string, args: any[]): string {
  if (args.length !== 1) return '';
  const arg = args[0];
  if (arg?.type === 'ObjectNode' || (arg?.type === 'ConstantNode' && typeof arg.value === 'string')) return '';
  return `a name before brackets is read as a call; to multiply, write "${name} * (${arg.toString()})"; `;
}

function call(n: any, next: (c: any) => Expr): Expr {
  if (n.fn?.type !== 'SymbolNode') throw new Refusal('may only call functions by name, such as exp(x)', '(');
  const name: string = n.fn.name;
  if (!isFunctionName(name)) {
    throw new Refusal(`may not call "${name}": ${multiplyHint(name, n.args)}the functions allowed are ${FUNCTION_NAMES.join(', ')} and pow`, name);
  }
  const args = n.args.map(next);
  if (name === 'pow') {
    if (args.length !== 2) throw new Refusal('pow takes two arguments: pow(x, y)', name);
    return { k: 'bin', op: '^', a: args[0], b: args[1] };
  }
  const def = FUNCTIONS[name];
  if (args.length < def.min || args.length > def.max) {
    const want = def.min === def.max ? `${def.min}` : `${def.min} to ${def.max}`;
    throw new Refusal(`${name} takes ${want} argument${def.max === 1 ? '' : 's'}; it was given ${args.length}`, name);
  }
  return { k: 'call', fn: name, args };
}
