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
} from '../quantity.ts';
import { isDimensionless, describeDim } from '../dimension.ts';
import { lookupUnit, isOffsetTemperature, NO_UNIT, mulUnits } from '../units.ts';

/** The study's names as seen by one expression: undefined means "not a study name". */
export type Lookup = (name: string) => Quantity | undefined;

/** A value of an expression: a quantity, or true/false from a comparison. */
export type Value = Quantity | boolean;

export type EvalResult = { ok: true; value: Value } | { ok: false; error: ExprProblem & { token?: string } };

class ExprError extends Error {
  constructor(message: string, readonly token?: string) {
    super(message);
  }
}

/** Evaluates e. Never throws: every failure comes back as a message. */
export function evaluateExpression(e: Expr, lookup: Lookup): EvalResult {
  const memo = new WeakMap<Expr, Literal | null>();
  const isName = (n: string) => lookup(n) !== undefined;
  try {
    return { ok: true, value: evaluate(e, lookup, isName, memo) };
  } catch (err) {
    if (err instanceof ExprError) return { ok: false, error: { message: err.message, token: err.token } };
    if (err instanceof QuantityError) return { ok: false, error: { message: err.message } };
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

function evaluate(e: Expr, lookup: Lookup, isName: (n: string) => boolean, memo: WeakMap<Expr, Literal | null>): Value {
  const lit = literalOf(e, isName, memo);
  if (lit) return literalQuantity(lit);
  const q = (x: Expr): Quantity => asQuantity(evaluate(x, lookup, isName, memo), x);
  const b = (x: Expr): boolean => asBoolean(evaluate(x, lookup, isName, memo));
  switch (e.k) {
    case 'bool':
      return e.v;
    case 'sym': {
      const v = lookup(e.name);
      if (v) return v;
      if (isConstantName(e.name)) return constantQuantity(e.name);
      throw new ExprError(`unknown name "${e.name}"`, e.name);
    }
    case 'neg':
      return neg(q(e.a));
    case 'bin': {
      if (e.op === '^') {
        const base = q(e.a);
        const p = q(e.b);
        if (!isDimensionless(p.dim)) throw new ExprError(`an exponent must be a plain number; it is ${describeDim(p.dim)}`);
        if (!isDimensionless(base.dim) && symbolsOf(e.b).some(isName)) {
          throw new ExprError(`a power of ${describeDim(base.dim)} needs a fixed exponent, not one that uses names`);
        }
        return pow(base, p.si);
      }
      if (e.op === '*') {
        const def = offsetTemperatureUnit(e.b, isName);
        const a = q(e.a);
        if (def && isDimensionless(a.dim)) return fromUnit(a.si, [[def.name, 1]]);
        return mul(a, q(e.b));
      }
      const a = q(e.a);
      const c = q(e.b);
      return e.op === '+' ? add(a, c) : e.op === '-' ? sub(a, c) : div(a, c);
    }
    case 'cmp': {
      const vals = e.args.map(q);
      let result = true;
      e.ops.forEach((op, i) => { result = compare(vals[i], vals[i + 1], op) && result; });
      return result;
    }
    case 'logic': {
      const a = b(e.a);
      const c = b(e.b);
      return e.op === 'and' ? a && c : a || c;
    }
    case 'not':
      return !b(e.a);
    case 'if': {
      const c = b(e.c);
      const a = evaluate(e.a, lookup, isName, memo);
      const d = evaluate(e.b, lookup, isName, memo);
      if (typeof a !== typeof d) throw new ExprError('both branches of "? :" must give a quantity, or both true/false');
      if (typeof a !== 'boolean') {
        const qa = a as Quantity, qd = d as Quantity;
        if (!sameBranchKind(qa, qd)) {
          throw new ExprError(`the branches of "? :" give different kinds of value: ${describeDim(qa.dim)} (${describe(qa)}) and ${describeDim(qd.dim)} (${describe(qd)})`);
        }
      }
      return c ? a : d;
    }
    case 'call': {
      const def = FUNCTIONS[e.fn];
      const args = e.args.map(q);
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
