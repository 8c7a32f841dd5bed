/**
 * The Newton form the Adams formulas (`adams.ts`) are built from: divided differences of the
 * rates at the actual past times, the integrals of the Newton basis over a step, and the
 * continuous solution of one step (Hairer, Nørsett & Wanner, Solving ODEs I, sec. III.5;
 * Shampine & Gordon, Computer Solution of Ordinary Differential Equations, 1975, ch. 4).
 */
import { type DenseSegment, writeStepEnd } from './types.ts';

/**
 * The Newton divided differences d_i = f[x_0, …, x_i] of the vectors F_i at the nodes x_i,
 * in place (d starts as a copy of F). O(n·m²) for m + 1 nodes.
 */
export function dividedDifferences(x: ArrayLike<number>, d: Float64Array[], m: number): void {
  const n = d[0].length;
  for (let j = 1; j <= m; j++) {
    for (let i = m; i >= j; i--) {
      const inv = 1 / (x[i] - x[i - j]);
      const di = d[i];
      const dp = d[i - 1];
      for (let c = 0; c < n; c++) di[c] = (di[c] - dp[c]) * inv;
    }
  }
}

/**
 * G_i(θ) = ∫_0^θ Π_{l<i} (s − x_l) ds for i = 0 … m, written into g: the weights of the
 * Newton terms in the integral of the interpolating polynomial. `coef` is scratch of length
 * m + 1.
 */
export function newtonIntegrals(x: ArrayLike<number>, m: number, theta: number, g: Float64Array, coef: Float64Array): void {
  coef.fill(0);
  coef[0] = 1;
  for (let i = 0; i <= m; i++) {
    // coef holds the coefficients of Π_{l<i} (s − x_l), degree i
    let acc = 0;
    let pow = theta;
    for (let j = 0; j <= i; j++) {
      acc += (coef[j] * pow) / (j + 1);
      pow *= theta;
    }
    g[i] = acc;
    if (i === m) break;
    for (let j = i + 1; j >= 1; j--) coef[j] = coef[j - 1] - x[i] * coef[j];
    coef[0] = -x[i] * coef[0];
  }
}

/** The continuous solution of one Adams step: y_n + h·Σ G_i(θ)·d_i. */
export class AdamsSegment implements DenseSegment {
  private readonly g: Float64Array;
  private readonly coef: Float64Array;
  /**
   * @param data [y0 | y1 | d_0 | … | d_m], each n long.
   * @param x the corrector's nodes in units of h from t0 (x_0 = 1 at t1).
   */
  constructor(readonly t0: number, readonly t1: number, private readonly h: number, private readonly n: number,
    private readonly m: number, private readonly x: Float64Array, private readonly data: Float64Array) {
    this.g = new Float64Array(m + 1);
    this.coef = new Float64Array(m + 2);
  }

  eval(t: number, out: Float64Array): void {
    const { data, n, m, g } = this;
    if (writeStepEnd(t, this.t0, this.t1, data, n, out)) return;
    newtonIntegrals(this.x, m, (t - this.t0) / this.h, g, this.coef);
    for (let c = 0; c < n; c++) {
      let acc = 0;
      for (let i = 0; i <= m; i++) acc += g[i] * data[(2 + i) * n + c];
      out[c] = data[c] + this.h * acc;
    }
  }
}
