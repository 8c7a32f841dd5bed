/**
 * Trust-region helpers of the Levenberg–Marquardt iteration: norms, and the step within the
 * radius from the SVD of the scaled Jacobian. The step comes from the singular value
 * decomposition of J·D⁻¹, which makes ‖D·s(λ)‖ a closed form in λ; λ is found by the
 * safeguarded Newton iteration on 1/‖D·s(λ)‖ − 1/Δ (Hebden 1973; Moré 1977), and a
 * rank-deficient J gives the minimum-norm step.
 */

const EPS = Number.EPSILON;
/** ‖D·s‖ within this fraction of Δ is close enough to the radius (Moré 1977: σ = 0.1). */
const RADIUS_TOLERANCE = 0.1;
/** Most Newton iterations for λ; two or three are typical. */
const MAX_LAMBDA_ITERATIONS = 60;

/** ‖v‖₂ without overflow for the sizes a fit has (plain sum of squares). */
export function norm2(v: ArrayLike<number>): number {
  let acc = 0;
  for (let i = 0; i < v.length; i++) acc += v[i] * v[i];
  return Math.sqrt(acc);
}

/** ‖D·v‖₂. */
export function scaledNorm(d: Float64Array, v: ArrayLike<number>): number {
  let acc = 0;
  for (let j = 0; j < d.length; j++) acc += (d[j] * v[j]) ** 2;
  return Math.sqrt(acc);
}

/**
 * The trust-region step in scaled variables z = D·s for the SVD Ĵ = U·diag(sig)·Vᵀ (k columns)
 * and a = Uᵀr: z(λ) = −Σ sig_i·a_i/(sig_i² + λ)·v_i, with λ = 0 when the (minimum-norm)
 * Gauss–Newton step fits in 1.1·Δ, otherwise λ > 0 with |‖z‖ − Δ| ≤ 0.1·Δ. Writes z into `z`
 * and returns λ.
 */
export function trustRegionStep(
  sig: Float64Array, a: Float64Array, v: Float64Array, k: number, delta: number, z: Float64Array,
): number {
  const coef = new Float64Array(k);
  const rankTol = sig[0] * k * EPS;
  let gn2 = 0;
  for (let i = 0; i < k; i++) if (sig[i] > rankTol) gn2 += (a[i] / sig[i]) ** 2;
  let lambda = 0;
  if (Math.sqrt(gn2) <= (1 + RADIUS_TOLERANCE) * delta) {
    for (let i = 0; i < k; i++) coef[i] = sig[i] > rankTol ? -a[i] / sig[i] : 0;
  } else {
    let g2 = 0;
    for (let i = 0; i < k; i++) g2 += (sig[i] * a[i]) ** 2;
    let lo = 0;
    let hi = Math.sqrt(g2) / delta; // ‖z(λ)‖ ≤ ‖Ĵᵀr‖/λ, so ‖z(hi)‖ ≤ Δ
    if (hi > 0) {
      // Newton from λ = 0 on the Gauss–Newton norm (restricted to the numerical rank).
      const q0 = Math.sqrt(gn2);
      let s0 = 0;
      for (let i = 0; i < k; i++) if (sig[i] > rankTol) s0 += a[i] ** 2 / sig[i] ** 4;
      lambda = ((q0 - delta) * q0 * q0) / (delta * s0);
      for (let it = 0; it < MAX_LAMBDA_ITERATIONS; it++) {
        if (!(lambda > lo && lambda < hi)) lambda = Math.max(1e-3 * hi, Math.sqrt(lo * hi));
        let q2 = 0, s = 0;
        for (let i = 0; i < k; i++) {
          const den = sig[i] * sig[i] + lambda;
          const w = (sig[i] * a[i]) / den;
          q2 += w * w;
          s += (w * w) / den;
        }
        const q = Math.sqrt(q2);
        if (Math.abs(q - delta) <= RADIUS_TOLERANCE * delta) break;
        if (q > delta) lo = lambda; else hi = lambda;
        // Newton on φ(λ) = 1/‖z(λ)‖ − 1/Δ: φ' = S/‖z‖³ with S = Σ (sig·a)²/(sig² + λ)³
        lambda += ((q - delta) * q2) / (delta * s);
      }
      for (let i = 0; i < k; i++) coef[i] = (-sig[i] * a[i]) / (sig[i] * sig[i] + lambda);
    } else {
      lambda = 0; // no gradient in the free variables: the step is zero
    }
  }
  for (let j = 0; j < k; j++) {
    let acc = 0;
    for (let i = 0; i < k; i++) acc += v[j * k + i] * coef[i];
    z[j] = acc;
  }
  return lambda;
}
