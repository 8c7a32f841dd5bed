/**
 * The Adams formulas with one evaluation of f a step (P(EC): the corrector applied once to f
 * at the predicted value, and that rate kept), their divided differences rebuilt from the
 * kept rates at every step: the arithmetic `adams.ts` had before it took the final evaluation
 * and kept its history in place, kept as it was for rtol below `PECE_FROM_RTOL` (`adams.ts`),
 * where a fit's model runs and must stay as smooth in its parameters as it was. The step loop
 * is `adams.ts`'s; this file is the mode's history, predictor, corrector, estimates and
 * choice of order (`AdamsFormulas`). Every `STIFF_TEST_EVERY`-th step the loop evaluates f at
 * the corrected value too, for the stiffness test, and that rate is kept (`keep`).
 */
import { type ResolvedOptions, errorNorm } from './control.ts';
import { AdamsSegment, dividedDifferences, newtonIntegrals } from './adams-newton.ts';
import { ADAMS_MAX_ORDER } from './adams-history.ts';
import { ADAMS_CONTROL } from './adams-control.ts';
import type { AdamsFormulas, NextStep } from './adams-formulas.ts';

/** to[i] = from[i] for i < n: for the few states of a rate law, faster than `set`'s call. */
function copy(from: Float64Array, to: Float64Array, n: number): void {
  for (let i = 0; i < n; i++) to[i] = from[i];
}

/** The factor on h that brings an estimate e of order q to the target (safety included). */
function stepFactor(e: number, q: number): number {
  return e === 0 ? ADAMS_CONTROL.maxFactor : ADAMS_CONTROL.safety * Math.pow(e, -1 / (q + 1));
}

/** P(EC) on differences rebuilt each step from the kept rates (see the file's comment). */
export class RebuiltFormulas implements AdamsFormulas {
  /** Past times and rates, newest first: T[0] = t, F[0] = the rate kept for t. */
  private readonly T: number[] = [];
  private readonly F: Float64Array[] = [];
  private readonly err: Float64Array;
  private readonly d: Float64Array[];
  private readonly x = new Float64Array(ADAMS_MAX_ORDER + 3);
  private readonly g = new Float64Array(ADAMS_MAX_ORDER + 3);
  private readonly coef = new Float64Array(ADAMS_MAX_ORDER + 4);
  /** The rate the step keeps: f at the predicted value, or at the corrected one (`keep`). */
  private kept: Float64Array;
  /** The step of the last `correct`. */
  private h = NaN;
  private readonly chosen: NextStep = { order: 1, factor: 1 };

  constructor(private readonly n: number, public options: ResolvedOptions) {
    this.err = new Float64Array(n);
    this.d = Array.from({ length: ADAMS_MAX_ORDER + 3 }, () => new Float64Array(n));
    this.kept = this.err;
  }

  get count(): number { return this.T.length; }

  clear(): void {
    this.T.length = 0;
    this.F.length = 0;
  }

  loadOne(t: number, f: Float64Array): void {
    this.clear();
    this.T.push(t);
    this.F.push(Float64Array.from(f));
  }

  load(T: readonly number[], F: Float64Array[]): void {
    this.clear();
    this.T.push(...T);
    this.F.push(...F);
  }

  rate(): Float64Array { return this.F[0]; }

  predict(h: number, k: number, _m: number, y: Float64Array, p: Float64Array): void {
    const { n, d, x, g, T, F } = this;
    const t = T[0];
    // predictor: nodes t_n, t_{n-1}, … in units of h from t_n
    for (let l = 0; l < k; l++) {
      x[l] = (T[l] - t) / h;
      copy(F[l], d[l], n);
    }
    dividedDifferences(x, d, k - 1);
    newtonIntegrals(x, k - 1, 1, g, this.coef);
    for (let c = 0; c < n; c++) {
      let acc = 0;
      for (let i = 0; i < k; i++) acc += g[i] * d[i][c];
      p[c] = y[c] + h * acc;
    }
  }

  correct(h: number, k: number, m: number, y: Float64Array, _p: Float64Array, fp: Float64Array, yNew: Float64Array): number {
    const { n, d, x, g, T, F } = this;
    const t = T[0];
    // corrector: nodes t_{n+1}, t_n, …; up to k + 2 of them for the estimate at order k + 1
    x[0] = 1;
    copy(fp, d[0], n);
    for (let l = 0; l < m; l++) {
      x[l + 1] = (T[l] - t) / h;
      copy(F[l], d[l + 1], n);
    }
    dividedDifferences(x, d, m);
    newtonIntegrals(x, m, 1, g, this.coef);
    for (let c = 0; c < n; c++) {
      let acc = 0;
      for (let i = 0; i <= k; i++) acc += g[i] * d[i][c];
      yNew[c] = y[c] + h * acc;
    }
    this.kept = fp;
    this.h = h;
    return this.termNorm(k, h, y, yNew) / ADAMS_CONTROL.target;
  }

  /** The scaled norm of h·G_i·d_i (the size of Newton term i in the step). */
  private termNorm(i: number, h: number, y: Float64Array, yNew: Float64Array): number {
    const { err, d, g, n } = this;
    for (let c = 0; c < n; c++) err[c] = h * g[i] * d[i][c];
    return errorNorm(err, y, yNew, this.options);
  }

  segment(t: number, tNew: number, h: number, k: number, m: number, y: Float64Array, yNew: Float64Array): AdamsSegment {
    return AdamsSegment.ofRows(t, tNew, h, y, yNew, this.d, this.x, Math.min(k, m));
  }

  keep(fc: Float64Array): void {
    this.kept = fc;
  }

  next(est: number, k: number, m: number, order: number, y: Float64Array, yNew: Float64Array): NextStep {
    const C = ADAMS_CONTROL;
    let next = order;
    let factor = stepFactor(est, k);
    if (k < order) {
      // the history was shorter than the order: keep building it
    } else if (m !== k + 1) {
      if (order < ADAMS_MAX_ORDER) next = order + 1;
    } else {
      const h = this.h;
      const estLow = k > 1 ? this.termNorm(k - 1, h, y, yNew) / C.target : Infinity;
      const estHigh = this.termNorm(k + 1, h, y, yNew) / C.target;
      const low = stepFactor(estLow, k - 1);
      const high = order < ADAMS_MAX_ORDER ? stepFactor(estHigh, k + 1) : 0;
      if (low >= factor && low >= high / C.raiseMargin) {
        next = order - 1;
        factor = low;
      } else if (high > C.raiseMargin * factor) {
        next = order + 1;
        factor = high;
      }
    }
    this.chosen.order = next;
    this.chosen.factor = factor;
    return this.chosen;
  }

  accept(tNew: number): void {
    const { T, F, n } = this;
    // keep the history: newest first, as many as the next order's estimates use
    T.unshift(tNew);
    F.unshift(F.length >= ADAMS_MAX_ORDER + 2 ? F.pop()! : new Float64Array(n));
    if (T.length > ADAMS_MAX_ORDER + 2) T.pop();
    copy(this.kept, F[0], n);
  }
}
