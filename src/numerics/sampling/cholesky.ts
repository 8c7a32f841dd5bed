/**
 * The Cholesky factor of a covariance matrix, for correlated normal draws: x = μ + L z with
 * z standard normal has covariance L Lᵀ = Σ. A matrix that is not positive semi-definite (to
 * round-off) gives null. Zero variances (a fixed estimate) give a zero column.
 */

/** L (n×n, row-major, lower triangular) with L Lᵀ = a; null when a is not symmetric positive semi-definite. Cost: n³/6. */
export function cholesky(a: ArrayLike<number>, n: number): Float64Array | null {
  const l = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < i; j++) {
      if (Math.abs(a[i * n + j] - a[j * n + i]) > 1e-9 * Math.sqrt(Math.abs(a[i * n + i] * a[j * n + j])) + 1e-300) return null;
    }
  }
  for (let j = 0; j < n; j++) {
    let d = a[j * n + j];
    for (let k = 0; k < j; k++) d -= l[j * n + k] * l[j * n + k];
    const tol = 1e-12 * Math.abs(a[j * n + j]);
    if (!(d > tol)) {
      if (d < -1e-9 * Math.abs(a[j * n + j]) || !Number.isFinite(d)) return null;
      continue; // a zero variance: its column stays zero
    }
    const ljj = Math.sqrt(d);
    l[j * n + j] = ljj;
    for (let i = j + 1; i < n; i++) {
      let s = a[i * n + j];
      for (let k = 0; k < j; k++) s -= l[i * n + k] * l[j * n + k];
      l[i * n + j] = s / ljj;
    }
  }
  return l;
}

/** out = center + L z. */
export function correlated(center: ArrayLike<number>, l: Float64Array, z: ArrayLike<number>, out: Float64Array): void {
  const n = center.length;
  for (let i = 0; i < n; i++) {
    let s = center[i];
    for (let k = 0; k <= i; k++) s += l[i * n + k] * z[k];
    out[i] = s;
  }
}
