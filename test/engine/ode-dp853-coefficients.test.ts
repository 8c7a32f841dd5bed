// Coefficient identities and order conditions of the Dormand–Prince 8(5,3) pair and its
// dense output, checked algebraically against Butcher's rooted-tree conditions (Hairer,
// Nørsett & Wanner, Solving ODEs I, sec. II.2, Theorem 2.13). The coefficients are decimals
// rounded to double precision, so the conditions hold to about 1e-13, not exactly; a typo
// in any digit that matters breaks one of them by far more.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import {
  DP853, DP853_A, DP853_B, DP853_B_HAT3, DP853_C, DP853_DENSE, DP853_E3, DP853_E5,
} from '../../src/numerics/ode/dp853-tableau.ts';
import { dp853ActiveModeHLambda, dp853ErrorOnMode } from '../../src/numerics/ode/dp853.ts';
import { stageValuesOnMode } from '../../src/numerics/ode/explicit-rk.ts';
import { defect, square } from './rooted-trees.ts';

const S = 16;
/** All sixteen stages as a square matrix (the steps's twelve, the new rate, the dense output's three). */
const ALPHA = DP853_A.map((row) => Array.from({ length: S }, (_, j) => row[j] ?? 0));
const pad = (w: readonly number[]) => Array.from({ length: S }, (_, j) => w[j] ?? 0);
const sum = (w: readonly number[]) => w.reduce((s, v) => s + v, 0);
const unit = (i: number) => pad([]).map((_, j) => (j === i ? 1 : 0));

describe('dp853 coefficients (Prince & Dormand 1981; Hairer, Nørsett & Wanner I, sec. II.5–II.6)', () => {
  it('each row of A sums to its c, for all sixteen stages', () => {
    DP853_A.forEach((row, i) => assert.ok(Math.abs(sum(row) - DP853_C[i]) < 1e-13, `row ${i}: ${sum(row) - DP853_C[i]}`));
  });

  it('the weights sum to 1, the embedded weights too, and the error weights to 0', () => {
    assert.ok(Math.abs(sum(DP853_B) - 1) < 1e-14);
    assert.ok(Math.abs(sum(DP853_B_HAT3) - 1) < 1e-15);
    assert.ok(Math.abs(sum(DP853_E5)) < 1e-14);
    assert.ok(Math.abs(sum(DP853_E3)) < 1e-14);
  });

  it('the solution has order 8: every condition of trees with up to 8 vertices (200 trees) holds', () => {
    const alpha = square(DP853);
    for (let p = 1; p <= 8; p++) assert.ok(defect(p, DP853_B, alpha, null) < 1e-12, `order ${p}: ${defect(p, DP853_B, alpha, null)}`);
  });

  it('the embedded solutions have orders 5 (b - e5) and 3 (b̂3), and not one more', () => {
    const alpha = square(DP853);
    const b5 = DP853_B.map((b, i) => b - DP853_E5[i]);
    for (let p = 1; p <= 5; p++) assert.ok(defect(p, b5, alpha, null) < 1e-12, `fifth-order, order ${p}`);
    assert.ok(defect(6, b5, alpha, null) > 1e-5);
    for (let p = 1; p <= 3; p++) assert.ok(defect(p, DP853_B_HAT3, alpha, null) < 1e-14, `third-order, order ${p}`);
    assert.ok(defect(4, DP853_B_HAT3, alpha, null) > 1e-4);
  });

  it('stage 12 is f at the new solution: its row is b and its c is 1; the last step stage is at c = 1 too', () => {
    assert.deepEqual([...DP853_A[12]], [...DP853_B]);
    assert.equal(DP853_C[12], 1);
    assert.equal(DP853_C[11], 1);
  });

  it('the dense output has order 7 at every θ and meets the step ends', () => {
    const b = pad(DP853_B);
    // y(θ) = y0 + θ(Δ + (1-θ)(r3 + θ(r4 + (1-θ)(r5 + θ(r6 + (1-θ)(r7 + θ r8)))))), as weights on the stages.
    const r3 = unit(0).map((v, i) => v - b[i]);
    const r4 = b.map((v, i) => v - unit(12)[i] - r3[i]);
    const [r5, r6, r7, r8] = DP853_DENSE.map(pad);
    const weights = (th: number) => b.map((_, i) => {
      const tail = r5[i] + th * (r6[i] + (1 - th) * (r7[i] + th * r8[i]));
      return th * (b[i] + (1 - th) * (r3[i] + th * (r4[i] + (1 - th) * tail)));
    });
    for (const th of [0.1, 0.3, 0.5, 0.77, 0.95]) {
      const w = weights(th);
      for (let p = 1; p <= 7; p++) assert.ok(defect(p, w, ALPHA, null, th) < 1e-12, `θ = ${th}, order ${p}: ${defect(p, w, ALPHA, null, th)}`);
    }
    assert.ok(defect(8, weights(0.5), ALPHA, null, 0.5) > 1e-9, 'not order 8 inside the step');
    weights(0).forEach((v) => assert.equal(v, 0));
    weights(1).forEach((v, i) => assert.ok(Math.abs(v - b[i]) < 1e-15));
  });

  it('the error estimate on a mode grows like |hλ|^8 (closed form: the estimate is of order 8)', () => {
    const ratio = dp853ErrorOnMode(-0.04) / dp853ErrorOnMode(-0.02);
    assert.ok(Math.abs(ratio / 256 - 1) < 0.05, `ratio ${ratio}`);
  });

  it('the stability region reaches past h·λ = -6.3 on the negative real axis, not past -6.5 (the stiffness threshold 6.1 sits near its edge)', () => {
    // R(z) = 1 + z Σ b_i K_i(z), with the stage values K_i of y' = λy, y = 1.
    const R = (z: number) => {
      const K = stageValuesOnMode(DP853_A, 12, z);
      return 1 + z * DP853_B.reduce((s, bi, i) => s + bi * K[i], 0);
    };
    for (let z = -0.1; z >= -6.3; z -= 0.1) assert.ok(Math.abs(R(z)) <= 1, `|R(${z})| = ${Math.abs(R(z))}`);
    assert.ok(Math.abs(R(-6.5)) > 1);
  });

  it('an accuracy-limited step on a present mode has h|λ| that shrinks with rtol like rtol^(1/8)', () => {
    const a = dp853ActiveModeHLambda(1e-8);
    const b = dp853ActiveModeHLambda(1e-10);
    assert.ok(dp853ErrorOnMode(-a) > 0.99e-8 && dp853ErrorOnMode(-a) < 1.01e-8);
    assert.ok(Math.abs(Math.log(a / b) / Math.log(100) - 1 / 8) < 0.02, `${a} ${b}`);
  });
});
