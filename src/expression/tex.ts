/**
 * TeX for a checked expression tree, for typesetting rate laws and derived values on the
 * printed sheet (the app hands the string to KaTeX). Names the study defines are set in
 * italic with a subscript for what follows the first underscore (`T_walkin` → T_walkin);
 * units are set upright (`degC` → °C, `ug` → µg); division becomes a fraction.
 */
import type { Expr } from './ast.ts';
import { isConstantName } from './constants.ts';
import { lookupUnit } from '../units/units.ts';

/** What a symbol stands for: a name the study defines (or an unknown one), a built-in constant, or a unit. */
export type SymbolKind = 'name' | 'constant' | 'unit';

const GREEK = new Set(['alpha', 'beta', 'gamma', 'delta', 'epsilon', 'zeta', 'eta', 'theta', 'kappa', 'lambda', 'mu', 'nu', 'xi', 'pi', 'rho', 'sigma', 'tau', 'phi', 'chi', 'psi', 'omega', 'Gamma', 'Delta', 'Theta', 'Lambda', 'Xi', 'Pi', 'Sigma', 'Phi', 'Psi', 'Omega']);
const UNIT_TEX: Record<string, string> = { degC: '\\text{°C}', degF: '\\text{°F}', degR: '\\text{°R}', ug: '\\mu\\mathrm{g}', uL: '\\mu\\mathrm{L}', um: '\\mu\\mathrm{m}', ohm: '\\Omega' };
const CONSTANT_TEX: Record<string, string> = { pi: '\\pi', e: '\\mathrm{e}', stefanBoltzmann: '\\sigma_{\\mathrm{SB}}', gravity: 'g_{\\mathrm{n}}', boltzmann: 'k_{\\mathrm{B}}', avogadro: 'N_{\\mathrm{A}}', gasConstant: 'R' };
const FUNCTION_TEX: Record<string, string> = { exp: '\\exp', log: '\\ln', sin: '\\sin', cos: '\\cos', tan: '\\tan', min: '\\min', max: '\\max' };
const COMPARE_TEX: Record<string, string> = { '<': '<', '>': '>', '<=': '\\le', '>=': '\\ge', '==': '=', '!=': '\\ne' };

/** Binding strength: a child weaker than its place needs parentheses. */
const enum P { Cond = 0, Or = 1, And = 2, Compare = 3, Add = 4, Mul = 5, Neg = 6, Pow = 7, Atom = 8 }

/** Letters and digits that TeX's math mode would take as something else. */
function escapeText(s: string): string {
  return s.replace(/_/g, '\\_');
}

/** A study name: one letter or a greek name in italic, longer names as an italic word; the part after the first `_` as a subscript. */
export function nameTex(name: string): string {
  const cut = name.indexOf('_');
  const base = cut > 0 ? name.slice(0, cut) : name;
  const sub = cut > 0 ? name.slice(cut + 1) : '';
  const b = GREEK.has(base) ? `\\${base}` : base.length === 1 ? base : `\\textit{${escapeText(base)}}`;
  if (!sub) return b;
  const s = GREEK.has(sub) ? `\\${sub}` : /^[0-9]+$/.test(sub) || sub.length === 1 ? sub : `\\mathrm{${escapeText(sub)}}`;
  return `${b}_{${s}}`;
}

/** A unit name set upright. */
export function unitTex(unit: string): string {
  return UNIT_TEX[unit] ?? `\\mathrm{${escapeText(unit)}}`;
}

/** A number as written, with an exponent as ×10^n. */
function numberTex(v: number): string {
  const text = String(v);
  const m = /^(-?[0-9.]+)e([+-]?[0-9]+)$/.exec(text);
  if (!m) return text;
  const exp = Number(m[2]);
  return m[1] === '1' ? `10^{${exp}}` : `${m[1]} \\times 10^{${exp}}`;
}

/**
 * How the engine reads a symbol, given the names a study defines: its names first, then the
 * built-in constants, then units (the order the checker resolves them in).
 */
export function symbolKinds(defined: ReadonlySet<string>): (name: string) => SymbolKind {
  return (name) => (defined.has(name) ? 'name' : isConstantName(name) ? 'constant' : lookupUnit(name) !== undefined ? 'unit' : 'name');
}

/** TeX for `e`; `kindOf` tells a study's names from constants and units. */
export function toTex(e: Expr, kindOf: (name: string) => SymbolKind): string {
  return tex(e, kindOf, TOP).s;
}

/**
 * Where a piece stands: inside a fraction (or a condition's rows, which TeX sets in text
 * style), where a plain `\frac` would shrink to subscript size, so `\dfrac` keeps it at full
 * size; or in an exponent, where small is right and `\frac` stays.
 */
interface Place { readonly nested: boolean; readonly script: boolean }
const TOP: Place = { nested: false, script: false };

/** The derivative of `state` with respect to time, set equal to its rate law: dT/dt = ... */
export function rateLawTex(state: string, rate: Expr, kindOf: (name: string) => SymbolKind): string {
  return `\\frac{\\mathrm{d}${nameTex(state)}}{\\mathrm{d}t} = ${toTex(rate, kindOf)}`;
}

interface Piece { readonly s: string; readonly p: P; /** starts with a digit (a product after it needs a sign) */ readonly num: boolean; readonly unit: boolean; /** a name of several letters, or a product holding one: set side by side with another factor, its letters would run into the other's */ readonly word?: boolean }

function wrap(x: Piece, need: P): string {
  return x.p < need ? `\\left(${x.s}\\right)` : x.s;
}

function tex(e: Expr, kindOf: (name: string) => SymbolKind, at: Place): Piece {
  const t = (x: Expr, where: Place = at) => tex(x, kindOf, where);
  const nested: Place = { nested: true, script: at.script };
  const script: Place = { nested: at.nested, script: true };
  switch (e.k) {
    case 'num': return { s: numberTex(e.v), p: P.Atom, num: true, unit: false };
    case 'bool': return { s: `\\mathrm{${e.v}}`, p: P.Atom, num: false, unit: false };
    case 'sym': {
      const kind = kindOf(e.name);
      if (kind === 'unit') return { s: unitTex(e.name), p: P.Atom, num: false, unit: true };
      const s = kind === 'constant' ? CONSTANT_TEX[e.name] ?? `\\mathrm{${escapeText(e.name)}}` : nameTex(e.name);
      return { s, p: P.Atom, num: false, unit: false, word: s.startsWith('\\textit') };
    }
    case 'neg': {
      const a = t(e.a);
      return { s: `-${wrap(a, P.Mul)}`, p: P.Neg, num: false, unit: false };
    }
    case 'bin': {
      const a = t(e.a, e.op === '/' ? nested : at);
      const b = t(e.b, e.op === '/' ? nested : e.op === '^' ? script : at);
      switch (e.op) {
        case '+': return { s: `${wrap(a, P.Add)} + ${wrap(b, P.Add + 1)}`, p: P.Add, num: a.num, unit: false };
        case '-': return { s: `${wrap(a, P.Add)} - ${wrap(b, P.Add + 1)}`, p: P.Add, num: a.num, unit: false };
        case '/': return { s: `${at.nested && !at.script ? '\\dfrac' : '\\frac'}{${a.s}}{${b.s}}`, p: P.Atom, num: false, unit: a.unit && b.unit };
        // a fraction raised to a power is bracketed, or the exponent would read as the denominator's
        case '^': return { s: `${e.a.k === 'bin' && e.a.op === '/' ? `\\left(${a.s}\\right)` : wrap(a, P.Atom)}^{${b.s}}`, p: P.Pow, num: a.num, unit: a.unit };
        case '*': {
          // a number times a number keeps its sign; a quantity and its unit get a thin space
          const right = wrap(b, P.Mul + 1);
          // names of several letters side by side ("ka Ag" would read k·a·A·g) get a dot between them
          const sep = b.num && !right.startsWith('\\left(') ? ' \\cdot ' : b.unit || a.unit ? '\\,' : (a.word || b.word) && !right.startsWith('\\left(') ? ' \\cdot ' : ' ';
          return { s: `${wrap(a, P.Mul)}${sep}${right}`, p: P.Mul, num: a.num, unit: a.unit && b.unit, word: a.word || b.word };
        }
      }
      break;
    }
    case 'cmp': {
      let s = wrap(t(e.args[0]), P.Add);
      e.ops.forEach((op, i) => { s += ` ${COMPARE_TEX[op]} ${wrap(t(e.args[i + 1]), P.Add)}`; });
      return { s, p: P.Compare, num: false, unit: false };
    }
    case 'logic': {
      const p = e.op === 'and' ? P.And : P.Or;
      return { s: `${wrap(t(e.a), p)} ${e.op === 'and' ? '\\land' : '\\lor'} ${wrap(t(e.b), p + 1)}`, p, num: false, unit: false };
    }
    case 'not': return { s: `\\lnot ${wrap(t(e.a), P.Neg)}`, p: P.Neg, num: false, unit: false };
    case 'if': return {
      s: `\\begin{cases} ${t(e.a, nested).s} & \\text{if } ${t(e.c, nested).s} \\\\ ${t(e.b, nested).s} & \\text{otherwise} \\end{cases}`,
      p: P.Atom, num: false, unit: false,
    };
    case 'call': {
      const args = e.args.map((x, i) => t(x, e.fn === 'pow' && i === 1 ? script : at));
      if (e.fn === 'sqrt') return { s: `\\sqrt{${args[0].s}}`, p: P.Atom, num: false, unit: false };
      if (e.fn === 'abs') return { s: `\\left|${args[0].s}\\right|`, p: P.Atom, num: false, unit: false };
      if (e.fn === 'pow') return { s: `${wrap(args[0], P.Atom)}^{${args[1].s}}`, p: P.Pow, num: false, unit: false };
      if (e.fn === 'log' && args.length === 2) return { s: `\\log_{${args[1].s}}\\left(${args[0].s}\\right)`, p: P.Atom, num: false, unit: false };
      if (e.fn === 'log2') return { s: `\\log_{2}\\left(${args[0].s}\\right)`, p: P.Atom, num: false, unit: false };
      if (e.fn === 'log10') return { s: `\\log_{10}\\left(${args[0].s}\\right)`, p: P.Atom, num: false, unit: false };
      const name = FUNCTION_TEX[e.fn] ?? `\\operatorname{${escapeText(e.fn)}}`;
      return { s: `${name}\\left(${args.map((a) => a.s).join(', ')}\\right)`, p: P.Atom, num: false, unit: false };
    }
  }
  throw new Error(`no TeX for expression node ${(e as { k: string }).k}`);
}
