/**
 * Explicit Runge–Kutta methods as Butcher tableaus, and the one kernel that runs their stages.
 *
 * The classical tableaus (Euler, Heun, the "classical" fourth-order method) are common
 * practice; see Hairer, Nørsett & Wanner, Solving ODEs I, sec. II.1, Table 1.1–1.2.
 */
import type { Evaluator } from './control.ts';

/**
 * y_{n+1} = y_n + h Σ b_i k_i with k_i = f(t + c_i h, y_n + h Σ_{j<i} a_ij k_j).
 * `a[i]` holds the i entries left of the diagonal. With `fsal` (first same as last) the last
 * row of a equals b and c ends with 1, so the last stage is f at the new solution and is
 * reused as the first stage of the next step.
 */
export interface ButcherTableau {
  readonly name: string;
  readonly order: number;
  readonly c: readonly number[];
  readonly a: readonly (readonly number[])[];
  readonly b: readonly number[];
  readonly fsal: boolean;
}

/** Explicit Euler, order 1. */
export const EULER: ButcherTableau = { name: 'euler', order: 1, c: [0], a: [[]], b: [1], fsal: false };

/** Heun's method (explicit trapezoid), order 2. */
export const HEUN: ButcherTableau = { name: 'heun', order: 2, c: [0, 1], a: [[], [1]], b: [1 / 2, 1 / 2], fsal: false };

/** The classical Runge–Kutta method, order 4. */
export const RK4: ButcherTableau = {
  name: 'rk4',
  order: 4,
  c: [0, 1 / 2, 1 / 2, 1],
  a: [[], [1 / 2], [0, 1 / 2], [0, 0, 1]],
  b: [1 / 6, 1 / 3, 1 / 3, 1 / 6],
  fsal: false,
};

/**
 * The stage values K_i(z) of the rows `a` (first `stages` of them) on y' = λy from y = 1 with
 * z = hλ real: K_i = 1 + z Σ_{j<i} a_ij K_j. For stability and error-on-a-mode analyses.
 */
export function stageValuesOnMode(a: readonly (readonly number[])[], stages: number, z: number): number[] {
  const K: number[] = [];
  for (let i = 0; i < stages; i++) {
    let v = 1;
    for (let j = 0; j < i; j++) v += z * a[i][j] * K[j];
    K.push(v);
  }
  return K;
}

/** Work arrays for `rkStep`: the stage derivatives k[i] and the current stage argument. */
export class RkWork {
  readonly k: Float64Array[];
  readonly arg: Float64Array;
  constructor(n: number, stages: number) {
    this.k = Array.from({ length: stages }, () => new Float64Array(n));
    this.arg = new Float64Array(n);
  }
}

/**
 * Evaluates stages `from` … `to - 1` of the rows (c, a) from (t, y) with step h: k[i] =
 * f(t + c_i h, y + h Σ_{j<i} a_ij k_j), the earlier k already in `work.k`. Stages with c_i = 1
 * are evaluated at `tNew`. Returns -1 on success, else the index of the first stage whose f
 * was not finite (its state is then in `work.arg`, its rate in `work.k[index]`). Costs
 * to - from evaluations.
 */
export function rkStages(
  c: readonly number[], a: readonly (readonly number[])[], from: number, to: number,
  rhs: Evaluator, t: number, y: Float64Array, h: number, work: RkWork, tNew: number,
): number {
  const n = y.length;
  const { k, arg } = work;
  for (let i = from; i < to; i++) {
    const row = a[i];
    for (let m = 0; m < n; m++) {
      let acc = 0;
      for (let j = 0; j < i; j++) acc += row[j] * k[j][m];
      arg[m] = y[m] + h * acc;
    }
    if (!rhs.call(c[i] === 1 ? tNew : t + c[i] * h, arg, k[i])) return i;
  }
  return -1;
}

/**
 * One step of size h from (t, y). `work.k[0]` must already hold f(t, y). Writes the new
 * solution into `yNew`; for an FSAL tableau the last stage (f at t + h, yNew) is evaluated
 * too. Returns -1 on success, else the index of the first stage whose f was not finite
 * (its state is then in `work.arg`, its rate in `work.k[index]`). Stages with c_i = 1 are
 * evaluated at `tNew` (default t + h), so that a step cut to land on an end time never
 * evaluates f past it through rounding. Costs s - 1 evaluations.
 */
export function rkStep(
  tab: ButcherTableau, rhs: Evaluator, t: number, y: Float64Array, h: number, work: RkWork, yNew: Float64Array,
  tNew = t + h,
): number {
  const s = tab.c.length;
  const bad = rkStages(tab.c, tab.a, 1, s, rhs, t, y, h, work, tNew);
  if (bad >= 0) return bad;
  if (tab.fsal) {
    yNew.set(work.arg);
    return -1;
  }
  const { b } = tab;
  const { k } = work;
  const n = y.length;
  for (let m = 0; m < n; m++) {
    let acc = 0;
    for (let j = 0; j < s; j++) acc += b[j] * k[j][m];
    yNew[m] = y[m] + h * acc;
  }
  return -1;
}
