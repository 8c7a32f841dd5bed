// Coefficient identities and order conditions of the ODE methods, checked algebraically.
//
// Order conditions come from Butcher's theory of rooted trees (Hairer, Nørsett & Wanner,
// Solving ODEs I, sec. II.2, Theorem 2.13: a Runge–Kutta method has order p when
// Σ b_i Φ_i(t) = 1/γ(t) for every rooted tree t with at most p vertices). For Rosenbrock
// methods the same recursion gains the term of the exact Jacobian on trees [u] (Hairer &
// Wanner, Solving ODEs II, sec. IV.7, whose Table 7.1 lists the resulting conditions up to
// order 4); a typo in any coefficient breaks one of these equations.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { DOPRI5, DOPRI5_B_HAT, DOPRI5_DENSE, DOPRI5_E } from '../../src/numerics/ode/dopri5.ts';
import { EULER, HEUN, RK4 } from '../../src/numerics/ode/explicit-rk.ts';
import { RODAS, RODAS_DENSE } from '../../src/numerics/ode/rosenbrock.ts';
import { TREES, defect, dot, square } from './rooted-trees.ts';

describe('rooted trees', () => {
  it('there are 1, 1, 2, 4, 9, 20, 48, 115 rooted trees with 1..8 vertices (OEIS A000081)', () => {
    assert.deepEqual(TREES.map((l) => l.length), [1, 1, 2, 4, 9, 20, 48, 115]);
  });
});

describe('explicit Runge–Kutta tableaus', () => {
  for (const tab of [EULER, HEUN, RK4, DOPRI5]) {
    it(`${tab.name}: weights sum to 1 and each row of A sums to its c`, () => {
      assert.ok(Math.abs(tab.b.reduce((s, v) => s + v, 0) - 1) < 1e-15);
      tab.a.forEach((row, i) => assert.ok(Math.abs(row.reduce((s, v) => s + v, 0) - tab.c[i]) < 1e-15, `row ${i}`));
    });
    it(`${tab.name}: has order exactly ${tab.order} (Butcher's conditions hold to ${tab.order}, fail at ${tab.order + 1})`, () => {
      const alpha = square(tab);
      for (let p = 1; p <= tab.order; p++) assert.ok(defect(p, tab.b, alpha, null) < 1e-14, `order ${p}`);
      if (tab.order < 5) assert.ok(defect(tab.order + 1, tab.b, alpha, null) > 1e-3);
    });
  }

  it('dopri5 is first-same-as-last: the last row of A is b and the last c is 1', () => {
    assert.deepEqual([...DOPRI5.a[6], 0], [...DOPRI5.b]);
    assert.equal(DOPRI5.c[6], 1);
  });

  it('dopri5 embedded solution has order 4, not 5; the error weights sum to 0', () => {
    const alpha = square(DOPRI5);
    for (let p = 1; p <= 4; p++) assert.ok(defect(p, DOPRI5_B_HAT, alpha, null) < 1e-14, `order ${p}`);
    assert.ok(defect(5, DOPRI5_B_HAT, alpha, null) > 1e-5);
    assert.ok(Math.abs(DOPRI5_E.reduce((s, v) => s + v, 0)) < 1e-16);
  });

  it('dopri5 dense output has order 4 at every θ and meets the step ends (Hairer, Nørsett & Wanner I, sec. II.6)', () => {
    const alpha = square(DOPRI5);
    const b = DOPRI5.b;
    // The weights of y(θ) = y0 + θ(Δ + (1-θ)(r3 + θ(r4 + (1-θ) r5))) as in DOPRI5_DENSE's doc.
    const weights = (th: number) => b.map((bi, i) => {
      const r3 = (i === 0 ? 1 : 0) - bi;
      const r4 = bi - (i === 6 ? 1 : 0) - r3;
      return th * (bi + (1 - th) * (r3 + th * (r4 + (1 - th) * DOPRI5_DENSE[i])));
    });
    for (const th of [0.1, 0.25, 0.5, 0.77, 0.9]) {
      const w = weights(th);
      for (let p = 1; p <= 4; p++) assert.ok(defect(p, w, alpha, null, th) < 1e-14, `θ = ${th}, order ${p}`);
    }
    weights(0).forEach((v) => assert.ok(v === 0));
    weights(1).forEach((v, i) => assert.ok(Math.abs(v - b[i]) < 1e-16));
  });
});

/** RODAS in the (α_ij, γ_ij, b_i) form of Hairer & Wanner II, eq. 7.4, from its u-form. */
function rodasClassic() {
  const s = 6;
  const g = RODAS.gamma;
  const full = (rows: readonly (readonly number[])[]) => rows.map((r) => Array.from({ length: s }, (_, j) => r[j] ?? 0));
  const A = full(RODAS.a);
  const C = full(RODAS.cc);
  // u = Γ k with Γ = (γ_ij); the u-form uses Γ⁻¹ = diag(1/γ) - C.
  const inv = C.map((row, i) => row.map((v, j) => (i === j ? 1 / g : 0) - v));
  const G = Array.from({ length: s }, () => new Array<number>(s).fill(0));
  for (let j = 0; j < s; j++) {
    for (let i = 0; i < s; i++) {
      let acc = i === j ? 1 : 0;
      for (let k = 0; k < i; k++) acc -= inv[i][k] * G[k][j];
      G[i][j] = acc / inv[i][i];
    }
  }
  const times = (row: readonly number[]) => Array.from({ length: s }, (_, j) => dot(row, G.map((r) => r[j])));
  const alpha = A.map(times);
  return { alpha, G, b: times(RODAS.m), bHat: times(RODAS.mHat), times };
}

/** R(z) of y' = λy, z = hλ (complex as [re, im]), for stage weights w in the classic form. */
function stability(z: [number, number], w: number[], alpha: number[][], G: number[][]): [number, number] {
  const mul = (a: [number, number], b: [number, number]): [number, number] => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
  const div = (a: [number, number], b: [number, number]): [number, number] => {
    const d = b[0] * b[0] + b[1] * b[1];
    return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
  };
  const k: [number, number][] = [];
  const g = RODAS.gamma;
  for (let i = 0; i < w.length; i++) {
    let sum: [number, number] = [1, 0];
    for (let j = 0; j < i; j++) sum = [sum[0] + (alpha[i][j] + G[i][j]) * k[j][0], sum[1] + (alpha[i][j] + G[i][j]) * k[j][1]];
    k.push(div(mul(z, sum), [1 - g * z[0], -g * z[1]]));
  }
  return [1 + dot(w, k.map((v) => v[0])), dot(w, k.map((v) => v[1]))];
}

describe('RODAS (Hairer & Wanner II, sec. IV.7)', () => {
  const { alpha, G, b, bHat, times } = rodasClassic();

  it('c_i = Σ_j α_ij and γ_i = Σ_j γ_ij', () => {
    alpha.forEach((row, i) => assert.ok(Math.abs(row.reduce((s, v) => s + v, 0) - RODAS.c[i]) < 1e-14, `c[${i}]`));
    G.forEach((row, i) => assert.ok(Math.abs(row.reduce((s, v) => s + v, 0) - RODAS.gammaSum[i]) < 1e-14, `γ[${i}]`));
    assert.equal(G[0][0], RODAS.gamma);
  });

  it('the solution has order 4 and the embedded one order 3 (and not 4)', () => {
    for (let p = 1; p <= 4; p++) assert.ok(defect(p, b, alpha, G) < 1e-14, `order ${p}: ${defect(p, b, alpha, G)}`);
    assert.ok(defect(5, b, alpha, G) > 1e-4);
    for (let p = 1; p <= 3; p++) assert.ok(defect(p, bHat, alpha, G) < 1e-14, `embedded order ${p}`);
    assert.ok(defect(4, bHat, alpha, G) > 1e-3);
  });

  it('both solutions are L-stable: R(z) → 0 as z → -∞, and |R(z)| ≤ 1 on the left half-plane', () => {
    for (const w of [b, bHat]) {
      const far = stability([-1e12, 0], w, alpha, G);
      assert.ok(Math.abs(far[0]) < 1e-10 && Math.abs(far[1]) < 1e-10, `R(-1e12) = ${far}`);
      for (const re of [0, -1e-3, -0.5, -2, -10, -100, -1e4]) {
        for (const im of [0, 0.3, 1, 3, 10, 100, 1e4]) {
          const r = stability([re, im], w, alpha, G);
          assert.ok(Math.hypot(r[0], r[1]) <= 1 + 1e-12, `|R(${re} + ${im}i)| = ${Math.hypot(r[0], r[1])}`);
        }
      }
    }
  });

  /**
   * Stage values u_i in the stiff limit hλ → -∞ of y' = λ(y - G(t)) + G'(t), h = 1, y0 = G(0)
   * + w0: dividing the stage equation by -λ leaves u_i = G(c_i) - (y0 + Σ a_ij u_j) + γ_i G'(0).
   */
  const stiffLimit = (G: (t: number) => number, dG0: number, w0: number) => {
    const u: number[] = [];
    for (let i = 0; i < 6; i++) {
      let arg = G(0) + w0;
      for (let j = 0; j < i; j++) arg += RODAS.a[i][j] * u[j];
      u.push(G(RODAS.c[i]) - arg + RODAS.gammaSum[i] * dG0);
    }
    return u;
  };
  /** The dense value at θ from u-stages: (1-θ)y0 + θy1 + θ(1-θ)(P + θQ). */
  const denseValue = (th: number, y0: number, u: number[]) => {
    const y1 = y0 + dot(RODAS.m, u);
    return (1 - th) * y0 + th * y1 + th * (1 - th) * (dot(RODAS_DENSE.e, u) + th * dot(RODAS_DENSE.g, u));
  };

  it('the dense output has order 3 at every θ and meets the step ends', () => {
    const e = times(RODAS_DENSE.e);
    const g = times(RODAS_DENSE.g);
    const weights = (th: number) => b.map((bi, i) => th * bi + th * (1 - th) * (e[i] + th * g[i]));
    for (const th of [0.1, 0.3, 0.5, 0.8, 0.95]) {
      const w = weights(th);
      for (let p = 1; p <= 3; p++) assert.ok(defect(p, w, alpha, G, th) < 1e-13, `θ = ${th}, order ${p}`);
    }
    weights(1).forEach((v, i) => assert.equal(v, b[i]));
    weights(0).forEach((v) => assert.ok(v === 0));
  });

  it('in the stiff limit the step and the dense output follow a quadratic forcing G exactly, and a cubic one at the step end', () => {
    for (const q of [0, 1, 2, 3]) {
      const G = (t: number) => t ** q;
      const u = stiffLimit(G, q === 1 ? 1 : 0, 0);
      assert.ok(Math.abs(G(0) + dot(RODAS.m, u) - G(1)) < 1e-13, `step end, G = t^${q}`);
      for (const th of [0.1, 0.25, 0.5, 0.9]) {
        const err = Math.abs(denseValue(th, G(0), u) - G(th));
        if (q <= 2) assert.ok(err < 1e-13, `θ = ${th}, G = t^${q}: ${err}`);
        else if (th !== 0.5) assert.ok(err > 1e-3, 'a cubic is not followed inside the step (why the stepper checks the dense output)');
      }
    }
  });

  it('in the stiff limit a start off the slow manifold decays inside the step without growing: |R(θ, ∞)| ≤ 1', () => {
    const u = stiffLimit(() => 0, 0, 1);
    assert.ok(Math.abs(1 + dot(RODAS.m, u)) < 1e-13, 'R(∞) = 0 at the step end');
    for (let i = 0; i <= 100; i++) assert.ok(Math.abs(denseValue(i / 100, 1, u)) <= 1 + 1e-12, `θ = ${i / 100}`);
  });
});
