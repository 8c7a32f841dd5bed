// The least-squares fitter (src/numerics/fit/least-squares.ts) on problems with known answers:
// noise-free data from known models, the NIST StRD nonlinear regression problems Misra1a and
// BoxBOD (certified values), and agreement with a reference library (ml-levenberg-marquardt).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { fitLeastSquares, type FitResult } from '../../src/numerics/fit/least-squares.ts';
import { integrate, denseAt } from '../../src/numerics/ode/integrate.ts';
import { MISRA1A, BOXBOD } from './nist-strd.ts';

const relErr = (x: number, exact: number) => Math.abs(x - exact) / Math.abs(exact);

type Model = (p: ArrayLike<number>, x: number) => number;

/** Fits model(p, x) to (xs, ys) with unweighted residuals model − y. */
function fitCurve(model: Model, xs: readonly number[], ys: readonly number[], p0: number[], options = {}, scale?: number[]): FitResult {
  return fitLeastSquares({
    m: xs.length, p0, scale,
    residuals: (p, out) => {
      for (let i = 0; i < xs.length; i++) out[i] = model(p, xs[i]) - ys[i];
      return true;
    },
  }, options);
}

const decay: Model = (p, t) => p[0] * Math.exp(-p[1] * t);
const plateau: Model = (p, x) => p[0] * (1 - Math.exp(-p[1] * x));
const michaelisMenten: Model = (p, s) => (p[0] * s) / (p[1] + s);

describe('noise-free data from a known model', () => {
  // Data computed from the model at the true parameters (closed form); the fit must return them.
  const cases: Array<{ name: string; model: Model; xs: number[]; truth: number[]; starts: number[][] }> = [
    {
      name: 'exponential decay y = A·e^(−k·t), A = 5, k = 0.7',
      model: decay, xs: Array.from({ length: 11 }, (_, i) => i), truth: [5, 0.7],
      starts: [[1, 0.05], [50, 5], [0.1, 3]],
    },
    {
      name: 'approach to a plateau y = a·(1 − e^(−b·x)), a = 3, b = 0.2',
      model: plateau, xs: [1, 2, 4, 6, 9, 12, 16, 20, 25, 30], truth: [3, 0.2],
      starts: [[10, 2], [0.5, 0.02], [100, 0.001]],
    },
    {
      name: 'Michaelis–Menten rate v = Vmax·S/(Km + S), Vmax = 2, Km = 0.5',
      model: michaelisMenten, xs: [0.05, 0.1, 0.2, 0.4, 0.8, 1.5, 3, 6], truth: [2, 0.5],
      starts: [[0.2, 20], [20, 0.01]],
    },
  ];
  for (const c of cases) {
    it(`recovers ${c.name} to 1e-6 relative from poor starts`, () => {
      const ys = c.xs.map((x) => c.model(c.truth, x));
      for (const p0 of c.starts) {
        const r = fitCurve(c.model, c.xs, ys, p0);
        assert.equal(r.converged, true, `from ${p0}: ${r.status}`);
        for (let j = 0; j < c.truth.length; j++) {
          assert.ok(relErr(r.p[j], c.truth[j]) <= 1e-6, `from ${p0}: p[${j}] = ${r.p[j]}, true ${c.truth[j]}`);
        }
        assert.ok(r.evaluations <= 150, `from ${p0}: ${r.evaluations} evaluations`);
      }
    });
  }

  it('recovers a rate constant and a start value through an ODE solver (the black-box use)', () => {
    // Newton cooling T' = −k·(T − Ta), Ta = 20: data from the closed form T = Ta + (T0 − Ta)·e^(−k·t)
    // with k = 0.35, T0 = 90; the model integrates the ODE (dopri5, rtol 1e-11), so its residuals
    // carry solver error of about 1e-10 and the difference step is set to match (√1e-11 ≈ 3e-6).
    const Ta = 20, truth = [0.35, 90];
    const times = [0.5, 1, 2, 3, 5, 8, 12];
    const ys = times.map((t) => Ta + (truth[1] - Ta) * Math.exp(-truth[0] * t));
    const at = new Float64Array(1);
    const r = fitLeastSquares({
      m: times.length, p0: [0.05, 50], lower: [0, -Infinity],
      residuals: (p, out) => {
        const k = p[0];
        const run = integrate((_t, y, dy) => { dy[0] = -k * (y[0] - Ta); }, 0, [p[1]], times[times.length - 1],
          { method: 'dopri5', rtol: 1e-11, atol: 1e-11 });
        if (run.status !== 'success') return false;
        for (let i = 0; i < times.length; i++) {
          if (!denseAt(run.segments, times[i], at)) return false;
          out[i] = at[0] - ys[i];
        }
        return true;
      },
    }, { diffStep: 3e-6 });
    assert.equal(r.converged, true, r.status);
    assert.ok(relErr(r.p[0], truth[0]) <= 1e-6, `k = ${r.p[0]}`);
    assert.ok(relErr(r.p[1], truth[1]) <= 1e-6, `T0 = ${r.p[1]}`);
  });
});

// NIST StRD Misra1a and BoxBOD (data and certified values: test/engine/nist-strd.ts).
describe('NIST StRD certified values', () => {
  for (const [name, d] of [['Misra1a', MISRA1A], ['BoxBOD', BOXBOD]] as const) {
    for (const [s, p0] of d.starts.entries()) for (const scaled of [false, true]) {
      const how = scaled ? ', steps scaled by the start' : '';
      it(`${name} from start ${s + 1} (${p0.join(', ')}${how}): parameters, standard errors and residual sum of squares to 6 digits`, () => {
        const r = fitCurve(plateau, d.x, d.y, p0, {}, scaled ? p0.map(Math.abs) : undefined);
        assert.equal(r.converged, true, r.status);
        for (let j = 0; j < 2; j++) {
          assert.ok(relErr(r.p[j], d.certified[j]) <= 1e-6, `b${j + 1} = ${r.p[j]}, certified ${d.certified[j]}`);
          assert.ok(r.standardErrors !== null);
          assert.ok(relErr(r.standardErrors[j], d.standardErrors[j]) <= 1e-6,
            `SE(b${j + 1}) = ${r.standardErrors[j]}, certified ${d.standardErrors[j]}`);
        }
        assert.ok(relErr(2 * (r.cost as number), d.rss) <= 1e-9, `RSS ${2 * (r.cost as number)}`);
        assert.ok(relErr(r.residualSD as number, d.residualSD) <= 1e-9, `residual SD ${r.residualSD}`);
        assert.equal(r.dof, d.dof);
        assert.deepEqual(r.atBound, [false, false]);
        assert.deepEqual(r.warnings, []);
        assert.ok(r.evaluations <= 120, `${r.evaluations} evaluations`);
      });
    }
  }
});

describe('agreement with ml-levenberg-marquardt (reference library)', () => {
  // The reference library is given analytic derivatives, 1000 iterations and no early stop; so
  // configured it reaches the NIST certified values to about 3e-11 relative on Misra1a (both
  // starts) and BoxBOD (start 2). From BoxBOD's start 1 it does not leave the start, so that case
  // is not compared. Our fitter differences its Jacobian and stops at ftol = 1e-12, which leaves
  // it within about 1e-7 of the optimum: agreement is required to 1e-6 relative.
  const reference = (xs: number[], ys: number[], p0: number[], model: Model, gradient: (p: number[]) => (x: number) => number[]) =>
    levenbergMarquardt({ x: xs, y: ys }, (p: number[]) => (x: number) => model(p, x), {
      initialValues: p0, damping: 1e-2, maxIterations: 1000, errorTolerance: 0, jacobianFunction: gradient,
    }).parameterValues;
  const plateauGradient = ([b1, b2]: number[]) => (x: number) => [1 - Math.exp(-b2 * x), b1 * x * Math.exp(-b2 * x)];

  const problems: Array<[string, typeof MISRA1A, number[]]> = [
    ['Misra1a start 1', MISRA1A, MISRA1A.starts[0]],
    ['Misra1a start 2', MISRA1A, MISRA1A.starts[1]],
    ['BoxBOD start 2', BOXBOD, BOXBOD.starts[1]],
  ];
  for (const [name, d, p0] of problems) {
    it(`${name}: the same optimum to 1e-6`, () => {
      const ref = reference(d.x, d.y, [...p0], plateau, plateauGradient);
      // the reference itself at the certified values (checks the configuration above)
      for (let j = 0; j < 2; j++) assert.ok(relErr(ref[j], d.certified[j]) <= 1e-9);
      const ours = fitCurve(plateau, d.x, d.y, p0);
      for (let j = 0; j < 2; j++) assert.ok(relErr(ours.p[j], ref[j]) <= 1e-6, `b${j + 1}: ${ours.p[j]} vs ${ref[j]}`);
    });
  }

  it('a three-parameter decay to a baseline with noisy data: the same optimum to 1e-6', () => {
    // y = c + A·e^(−k·t) with A = 8, k = 0.45, c = 1.5 plus fixed pseudo-random noise (sd 0.05).
    const model: Model = (p, t) => p[2] + p[0] * Math.exp(-p[1] * t);
    const gradient = ([A, k]: number[]) => (t: number) => [Math.exp(-k * t), -A * t * Math.exp(-k * t), 1];
    const rand = gaussian(2024);
    const ts = Array.from({ length: 20 }, (_, i) => 0.5 * i);
    const ys = ts.map((t) => model([8, 0.45, 1.5], t) + 0.05 * rand());
    // The reference starts near the optimum (from (3, 1, 0) it wanders to k ≈ 3000, a sum of
    // squares of 61 against 0.044); ours starts there and from the poorer (3, 1, 0).
    const ref = reference(ts, ys, [6, 0.3, 1], model, gradient);
    for (const p0 of [[6, 0.3, 1], [3, 1, 0]]) {
      const ours = fitCurve(model, ts, ys, p0);
      assert.equal(ours.converged, true);
      for (let j = 0; j < 3; j++) assert.ok(relErr(ours.p[j], ref[j]) <= 1e-6, `from ${p0}, p[${j}]: ${ours.p[j]} vs ${ref[j]}`);
    }
  });
});

/** Standard normal deviates from a fixed seed (mulberry32 uniform, Box–Muller). */
function gaussian(seed: number): () => number {
  let a = seed >>> 0;
  const uniform = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => {
    const u = 1 - uniform();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * uniform());
  };
}
