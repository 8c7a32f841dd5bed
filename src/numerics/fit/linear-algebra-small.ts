/**
 * The singular value decomposition of a small dense matrix, for the least-squares fitter:
 * its trust-region steps, its covariance and its identifiability test.
 *
 * Method: one-sided Jacobi (M. R. Hestenes, "Inversion of matrices by biorthogonalization",
 * J. SIAM 6, 1958; Golub & Van Loan, Matrix Computations, 4th ed., sec. 8.6.4). Plane
 * rotations of column pairs until every pair is orthogonal to working precision; the column
 * norms are then the singular values. It finds small singular values to high relative
 * accuracy when the columns are scaled (Demmel & Veselić, "Jacobi's method is more accurate
 * than QR", SIAM J. Matrix Anal. Appl. 13, 1992), which is what a rank test needs.
 *
 * Matrices are row-major Float64Arrays. Cost: about 3·m·n² multiply-adds per sweep, with 5 to
 * 10 sweeps for the sizes a fit has (n up to about 20 columns).
 */

/** Most sweeps; convergence is quadratic, so this is reached only by a matrix with NaN. */
const MAX_SWEEPS = 60;
/**
 * Two columns count as orthogonal when |cos angle| is below m·ε (the rounding of an inner
 * product of length m; Golub & Van Loan, sec. 8.6.4).
 */
const orthogonalTolerance = (m: number): number => Math.max(m, 2) * Number.EPSILON;

/** A = U·diag(s)·Vᵀ, for A of m×n with m ≥ n. */
export interface Svd {
  /** Singular values, largest first (n of them; zero for a zero column direction). */
  readonly s: Float64Array;
  /** Left singular vectors, m×n row-major; the column of a zero singular value is zero. */
  readonly u: Float64Array;
  /** Right singular vectors, n×n row-major (column j belongs to s[j]); orthogonal. */
  readonly v: Float64Array;
  /** Sweeps made. */
  readonly sweeps: number;
  /** False when MAX_SWEEPS passed before every pair was orthogonal (a NaN or infinity in A). */
  readonly converged: boolean;
}

/**
 * The SVD of `a` (m×n row-major, m ≥ n; not modified). Returns singular values in decreasing
 * order with their vectors. A non-finite entry gives `converged: false` and NaN values; it
 * never throws for finite input of the right size. Throws RangeError when m < n or the
 * array's length is not m·n.
 */
export function jacobiSvd(a: ArrayLike<number>, m: number, n: number): Svd {
  if (!(Number.isInteger(m) && Number.isInteger(n) && m >= n && n >= 0)) {
    throw new RangeError(`jacobiSvd needs integers m >= n >= 0; got m = ${m}, n = ${n}`);
  }
  if (a.length !== m * n) throw new RangeError(`a must have m·n = ${m * n} entries; it has ${a.length}`);
  // Work on columns stored contiguously (column j at w[j*m ...]) for cache-friendly rotations.
  const w = new Float64Array(m * n);
  for (let i = 0; i < m; i++) for (let j = 0; j < n; j++) w[j * m + i] = a[i * n + j];
  const vt = new Float64Array(n * n); // row j of vt is column j of V
  for (let j = 0; j < n; j++) vt[j * n + j] = 1;

  const tol = orthogonalTolerance(m);
  let sweeps = 0;
  let converged = n < 2;
  while (!converged && sweeps < MAX_SWEEPS) {
    sweeps++;
    let rotated = false;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) {
        let alpha = 0, beta = 0, gamma = 0;
        const op = p * m, oq = q * m;
        for (let i = 0; i < m; i++) {
          const x = w[op + i], y = w[oq + i];
          alpha += x * x;
          beta += y * y;
          gamma += x * y;
        }
        if (gamma === 0 || !(Math.abs(gamma) > tol * Math.sqrt(alpha * beta))) {
          if (Number.isNaN(gamma)) return nanSvd(m, n, sweeps);
          continue;
        }
        rotated = true;
        // The rotation that zeroes the (p, q) entry of the 2×2 Gram matrix [[alpha, gamma], [gamma, beta]].
        const zeta = (beta - alpha) / (2 * gamma);
        const t = (zeta >= 0 ? 1 : -1) / (Math.abs(zeta) + Math.sqrt(1 + zeta * zeta));
        const c = 1 / Math.sqrt(1 + t * t);
        const s = c * t;
        for (let i = 0; i < m; i++) {
          const x = w[op + i], y = w[oq + i];
          w[op + i] = c * x - s * y;
          w[oq + i] = s * x + c * y;
        }
        const vp = p * n, vq = q * n;
        for (let i = 0; i < n; i++) {
          const x = vt[vp + i], y = vt[vq + i];
          vt[vp + i] = c * x - s * y;
          vt[vq + i] = s * x + c * y;
        }
      }
    }
    converged = !rotated;
  }

  const norms = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    let acc = 0;
    for (let i = 0; i < m; i++) acc += w[j * m + i] ** 2;
    norms[j] = Math.sqrt(acc);
  }
  const order = Array.from({ length: n }, (_, j) => j).sort((x, y) => norms[y] - norms[x]);
  const s = new Float64Array(n);
  const u = new Float64Array(m * n);
  const v = new Float64Array(n * n);
  order.forEach((j, k) => {
    s[k] = norms[j];
    const inv = norms[j] > 0 ? 1 / norms[j] : 0;
    for (let i = 0; i < m; i++) u[i * n + k] = w[j * m + i] * inv;
    for (let i = 0; i < n; i++) v[i * n + k] = vt[j * n + i];
  });
  return { s, u, v, sweeps, converged };
}

function nanSvd(m: number, n: number, sweeps: number): Svd {
  return {
    s: new Float64Array(n).fill(NaN), u: new Float64Array(m * n).fill(NaN),
    v: new Float64Array(n * n).fill(NaN), sweeps, converged: false,
  };
}
