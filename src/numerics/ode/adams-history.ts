/**
 * The history of the Adams formulas (`adams.ts`): the rates at the past times in Newton's
 * divided-difference form, updated in place by one new diagonal a step instead of rebuilt from
 * the rates, in preallocated typed arrays, with no allocation in a step.
 *
 * - The differences are kept scaled to a step h, d_i = h^i·f[t_n, t_{n−1}, …, t_{n−i}] (the
 *   differences in the unit of h, as the Newton weights are in it), and scaled again by
 *   (h'/h)^i when the step changes: n numbers a difference instead of a rebuild of
 *   O(n·k²).
 * - The new point's diagonal e_i = h^i·f[t_{n+1}, t_n, …, t_{n+1−i}] follows from the old one by
 *   e_i = (e_{i−1} − d_{i−1})/(1 − x_{i−1}), x_l = (t_{n−l} − t_n)/h: the recurrence of the
 *   divided-difference table along its last diagonal (Hairer, Nørsett & Wanner, Solving ODEs I,
 *   sec. III.5, eq. 5.3; Shampine & Gordon, Computer Solution of Ordinary Differential
 *   Equations, 1975, ch. 4, whose modified differences φ_{i+1}(n + 1) = φ_i(n + 1) − β_i·φ_i(n)
 *   are the same recurrence with another scaling). It gives the corrector's differences, and
 *   after the step they are the history.
 * - The weights G_i = ∫_0^1 Π_{l<i} (s − x_l) ds of the predictor come from the nodes, once a
 *   step (the step changes every step, so they do too); the corrector's and the error
 *   estimates' follow from them (see `correctorWeight`).
 */
import { dividedDifferences, stepWeights } from './adams-newton.ts';

/** Highest order of the predictor (the corrector's is one more). */
export const ADAMS_MAX_ORDER = 12;

/** Points of the history: enough for the estimate at order k + 1 of the highest k. */
export const HISTORY_POINTS = ADAMS_MAX_ORDER + 2;

export class AdamsHistory {
  /** Past times, newest first: times[0] is the accepted time t_n. */
  readonly times = new Float64Array(HISTORY_POINTS);
  /** The number of valid points (and differences). */
  count = 0;
  /** d_i at d[i·n …] for i < count, scaled to the step `scale`. */
  d: Float64Array;
  /** The new point's differences e_i at e[i·n …] (see the file's comment), once `extend` ran. */
  e: Float64Array;
  /** The step the differences are scaled to. */
  private scale = NaN;
  /**
   * The nodes in units of the step from t_n, the corrector's order: x[0] = 1 (t_{n+1}),
   * x[1 + l] = (t_{n−l} − t_n)/h (so x[1] = 0). The predictor's nodes start at x[1].
   */
  readonly x = new Float64Array(HISTORY_POINTS + 1);
  /** The predictor's weights G_i (i ≤ m of the last `prepare`). */
  readonly g = new Float64Array(HISTORY_POINTS + 1);
  private readonly coef = new Float64Array(HISTORY_POINTS + 2);

  constructor(readonly n: number) {
    this.d = new Float64Array(HISTORY_POINTS * n);
    this.e = new Float64Array(HISTORY_POINTS * n);
  }

  clear(): void {
    this.count = 0;
    this.scale = NaN;
  }

  /**
   * Starts from the points T (newest first) and the rates F there (which it overwrites), the
   * differences scaled to the step h. O(n·P²) for P points, once a piece.
   */
  load(T: readonly number[], F: Float64Array[], h: number): void {
    const { n, x, d } = this;
    const count = Math.min(T.length, HISTORY_POINTS);
    for (let l = 0; l < count; l++) {
      this.times[l] = T[l];
      x[l] = (T[l] - T[0]) / h;
    }
    dividedDifferences(x, F, count - 1);
    for (let l = 0; l < count; l++) for (let c = 0; c < n; c++) d[l * n + c] = F[l][c];
    this.count = count;
    this.scale = h;
  }

  /** Starts from the one point (t, f) (a run's first piece, which climbs from order 1). */
  loadOne(t: number, f: Float64Array, h: number): void {
    this.times[0] = t;
    for (let c = 0; c < this.n; c++) this.d[c] = f[c];
    this.count = 1;
    this.scale = h;
  }

  /**
   * Readies a step of h from t_n: the differences scaled to h, the nodes, and the predictor's
   * weights G_0 … G_m (m < count + 1). O(n·count + m²).
   */
  prepare(h: number, m: number): void {
    const { n, d, x, count, times } = this;
    if (h !== this.scale) {
      const rho = h / this.scale;
      let r = 1;
      for (let i = 1; i < count; i++) {
        r *= rho;
        const at = i * n;
        for (let c = 0; c < n; c++) d[at + c] *= r;
      }
      this.scale = h;
    }
    const t = times[0];
    const inv = 1 / h;
    x[0] = 1;
    x[1] = 0;
    for (let l = 1; l < count; l++) x[1 + l] = (times[l] - t) * inv;
    stepWeights(x, 1, m, this.g, this.coef);
  }

  /**
   * The weight of the corrector's Newton term i, ∫_0^1 (s − 1)·Π_{l<i−1} (s − x_l) ds, from
   * the predictor's: (s − 1)·Π_{l<i−1} = Π_{l<i} + (x_{i−1} − 1)·Π_{l<i−1}. For 1 ≤ i ≤ m.
   */
  correctorWeight(i: number): number {
    return this.g[i] + (this.x[i] - 1) * this.g[i - 1];
  }

  /** e_0 = f (the rate at the new point), e_i = (e_{i−1} − d_{i−1})/(1 − x_{i−1}) for i ≤ m. O(n·m). */
  extend(f: Float64Array, m: number): void {
    const { n, d, e, x } = this;
    for (let c = 0; c < n; c++) e[c] = f[c];
    for (let i = 1; i <= m; i++) {
      const inv = 1 / (1 - x[i]);
      const at = i * n;
      const back = at - n;
      for (let c = 0; c < n; c++) e[at + c] = (e[back + c] - d[back + c]) * inv;
    }
  }

  /**
   * Takes the new point tNew with its differences e_0 … e_m (`extend`) as the history: m + 1
   * points, as many as the next step's estimates can use when the order rises by one.
   */
  accept(tNew: number, m: number): void {
    const count = Math.min(m + 1, HISTORY_POINTS);
    this.times.copyWithin(1, 0, count - 1);
    this.times[0] = tNew;
    const old = this.d;
    this.d = this.e;
    this.e = old;
    this.count = count;
  }
}
