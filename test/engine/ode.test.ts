// Accuracy of the ODE solvers against closed-form solutions, measured in tolerance units
// (y - y_exact) / (atol + rtol·|y_exact|) at the steps, at each step's midpoint and on a
// dense grid; dense output at the step ends; empirical orders by halving the step; and
// agreement with a reference library (odex, a port of Hairer & Wanner's Gragg–Bulirsch–Stoer
// extrapolation code ODEX) on the same problems.
//
// Problems are in SI magnitudes (seconds, kelvin, kg, m³), as the engine will pass them.
// Closed forms: exponential decay and Newton cooling (linear, first order); the logistic
// equation y = K / (1 + (K/y0 - 1)·e^{-rt}); a constant-rate infusion C' = R/V - kC with
// C = R/(kV)·(1 - e^{-kt}); first-order absorption A' = -ka·A, C' = ka·A/V - k·C with the
// Bateman solution C = D·ka/(V(ka - k))·(e^{-kt} - e^{-ka·t}) (Bateman 1910; common
// practice in pharmacokinetics texts, e.g. Gibaldi & Perrier, Pharmacokinetics, ch. 1).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { createRequire } from 'node:module';
import { integrate, denseAt, findSegment, type IntegrateResult, type Method } from '../../src/numerics/ode/integrate.ts';
import { DOPRI5 } from '../../src/numerics/ode/dopri5.ts';
import { RkWork, rkStep } from '../../src/numerics/ode/explicit-rk.ts';
import { Evaluator } from '../../src/numerics/ode/control.ts';
import { newCounters, type Rhs } from '../../src/numerics/ode/types.ts';

const HOUR = 3600;

/**
 * The part of odex's API used here. Loaded with require and typed by hand: the package ships
 * its TypeScript source beside the JavaScript, which the strict project check would compile.
 */
interface OdexSolver {
  relativeTolerance: number | number[];
  absoluteTolerance: number | number[];
  denseOutput: boolean;
  grid(dt: number, out: (t: number, y: number[]) => void): unknown;
  solve(f: (t: number, y: number[]) => number[], t0: number, y0: number[], t1: number, out?: unknown): { outcome: number; nEval: number };
}
const odex = createRequire(import.meta.url)('odex') as { Solver: new (n: number) => OdexSolver };

interface Problem {
  readonly name: string;
  readonly f: Rhs;
  readonly y0: readonly number[];
  readonly t1: number;
  readonly exact: (t: number) => number[];
  /** atol of each state is this times rtol: the size below which relative accuracy stops mattering. */
  readonly typical: readonly number[];
}

const k = 0.35 / HOUR;
const Ta = 293.15; // 20 °C in K
const T0 = 353.15; // 80 °C in K
const r = 1 / HOUR;
const K = 1000;
const R = 2e-6 / HOUR; // 2 mg/h in kg/s
const V = 0.04; // 40 L in m³
const kel = 0.1 / HOUR;
const dose = 5e-4; // 500 mg in kg
const ka = 1.2 / HOUR;
const k2 = 0.15 / HOUR;

const PROBLEMS: readonly Problem[] = [
  {
    name: 'exponential decay',
    f: (_t, y, dy) => { dy[0] = -k * y[0]; },
    y0: [1], t1: 8 * HOUR, typical: [1],
    exact: (t) => [Math.exp(-k * t)],
  },
  {
    name: 'Newton cooling',
    f: (_t, y, dy) => { dy[0] = -k * (y[0] - Ta); },
    y0: [T0], t1: 8 * HOUR, typical: [1],
    exact: (t) => [Ta + (T0 - Ta) * Math.exp(-k * t)],
  },
  {
    name: 'logistic growth',
    f: (_t, y, dy) => { dy[0] = r * y[0] * (1 - y[0] / K); },
    y0: [10], t1: 24 * HOUR, typical: [1],
    exact: (t) => [K / (1 + (K / 10 - 1) * Math.exp(-r * t))],
  },
  {
    name: 'constant-rate infusion',
    f: (_t, y, dy) => { dy[0] = R / V - kel * y[0]; },
    y0: [0], t1: 48 * HOUR, typical: [1e-3],
    exact: (t) => [(R / (kel * V)) * (1 - Math.exp(-kel * t))],
  },
  {
    name: 'first-order absorption (Bateman)',
    f: (_t, y, dy) => {
      dy[0] = -ka * y[0];
      dy[1] = (ka * y[0]) / V - k2 * y[1];
    },
    y0: [dose, 0], t1: 24 * HOUR, typical: [1e-3, 1e-2],
    exact: (t) => [dose * Math.exp(-ka * t), ((dose * ka) / (V * (ka - k2))) * (Math.exp(-k2 * t) - Math.exp(-ka * t))],
  },
];

const atolOf = (p: Problem, rtol: number) => p.typical.map((s) => s * rtol);

/** Largest error in tolerance units of out against the exact solution at t. */
function units(p: Problem, t: number, out: Float64Array, rtol: number, atol: number[]): number {
  const ex = p.exact(t);
  let worst = 0;
  for (let i = 0; i < ex.length; i++) worst = Math.max(worst, Math.abs(out[i] - ex[i]) / (atol[i] + rtol * Math.abs(ex[i])));
  return worst;
}

/** Errors in tolerance units at the step ends, at the step midpoints and on a 500-point grid. */
function measure(p: Problem, res: IntegrateResult, rtol: number, atol: number[]) {
  const out = new Float64Array(p.y0.length);
  let steps = 0;
  let mids = 0;
  let grid = 0;
  for (const s of res.segments) {
    s.eval(s.t1, out);
    steps = Math.max(steps, units(p, s.t1, out, rtol, atol));
    const mid = 0.5 * (s.t0 + s.t1);
    s.eval(mid, out);
    mids = Math.max(mids, units(p, mid, out, rtol, atol));
  }
  for (let i = 0; i <= 500; i++) {
    const t = (p.t1 * i) / 500;
    assert.ok(denseAt(res.segments, t, out), `t = ${t} is covered`);
    grid = Math.max(grid, units(p, t, out, rtol, atol));
  }
  return { steps, mids, grid };
}

/**
 * Limits in tolerance units. Local error control does not bound the global error, but for
 * these contractive problems it stays within a few units at the steps (SciPy's solve_ivp
 * tests use 5). Inside a step dopri5's interpolant is of order 4 against a fifth-order
 * step, so at tight tolerances it strays further: up to 9.4 units was measured (logistic
 * growth, rtol 1e-9, 30% into a step); the other problems stay below 3.
 */
const AT_STEPS = 3;
const DENSE = 12;

/**
 * Evaluation budgets at rtol = 1e-6: measured when this was written plus about 20%, so an
 * efficiency regression fails like a wrong answer.
 */
const BUDGET: Record<string, { dopri5: number; stiff: number }> = {
  'exponential decay': { dopri5: 120, stiff: 250 },
  'Newton cooling': { dopri5: 110, stiff: 200 },
  'logistic growth': { dopri5: 330, stiff: 930 },
  'constant-rate infusion': { dopri5: 140, stiff: 290 },
  'first-order absorption (Bateman)': { dopri5: 260, stiff: 580 },
};

describe('adaptive solvers against closed forms, in tolerance units', () => {
  for (const p of PROBLEMS) {
    for (const method of ['dopri5', 'stiff', 'auto'] as const) {
      it(`${p.name} with ${method}: within ${AT_STEPS} units at the steps and ${DENSE} on the dense output`, () => {
        for (const rtol of [1e-3, 1e-6, 1e-9]) {
          const atol = atolOf(p, rtol);
          const res = integrate(p.f, 0, p.y0, p.t1, { method, rtol, atol });
          assert.equal(res.status, 'success', res.message);
          assert.equal(res.t, p.t1);
          const e = measure(p, res, rtol, atol);
          assert.ok(e.steps <= AT_STEPS, `rtol ${rtol}: ${e.steps} units at the steps`);
          assert.ok(e.mids <= DENSE, `rtol ${rtol}: ${e.mids} units at the midpoints`);
          assert.ok(e.grid <= DENSE, `rtol ${rtol}: ${e.grid} units on the grid`);
          if (method === 'auto') assert.equal(res.switchedToStiff, null, 'a non-stiff problem stays with dopri5');
          if (rtol === 1e-6 && method !== 'auto') {
            assert.ok(res.counters.evaluations <= BUDGET[p.name][method], `${res.counters.evaluations} evaluations`);
          }
        }
      });
    }
  }

  it('tighter tolerances give smaller errors (dopri5 and stiff, logistic growth)', () => {
    const p = PROBLEMS[2];
    for (const method of ['dopri5', 'stiff'] as const) {
      const errs = [1e-4, 1e-7, 1e-10].map((rtol) => {
        const res = integrate(p.f, 0, p.y0, p.t1, { method, rtol, atol: atolOf(p, rtol) });
        return Math.abs(res.y[0] - p.exact(p.t1)[0]);
      });
      assert.ok(errs[1] < errs[0] / 30 && errs[2] < errs[1] / 30, `${method}: ${errs}`);
    }
  });
});

describe('fixed-step methods against closed forms', () => {
  /** Largest |exact| of each state over the run, the scale of the relative errors below. */
  const sizes = (p: Problem) => p.y0.map((_, i) => Math.max(...Array.from({ length: 101 }, (_, j) => Math.abs(p.exact((p.t1 * j) / 100)[i]))));
  // Relative limits: about three times the largest error measured when this was written
  // (7.7e-10, 1.05e-6, 5.6e-4), a check of the whole path; the empirical orders below are
  // the sharp test of each method.
  for (const [method, step, limit] of [['rk4', 60, 2.5e-9], ['heun', 10, 3.2e-6], ['euler', 5, 1.7e-3]] as const) {
    it(`${method} with a ${step} s step tracks every problem to ${limit} of the state's size, at steps and midpoints`, () => {
      for (const p of PROBLEMS) {
        const res = integrate(p.f, 0, p.y0, p.t1, { method, step });
        assert.equal(res.status, 'success');
        const size = sizes(p);
        const out = new Float64Array(p.y0.length);
        for (const s of res.segments) {
          for (const t of [s.t1, 0.5 * (s.t0 + s.t1)]) {
            s.eval(t, out);
            const ex = p.exact(t);
            for (let i = 0; i < ex.length; i++) {
              assert.ok(Math.abs(out[i] - ex[i]) <= limit * size[i], `${p.name}, t = ${t}: ${out[i]} vs ${ex[i]}`);
            }
          }
        }
      }
    });
  }

  it('the last step is shortened to land exactly on the end; steps sit at t0 + i·step', () => {
    const p = PROBLEMS[0];
    const res = integrate(p.f, 0, p.y0, 1000, { method: 'rk4', step: 300 });
    assert.deepEqual(res.segments.map((s) => s.t1), [300, 600, 900, 1000]);
    assert.equal(res.counters.steps, 4);
    assert.equal(res.counters.evaluations, 4 * 4 + 1);
  });

  it('rk4 with Hermite dense output reproduces y = t³ exactly (Simpson\'s rule and cubic Hermite interpolation are exact for cubics)', () => {
    const res = integrate((t, _y, dy) => { dy[0] = 3 * t * t; }, 0, [0], 2, { method: 'rk4', step: 0.25 });
    const out = new Float64Array(1);
    for (let i = 0; i <= 80; i++) {
      const t = (2 * i) / 80;
      denseAt(res.segments, t, out);
      assert.ok(Math.abs(out[0] - t ** 3) < 1e-14, `t = ${t}: ${out[0]}`);
    }
  });
});

describe('dense output', () => {
  const methods: { method: Method; step?: number }[] = [
    { method: 'dopri5' }, { method: 'stiff' }, { method: 'rk4', step: 700 }, { method: 'heun', step: 700 }, { method: 'euler', step: 700 },
  ];
  for (const { method, step } of methods) {
    it(`${method}: segments tile [t0, t1] and reproduce the step end states bit for bit`, () => {
      const p = PROBLEMS[4];
      const res = integrate(p.f, 0, p.y0, p.t1, { method, step, rtol: 1e-6, atol: atolOf(p, 1e-6) });
      const segs = res.segments;
      assert.ok(segs.length > 3);
      assert.equal(segs[0].t0, 0);
      assert.equal(segs[segs.length - 1].t1, p.t1);
      const a = new Float64Array(2);
      const b = new Float64Array(2);
      segs[0].eval(0, a);
      assert.deepEqual([...a], p.y0);
      for (let i = 0; i + 1 < segs.length; i++) {
        assert.equal(segs[i].t1, segs[i + 1].t0);
        segs[i].eval(segs[i].t1, a);
        segs[i + 1].eval(segs[i + 1].t0, b);
        assert.deepEqual([...a], [...b], `at the end of step ${i}`);
      }
      segs[segs.length - 1].eval(p.t1, a);
      assert.deepEqual([...a], [...res.y]);
    });
  }

  it('denseAt finds the covering segment by binary search and refuses times outside the span', () => {
    const p = PROBLEMS[0];
    const res = integrate(p.f, 0, p.y0, p.t1, { method: 'rk4', step: 1000 });
    const segs = res.segments;
    assert.equal(findSegment(segs, 0), 0);
    assert.equal(findSegment(segs, 999), 0);
    assert.equal(findSegment(segs, 1000), 1, 'a shared end belongs to the later segment');
    assert.equal(findSegment(segs, 2500), 2);
    assert.equal(findSegment(segs, p.t1), segs.length - 1);
    assert.equal(findSegment(segs, -1), -1);
    assert.equal(findSegment(segs, p.t1 + 1), -1);
    assert.equal(findSegment(segs, NaN), -1);
    assert.equal(findSegment([], 0), -1);
    const out = new Float64Array([42]);
    assert.equal(denseAt(segs, p.t1 * 2, out), false);
    assert.equal(out[0], 42);
  });
});

describe('empirical order by halving the step (logistic y\' = y(1 - y), y(0) = 0.1, to t = 2)', () => {
  const f: Rhs = (_t, y, dy) => { dy[0] = y[0] * (1 - y[0]); };
  const exact = 1 / (1 + 9 * Math.exp(-2));
  const orderOf = (errs: number[]) => errs.slice(1).map((e, i) => Math.log2(errs[i] / e));

  for (const [method, p, steps] of [['euler', 1, [0.02, 0.01, 0.005]], ['heun', 2, [0.04, 0.02, 0.01]], ['rk4', 4, [0.2, 0.1, 0.05]]] as const) {
    it(`${method} has order ${p}`, () => {
      const errs = steps.map((h) => Math.abs(integrate(f, 0, [0.1], 2, { method, step: h }).y[0] - exact));
      for (const o of orderOf(errs)) assert.ok(Math.abs(o - p) < 0.15, `observed orders ${orderOf(errs)}`);
    });
  }

  it('dopri5 (its fifth-order solution, fixed steps through the kernel) has order 5', () => {
    const counters = newCounters();
    const rhs = new Evaluator(f, counters);
    const errs = [0.2, 0.1, 0.05].map((h) => {
      const work = new RkWork(1, 7);
      let y = new Float64Array([0.1]);
      const next = new Float64Array(1);
      rhs.call(0, y, work.k[0]);
      const n = Math.round(2 / h);
      for (let i = 0; i < n; i++) {
        assert.equal(rkStep(DOPRI5, rhs, i * h, y, h, work, next), -1);
        y = Float64Array.from(next);
        work.k[0].set(work.k[6]);
      }
      return Math.abs(y[0] - exact);
    });
    for (const o of orderOf(errs)) assert.ok(Math.abs(o - 5) < 0.35, `observed orders ${orderOf(errs)}`);
  });

  it('the stiff method has order 4 (steps held fixed by maxStep and a tolerance that never rejects)', () => {
    const errs = [0.2, 0.1, 0.05].map((h) => {
      const res = integrate(f, 0, [0.1], 2, { method: 'stiff', firstStep: h, maxStep: h, rtol: 1e3, atol: 1e-12 });
      assert.equal(res.counters.rejected, 0);
      assert.equal(res.counters.steps, Math.round(2 / h));
      return Math.abs(res.y[0] - exact);
    });
    for (const o of orderOf(errs)) assert.ok(Math.abs(o - 4) < 0.5, `observed orders ${orderOf(errs)}`);
  });

  it('with an analytic Jacobian the stiff method gives the same answer and saves the differencing evaluations', () => {
    const jacobian = (_t: number, y: Float64Array, jac: Float64Array) => { jac[0] = 1 - 2 * y[0]; };
    const analytic = integrate(f, 0, [0.1], 2, { method: 'stiff', autonomous: true, rtol: 1e-8, atol: 1e-12, jacobian });
    const differenced = integrate(f, 0, [0.1], 2, { method: 'stiff', autonomous: true, rtol: 1e-8, atol: 1e-12 });
    assert.ok(Math.abs(analytic.y[0] - exact) < 1e-7);
    assert.ok(Math.abs(analytic.y[0] - differenced.y[0]) < 1e-9);
    assert.equal(analytic.counters.rejected, 0);
    assert.equal(analytic.counters.steps, differenced.counters.steps);
    // Per step: f at the start, five more stages, one dense-output check; plus one to choose h0.
    assert.equal(analytic.counters.evaluations, 7 * analytic.counters.steps + 1);
    // Differencing a one-state Jacobian costs one evaluation per step.
    assert.equal(differenced.counters.evaluations, analytic.counters.evaluations + differenced.counters.steps);
  });
});

describe('runs that restart and runs of zero length', () => {
  it('two pieces joined with nextStep → firstStep agree with one run, and the second piece starts with a good step', () => {
    const p = PROBLEMS[4];
    const rtol = 1e-8;
    const atol = atolOf(p, rtol);
    const whole = integrate(p.f, 0, p.y0, p.t1, { method: 'dopri5', rtol, atol });
    const first = integrate(p.f, 0, p.y0, p.t1 / 2, { method: 'dopri5', rtol, atol });
    const second = integrate(p.f, first.t, first.y, p.t1, { method: 'dopri5', rtol, atol, firstStep: first.nextStep });
    assert.equal(second.status, 'success');
    const ex = p.exact(p.t1);
    for (let i = 0; i < 2; i++) {
      assert.ok(Math.abs(second.y[i] - ex[i]) / (atol[i] + rtol * Math.abs(ex[i])) < AT_STEPS);
      assert.ok(Math.abs(second.y[i] - whole.y[i]) / (atol[i] + rtol * Math.abs(ex[i])) < AT_STEPS);
    }
    assert.equal(second.counters.rejected, 0, 'the carried step is accepted');
    assert.ok(first.counters.steps + second.counters.steps <= whole.counters.steps + 3);
  });

  it('a run from t0 to t0 succeeds at once with no segments and no evaluations', () => {
    const res = integrate(PROBLEMS[0].f, 5, [2], 5);
    assert.equal(res.status, 'success');
    assert.equal(res.segments.length, 0);
    assert.equal(res.counters.evaluations, 0);
    assert.deepEqual([...res.y], [2]);
  });

  it('no method evaluates f past t1 (nor before t0), also for ends that are not round numbers', () => {
    const p = PROBLEMS[4];
    for (const [t0, t1] of [[100, 5100], [1 / 3, 1 / 3 + 0.7 * HOUR], [0.1, 0.3]]) {
      for (const method of ['dopri5', 'stiff', 'auto', 'rk4', 'heun', 'euler'] as const) {
        let lo = Infinity;
        let hi = -Infinity;
        const f: Rhs = (t, y, dy) => {
          lo = Math.min(lo, t);
          hi = Math.max(hi, t);
          p.f(t, y, dy);
        };
        const res = integrate(f, t0, p.y0, t1, { method, step: (t1 - t0) / 7.3 });
        assert.equal(res.status, 'success');
        assert.equal(res.t, t1);
        assert.ok(lo >= t0 && hi <= t1, `${method} on [${t0}, ${t1}]: f called on [${lo}, ${hi}]`);
      }
    }
  });
});

describe('agreement with odex (Gragg–Bulirsch–Stoer extrapolation, npm "odex")', () => {
  for (const p of PROBLEMS) {
    it(`${p.name}: dopri5, stiff and odex agree within 3 tolerance units at 1 h intervals`, () => {
      const rtol = 1e-8;
      const atol = atolOf(p, rtol);
      const n = p.y0.length;
      const solver = new odex.Solver(n);
      solver.relativeTolerance = rtol;
      solver.absoluteTolerance = atol;
      solver.denseOutput = true;
      const dy = new Float64Array(n);
      const y = new Float64Array(n);
      const theirs: [number, number[]][] = [];
      const run = solver.solve((t: number, yy: number[]) => {
        y.set(yy);
        p.f(t, y, dy);
        return Array.from(dy);
      }, 0, [...p.y0], p.t1, solver.grid(HOUR, (t: number, yy: number[]) => { theirs.push([t, yy.slice()]); }));
      assert.equal(run.outcome, 0, 'odex converged');
      assert.ok(theirs.length >= Math.floor(p.t1 / HOUR));
      for (const method of ['dopri5', 'stiff'] as const) {
        const ours = integrate(p.f, 0, p.y0, p.t1, { method, rtol, atol });
        const out = new Float64Array(n);
        for (const [t, yy] of theirs) {
          denseAt(ours.segments, t, out);
          const ex = p.exact(t);
          for (let i = 0; i < n; i++) {
            const tol = atol[i] + rtol * Math.abs(ex[i]);
            assert.ok(Math.abs(out[i] - yy[i]) <= 3 * tol, `${method}, t = ${t}, state ${i}: ${out[i]} vs odex ${yy[i]}`);
          }
        }
      }
    });
  }
});
