/**
 * The checker: evaluates an expression on quantities, so that every dimension and
 * temperature rule is enforced, and returns the value in the units the user wrote.
 */
import type { Expr } from './ast.ts';
import { symbolsOf } from './ast.ts';
import { FUNCTIONS } from './functions.ts';
import { CONSTANTS, isConstantName } from './constants.ts';
import { type Literal, literalOf, unitSymbol } from './literal.ts';
import type { ExprProblem } from './parse.ts';
import {
  type Quantity, QuantityError, add, sub, mul, div, pow, neg, compare, fromUnit, plain, describe,
} from '../units/quantity.ts';
import { isDimensionless, describeDim } from '../units/dimension.ts';
import { lookupUnit, isOffsetTemperature, NO_UNIT, mulUnits } from '../units/units.ts';

/** The study's names as seen by one expression: undefined means "not a study name". */
/** The value of a name: a quantity, or true/false for a parameter that is a condition (a verdict). */
export type Lookup = (name: string) => Value | undefined;

/** A value of an expression: a quantity, or true/false from a comparison. */
export type Value = Quantity | boolean;

/** `units`: the problem is a unit or dimension mismatch in the arithmetic. */
export type EvalResult = { ok: true; value: Value } | { ok: false; error: ExprProblem & { token?: string; units?: true } };

class ExprError extends Error {
  constructor(message: string, readonly token?: string) {
    super(message);
  }
}

/** Evaluates e. Never throws: every failure comes back as a message. */
export function evaluateExpression(e: Expr, lookup: Lookup): EvalResult {
  const ctx: Ctx = { lookup, isName: (n: string) => lookup(n) !== undefined, memo: new WeakMap() };
  try {
    return { ok: true, value: evaluate(e, ctx) };
  } catch (err) {
    if (err instanceof ExprError) return { ok: false, error: { message: err.message, token: err.token } };
    if (err instanceof QuantityError) return { ok: false, error: { message: err.message, units: true } };
    if (err instanceof RangeError) return { ok: false, error: { message: 'is nested too deeply' } };
    return { ok: false, error: { message: `could not be evaluated: ${(err as Error).message}` } };
  }
}

/** A folded literal as a quantity: a lone temperature unit makes a point on its scale. */
export function literalQuantity(lit: Literal): Quantity {
  const q = fromUnit(lit.coef, lit.unit);
  return q.unit.length > 1 ? { ...q, unit: mulUnits(NO_UNIT, q.unit) } : q;
}

/** `x degC` where x is not a literal: the point x on that scale, if the pattern applies. */
export function offsetTemperatureUnit(e: Expr, isName: (n: string) => boolean) {
  if (e.k !== 'sym' || !unitSymbol(e.name, isName)) return undefined;
  const def = lookupUnit(e.name)!;
  return isOffsetTemperature(def) ? def : undefined;
}

interface Ctx {
  readonly lookup: Lookup;
  readonly isName: (n: string) => boolean;
  readonly memo: WeakMap<Expr, Literal | null>;
}

function quantityAt(x: Expr, c: Ctx): Quantity {
  return asQuantity(evaluate(x, c), x);
}

function booleanAt(x: Expr, c: Ctx): boolean {
  return asBoolean(evaluate(x, c));
}

function evaluate(e: Expr, c: Ctx): Value {
  const lit = literalOf(e, c.isName, c.memo);
  if (lit) return literalQuantity(lit);
  switch (e.k) {
    case 'bool':
      return e.v;
    case 'sym': {
      const v = c.lookup(e.name);
      if (v !== undefined) return v;
      if (isConstantName(e.name)) return constantQuantity(e.name);
      throw new ExprError(`unknown name "${e.name}"`, e.name);
    }
    case 'neg':
      return neg(quantityAt(e.a, c));
    case 'bin': {
      if (e.op === '^') {
        const base = quantityAt(e.a, c);
        const p = quantityAt(e.b, c);
        if (!isDimensionless(p.dim)) throw new ExprError(`an exponent must be a plain number; it is ${describeDim(p.dim)}`);
        if (!isDimensionless(base.dim) && symbolsOf(e.b).some(c.isName)) {
          throw new ExprError(`a power of ${describeDim(base.dim)} needs a fixed exponent, not one that uses names`);
        }
        return pow(base, p.si);
      }
      if (e.op === '*') {
        const def = offsetTemperatureUnit(e.b, c.isName);
        const a = quantityAt(e.a, c);
        if (def && isDimensionless(a.dim)) return fromUnit(a.si, [[def.name, 1]]);
        return mul(a, quantityAt(e.b, c));
      }
      const a = quantityAt(e.a, c);
      const b = quantityAt(e.b, c);
      return e.op === '+' ? add(a, b) : e.op === '-' ? sub(a, b) : div(a, b);
    }
    case 'cmp': {
      const vals = e.args.map((x) => quantityAt(x, c));
      let result = true;
      for (let i = 0; i < e.ops.length; i++) result = compare(vals[i], vals[i + 1], e.ops[i]) && result;
      return result;
    }
    case 'logic': {
      const a = booleanAt(e.a, c);
      const b = booleanAt(e.b, c);
      return e.op === 'and' ? a && b : a || b;
    }
    case 'not':
      return !booleanAt(e.a, c);
    case 'if': {
      const cond = booleanAt(e.c, c);
      const a = evaluate(e.a, c);
      const d = evaluate(e.b, c);
      if (typeof a !== typeof d) throw new ExprError('both branches of "? :" must give a quantity, or both true/false');
      if (typeof a !== 'boolean') {
        const qa = a as Quantity, qd = d as Quantity;
        if (!sameBranchKind(qa, qd)) {
          throw new ExprError(`the branches of "? :" give different kinds of value: ${describeDim(qa.dim)} (${describe(qa)}) and ${describeDim(qd.dim)} (${describe(qd)})`);
        }
      }
      return cond ? a : d;
    }
    case 'call': {
      const def = FUNCTIONS[e.fn];
      const args = e.args.map((x) => quantityAt(x, c));
      const dim = def.dim(args.map((x) => x.dim));
      if (typeof dim === 'string') throw new ExprError(dim, e.fn);
      const si = def.fn(...args.map((x) => x.si));
      if (def.unit === 'none') return { si, dim, unit: NO_UNIT };
      if (def.unit === 'first') return { ...args[0], si };
      return { ...pow(args[0], def.unit.power), si };
    }
    case 'num':
      return plain(e.v);
  }
}

function constantQuantity(name: string): Quantity {
  const c = CONSTANTS[name];
  return { ...fromUnit(1, c.unit), si: c.si };
}

function sameBranchKind(a: Quantity, b: Quantity): boolean {
  if (describeDim(a.dim) !== describeDim(b.dim) || !a.dim.every((x, i) => Math.abs(x - b.dim[i]) < 1e-9)) return false;
  return !((a.temp === 'point' && b.temp === 'delta') || (a.temp === 'delta' && b.temp === 'point'));
}

function asQuantity(v: Value, e: Expr): Quantity {
  if (typeof v === 'boolean') throw new ExprError(`a true/false value cannot be used as a number${e.k === 'cmp' ? ' (use "? :" to choose a value)' : ''}`);
  return v;
}

function asBoolean(v: Value): boolean {
  if (typeof v !== 'boolean') throw new ExprError(`a condition must be a comparison or true/false; it is ${describe(v)}`);
  return v;
}
