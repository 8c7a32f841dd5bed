// The one-sided Jacobi SVD under the least-squares fitter (src/numerics/fit/linear-algebra-small.ts):
// factors that reproduce the matrix, orthogonal vectors, and singular values known in closed form.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { jacobiSvd } from '../../src/numerics/fit/linear-algebra-small.ts';

/** max |A − U·diag(s)·Vᵀ| relative to max |A|. */
function reconstructionError(a: number[], m: number, n: number): number {
  const { s, u, v } = jacobiSvd(a, m, n);
  let worst = 0, scale = 0;
  for (let i = 0; i < m; i++) {
    for (let j = 0; j < n; j++) {
      let acc = 0;
      for (let k = 0; k < n; k++) acc += u[i * n + k] * s[k] * v[j * n + k];
      worst = Math.max(worst, Math.abs(acc - a[i * n + j]));
      scale = Math.max(scale, Math.abs(a[i * n + j]));
    }
  }
  return worst / scale;
}

/** max |VᵀV − I|. */
function orthogonalityError(v: Float64Array, n: number): number {
  let worst = 0;
  for (let p = 0; p < n; p++) {
    for (let q = 0; q < n; q++) {
      let acc = 0;
      for (let i = 0; i < n; i++) acc += v[i * n + p] * v[i * n + q];
      worst = Math.max(worst, Math.abs(acc - (p === q ? 1 : 0)));
    }
  }
  return worst;
}

describe('jacobiSvd', () => {
  it('gives the singular values of a matrix built from known factors, largest first, to 1e-14', () => {
    // By construction: A = Q1·diag(7, 3, 1e-9)·Q2ᵀ with Q1 (4×3, orthonormal columns) and Q2 plane
    // rotations, so its singular values are exactly 7, 3 and 1e-9 (up to rounding of the product).
    const c1 = Math.cos(0.3), s1 = Math.sin(0.3), c2 = Math.cos(1.1), s2 = Math.sin(1.1);
    const q1 = [ // columns: orthonormal vectors of R⁴
      [c1, -s1, 0], [s1, c1, 0], [0, 0, c2], [0, 0, s2],
    ];
    const q2 = [[c2, 0, -s2], [0, 1, 0], [s2, 0, c2]]; // a rotation of R³
    const sigma = [7, 3, 1e-9];
    const a: number[] = [];
    for (let i = 0; i < 4; i++) {
      for (let j = 0; j < 3; j++) {
        let acc = 0;
        for (let k = 0; k < 3; k++) acc += q1[i][k] * sigma[k] * q2[j][k];
        a.push(acc);
      }
    }
    const r = jacobiSvd(a, 4, 3);
    assert.equal(r.converged, true);
    assert.ok(Math.abs(r.s[0] - 7) <= 7 * 1e-14);
    assert.ok(Math.abs(r.s[1] - 3) <= 3 * 1e-14);
    // the smallest one is absolute-accurate to rounding of A's entries (about 7·ε)
    assert.ok(Math.abs(r.s[2] - 1e-9) <= 1e-14, `${r.s[2]}`);
    assert.ok(reconstructionError(a, 4, 3) <= 1e-15);
    assert.ok(orthogonalityError(r.v, 3) <= 1e-15);
  });

  it('finds an exact zero singular value for collinear columns and keeps V orthogonal', () => {
    // Closed form: columns x and 2x span one direction, so the singular values are ‖(x, 2x)‖_F and 0.
    const x = [1, 2, 3, 4, 5];
    const a = x.flatMap((v) => [v, 2 * v]);
    const r = jacobiSvd(a, 5, 2);
    const frob = Math.sqrt(5 * x.reduce((acc, v) => acc + v * v, 0));
    assert.ok(Math.abs(r.s[0] - frob) <= frob * 1e-15);
    assert.ok(r.s[1] <= frob * 1e-15, `${r.s[1]}`);
    // the null direction is (2, −1)/√5 up to sign
    const nullDir = [r.v[0 * 2 + 1], r.v[1 * 2 + 1]];
    assert.ok(Math.abs(Math.abs(nullDir[0]) - 2 / Math.sqrt(5)) <= 1e-15);
    assert.ok(Math.abs(Math.abs(nullDir[1]) - 1 / Math.sqrt(5)) <= 1e-15);
    assert.ok(orthogonalityError(r.v, 2) <= 1e-15);
  });

  it('handles a zero column, a single column and a diagonal matrix exactly', () => {
    // closed forms: a zero column has singular value 0; one column's singular value is its norm;
    // a diagonal matrix's are its |entries|, sorted
    const zero = jacobiSvd([1, 0, 2, 0, 2, 0], 3, 2);
    assert.deepEqual(Array.from(zero.s), [3, 0]);
    const one = jacobiSvd([3, 4], 2, 1);
    assert.deepEqual(Array.from(one.s), [5]);
    assert.ok(Math.abs(one.u[0] - 0.6) <= 2e-16 && Math.abs(one.u[1] - 0.8) <= 2e-16);
    const diag = jacobiSvd([2, 0, 0, 0, -5, 0, 0, 0, 1], 3, 3);
    assert.deepEqual(Array.from(diag.s), [5, 2, 1]);
  });

  it('reproduces random tall matrices to rounding', () => {
    // identity A = U·diag(s)·Vᵀ, on matrices from a fixed-seed generator (xorshift32)
    let state = 12345;
    const rand = () => {
      state ^= state << 13; state ^= state >>> 17; state ^= state << 5; state >>>= 0;
      return state / 4294967296 - 0.5;
    };
    for (const [m, n] of [[3, 3], [10, 4], [40, 7]]) {
      const a = Array.from({ length: m * n }, rand);
      const r = jacobiSvd(a, m, n);
      assert.equal(r.converged, true);
      assert.ok(reconstructionError(a, m, n) <= 1e-14, `${m}×${n}`);
      assert.ok(orthogonalityError(r.v, n) <= 1e-14, `${m}×${n}`);
      for (let k = 1; k < n; k++) assert.ok(r.s[k] <= r.s[k - 1]);
    }
  });

  it('reports NaN input as not converged instead of looping, and refuses bad shapes', () => {
    const r = jacobiSvd([1, Number.NaN, 3, 4], 2, 2);
    assert.equal(r.converged, false);
    assert.throws(() => jacobiSvd([1, 2, 3], 1, 3), RangeError);
    assert.throws(() => jacobiSvd([1, 2, 3], 2, 2), RangeError);
  });
});
