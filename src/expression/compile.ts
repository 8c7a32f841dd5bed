/**
 * The compiler: turns a checked expression into a plain function over SI magnitudes, for
 * the numeric work (simulation, root finding, fitting), which must not touch unit objects.
 *
 * Literals and names that are not inputs are folded into constants; inputs are read from an
 * array in the order given. The code is generated as JavaScript text from the allow-listed
 * tree only (numbers are printed by the engine, names become array indices), so nothing of
 * the user's text reaches the generated code. Where the platform forbids generated code
 * (a strict content security policy), an equivalent closure tree is used instead.
 */
import type { Expr } from './ast.ts';
import { FUNCTIONS } from './functions.ts';
import { CONSTANTS, isConstantName } from './constants.ts';
import { type Literal, literalOf } from './literal.ts';
import { evaluateExpression, literalQuantity, offsetTemperatureUnit, type Lookup } from './evaluate.ts';
import { isDimensionless } from '../units/dimension.ts';

/** A compiled expression: reads its inputs (SI) and returns its value (SI). Booleans become 1/0. */
export type Compiled = (x: ArrayLike<number>) => number;

const F: Record<string, (...x: number[]) => number> = Object.fromEntries(
  Object.entries(FUNCTIONS).map(([name, def]) => [name, def.fn]),
);

let generatedCodeAllowed: boolean | undefined;

/**
 * Compiles e, which must already have passed `evaluateExpression` with the same lookup.
 * `inputs` names the values read at run time, by position; every other name is folded in at
 * its current value. Cost: linear in the size of e; the result runs at hand-written speed.
 */
export function compileExpression(e: Expr, lookup: Lookup, inputs: readonly string[]): Compiled {
  const memo = new WeakMap<Expr, Literal | null>();
  const isName = (n: string) => inputs.includes(n) || lookup(n) !== undefined;
  if (generatedCodeAllowed !== false) {
    try {
      const body = toCode(e, lookup, isName, inputs, memo);
      const fn = new Function('F', `"use strict"; return function compiled(x) { return +(${body}); };`)(F) as Compiled;
      generatedCodeAllowed = true;
      return fn;
    } catch (err) {
      if (!(err instanceof EvalError)) throw err;
      generatedCodeAllowed = false;
    }
  }
  const c = toClosure(e, lookup, isName, inputs, memo);
  return (x) => +c(x);
}

function num(v: number): string {
  if (Number.isNaN(v)) return 'NaN';
  if (v === Infinity) return 'Infinity';
  if (v === -Infinity) return '(-Infinity)';
  // String(-0) is "0": print the sign, or -(0 * x) would give +0 where the closures give -0
  if (Object.is(v, -0)) return '(-0)';
  return v < 0 ? `(${String(v)})` : String(v);
}

function constantOf(e: Expr, lookup: Lookup, isName: (n: string) => boolean, inputs: readonly string[], memo: WeakMap<Expr, Literal | null>): number | undefined {
  const lit = literalOf(e, isName, memo);
  if (lit) return literalQuantity(lit).si;
  if (e.k === 'num') return e.v;
  if (e.k === 'sym' && !inputs.includes(e.name)) {
    const v = lookup(e.name);
    if (v !== undefined) return typeof v === 'boolean' ? Number(v) : v.si;
    if (isConstantName(e.name)) return CONSTANTS[e.name].si;
    throw new Error(`unknown name "${e.name}"`);
  }
  return undefined;
}

function toCode(e: Expr, lookup: Lookup, isName: (n: string) => boolean, inputs: readonly string[], memo: WeakMap<Expr, Literal | null>): string {
  const k = constantOf(e, lookup, isName, inputs, memo);
  if (k !== undefined) return num(k);
  const c = (x: Expr) => toCode(x, lookup, isName, inputs, memo);
  switch (e.k) {
    case 'bool': return e.v ? 'true' : 'false';
    case 'sym': return `x[${inputs.indexOf(e.name)}]`;
    case 'neg': return `(-${c(e.a)})`;
    case 'bin': {
      if (e.op === '^') return `Math.pow(${c(e.a)}, ${c(e.b)})`;
      const def = e.op === '*' ? readingOn(e, lookup, isName) : undefined;
      if (def) return `(${c(e.a)} * ${num(def.factor)} + ${num(def.zero)})`;
      return `(${c(e.a)} ${e.op} ${c(e.b)})`;
    }
    case 'cmp': {
      const parts = e.ops.map((op, i) => `(${c(e.args[i])} ${op === '==' ? '===' : op === '!=' ? '!==' : op} ${c(e.args[i + 1])})`);
      return `(${parts.join(' && ')})`;
    }
    case 'logic': return `(${c(e.a)} ${e.op === 'and' ? '&&' : '||'} ${c(e.b)})`;
    case 'not': return `(!${c(e.a)})`;
    case 'if': return `(${c(e.c)} ? ${c(e.a)} : ${c(e.b)})`;
    case 'call': return `F.${e.fn}(${e.args.map(c).join(', ')})`;
    case 'num': return num(e.v);
  }
}

/**
 * `a degC`: the scale when the checker reads it as the reading a on that scale, which it
 * does only when a is a plain number (`k degC` with k per hour is a product, not a reading).
 */
function readingOn(e: Extract<Expr, { k: 'bin' }>, lookup: Lookup, isName: (n: string) => boolean) {
  const def = offsetTemperatureUnit(e.b, isName);
  if (!def) return undefined;
  const a = evaluateExpression(e.a, lookup);
  return a.ok && typeof a.value !== 'boolean' && isDimensionless(a.value.dim) ? def : undefined;
}

type Closure = (x: ArrayLike<number>) => number | boolean;

function toClosure(e: Expr, lookup: Lookup, isName: (n: string) => boolean, inputs: readonly string[], memo: WeakMap<Expr, Literal | null>): Closure {
  const k = constantOf(e, lookup, isName, inputs, memo);
  if (k !== undefined) return () => k;
  const c = (x: Expr) => toClosure(x, lookup, isName, inputs, memo);
  switch (e.k) {
    case 'bool': { const v = e.v; return () => v; }
    case 'sym': { const i = inputs.indexOf(e.name); return (x) => x[i]; }
    case 'neg': { const a = c(e.a); return (x) => -a(x); }
    case 'bin': {
      const a = c(e.a);
      if (e.op === '^') { const b = c(e.b); return (x) => Math.pow(+a(x), +b(x)); }
      const def = e.op === '*' ? readingOn(e, lookup, isName) : undefined;
      if (def) return (x) => +a(x) * def.factor + def.zero;
      const b = c(e.b);
      switch (e.op) {
        case '+': return (x) => +a(x) + +b(x);
        case '-': return (x) => +a(x) - +b(x);
        case '*': return (x) => +a(x) * +b(x);
        default: return (x) => +a(x) / +b(x);
      }
    }
    case 'cmp': {
      const args = e.args.map(c);
      const ops = e.ops;
      return (x) => {
        const v = args.map((f) => +f(x));
        return ops.every((op, i) => compareNumbers(v[i], v[i + 1], op));
      };
    }
    case 'logic': {
      const a = c(e.a), b = c(e.b);
      return e.op === 'and' ? (x) => Boolean(a(x)) && Boolean(b(x)) : (x) => Boolean(a(x)) || Boolean(b(x));
    }
    case 'not': { const a = c(e.a); return (x) => !a(x); }
    case 'if': { const t = c(e.c), a = c(e.a), b = c(e.b); return (x) => (t(x) ? a(x) : b(x)); }
    case 'call': { const f = F[e.fn]; const args = e.args.map(c); return (x) => f(...args.map((g) => +g(x))); }
    case 'num': { const v = e.v; return () => v; }
  }
}

function compareNumbers(a: number, b: number, op: string): boolean {
  switch (op) {
    case '<': return a < b;
    case '>': return a > b;
    case '<=': return a <= b;
    case '>=': return a >= b;
    case '==': return a === b;
    default: return a !== b;
  }
}

/**
 * For tests and benchmarks: force the closure path (false), as under a strict content
 * security policy, or let the next compilation try generated code again (undefined).
 */
export function setGeneratedCode(allowed: boolean | undefined): void {
  generatedCodeAllowed = allowed;
}

/**
 * Whether compiled expressions are generated code (true), closures because the platform
 * refused `new Function` or a test forced them (false), or not known until the first
 * compilation (undefined). Functions already compiled keep the form they were made in.
 */
export function generatedCodeInUse(): boolean | undefined {
  return generatedCodeAllowed;
}
