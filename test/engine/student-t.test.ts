// Student's t quantile and the special functions under it (src/numerics/fit/student-t.ts),
// against printed tables, closed forms and identities named beside each check.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import {
  CORNISH_FISHER_DOF, cornishFisher, logGamma, normalQuantile, normalUpperTail, regularizedBeta,
  regularizedGammaQ, studentTCdf, studentTQuantile, studentTUpperTail,
} from '../../src/numerics/fit/student-t.ts';

const relErr = (x: number, exact: number) => Math.abs(x - exact) / Math.abs(exact);

describe('studentTQuantile', () => {
  it('matches the printed two-sided 95% table (t at 0.975) to its three decimals', () => {
    // Standard statistical tables of Student's t, upper 2.5% points, three decimals (from memory).
    const table: Array<[number, number]> = [
      [1, 12.706], [2, 4.303], [3, 3.182], [4, 2.776], [5, 2.571], [6, 2.447], [7, 2.365],
      [8, 2.306], [9, 2.262], [10, 2.228], [15, 2.131], [20, 2.086], [25, 2.060], [30, 2.042],
      [40, 2.021], [60, 2.000], [120, 1.980], [Infinity, 1.960],
    ];
    for (const [dof, t] of table) {
      const got = studentTQuantile(0.975, dof);
      assert.ok(Math.abs(got - t) <= 0.0005 + 1e-12, `dof ${dof}: ${got} against the table's ${t}`);
    }
  });

  it('matches the printed 90% and 99% two-sided columns', () => {
    // Standard tables: upper 5% and 0.5% points, three decimals (from memory).
    const table: Array<[number, number, number]> = [
      [0.95, 1, 6.314], [0.95, 10, 1.812], [0.95, 30, 1.697],
      [0.995, 1, 63.657], [0.995, 10, 3.169], [0.995, 30, 2.750],
    ];
    for (const [p, dof, t] of table) {
      const got = studentTQuantile(p, dof);
      assert.ok(Math.abs(got - t) <= 0.0005 + 1e-12, `p ${p}, dof ${dof}: ${got} against ${t}`);
    }
  });

  it('tends to the normal quantile as dof grows', () => {
    // Limit: t(p, ν) → z(p) as ν → ∞, with t − z = (z³ + z)/(4ν) + O(1/ν²) (A&S 26.7.5; the
    // second coefficient, (5z⁵ + 16z³ + 3z)/96, is about 2.82 at z = 1.96).
    const z = normalQuantile(0.975);
    for (const dof of [1e3, 1e5, 1e7]) {
      const t = studentTQuantile(0.975, dof);
      const firstTerm = (z ** 3 + z) / (4 * dof);
      assert.ok(Math.abs(t - z - firstTerm) <= 3 / dof ** 2, `dof ${dof}: t − z = ${t - z}, first term ${firstTerm}`);
    }
    assert.equal(studentTQuantile(0.975, Infinity), z);
  });

  it('is tan(π(p − 1/2)) for one degree of freedom (the Cauchy distribution) to 1e-12', () => {
    // closed form: the Cauchy quantile, written as 1/tan(π(1 − p)) near p = 1 where it is exact to rounding
    for (const p of [0.5000001, 0.6, 0.75, 0.9, 0.975, 0.999, 1 - 1e-9]) {
      const exact = p < 0.75 ? Math.tan(Math.PI * (p - 0.5)) : 1 / Math.tan(Math.PI * (1 - p));
      assert.ok(relErr(studentTQuantile(p, 1), exact) <= 1e-12, `p ${p}`);
      assert.ok(relErr(studentTQuantile(1 - p, 1), -exact) <= 1e-12, `1 − p for p ${p}`);
    }
  });

  it('is (2p − 1)·√(2 / (4p(1 − p))) for two degrees of freedom to 1e-12', () => {
    // closed form: F(t) = 1/2 + t / (2√(2 + t²)) inverted
    for (const p of [0.55, 0.8, 0.975, 0.995, 1 - 1e-8]) {
      const exact = (2 * p - 1) * Math.sqrt(2 / (4 * p * (1 - p)));
      assert.ok(relErr(studentTQuantile(p, 2), exact) <= 1e-12, `p ${p}`);
    }
  });

  it('inverts the distribution function for any dof, integer or not', () => {
    // identity: F(F⁻¹(p)) = p
    for (const dof of [0.5, 1, 2.5, 7, 33, 480, 9999]) {
      for (const p of [0.01, 0.3, 0.7, 0.975, 0.9999]) {
        const t = studentTQuantile(p, dof);
        assert.ok(Math.abs(studentTCdf(t, dof) - p) <= 1e-13, `dof ${dof}, p ${p}: F(t) = ${studentTCdf(t, dof)}`);
      }
    }
  });

  it('agrees with the Cornish–Fisher expansion where both apply, to the size of the next term', () => {
    // Two independent routes: the incomplete-beta inversion and A&S 26.7.5 (four terms). The
    // neglected fifth term is of order 1/ν⁵; at ν = 200 that is below 1e-11.
    const z = normalQuantile(0.975);
    for (const dof of [200, 1000, CORNISH_FISHER_DOF]) {
      const direct = studentTQuantile(0.975, dof);
      assert.ok(Math.abs(direct - cornishFisher(z, dof)) <= 1e-11, `dof ${dof}`);
    }
    // Just above the switch the expansion is used; it continues the curve smoothly.
    const below = studentTQuantile(0.975, CORNISH_FISHER_DOF);
    const above = studentTQuantile(0.975, CORNISH_FISHER_DOF * (1 + 1e-9));
    assert.ok(Math.abs(below - above) <= 1e-12);
  });

  it('refuses p outside (0, 1) and dof ≤ 0 with a RangeError naming them', () => {
    assert.throws(() => studentTQuantile(0, 5), /p must be/);
    assert.throws(() => studentTQuantile(1, 5), /p must be/);
    assert.throws(() => studentTQuantile(Number.NaN, 5), /p must be/);
    assert.throws(() => studentTQuantile(0.975, 0), /dof must be/);
    assert.throws(() => studentTQuantile(0.975, -3), /dof must be/);
  });
});

describe('studentTUpperTail', () => {
  it('matches the closed forms of A&S 26.7.3–26.7.4 for ν = 1 to 5', () => {
    // A(t|ν) = P(|T| ≤ t), θ = atan(t/√ν); odd ν: (2/π)(θ + sinθ(cosθ + ⅔cos³θ + ...)),
    // even ν: sinθ(1 + ½cos²θ + (1·3)/(2·4)cos⁴θ + ...). Upper tail = (1 − A)/2.
    const closed: Record<number, (th: number) => number> = {
      1: (th) => (2 / Math.PI) * th,
      2: (th) => Math.sin(th),
      3: (th) => (2 / Math.PI) * (th + Math.sin(th) * Math.cos(th)),
      4: (th) => Math.sin(th) * (1 + 0.5 * Math.cos(th) ** 2),
      5: (th) => (2 / Math.PI) * (th + Math.sin(th) * (Math.cos(th) + (2 / 3) * Math.cos(th) ** 3)),
    };
    for (const dof of [1, 2, 3, 4, 5]) {
      for (const t of [0.01, 0.5, 1, 2.2, 7]) { // larger t: the closed forms themselves cancel
        const a = closed[dof](Math.atan(t / Math.sqrt(dof)));
        const exact = (1 - a) / 2;
        assert.ok(relErr(studentTUpperTail(t, dof), exact) <= 1e-11, `dof ${dof}, t ${t}`);
      }
    }
  });

  it('is 1/2 at 0, symmetric, and 0 at infinity', () => {
    // identities of a symmetric distribution
    assert.equal(studentTUpperTail(0, 4), 0.5);
    assert.ok(Math.abs(studentTUpperTail(-1.3, 4) - (1 - studentTUpperTail(1.3, 4))) <= 1e-15);
    assert.equal(studentTUpperTail(Infinity, 4), 0);
  });
});

describe('special functions', () => {
  it('logGamma gives ln((n − 1)!) and the half-integer values to 1e-14', () => {
    // closed forms: Γ(n) = (n − 1)!, Γ(1/2) = √π, Γ(n + 1/2) = (2n)!/(4ⁿ n!)·√π
    let logFact = 0;
    for (let n = 1; n <= 170; n++) {
      if (n > 1) logFact += Math.log(n - 1);
      const got = logGamma(n);
      assert.ok(Math.abs(got - logFact) <= 1e-14 * Math.max(1, Math.abs(logFact)) + 2e-15, `n ${n}: ${got} vs ${logFact}`);
    }
    assert.ok(relErr(Math.exp(logGamma(0.5)), Math.sqrt(Math.PI)) <= 1e-14);
    assert.ok(relErr(Math.exp(logGamma(1.5)), Math.sqrt(Math.PI) / 2) <= 1e-14);
    // Γ(10.5) = 19!!/2¹⁰·√π, 19!! = 654729075
    assert.ok(relErr(Math.exp(logGamma(10.5)), (654729075 / 1024) * Math.sqrt(Math.PI)) <= 1e-14);
    // reflection below 1/2: Γ(1/4)·Γ(3/4) = π√2
    assert.ok(relErr(logGamma(0.25) + logGamma(0.75), Math.log(Math.PI * Math.SQRT2)) <= 1e-14);
  });

  it('regularizedBeta matches its closed forms and the binomial identity', () => {
    for (const x of [1e-6, 0.1, 0.37, 0.5, 0.9, 0.999]) {
      // I_x(a, 1) = xᵃ; I_x(1, b) = 1 − (1 − x)ᵇ; I_x(1/2, 1/2) = (2/π)·asin√x
      assert.ok(relErr(regularizedBeta(x, 3.5, 1), x ** 3.5) <= 1e-13, `x^a at ${x}`);
      assert.ok(relErr(regularizedBeta(x, 1, 2.5), -Math.expm1(2.5 * Math.log1p(-x))) <= 1e-13, `1 − (1 − x)^b at ${x}`);
      assert.ok(relErr(regularizedBeta(x, 0.5, 0.5), (2 / Math.PI) * Math.asin(Math.sqrt(x))) <= 1e-13, `arcsine at ${x}`);
      // symmetry: I_x(a, b) = 1 − I_{1−x}(b, a)
      assert.ok(Math.abs(regularizedBeta(x, 2.3, 7.1) - (1 - regularizedBeta(1 - x, 7.1, 2.3))) <= 1e-14);
    }
    // A&S 26.5.24: P(X ≥ k) for X ~ Binomial(n, p) is I_p(k, n − k + 1)
    const n = 20, p = 0.3;
    for (const k of [1, 5, 6, 12, 20]) {
      let tail = 0;
      for (let j = k; j <= n; j++) {
        let c = 1;
        for (let i = 1; i <= j; i++) c = (c * (n - j + i)) / i;
        tail += c * p ** j * (1 - p) ** (n - j);
      }
      assert.ok(relErr(regularizedBeta(p, k, n - k + 1), tail) <= 1e-12, `k ${k}`);
    }
  });

  it('regularizedGammaQ matches the Poisson sum and erfc on both of its branches', () => {
    // Q(n, x) = e^{−x} Σ_{k<n} xᵏ/k! (closed form for integer n)
    for (const nn of [1, 3, 10]) {
      for (const x of [0.2, 2, 9, 11, 30]) {
        let term = 1, sum = 0;
        for (let k = 0; k < nn; k++) { sum += term; term *= x / (k + 1); }
        assert.ok(relErr(regularizedGammaQ(nn, x), Math.exp(-x) * sum) <= 1e-13, `n ${nn}, x ${x}`);
      }
    }
    // erfc(1) = 0.157299207050285130658... (from memory); Q(1/2, x²) = erfc(x)
    assert.ok(relErr(regularizedGammaQ(0.5, 1), 0.15729920705028513) <= 1e-14);
  });

  it('normalQuantile and normalUpperTail match the standard values', () => {
    // z(0.975) = 1.959963984540054, z(0.995) = 2.575829303548901, z(0.999) = 3.090232306167814,
    // P(Z > 1) = 0.158655253931457 (standard normal tables at full precision, from memory)
    assert.ok(relErr(normalQuantile(0.975), 1.959963984540054) <= 1e-14);
    assert.ok(relErr(normalQuantile(0.995), 2.575829303548901) <= 1e-14);
    assert.ok(relErr(normalQuantile(0.999), 3.090232306167814) <= 1e-13);
    assert.ok(relErr(normalQuantile(0.025), -1.959963984540054) <= 1e-14);
    assert.ok(relErr(normalUpperTail(1), 0.15865525393145707) <= 1e-14);
  });
});
