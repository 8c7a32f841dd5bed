/**
 * The NDF's formulas apart from its step loop (`ndf.ts`): the coefficients by order, the
 * step loop's constants, the change of step size by rescaling backward differences, and the
 * dense output. After
 * Shampine & Reichelt, "The MATLAB ODE Suite", SIAM J. Sci. Comput. 18 (1997), 1–22, sec. 2.
 */
import { type DenseSegment, writeStepEnd } from './types.ts';

/** Highest order of the formulas. */
export const NDF_MAX_ORDER = 5;

/**
 * The NDF coefficients by order k (index 0 unused): κ_k (Shampine & Reichelt 1997, Table 1;
 * κ_5 = 0, order 5 is the BDF), γ_k = Σ_{j≤k} 1/j, α_k = (1 - κ_k)·γ_k (the formula's
 * leading coefficient) and the error constant κ_k·γ_k + 1/(k+1) (the local error is about
 * that times ∇^{k+1} y_{n+1}).
 */
export const NDF = (() => {
  const kappa = [0, -0.185, -1 / 9, -0.0823, -0.0415, 0];
  const gamma = [0];
  for (let k = 1; k <= NDF_MAX_ORDER + 1; k++) gamma.push(gamma[k - 1] + 1 / k);
  const alpha = kappa.map((kk, k) => (1 - kk) * gamma[k]);
  const errorConst = [...kappa, 0].map((kk, k) => kk * gamma[k] + 1 / (k + 1));
  return { kappa, gamma, alpha, errorConst } as const;
})();

/** The NDF stepper's step-size and Newton constants (`ndf.ts`) (Hairer & Wanner II, sec. IV.8; common practice). */
export const NDF_CONTROL = {
  /** Safety factor on the predicted step. */
  safety: 0.9,
  minFactor: 0.2,
  maxFactor: 10,
  /**
   * The error estimate is taken at least this many times over, in the step's test and in
   * the choice of order alike; more where errors add up (`ndf-accumulation.ts`). Measured over
   * rtol 1e-3 … 1e-10 with the Newton test below, the largest error at the steps was, with a
   * fixed margin of 3, 10 and 30: 2×2 system with eigenvalues -1 and -1000 1.3–40, 0.5–15,
   * 0.26–6.0 units (its errors add up: see `ndf-accumulation.ts`); Robertson 0–3.8, 0.01–1.6,
   * 0.04–0.64; y' = -1e4 (y - cos t) 0.4–4.5, 0.08–1.7, 0.04–0.67; for about 30 % more
   * evaluations from 3 to 30 (still below LSODA's on the forced problem at every tolerance).
   * So 30.
   */
  errorMargin: 30,
  /** Most Newton iterations per attempt. */
  newtonIterations: 4,
  /**
   * The iteration stops when its predicted remaining error is below this fraction of the
   * tolerance (κ of Hairer & Wanner IV.8, between 0.01 and 0.1), and no lower than a few
   * roundoffs of the solution.
   */
  newtonFraction: 0.03,
  /** Factor for a step whose iteration failed with a fresh Jacobian, or met a non-finite f. */
  failShrink: 0.5,
  /**
   * An iteration that shrinks the correction by less than this fails, and a measured rate
   * falls by at most this factor per iteration (Shampine & Reichelt 1997, ode15s: 0.9).
   */
  slowRate: 0.9,
  /** The first iteration stops on a remembered rate only within this share of the tolerance (ode15s: 0.1). */
  firstIterationShare: 0.1,
  nonFiniteShrink: 0.25,
  /**
   * The global error is carried with the kept Jacobian (`ndf-accumulation.ts`) only while
   * the Newton iteration's measured rate is below this: the rate is about how far the kept J
   * is from the present one. On Robertson's problem J from t = 0 has no coupling through y2
   * and y3, so an error in y2 looked as if it never decayed, and the margin rose to its cap
   * (12 000–108 000 evaluations instead of 275–1 708).
   */
  trustRate: 0.01,
} as const;

/**
 * Rescales backward differences D[0..k] (to the step h) to the step ρh, in place:
 * D ← (R·U)ᵀ D with R_ij = Π_{m=1..i} (m - 1 - ρ j)/m and U the same at ρ = 1 (Shampine &
 * Reichelt 1997, sec. 2.2). `D[0]`, the solution, is left unchanged. Cost O(k²·n).
 */
export function rescaleDifferences(D: Float64Array[], k: number, rho: number, work: Float64Array[]): void {
  const size = k + 1;
  const R = differenceChange(size, rho);
  const U = differenceChange(size, 1);
  const RU = new Float64Array(size * size);
  for (let i = 0; i < size; i++) {
    for (let j = 0; j < size; j++) {
      let acc = 0;
      for (let m = 0; m < size; m++) acc += R[i * size + m] * U[m * size + j];
      RU[i * size + j] = acc;
    }
  }
  const n = D[0].length;
  for (let i = 0; i < size; i++) {
    const w = work[i];
    w.fill(0);
    for (let j = 0; j < size; j++) {
      const c = RU[j * size + i];
      if (c !== 0) for (let q = 0; q < n; q++) w[q] += c * D[j][q];
    }
  }
  for (let i = 0; i < size; i++) D[i].set(work[i]);
}

function differenceChange(size: number, rho: number): Float64Array {
  const M = new Float64Array(size * size);
  for (let j = 0; j < size; j++) M[j] = 1;
  for (let i = 1; i < size; i++) {
    for (let j = 0; j < size; j++) M[i * size + j] = (M[(i - 1) * size + j] * (i - 1 - rho * j)) / i;
  }
  return M;
}

/**
 * The continuous solution of one NDF step: the polynomial through y_{n+1}, y_n, …,
 * y_{n+1-k} at spacing h, y(t) = Σ_j D_j Π_{m<j} (x + m)/(m + 1) with x = (t - t1)/h.
 */
export class NdfSegment implements DenseSegment {
  /** [y0 | y1 | D_1 | … | D_k], each n long. */
  constructor(readonly t0: number, readonly t1: number, private readonly h: number, private readonly n: number,
    private readonly order: number, private readonly data: Float64Array) {}

  eval(t: number, out: Float64Array): void {
    const { data, n } = this;
    if (writeStepEnd(t, this.t0, this.t1, data, n, out)) return;
    const x = (t - this.t1) / this.h;
    for (let i = 0; i < n; i++) out[i] = data[n + i];
    let p = 1;
    for (let j = 1; j <= this.order; j++) {
      p *= (x + j - 1) / j;
      const off = (j + 1) * n;
      for (let i = 0; i < n; i++) out[i] += p * data[off + i];
    }
  }
}

