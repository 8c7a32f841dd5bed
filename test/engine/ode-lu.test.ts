// The dense LU solver of the stiff method: the solution reproduces the right-hand side
// (A·x = b by definition), pivoting handles a zero leading entry, singular matrices are
// refused, and the factors multiply back to P·A.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { luFactor, luSolve } from '../../src/numerics/ode/lu.ts';

/** A small deterministic generator (a linear congruential one; Knuth, TAOCP vol. 2, sec. 3.2.1). */
function numbers(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32 - 0.5;
  };
}

function solve(a: number[][], b: number[]): { ok: boolean; x: number[] } {
  const n = a.length;
  const m = Float64Array.from(a.flat());
  const pivot = new Int32Array(n);
  const ok = luFactor(m, n, pivot);
  const x = Float64Array.from(b);
  if (ok) luSolve(m, n, pivot, x);
  return { ok, x: [...x] };
}

describe('LU with partial pivoting', () => {
  it('solves random systems of size 1 to 12 with a residual at round-off level', () => {
    const rand = numbers(7);
    for (let n = 1; n <= 12; n++) {
      for (let trial = 0; trial < 5; trial++) {
        const a = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => rand() + (i === j ? 2 : 0)));
        const b = Array.from({ length: n }, rand);
        const { ok, x } = solve(a, b);
        assert.ok(ok);
        for (let i = 0; i < n; i++) {
          const ax = a[i].reduce((s, v, j) => s + v * x[j], 0);
          assert.ok(Math.abs(ax - b[i]) < 1e-13, `n = ${n}, row ${i}: residual ${ax - b[i]}`);
        }
      }
    }
  });

  it('pivots past a zero on the diagonal', () => {
    const { ok, x } = solve([[0, 1], [1, 0]], [3, 5]);
    assert.ok(ok);
    assert.deepEqual(x, [5, 3]);
  });

  it('picks the largest pivot, so a tiny leading entry loses no accuracy', () => {
    // Without pivoting, eliminating with 1e-20 destroys the answer (Golub & Van Loan, sec. 3.3).
    const { ok, x } = solve([[1e-20, 1], [1, 1]], [1, 2]);
    assert.ok(ok);
    assert.ok(Math.abs(x[0] - 1) < 1e-15 && Math.abs(x[1] - 1) < 1e-15, `${x}`);
  });

  it('refuses a singular matrix and one holding NaN', () => {
    assert.equal(solve([[1, 2], [2, 4]], [1, 1]).ok, false);
    assert.equal(solve([[0, 0], [0, 0]], [1, 1]).ok, false);
    assert.equal(solve([[NaN, 1], [1, 1]], [1, 1]).ok, false);
  });

  it('the factors multiply back to the row-permuted matrix', () => {
    const rand = numbers(11);
    const n = 6;
    const a = Array.from({ length: n }, () => Array.from({ length: n }, rand));
    const m = Float64Array.from(a.flat());
    const pivot = new Int32Array(n);
    assert.ok(luFactor(m, n, pivot));
    const pa = a.map((r) => r.slice());
    for (let k = 0; k < n; k++) [pa[k], pa[pivot[k]]] = [pa[pivot[k]], pa[k]];
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        let acc = 0;
        for (let k = 0; k <= Math.min(i, j); k++) acc += (k === i ? 1 : m[i * n + k]) * m[k * n + j];
        assert.ok(Math.abs(acc - pa[i][j]) < 1e-14, `(${i}, ${j})`);
      }
    }
  });
});
