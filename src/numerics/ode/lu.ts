/**
 * Dense LU factorization with partial pivoting for the small systems of the stiff method
 * (Golub & Van Loan, Matrix Computations, sec. 3.4, Algorithm 3.4.1 — common practice).
 * Matrices are row-major Float64Arrays of n×n; cost n³/3 multiply-adds to factor, n² to solve.
 */

/**
 * Factors `a` in place into L (unit lower, below the diagonal) and U (upper, on and above),
 * with P·A = L·U recorded in `pivot` (row i was swapped with row pivot[i] at step i).
 * Returns false when a pivot is zero or not finite (the matrix is singular to working
 * precision, or holds NaN); `a` is then partly overwritten.
 */
export function luFactor(a: Float64Array, n: number, pivot: Int32Array): boolean {
  for (let k = 0; k < n; k++) {
    let p = k;
    let best = Math.abs(a[k * n + k]);
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(a[i * n + k]);
      if (v > best) {
        best = v;
        p = i;
      }
    }
    pivot[k] = p;
    if (!(best > 0) || !Number.isFinite(best)) return false;
    if (p !== k) {
      for (let j = 0; j < n; j++) {
        const tmp = a[k * n + j];
        a[k * n + j] = a[p * n + j];
        a[p * n + j] = tmp;
      }
    }
    const inv = 1 / a[k * n + k];
    for (let i = k + 1; i < n; i++) {
      const l = a[i * n + k] * inv;
      a[i * n + k] = l;
      if (l === 0) continue;
      for (let j = k + 1; j < n; j++) a[i * n + j] -= l * a[k * n + j];
    }
  }
  return true;
}

/** Solves A·x = b in place (b becomes x) with the factors from `luFactor`. */
export function luSolve(lu: Float64Array, n: number, pivot: Int32Array, b: Float64Array): void {
  for (let k = 0; k < n; k++) {
    const p = pivot[k];
    if (p !== k) {
      const tmp = b[k];
      b[k] = b[p];
      b[p] = tmp;
    }
  }
  for (let i = 1; i < n; i++) {
    let acc = b[i];
    for (let j = 0; j < i; j++) acc -= lu[i * n + j] * b[j];
    b[i] = acc;
  }
  for (let i = n - 1; i >= 0; i--) {
    let acc = b[i];
    for (let j = i + 1; j < n; j++) acc -= lu[i * n + j] * b[j];
    b[i] = acc / lu[i * n + i];
  }
}
