// The Dormand–Prince 8(5,3) method (dp853) on problems with closed forms, in tolerance
// units err / (atol + rtol·|y_exact|) at the steps and on a dense grid, within evaluation
// budgets; and auto's choice of it at tight tolerances.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { ADAMS_FROM_RTOL, denseAt, integrate } from '../../src/numerics/ode/integrate.ts';
import type { Rhs } from '../../src/numerics/ode/types.ts';

const HOUR = 3600;
const kc = 0.35 / HOUR, r = 1 / HOUR, K = 1000, ka = 1.2 / HOUR, ke = 0.15 / HOUR, V = 0.04, dose = 5e-4;

interface Problem {
  readonly name: string;
  readonly f: Rhs;
  readonly y0: readonly number[];
  readonly t1: number;
  readonly exact: (t: number) => number[];
  /** The state's largest size over the run: atol = 1e-3·rtol·size, as a simulate cell sets it. */
  readonly size: readonly number[];
  /** Largest error allowed, in tolerance units (global error; see the comment at CASES). */
  readonly units: number;
  /** Evaluations allowed at rtol 1e-7, 1e-8, 1e-9, 1e-10, and dopri5's count there (measured). */
  readonly budget: readonly number[];
  readonly dopri5: readonly number[];
}

/**
 * Budgets: counts measured plus about 15 %. The error bounds are of the global error, on the
 * grid too (the order-7 interpolant inside each step), which a per-step tolerance does not
 * bound by itself: before dp853 measured its error against tolerances 20 times tighter
 * (DP853_TOLERANCE_SAFETY), it reached 1.1 units on cooling, 20 on the logistic curve and 10 on
 * Bateman's; now at most 0.73 (measured), for 10–25 % more evaluations (the budgets were
 * 160–230, 450–865 and 485–920).
 */
const PROBLEMS: readonly Problem[] = [
  {
    // closed form: T = Ta + (T0 - Ta) e^{-kt}
    name: 'Newton cooling', f: (_t, y, dy) => { dy[0] = -kc * (y[0] - 293.15); }, y0: [353.15], t1: 8 * HOUR,
    exact: (t) => [293.15 + 60 * Math.exp(-kc * t)], size: [353.15], units: 1,
    budget: [175, 210, 230, 260], dopri5: [146, 206, 302, 440],
  },
  {
    // closed form: N = K / (1 + (K/N0 - 1) e^{-rt})
    name: 'logistic growth', f: (_t, y, dy) => { dy[0] = r * y[0] * (1 - y[0] / K); }, y0: [10], t1: 24 * HOUR,
    exact: (t) => [K / (1 + (K / 10 - 1) * Math.exp(-r * t))], size: [1000], units: 1,
    budget: [600, 705, 900, 1135], dopri5: [596, 890, 1358, 2090],
  },
  {
    // closed form (Bateman): A = D e^{-ka t}, C = D ka / (V (ka - k)) (e^{-kt} - e^{-ka t})
    name: 'oral absorption (Bateman)',
    f: (_t, y, dy) => { dy[0] = -ka * y[0]; dy[1] = (ka * y[0]) / V - ke * y[1]; }, y0: [dose, 0], t1: 24 * HOUR,
    exact: (t) => [dose * Math.exp(-ka * t), ((dose * ka) / (V * (ka - ke))) * (Math.exp(-ke * t) - Math.exp(-ka * t))],
    size: [dose, 0.0095], units: 1,
    budget: [625, 780, 970, 1245], dopri5: [878, 1346, 2096, 3250],
  },
];

function run(p: Problem, rtol: number, method: 'dp853' | 'dopri5' | 'adams' | 'auto' = 'dp853') {
  const atol = p.size.map((s) => 1e-3 * rtol * s);
  const res = integrate(p.f, 0, p.y0, p.t1, { method, rtol, atol });
  const n = p.y0.length;
  const out = new Float64Array(n);
  const units = (t: number) => {
    const ex = p.exact(t);
    let worst = 0;
    for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(out[i] - ex[i]) / (atol[i] + rtol * Math.abs(ex[i])));
    return worst;
  };
  let steps = 0;
  for (const s of res.segments) {
    s.eval(s.t1, out);
    steps = Math.max(steps, units(s.t1));
  }
  let grid = 0;
  for (let i = 0; i <= 2000; i++) {
    const t = (p.t1 * i) / 2000;
    assert.ok(denseAt(res.segments, t, out));
    grid = Math.max(grid, units(t));
  }
  return { res, steps, grid, atol };
}

describe('dp853 on closed forms at rtol 1e-7 … 1e-10 (atol = 1e-3·rtol·size)', () => {
  for (const p of PROBLEMS) {
    [1e-7, 1e-8, 1e-9, 1e-10].forEach((rtol, i) => {
      it(`${p.name} at rtol ${rtol}: within ${p.units} units at the steps and on a 2001-point grid, in at most ${p.budget[i]} evaluations (dopri5: ${p.dopri5[i]})`, () => {
        const { res, steps, grid } = run(p, rtol);
        assert.equal(res.status, 'success');
        assert.equal(res.method, 'dp853');
        assert.ok(steps <= p.units, `${steps} units at the steps`);
        assert.ok(grid <= p.units, `${grid} units on the grid`);
        assert.ok(res.counters.evaluations <= p.budget[i], `${res.counters.evaluations} evaluations`);
        assert.ok(p.budget[i] < p.dopri5[i] * 1.2 || p.name === 'Newton cooling');
      });
    });
  }

  it('the error falls as the tolerance tightens (tolerance proportionality within a factor 30 per decade on cooling)', () => {
    const p = PROBLEMS[0];
    const errs = [1e-7, 1e-8, 1e-9, 1e-10].map((rtol) => run(p, rtol).grid * rtol);
    for (let i = 1; i < errs.length; i++) assert.ok(errs[i] < errs[i - 1] / 3 && errs[i] > errs[i - 1] / 30, errs.join(' '));
  });

  it('the dense output meets the steps bit for bit, and the run ends on the last step', () => {
    const { res } = run(PROBLEMS[2], 1e-9);
    const a = new Float64Array(2);
    const b = new Float64Array(2);
    for (let i = 1; i < res.segments.length; i++) {
      res.segments[i - 1].eval(res.segments[i - 1].t1, a);
      res.segments[i].eval(res.segments[i].t0, b);
      assert.deepEqual([...a], [...b]);
    }
    res.segments[res.segments.length - 1].eval(PROBLEMS[2].t1, a);
    assert.deepEqual([...a], [...res.y]);
  });

  it('each accepted step costs 15 evaluations and each rejected one 11, plus 2 to start (hand-worked from the stage count)', () => {
    const { res } = run(PROBLEMS[1], 1e-9);
    const c = res.counters;
    assert.equal(c.evaluations, 15 * c.steps + 11 * c.rejected + 2);
  });

  it('two pieces joined with nextStep → firstStep agree with one run, and the carried step is accepted', () => {
    const p = PROBLEMS[2];
    const rtol = 1e-9;
    const atol = p.size.map((s) => 1e-3 * rtol * s);
    const whole = integrate(p.f, 0, p.y0, p.t1, { method: 'dp853', rtol, atol });
    const first = integrate(p.f, 0, p.y0, p.t1 / 2, { method: 'dp853', rtol, atol });
    const second = integrate(p.f, first.t, first.y, p.t1, { method: 'dp853', rtol, atol, firstStep: first.nextStep });
    const ex = p.exact(p.t1);
    for (let i = 0; i < 2; i++) assert.ok(Math.abs(second.y[i] - ex[i]) / (atol[i] + rtol * Math.abs(ex[i])) < p.units);
    assert.equal(second.counters.rejected, 0);
    assert.ok(first.counters.steps + second.counters.steps <= whole.counters.steps + 3);
  });
});

describe('auto chooses the method from the tolerance', () => {
  it(`auto runs adams at rtol ${ADAMS_FROM_RTOL} and below and dopri5 above, and says so`, () => {
    assert.equal(run(PROBLEMS[2], 1e-8, 'auto').res.method, 'adams');
    assert.equal(run(PROBLEMS[2], 1e-6, 'auto').res.method, 'adams');
    assert.equal(run(PROBLEMS[2], 1e-5, 'auto').res.method, 'dopri5');
    assert.equal(run(PROBLEMS[2], 1e-3, 'auto').res.method, 'dopri5');
  });

  it('auto at rtol 1e-9 spends what adams itself does, and less than half of dopri5\'s count (Bateman)', () => {
    const p = PROBLEMS[2];
    const auto = run(p, 1e-9, 'auto').res.counters.evaluations;
    assert.equal(auto, run(p, 1e-9, 'adams').res.counters.evaluations);
    assert.ok(auto < 0.5 * run(p, 1e-9, 'dopri5').res.counters.evaluations);
  });

  it('dp853 finds y\' = -1e4 (y - cos t) stiff at rtol 1e-8, and auto then switches to the stiff method', () => {
    const f: Rhs = (t, y, dy) => { dy[0] = -1e4 * (y[0] - Math.cos(t)); };
    const alone = integrate(f, 0, [0], 10, { method: 'dp853', rtol: 1e-8, atol: 1e-11 });
    assert.ok(alone.stiffnessDetected !== null && alone.stiffnessDetected < 0.1, `found at ${alone.stiffnessDetected}`);
    const auto = integrate(f, 0, [0], 10, { method: 'auto', rtol: 1e-8, atol: 1e-11 });
    assert.equal(auto.method, 'stiff');
    // auto starts with adams at this tolerance, whose own test finds it as early
    assert.ok(auto.switchedToStiff !== null && auto.switchedToStiff < 0.1, `switched at ${auto.switchedToStiff}`);
  });
});
