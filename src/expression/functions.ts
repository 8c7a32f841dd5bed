/**
 * The functions an expression may call. Each entry fixes the argument count, the dimension
 * rule and the one numeric implementation shared by the checker and the compiled code, so
 * that a checked value and a compiled value can never disagree.
 */
import { type Dim, DIMENSIONLESS, isDimensionless, sameDim, powDim, describeDim } from '../units/dimension.ts';

export interface FunctionDef {
  readonly min: number;
  readonly max: number;
  /** The result's dimension from the arguments' dimensions, or a message saying what is wrong. */
  readonly dim: (args: readonly Dim[]) => Dim | string;
  /** How the result's display unit follows: 'first' keeps the first argument's unit. */
  readonly unit: 'none' | 'first' | { readonly power: number };
  readonly fn: (...x: number[]) => number;
}

const ANGLE_INDEX = 7;
const plainArgs = (what: string) => (args: readonly Dim[]) =>
  args.every(isDimensionless) ? DIMENSIONLESS : `${what} needs a plain number; it got ${describeDim(args.find((d) => !isDimensionless(d))!)}`;
const angleArg = (what: string) => (args: readonly Dim[]) =>
  isDimensionless(args[0]) || sameDim(args[0], DIMENSIONLESS.map((_, i) => (i === ANGLE_INDEX ? 1 : 0)))
    ? DIMENSIONLESS : `${what} needs an angle or a plain number; it got ${describeDim(args[0])}`;
const sameArgs = (what: string) => (args: readonly Dim[]) =>
  args.every((d) => sameDim(d, args[0])) ? args[0] : `${what} needs arguments of one kind; it got ${args.map(describeDim).join(' and ')}`;
const rounding = (what: string) => (args: readonly Dim[]) =>
  args.every(isDimensionless) ? DIMENSIONLESS : `${what} needs a plain number: divide by a unit first, such as ${what}(t / (1 h))`;

function roundHalfAway(x: number, digits = 0): number {
  const f = Math.pow(10, Math.trunc(digits));
  const y = Math.abs(x) * f;
  return (Math.sign(x) * Math.round(y)) / f;
}

const p = (min: number, max: number, dim: FunctionDef['dim'], unit: FunctionDef['unit'], fn: FunctionDef['fn']): FunctionDef =>
  ({ min, max, dim, unit, fn });

export const FUNCTIONS: Readonly<Record<string, FunctionDef>> = Object.freeze({
  exp: p(1, 1, plainArgs('exp'), 'none', Math.exp),
  log: p(1, 2, plainArgs('log'), 'none', (x: number, b?: number) => (b === undefined ? Math.log(x) : Math.log(x) / Math.log(b))),
  log10: p(1, 1, plainArgs('log10'), 'none', Math.log10),
  log2: p(1, 1, plainArgs('log2'), 'none', Math.log2),
  sqrt: p(1, 1, (a) => powDim(a[0], 0.5), { power: 0.5 }, Math.sqrt),
  cbrt: p(1, 1, (a) => powDim(a[0], 1 / 3), { power: 1 / 3 }, Math.cbrt),
  abs: p(1, 1, (a) => a[0], 'first', Math.abs),
  sign: p(1, 1, () => DIMENSIONLESS, 'none', Math.sign),
  min: p(1, 16, sameArgs('min'), 'first', Math.min),
  max: p(1, 16, sameArgs('max'), 'first', Math.max),
  sin: p(1, 1, angleArg('sin'), 'none', Math.sin),
  cos: p(1, 1, angleArg('cos'), 'none', Math.cos),
  tan: p(1, 1, angleArg('tan'), 'none', Math.tan),
  asin: p(1, 1, plainArgs('asin'), 'none', Math.asin),
  acos: p(1, 1, plainArgs('acos'), 'none', Math.acos),
  atan: p(1, 1, plainArgs('atan'), 'none', Math.atan),
  sinh: p(1, 1, plainArgs('sinh'), 'none', Math.sinh),
  cosh: p(1, 1, plainArgs('cosh'), 'none', Math.cosh),
  tanh: p(1, 1, plainArgs('tanh'), 'none', Math.tanh),
  floor: p(1, 1, rounding('floor'), 'none', Math.floor),
  ceil: p(1, 1, rounding('ceil'), 'none', Math.ceil),
  round: p(1, 2, rounding('round'), 'none', roundHalfAway),
});

export const FUNCTION_NAMES: readonly string[] = Object.freeze(Object.keys(FUNCTIONS));

/** `pow(x, y)` is written as `x ^ y` by the parser, so it shares its rules. */
export function isFunctionName(name: string): boolean {
  return Object.prototype.hasOwnProperty.call(FUNCTIONS, name) || name === 'pow';
}
