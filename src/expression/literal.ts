/**
 * Unit literals: the parts of an expression made only of numbers and units, such as
 * `74 degC`, `0.35 / h` or `1000 mg / (42 L)`. They are folded into one quantity before
 * anything else, which is how `3 degC / h` comes to mean a rate of 3 K per hour while
 * `74 degC` stays a point on the Celsius scale.
 */
import type { Expr } from './ast.ts';
import { lookupUnit, isOffsetTemperature } from '../units/units.ts';
import { isConstantName } from './constants.ts';

export interface Literal {
  readonly coef: number;
  readonly unit: ReadonlyArray<readonly [string, number]>;
}

/** Whether `name` reads as a unit here: a unit that no study name or constant shadows. */
export type IsName = (name: string) => boolean;

export function unitSymbol(name: string, isName: IsName): boolean {
  return !isName(name) && !isConstantName(name) && lookupUnit(name) !== undefined;
}

/**
 * The literal `e` stands for, or null when it involves a name, a function or anything else.
 * Cost: linear in the size of e; callers memoise by node.
 */
export function literalOf(e: Expr, isName: IsName, memo: WeakMap<Expr, Literal | null>): Literal | null {
  if (memo.has(e)) return memo.get(e)!;
  const lit = compute(e, isName, memo);
  memo.set(e, lit);
  return lit;
}

function compute(e: Expr, isName: IsName, memo: WeakMap<Expr, Literal | null>): Literal | null {
  switch (e.k) {
    case 'num':
      return { coef: e.v, unit: [] };
    case 'sym':
      return unitSymbol(e.name, isName) ? { coef: 1, unit: [[e.name, 1]] } : null;
    case 'neg': {
      const a = literalOf(e.a, isName, memo);
      return a && { coef: -a.coef, unit: a.unit };
    }
    case 'bin': {
      if (e.op === '^') {
        const a = literalOf(e.a, isName, memo);
        const p = exponentOf(e.b);
        if (!a || p === null) return null;
        // a power of a temperature reading is a power of its absolute value: left to the
        // quantity arithmetic, which uses kelvin ((26.85 degC)^4 is (300 K)^4)
        if (p !== 1 && a.unit.length === 1 && a.unit[0][1] === 1 && isOffsetTemperature(lookupUnit(a.unit[0][0])!) && e.a.k !== 'sym') return null;
        return { coef: Math.pow(a.coef, p), unit: a.unit.map(([n, q]) => [n, q * p] as const) };
      }
      if (e.op !== '*' && e.op !== '/') return null;
      const a = literalOf(e.a, isName, memo);
      const b = a && literalOf(e.b, isName, memo);
      if (!a || !b) return null;
      const sign = e.op === '*' ? 1 : -1;
      const unit = a.unit.map(([n, q]) => [n, q] as [string, number]);
      for (const [n, q] of b.unit) {
        const hit = unit.find((u) => u[0] === n);
        if (hit) hit[1] += sign * q;
        else unit.push([n, sign * q]);
      }
      return {
        coef: e.op === '*' ? a.coef * b.coef : a.coef / b.coef,
        unit: unit.filter(([, q]) => q !== 0),
      };
    }
    default:
      return null;
  }
}

function exponentOf(e: Expr): number | null {
  if (e.k === 'num') return e.v;
  if (e.k === 'neg' && e.a.k === 'num') return -e.a.v;
  return null;
}
