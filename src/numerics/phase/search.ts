/**
 * The working state shared by the steps of the equilibrium search: the counted, budgeted
 * evaluator of f, the scales and tolerances (`Ctx`), what the search has found so far
 * (`Found`), and the small helpers every step uses (location tolerance, sign of a value,
 * best-effort evaluation). Internal to `src/numerics/phase/`.
 */
import type { FSign, Span } from './types.ts';
import { charge } from '../work-meter.ts';

export const EPS = Number.EPSILON;
/** Across a converged sign-change bracket: |f| fallen by this factor is a zero ... */
export const ROOT_DROP = 1e-3;
/** ... grown by this factor is a pole; anything between is a jump. */
export const POLE_GROWTH = 1e3;
/** Steps for differences: cube root of epsilon for first derivatives (common practice). */
export const DIFF_STEP = Math.cbrt(EPS);

/** Thrown by `Evaluator.at` past the current limit; caught by `findEquilibria`. */
export class BudgetError extends Error {}

/** Calls f, counts the calls, and refuses past the current limit. A throw from f is NaN. */
export class Evaluator {
  count = 0;
  limit: number;
  constructor(private readonly f: (y: number) => number, readonly cap: number) { this.limit = cap; }
  get left(): number { return this.limit - this.count; }
  at(y: number): number {
    if (this.count >= this.limit) throw new BudgetError();
    this.count++;
    charge();
    let v: unknown;
    try { v = this.f(y); } catch { v = NaN; }
    return typeof v === 'number' ? v : NaN;
  }
}

/** A feature found by the search: a zero of f (refined or not), a pole, or a jump. */
export type Found =
  | { kind: 'root'; y: number; converged: boolean }
  | { kind: 'pole' | 'jump'; y: number };

/** The search's scales, tolerances and running state. */
export interface Ctx {
  readonly ev: Evaluator;
  readonly from: number;
  readonly to: number;
  readonly width: number;
  readonly xtol: number;
  readonly rtol: number;
  /** Typical |f|: the median over the initial grid. */
  readonly fScale: number;
  /** The largest |f| on the initial grid within two cells of y: the scale zero is judged against there. */
  readonly localScale: (y: number) => number;
  /** |f| at or below this counts as zero at y. */
  readonly zeroAt: (y: number) => number;
  /** |f| at or below this is rounding at y: it carries no sign. */
  readonly noiseAt: (y: number) => number;
  readonly derivative?: (y: number) => number;
  readonly warnings: string[];
  /** Gaps found so far (a sign change can reveal one). */
  readonly gaps: Span[];
  exhausted: boolean;
}

/** The location tolerance at y. */
export const tolAt = (c: Ctx, y: number): number => c.xtol + c.rtol * Math.abs(y);
/** The sign of v, '0' within floor, null when v is not finite. */
export const signOf = (c: Ctx, v: number, floor: number): FSign | null =>
  !Number.isFinite(v) ? null : Math.abs(v) <= floor ? '0' : v > 0 ? '+' : '-';

/** Evaluation that yields NaN instead of running past the budget (classification is best effort). */
export function tryAt(c: Ctx, y: number): number {
  if (c.ev.left <= 0) { c.exhausted = true; return NaN; }
  return c.ev.at(y);
}

/** Strictly opposite signs (a product would underflow for tiny values). */
export const opposite = (a: number, b: number): boolean => (a > 0 && b < 0) || (a < 0 && b > 0);

/** Samples of f, sorted by y. */
export interface Grid { readonly Y: readonly number[]; readonly F: readonly number[] }
