// When `auto` switches from its explicit method to the stiff one. dopri5's stiffness test
// (Hairer & Wanner, Solving ODEs II, sec. IV.2) asks for 15 steps above its stability edge; a
// run whose Jacobian has a dominant eigenvalue that decays e-fold at least STIFF_SPAN times over
// the rest of the run, found by power iteration on differenced evaluations (`dominantRate`),
// needs 2. Checked against closed-form eigenvalues, against the smooth work-precision problems
// (which must never switch), and on the stiff forced problem (which must switch early). The
// Adams formulas' own test (auto from rtol 1e-6) asks the same check (`FastModeCheck`), and
// hands over only a run whose fast mode spans STIFF_SPAN e-folds over its rest.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { integrate } from '../../src/numerics/ode/integrate.ts';
import { dominantRate } from '../../src/numerics/ode/jacobian.ts';
import { newContext, resolveOptions } from '../../src/numerics/ode/control.ts';
import { type Rhs, newCounters } from '../../src/numerics/ode/types.ts';
import { ours, problems } from '../../bench/work-precision.ts';

const TOLERANCES = [1e-3, 1e-4, 1e-5, 1e-6, 1e-7, 1e-8, 1e-9, 1e-10];

function rateOf(f: Rhs, y: readonly number[], v: readonly number[], rtol = 1e-6): { rate: number; evaluations: number } {
  const n = y.length;
  const start = Float64Array.from(y);
  const counters = newCounters();
  const ctx = newContext(f, start, resolveOptions({ rtol, atol: 1e-12 }, n, 1), counters, 1);
  const f0 = new Float64Array(n);
  f(0, start, f0);
  const rate = dominantRate(ctx, 0, start, f0, Float64Array.from(v), new Float64Array(n), new Float64Array(n));
  return { rate, evaluations: counters.evaluations };
}

describe('dominantRate: |λ| of the Jacobian\'s dominant eigenvalue by power iteration', () => {
  it('one state: the slope of f itself, in one evaluation (y\' = -1e4 (y - cos t): 1e4)', () => {
    const { rate, evaluations } = rateOf((t, y, dy) => { dy[0] = -1e4 * (y[0] - Math.cos(t)); }, [0.3], [1]);
    assert.ok(Math.abs(rate - 1e4) <= 1e-4 * 1e4, `${rate}`);
    assert.equal(evaluations, 1);
  });

  it('oral absorption with the dose in kg and the concentration in kg/m³: ka, not the coupling ka/V (eigenvalues -ka, -k of a triangular J)', () => {
    const ka = 1.2 / 3600, k = 0.15 / 3600, V = 0.04;
    const f: Rhs = (_t, y, dy) => { dy[0] = -ka * y[0]; dy[1] = (ka * y[0]) / V - k * y[1]; };
    // The first product alone, ‖J·v‖/‖v‖ from v = (1, 0), is about ka/V = 25 ka.
    const { rate, evaluations } = rateOf(f, [5e-4, 0.004], [1, 0]);
    assert.ok(Math.abs(rate - ka) <= 0.15 * ka, `${rate / ka} ka`);
    assert.ok(evaluations <= 8, `${evaluations} evaluations`);
  });

  it('a 3×3 symmetric J with eigenvalues -1, -10, -100 (J = Q diag Qᵀ, Q a Householder reflection): 100', () => {
    const u = [1, 2, 2].map((x) => x / 3);
    const lambdas = [-1, -10, -100];
    const Q = u.map((ui, i) => u.map((uj, j) => (i === j ? 1 : 0) - 2 * ui * uj));
    const J = Q.map((_, i) => Q.map((__, j) => lambdas.reduce((acc, l, m) => acc + Q[i][m] * l * Q[j][m], 0)));
    const f: Rhs = (_t, y, dy) => { for (let i = 0; i < 3; i++) dy[i] = J[i][0] * y[0] + J[i][1] * y[1] + J[i][2] * y[2]; };
    const { rate } = rateOf(f, [1, 1, 1], [1, 0.5, 0.25]);
    assert.ok(Math.abs(rate - 100) <= 10, `${rate}`);
  });
});

describe('auto keeps the smooth work-precision problems on their non-stiff method at every tolerance', () => {
  for (const p of problems()) {
    if (p.name.startsWith('stiff')) continue;
    it(`${p.name}: no stiffness reported at rtol 1e-3 … 1e-10`, () => {
      for (const rtol of TOLERANCES) {
        const run = ours(p, 'auto', rtol);
        assert.ok(!run.method.includes('stiff'), `rtol ${rtol}: ${run.method}`);
      }
    });
  }
});

describe('the stiff forced problem y\' = -1e4 (y - cos t) over 10 s: auto switches after its transient', () => {
  // Before the fast-mode rule: at 0.0083, 0.0080, 0.0077, 0.0066 s, after 200 evaluations of dopri5 at rtol 1e-3.
  for (const rtol of [1e-3, 1e-4, 1e-5]) {
    it(`rtol ${rtol}: dopri5 hands over before t = 0.003 s (the transient e^{-1e4 t} is below atol by 0.0014 s at rtol 1e-3)`, () => {
      const res = integrate((t, y, dy) => { dy[0] = -1e4 * (y[0] - Math.cos(t)); }, 0, [0], 10, { method: 'auto', rtol, atol: 1e-3 * rtol });
      assert.equal(res.method, 'stiff');
      assert.ok(res.switchedToStiff !== null && res.switchedToStiff < 0.003, `switched at ${res.switchedToStiff}`);
    });
  }
});

describe('the Adams formulas (auto from rtol 1e-6) hand over with the same fast-mode check', () => {
  // From rtol 1e-6 (ADAMS_FROM_RTOL) auto starts with the Adams formulas. Their own test (every
  // eighth step) asked for 3 signals in a row with the test's ratio decaying 100 e-folds over the
  // rest of the run: on the forced problem they handed over at 0.0036, 0.0030, 0.0024, 0.0018,
  // 0.0011 s at rtol 1e-6 … 1e-10. With J's dominant eigenvalue confirmed (1e4, the closed-form
  // rate of y' = -1e4 (y - cos t), times 10 s: 1e5 e-folds), 2 signals.
  const forced: Rhs = (t, y, dy) => { dy[0] = -1e4 * (y[0] - Math.cos(t)); };
  for (const rtol of [1e-6, 1e-7, 1e-8, 1e-9, 1e-10]) {
    it(`y' = -1e4 (y - cos t) over 10 s, rtol ${rtol}: handed over before t = 0.002 s`, () => {
      const res = integrate(forced, 0, [0], 10, { method: 'auto', rtol, atol: 1e-3 * rtol });
      assert.equal(res.method, 'stiff');
      assert.ok(res.switchedToStiff !== null && res.switchedToStiff < 0.002, `switched at ${res.switchedToStiff}`);
    });
  }
  // A rate that switches on in the last 0.04 s: a(t) = 1 + 1e4/(1 + e^{-(t - 9.96)/0.001}), so
  // the fast mode decays at most 1e4 · 0.04 = 400 e-folds over what is left of the run (hand-worked),
  // below STIFF_SPAN: not stiff over its rest, by the stiff method's own rule. The Adams test
  // handed it over at t = 9.960–9.963 at every tolerance before.
  const late: Rhs = (t, y, dy) => { dy[0] = -(1 + 1e4 / (1 + Math.exp(-(t - 9.96) / 0.001))) * (y[0] - Math.cos(t)); };
  for (const rtol of [1e-6, 1e-7, 1e-8, 1e-9, 1e-10]) {
    it(`a fast mode in the last 0.04 s of 10, rtol ${rtol}: never handed over`, () => {
      const res = integrate(late, 0, [0.5], 10, { method: 'auto', rtol, atol: 1e-3 * rtol });
      assert.equal(res.status, 'success');
      assert.equal(res.stiffnessDetected, null);
      assert.equal(res.method, 'adams');
    });
  }
});

describe('a coupling between states of different units is not a fast mode', () => {
  // y0' = -y0, y1' = 100 y0 - y1 over 200 (a Jordan-like J: both eigenvalues -1, ‖J‖ ≈ 100;
  // closed form y0 = e^{-t}, y1 = 100 t e^{-t}). |λ|·span = 200 < STIFF_SPAN, so the rule of 15
  // steps above the edge holds: the tail after about t = 80, where both have decayed below
  // atol and the steps stand on the edge, is where auto switches, as before the rule. Taking
  // the test's own ratio ‖J·v‖/‖v‖ (up to 100) for |λ| armed the rule at t ≈ 3.2–4.1 and made it
  // switch at t ≈ 35–44.
  const f: Rhs = (_t, y, dy) => { dy[0] = -y[0]; dy[1] = 100 * y[0] - y[1]; };
  for (const rtol of [1e-3, 1e-4, 1e-5, 1e-6]) {
    it(`rtol ${rtol}: no switch before t = 50`, () => {
      const atol = [1e-3 * rtol, 1e-3 * rtol * 37];
      const res = integrate(f, 0, [1, 0], 200, { method: 'auto', rtol, atol });
      assert.ok(res.stiffnessDetected === null || res.stiffnessDetected > 50, `stiff at ${res.stiffnessDetected}`);
    });
  }
});
