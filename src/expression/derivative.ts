/**
 * Symbolic differentiation of an expression tree with respect to one name, for the phase
 * analysis's cross-check of the slope at an equilibrium. Unit literals, constants and other
 * names are constants. Returns undefined where the derivative has no closed form here
 * (min, max, abs at a kink, rounding, conditions on the variable): the caller then relies on
 * differences alone.
 */
import type { Expr } from './ast.ts';
import { symbolsOf } from './ast.ts';

const ZERO: Expr = { k: 'num', v: 0 };
const ONE: Expr = { k: 'num', v: 1 };
const num = (v: number): Expr => ({ k: 'num', v });
const bin = (op: '+' | '-' | '*' | '/' | '^', a: Expr, b: Expr): Expr => ({ k: 'bin', op, a, b });
const call = (fn: string, ...args: Expr[]): Expr => ({ k: 'call', fn, args });

/** d e / d name, or undefined when not available in closed form. */
export function derivative(e: Expr, name: string): Expr | undefined {
  if (!symbolsOf(e).includes(name)) return ZERO;
  const d = (x: Expr) => derivative(x, name);
  switch (e.k) {
    case 'num': case 'bool': return ZERO;
    case 'sym': return e.name === name ? ONE : ZERO;
    case 'neg': { const da = d(e.a); return da && { k: 'neg', a: da }; }
    case 'bin': {
      const da = d(e.a), db = d(e.b);
      if (!da || !db) return undefined;
      switch (e.op) {
        case '+': return bin('+', da, db);
        case '-': return bin('-', da, db);
        case '*': return bin('+', bin('*', da, e.b), bin('*', e.a, db));
        case '/': return bin('/', bin('-', bin('*', da, e.b), bin('*', e.a, db)), bin('^', e.b, num(2)));
        case '^': {
          if (!symbolsOf(e.b).includes(name)) return bin('*', bin('*', e.b, bin('^', e.a, bin('-', e.b, ONE))), da);
          // a^b = exp(b log a): d = a^b (db log a + b da / a)
          return bin('*', e, bin('+', bin('*', db, call('log', e.a)), bin('/', bin('*', e.b, da), e.a)));
        }
      }
      return undefined;
    }
    case 'if': {
      if (symbolsOf(e.c).includes(name)) return undefined;
      const da = d(e.a), db = d(e.b);
      return da && db ? { k: 'if', c: e.c, a: da, b: db } : undefined;
    }
    case 'call': {
      if (e.args.length !== 1) return undefined;
      const a = e.args[0];
      const da = d(a);
      if (!da) return undefined;
      const chain = (outer: Expr) => bin('*', outer, da);
      switch (e.fn) {
        case 'exp': return chain(e);
        case 'log': return chain(bin('/', ONE, a));
        case 'log10': return chain(bin('/', ONE, bin('*', a, num(Math.LN10))));
        case 'log2': return chain(bin('/', ONE, bin('*', a, num(Math.LN2))));
        case 'sqrt': return chain(bin('/', ONE, bin('*', num(2), e)));
        case 'cbrt': return chain(bin('/', ONE, bin('*', num(3), bin('^', e, num(2)))));
        case 'sin': return chain(call('cos', a));
        case 'cos': return chain({ k: 'neg', a: call('sin', a) });
        case 'tan': return chain(bin('/', ONE, bin('^', call('cos', a), num(2))));
        case 'sinh': return chain(call('cosh', a));
        case 'cosh': return chain(call('sinh', a));
        case 'tanh': return chain(bin('-', ONE, bin('^', e, num(2))));
        case 'atan': return chain(bin('/', ONE, bin('+', ONE, bin('^', a, num(2)))));
        default: return undefined;
      }
    }
    default:
      return undefined;
  }
}
