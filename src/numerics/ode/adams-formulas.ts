/**
 * The Adams formulas' arithmetic as the step loop of `adams.ts` calls it, in one of two modes:
 * the history kept in place with the final evaluation (PECE, `InPlaceFormulas` here), and the
 * one-evaluation mode whose differences are rebuilt from the kept rates at every step (P(EC),
 * `RebuiltFormulas` in `adams-rebuilt.ts`). The loop (rejections, non-finite rates, the
 * stiffness test, the start after a dose) is the same for both; each mode keeps its own
 * arithmetic, so that its results stay the same to the last bit (`PECE_FROM_RTOL` in
 * `adams.ts` says why the one-evaluation mode is kept below rtol 1e-9).
 */
import type { ResolvedOptions } from './control.ts';
import { AdamsSegment } from './adams-newton.ts';
import { ADAMS_MAX_ORDER, AdamsHistory } from './adams-history.ts';
import { ADAMS_CONTROL } from './adams-control.ts';

/** The order and the factor on h for the next step, as a mode chooses them (before the clamp to the factor limits). */
export interface NextStep {
  order: number;
  factor: number;
}

/** What the step loop asks of a mode's history and arithmetic. */
export interface AdamsFormulas {
  /** The run's tolerances (set by the stepper at each start). */
  options: ResolvedOptions;
  /** The points of the history. */
  readonly count: number;
  /** Forgets the history (a new piece or run). */
  clear(): void;
  /** Starts from the one point (t, f) (a run's first piece, which climbs from order 1). */
  loadOne(t: number, f: Float64Array, h: number): void;
  /** Starts from the points T (newest first) and their rates F (which it may overwrite), for a step of h. */
  load(T: readonly number[], F: Float64Array[], h: number): void;
  /** The rate kept for the newest point (a collapse's check near a singularity). */
  rate(): Float64Array;
  /** Writes the predictor of order k for a step of h from (t_n, y) into p; m = min(k + 1, count). */
  predict(h: number, k: number, m: number, y: Float64Array, p: Float64Array): void;
  /** Writes the corrector into yNew from f(p) = fp; returns the order-k estimate over the target. */
  correct(h: number, k: number, m: number, y: Float64Array, p: Float64Array, fp: Float64Array, yNew: Float64Array): number;
  /** The dense output of the step just corrected. */
  segment(t: number, tNew: number, h: number, k: number, m: number, y: Float64Array, yNew: Float64Array): AdamsSegment;
  /** Takes f at the corrected value as the new point's rate (the final evaluation, or the stiffness test's). */
  keep(fc: Float64Array, m: number): void;
  /**
   * The next order among order − 1, order, order + 1 and its factor, from the estimate `est`
   * at k of the step just kept (y to yNew); the same object at every call.
   */
  next(est: number, k: number, m: number, order: number, y: Float64Array, yNew: Float64Array): NextStep;
  /** Takes the new point tNew (with the rate `correct` or `keep` left) as the history's newest. */
  accept(tNew: number, m: number): void;
}

/** ln of the factor on h that brings an estimate e of order q to the target (safety included). */
function logFactor(e: number, q: number): number {
  return e === 0 ? LOG_MAX_FACTOR : LOG_SAFETY - Math.log(e) / (q + 1);
}
const LOG_MAX_FACTOR = Math.log(ADAMS_CONTROL.maxFactor);
const LOG_SAFETY = Math.log(ADAMS_CONTROL.safety);
const LOG_RAISE_MARGIN = Math.log(ADAMS_CONTROL.raiseMargin);

/**
 * PECE on the history kept in place (`adams-history.ts`): the corrector from the predictor
 * plus the new point's term, and in the same pass the estimates at orders k − 1, k, k + 1;
 * the order and step chosen on the logarithms of their factors.
 */
export class InPlaceFormulas implements AdamsFormulas {
  private readonly history: AdamsHistory;
  private sumLow = 0;
  private sumHigh = 0;
  private readonly chosen: NextStep = { order: 1, factor: 1 };

  constructor(private readonly n: number, public options: ResolvedOptions) {
    this.history = new AdamsHistory(n);
  }

  get count(): number { return this.history.count; }
  clear(): void { this.history.clear(); }
  loadOne(t: number, f: Float64Array, h: number): void { this.history.loadOne(t, f, h); }
  load(T: readonly number[], F: Float64Array[], h: number): void { this.history.load(T, F, h); }
  rate(): Float64Array { return this.history.d; }

  predict(h: number, k: number, m: number, y: Float64Array, p: Float64Array): void {
    const { history, n } = this;
    history.prepare(h, m);
    const { d, g } = history;
    // predictor: y_n + h·Σ_{i<k} G_i·d_i
    for (let c = 0; c < n; c++) {
      let acc = 0;
      for (let i = 0; i < k; i++) acc += g[i] * d[i * n + c];
      p[c] = y[c] + h * acc;
    }
  }

  correct(h: number, k: number, m: number, y: Float64Array, p: Float64Array, fp: Float64Array, yNew: Float64Array): number {
    const { history, n } = this;
    const { atol, rtol } = this.options;
    history.extend(fp, m);
    const { e, g } = history;
    // corrector (the predictor plus the term of the new point: the Newton form through
    // t_{n+1}, t_n, …, t_{n−k+1} in the order t_n, …, t_{n−k+1}, t_{n+1}) and, in the same
    // pass, the corrector's terms k − 1, k, k + 1 scaled as in `errorNorm`: h·G_i·e_i
    const wk = h * g[k];
    const ck = h * history.correctorWeight(k);
    const cLow = k > 1 ? h * history.correctorWeight(k - 1) : 0;
    const cHigh = m === k + 1 ? h * history.correctorWeight(k + 1) : 0;
    let sum = 0, sumLow = 0, sumHigh = 0;
    for (let c = 0; c < n; c++) {
      const ek = e[k * n + c];
      const v = p[c] + wk * ek;
      yNew[c] = v;
      const inv = 1 / (atol[c] + rtol * Math.max(Math.abs(y[c]), Math.abs(v)));
      const r = ck * ek * inv;
      const rLow = cLow * e[(k - 1) * n + c] * inv;
      const rHigh = cHigh * e[(k + 1) * n + c] * inv;
      sum += r * r;
      sumLow += rLow * rLow;
      sumHigh += rHigh * rHigh;
    }
    this.sumLow = sumLow;
    this.sumHigh = sumHigh;
    return Math.sqrt(sum / n) / ADAMS_CONTROL.target;
  }

  segment(t: number, tNew: number, h: number, k: number, _m: number, y: Float64Array, yNew: Float64Array): AdamsSegment {
    return AdamsSegment.of(t, tNew, h, y, yNew, this.history.e, this.history.x, 0, k);
  }

  keep(fc: Float64Array, m: number): void {
    this.history.extend(fc, m);
  }

  next(est: number, k: number, m: number, order: number): NextStep {
    const n = this.n;
    const C = ADAMS_CONTROL;
    let next = order;
    let logF = logFactor(est, k);
    if (k < order) {
      // the history was shorter than the order: keep building it
    } else if (m !== k + 1) {
      if (order < ADAMS_MAX_ORDER) next = order + 1;
    } else {
      const low = k > 1 ? logFactor(Math.sqrt(this.sumLow / n) / C.target, k - 1) : -Infinity;
      const high = order < ADAMS_MAX_ORDER ? logFactor(Math.sqrt(this.sumHigh / n) / C.target, k + 1) : -Infinity;
      if (low >= logF && low >= high - LOG_RAISE_MARGIN) {
        next = order - 1;
        logF = low;
      } else if (high > LOG_RAISE_MARGIN + logF) {
        next = order + 1;
        logF = high;
      }
    }
    this.chosen.order = next;
    this.chosen.factor = Math.exp(logF);
    return this.chosen;
  }

  accept(tNew: number, m: number): void {
    this.history.accept(tNew, m);
  }
}
