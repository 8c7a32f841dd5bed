/**
 * The Newton form the Adams formulas (`adams.ts`) are built from: divided differences of the
 * rates at the actual past times, the integrals of the Newton basis over a step, and the
 * continuous solution of one step (Hairer, Nørsett & Wanner, Solving ODEs I, sec. III.5;
 * Shampine & Gordon, Computer Solution of Ordinary Differential Equations, 1975, ch. 4).
 */
import { type DenseSegment, DenseSlab, writeStepEnd } from './types.ts';

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
 * Newton terms in the integral of the interpolating polynomial, with the nodes x_l read from
 * x[xAt + l]. `coef` is scratch of length m + 2. O(m²).
 */
export function newtonIntegrals(x: ArrayLike<number>, m: number, theta: number, g: Float64Array, coef: Float64Array, xAt = 0): void {
  coef.fill(0, 0, m + 2);
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
    const xi = x[xAt + i];
    for (let j = i + 1; j >= 1; j--) coef[j] = coef[j - 1] - xi * coef[j];
    coef[0] = -xi * coef[0];
  }
}

/** `newtonIntegrals` at θ = 1, the weights of a whole step (each step's predictor). */
export function stepWeights(x: ArrayLike<number>, xAt: number, m: number, g: Float64Array, coef: Float64Array): void {
  coef[0] = 1;
  for (let i = 0; i <= m; i++) {
    let acc = 0;
    for (let j = 0; j <= i; j++) acc += coef[j] / (j + 1);
    g[i] = acc;
    if (i === m) break;
    const xi = x[xAt + i];
    coef[i + 1] = coef[i];
    for (let j = i; j >= 1; j--) coef[j] = coef[j - 1] - xi * coef[j];
    coef[0] = -xi * coef[0];
  }
}

/** Scratch of every segment's `eval` (one at a time: eval neither waits nor calls back). */
const scratchG = new Float64Array(64);
const scratchCoef = new Float64Array(65);

/** Where the segments' numbers come from: one chunk for many steps (as dopri5's). */
const slab = new DenseSlab();

/**
 * The continuous solution of one Adams step: y_n + h·Σ G_i(θ)·d_i. Its numbers, from `at` in
 * `data`: [y0 | y1 | d_0 | … | d_m], each n long, then the corrector's m + 1 nodes in units of
 * h from t0 (x_0 = 1 at t1).
 */
export class AdamsSegment implements DenseSegment {
  /** Whether the power form (after the nodes, `powers`) has been computed. */
  private expanded = false;

  /**
   * `powers`: the segment keeps room for y(θ) = y0 + Σ_j a_j·θ^(j+1) (a_j n numbers each,
   * after the nodes), made on its first `eval` inside the step: then each `eval` is a Horner
   * sum, O(n·m), instead of the Newton integrals' O(m²) (a run's questions, areas and
   * crossings evaluate a segment many times). Without it, `eval` integrates the Newton form
   * at each call, as the one-evaluation mode's segments always did (`adams-rebuilt.ts`: its
   * dense values stay the same to the last bit).
   */
  constructor(readonly t0: number, readonly t1: number, private readonly h: number, private readonly n: number,
    private readonly m: number, private readonly data: Float64Array, private readonly at: number, private readonly powers = false) {}

  /**
   * A segment whose numbers are copied from y0, y1, the differences d_0 … d_m (flat, d_i at
   * d[i·n …]) and the nodes x_0 … x_m (from x[xAt]).
   */
  static of(t0: number, t1: number, h: number, y0: Float64Array, y1: Float64Array, d: Float64Array, x: Float64Array, xAt: number, m: number): AdamsSegment {
    const n = y0.length;
    const at = slab.take((3 + m) * n + m + 1 + (m + 1) * n);
    const data = slab.data;
    for (let c = 0; c < n; c++) {
      data[at + c] = y0[c];
      data[at + n + c] = y1[c];
    }
    const to = at + 2 * n;
    for (let j = 0; j < (m + 1) * n; j++) data[to + j] = d[j];
    const nodes = at + (3 + m) * n;
    for (let i = 0; i <= m; i++) data[nodes + i] = x[xAt + i];
    return new AdamsSegment(t0, t1, h, n, m, data, at, true);
  }

  /** `of` for differences held one array each (the one-evaluation mode, `adams-rebuilt.ts`). */
  static ofRows(t0: number, t1: number, h: number, y0: Float64Array, y1: Float64Array, d: readonly Float64Array[], x: Float64Array, m: number): AdamsSegment {
    const n = y0.length;
    const at = slab.take((3 + m) * n + m + 1);
    const data = slab.data;
    for (let c = 0; c < n; c++) {
      data[at + c] = y0[c];
      data[at + n + c] = y1[c];
    }
    for (let i = 0; i <= m; i++) {
      const di = d[i];
      const to = at + (2 + i) * n;
      for (let c = 0; c < n; c++) data[to + c] = di[c];
    }
    for (let i = 0; i <= m; i++) data[at + (3 + m) * n + i] = x[i];
    return new AdamsSegment(t0, t1, h, n, m, data, at);
  }

  /**
   * The power form's coefficients a_j = h/(j + 1)·Σ_{i≥j} c_ij·d_i, c_ij the coefficient of s^j
   * in Π_{l<i} (s − x_l) (the expansion `newtonIntegrals` integrates term by term).
   */
  private expand(): void {
    const { data, n, m, at, h } = this;
    const nodes = at + (3 + m) * n;
    const a = nodes + m + 1;
    const coef = scratchCoef;
    coef.fill(0, 0, m + 2);
    coef[0] = 1;
    data.fill(0, a, a + (m + 1) * n);
    for (let i = 0; i <= m; i++) {
      const di = at + (2 + i) * n;
      for (let j = 0; j <= i; j++) {
        const w = coef[j];
        const aj = a + j * n;
        for (let c = 0; c < n; c++) data[aj + c] += w * data[di + c];
      }
      if (i === m) break;
      const xi = data[nodes + i];
      for (let j = i + 1; j >= 1; j--) coef[j] = coef[j - 1] - xi * coef[j];
      coef[0] = -xi * coef[0];
    }
    for (let j = 0; j <= m; j++) {
      const scale = h / (j + 1);
      const aj = a + j * n;
      for (let c = 0; c < n; c++) data[aj + c] *= scale;
    }
    this.expanded = true;
  }

  eval(t: number, out: Float64Array): void {
    const { data, n, m, at } = this;
    if (writeStepEnd(t, this.t0, this.t1, data, n, out, at)) return;
    if (this.powers) {
      if (!this.expanded) this.expand();
      const theta = (t - this.t0) / this.h;
      const a = at + (3 + m) * n + m + 1;
      for (let c = 0; c < n; c++) {
        let acc = 0;
        for (let j = m; j >= 0; j--) acc = (acc + data[a + j * n + c]) * theta;
        out[c] = data[at + c] + acc;
      }
      return;
    }
    const g = scratchG;
    newtonIntegrals(data, m, (t - this.t0) / this.h, g, scratchCoef, at + (3 + m) * n);
    for (let c = 0; c < n; c++) {
      let acc = 0;
      for (let i = 0; i <= m; i++) acc += g[i] * data[at + (2 + i) * n + c];
      out[c] = data[at + c] + this.h * acc;
    }
  }
}
