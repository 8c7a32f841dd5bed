// Stiff problems: the stiff method and auto (which must detect stiffness and switch), each
// within a stated evaluation budget (measured when this was written, plus about 20%).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { denseAt, integrate } from '../../src/numerics/ode/integrate.ts';
import { Status, type Rhs } from '../../src/numerics/ode/types.ts';

/**
 * Robertson's chemical kinetics (Robertson 1966), the standard stiff test:
 * y1' = -0.04 y1 + 1e4 y2 y3, y2' = 0.04 y1 - 1e4 y2 y3 - 3e7 y2², y3' = 3e7 y2²,
 * y(0) = (1, 0, 0). The rates sum to zero, so y1 + y2 + y3 = 1 for all t.
 */
const robertson: Rhs = (_t, y, dy) => {
  dy[0] = -0.04 * y[0] + 1e4 * y[1] * y[2];
  dy[2] = 3e7 * y[1] * y[1];
  dy[1] = -dy[0] - dy[2];
};

/**
 * y(40) from Hairer & Wanner, Solving ODEs II, sec. IV.10 (the Robertson reference
 * values) — typed from memory; they add up to 1 to 13 digits, as they must.
 */
const ROBERTSON_AT_40 = [0.7158270687193, 9.185534764557e-6, 0.2841637457458];

const rtol = 1e-6;
const atol = [1e-8, 1e-14, 1e-8];

function unitsAgainst(ref: number[], y: Float64Array): number {
  return Math.max(...ref.map((r, i) => Math.abs(y[i] - r) / (atol[i] + rtol * Math.abs(r))));
}

describe('Robertson (Robertson 1966) to t = 40', () => {
  it('the reference values conserve mass', () => {
    assert.ok(Math.abs(ROBERTSON_AT_40.reduce((s, v) => s + v, 0) - 1) < 1e-12);
  });

  it('stiff: within 3 tolerance units of the reference, in at most 1280 evaluations', () => {
    const res = integrate(robertson, 0, [1, 0, 0], 40, { method: 'stiff', rtol, atol, autonomous: true });
    assert.equal(res.status, Status.Success, res.message);
    assert.ok(unitsAgainst(ROBERTSON_AT_40, res.y) < 3, `${unitsAgainst(ROBERTSON_AT_40, res.y)} units`);
    assert.ok(res.counters.evaluations <= 1280, `${res.counters.evaluations} evaluations`);
    assert.equal(res.counters.switchedToStiff, null);
  });

  it('auto: detects stiffness early, switches, and lands within 3 units in at most 1160 evaluations', () => {
    const res = integrate(robertson, 0, [1, 0, 0], 40, { method: 'auto', rtol, atol });
    assert.equal(res.status, Status.Success, res.message);
    assert.equal(res.method, 'stiff');
    assert.ok(res.switchedToStiff !== null && res.switchedToStiff > 0 && res.switchedToStiff < 0.1, `switched at ${res.switchedToStiff}`);
    assert.equal(res.stiffnessDetected, res.switchedToStiff);
    assert.ok(unitsAgainst(ROBERTSON_AT_40, res.y) < 3);
    assert.ok(res.counters.evaluations <= 1160, `${res.counters.evaluations} evaluations`);
    // The dense output is continuous across the switch.
    const before = new Float64Array(3);
    const after = new Float64Array(3);
    const i = res.segments.findIndex((s) => s.t1 === res.switchedToStiff);
    assert.ok(i >= 0);
    res.segments[i].eval(res.switchedToStiff, before);
    res.segments[i + 1].eval(res.switchedToStiff, after);
    assert.deepEqual([...before], [...after]);
  });

  it('dopri5 alone reports the stiffness and exhausts a 30 000-evaluation budget long before t = 40', () => {
    const res = integrate(robertson, 0, [1, 0, 0], 40, { method: 'dopri5', rtol, atol, maxEvaluations: 30_000 });
    assert.equal(res.status, Status.Budget);
    assert.ok(res.t < 20);
    assert.ok(res.stiffnessDetected !== null && res.stiffnessDetected < 0.1);
    assert.equal(res.switchedToStiff, null);
  });

  it('mass stays conserved on the dense output all the way to t = 1e11 (linear invariants are kept by Rosenbrock methods)', () => {
    const res = integrate(robertson, 0, [1, 0, 0], 1e11, { method: 'stiff', rtol, atol, autonomous: true });
    assert.equal(res.status, Status.Success, res.message);
    assert.ok(res.counters.evaluations <= 4200, `${res.counters.evaluations} evaluations`);
    const out = new Float64Array(3);
    for (const s of res.segments) {
      for (const t of [s.t0, 0.25 * (3 * s.t0 + s.t1), 0.5 * (s.t0 + s.t1), s.t1]) {
        s.eval(t, out);
        assert.ok(Math.abs(out[0] + out[1] + out[2] - 1) < 1e-9, `t = ${t}: sum ${out[0] + out[1] + out[2]}`);
        assert.ok(out[1] > -1e-12, `y2 stays non-negative at t = ${t}`);
      }
    }
    assert.ok(res.y[2] > 0.9999999 && res.y[0] < 1e-7, 'nearly all of y1 has become y3');
  });
});

describe('stiff linear problems with closed forms, checked on the steps and the dense output', () => {
  // Prothero & Robinson (1974): y' = λ(y - cos t) - sin t, y(0) = 1 has y = cos t for any λ.
  const lambda = -1e6;
  const prothero: Rhs = (t, y, dy) => { dy[0] = lambda * (y[0] - Math.cos(t)) - Math.sin(t); };
  // u' = 998u + 1998v, v' = -999u - 1999v, u(0) = 1, v(0) = 0 (eigenvalues -1 and -1000):
  // u = 2e^{-t} - e^{-1000t}, v = -e^{-t} + e^{-1000t} (common practice, e.g. Numerical
  // Recipes, sec. 16.6; check by substitution).
  const pair: Rhs = (_t, y, dy) => {
    dy[0] = 998 * y[0] + 1998 * y[1];
    dy[1] = -999 * y[0] - 1999 * y[1];
  };
  const cases = [
    { name: 'Prothero–Robinson, λ = -1e6', f: prothero, y0: [1], exact: (t: number) => [Math.cos(t)], budget: { stiff: 3400, auto: 3650 } },
    { name: 'the 2×2 system with eigenvalues -1 and -1000', f: pair, y0: [1, 0],
      exact: (t: number) => [2 * Math.exp(-t) - Math.exp(-1000 * t), -Math.exp(-t) + Math.exp(-1000 * t)], budget: { stiff: 1360, auto: 1260 } },
  ];
  for (const c of cases) {
    for (const method of ['stiff', 'auto'] as const) {
      it(`${c.name}, ${method}: within 3 units at the steps and on a 1000-point grid, within budget`, () => {
        const tol = { rtol: 1e-6, atol: 1e-9 };
        const res = integrate(c.f, 0, c.y0, 10, { method, ...tol });
        assert.equal(res.status, Status.Success, res.message);
        if (method === 'auto') assert.ok(res.switchedToStiff !== null, 'auto switched');
        const out = new Float64Array(c.y0.length);
        const units = (t: number) => Math.max(...c.exact(t).map((v, i) => Math.abs(out[i] - v) / (tol.atol + tol.rtol * Math.abs(v))));
        for (const s of res.segments) {
          s.eval(s.t1, out);
          assert.ok(units(s.t1) < 3, `step end ${s.t1}: ${units(s.t1)} units`);
        }
        for (let i = 0; i <= 1000; i++) {
          const t = i / 100;
          denseAt(res.segments, t, out);
          assert.ok(units(t) < 3, `t = ${t}: ${units(t)} units`);
        }
        assert.ok(res.counters.evaluations <= c.budget[method], `${res.counters.evaluations} evaluations`);
      });
    }
  }

  it('without dense-output control the stiff method takes far fewer steps on Prothero–Robinson, and only its step ends are accurate', () => {
    const res = integrate(prothero, 0, [1], 10, { method: 'stiff', rtol: 1e-6, atol: 1e-9, denseErrorControl: false });
    assert.equal(res.status, Status.Success);
    assert.ok(res.counters.steps < 30, `${res.counters.steps} steps`);
    const out = new Float64Array(1);
    let worst = 0;
    for (const s of res.segments) {
      s.eval(s.t1, out);
      assert.ok(Math.abs(out[0] - Math.cos(s.t1)) < 3 * (1e-9 + 1e-6 * Math.abs(Math.cos(s.t1))));
      const t = s.t0 + 0.25 * (s.t1 - s.t0);
      s.eval(t, out);
      worst = Math.max(worst, Math.abs(out[0] - Math.cos(t)));
    }
    assert.ok(worst > 1e-4, 'large steps leave the interpolant well off cos t inside them');
  });
});
