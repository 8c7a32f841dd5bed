// The least-squares fitter (src/numerics/fit/least-squares.ts) at its edges: bounds, too few points,
// parameters the data cannot separate, a model that fails, budgets, cancellation and invalid
// input. Nothing may throw, hang or hand back NaN.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import {
  FIT_MESSAGES, FitStatus, fitLeastSquares, type FitResult, type LeastSquaresProblem,
} from '../../src/numerics/fit/least-squares.ts';
import { brentRoot } from '../../src/numerics/brent.ts';

const relErr = (x: number, exact: number) => Math.abs(x - exact) / Math.abs(exact);

/** Every number in the result (arrays, typed arrays, nested objects) is finite, or ±Infinity where allowed. */
function assertNoNaN(value: unknown, path = 'result'): void {
  if (typeof value === 'number') assert.ok(!Number.isNaN(value), `${path} is NaN`);
  else if (ArrayBuffer.isView(value)) (value as Float64Array).forEach((v, i) => assert.ok(!Number.isNaN(v), `${path}[${i}] is NaN`));
  else if (Array.isArray(value)) value.forEach((v, i) => assertNoNaN(v, `${path}[${i}]`));
  else if (value && typeof value === 'object') for (const [k, v] of Object.entries(value)) assertNoNaN(v, `${path}.${k}`);
}

// Exponential decay y = A·e^(−k·t) with noise-free data at A = 2, k = 0.5 (closed form).
const TIMES = Array.from({ length: 11 }, (_, i) => i);
const DECAY_DATA = TIMES.map((t) => 2 * Math.exp(-0.5 * t));
function decayProblem(extra: Partial<LeastSquaresProblem> = {}, seen?: number[][]): LeastSquaresProblem {
  return {
    m: TIMES.length, p0: [1, 0.1],
    residuals: (p, out) => {
      seen?.push(Array.from(p));
      for (let i = 0; i < TIMES.length; i++) out[i] = p[0] * Math.exp(-p[1] * TIMES[i]) - DECAY_DATA[i];
      return true;
    },
    ...extra,
  };
}

describe('bounds', () => {
  it('stops on an upper bound that cuts off the optimum, reports it, and never evaluates beyond it', () => {
    // True k = 0.5 lies above the bound 0.3, so the constrained optimum has k = 0.3 and, for that k,
    // the A of linear least squares: A = Σ y·e^(−0.3t) / Σ e^(−0.6t) (closed form).
    const seen: number[][] = [];
    const r = fitLeastSquares(decayProblem({ upper: [Infinity, 0.3] }, seen));
    assert.equal(r.converged, true, r.status);
    assert.equal(r.p[1], 0.3);
    const A = TIMES.reduce((acc, t, i) => acc + DECAY_DATA[i] * Math.exp(-0.3 * t), 0)
      / TIMES.reduce((acc, t) => acc + Math.exp(-0.6 * t), 0);
    assert.ok(relErr(r.p[0], A) <= 1e-8, `A = ${r.p[0]}, closed form ${A}`);
    assert.deepEqual(r.atBound, [false, true]);
    assert.deepEqual(r.warnings.map((w) => [w.kind, w.parameters]), [['at-bound', [1]]]);
    assert.ok(seen.every((p) => p[1] <= 0.3), 'the model was called beyond the bound');
  });

  it('stops on a lower bound and satisfies the first-order conditions there', () => {
    // KKT conditions (closed form for a bound constraint): with A held at its lower bound 3, the
    // gradient of the cost along k vanishes, and along A it is positive (the cost falls below the bound).
    const seen: number[][] = [];
    const r = fitLeastSquares(decayProblem({ p0: [4, 0.1], lower: [3, 0] }, seen));
    assert.equal(r.converged, true, r.status);
    assert.equal(r.p[0], 3);
    assert.deepEqual(r.atBound, [true, false]);
    const res = r.residuals as Float64Array;
    const gA = TIMES.reduce((acc, t, i) => acc + res[i] * Math.exp(-r.p[1] * t), 0);
    const gk = TIMES.reduce((acc, t, i) => acc + res[i] * -r.p[0] * t * Math.exp(-r.p[1] * t), 0);
    assert.ok(gA > 0, `∂cost/∂A = ${gA}`);
    // |cos| of the angle between r and ∂r/∂k: zero at the optimum; ftol = 1e-12 leaves about √ftol
    const colK = TIMES.map((t) => -r.p[0] * t * Math.exp(-r.p[1] * t));
    const cosK = Math.abs(gk) / (Math.hypot(...colK) * Math.hypot(...res));
    assert.ok(cosK <= 1e-5, `cos = ${cosK}`);
    // and k is where ∂cost/∂k = 0 at A = 3, found independently by a 1-D zero finder (Brent)
    const dCostDk = (k: number) => TIMES.reduce((acc, t, i) => acc + (3 * Math.exp(-k * t) - DECAY_DATA[i]) * -3 * t * Math.exp(-k * t), 0);
    const zero = brentRoot(dCostDk, 0.5, 2, { xtol: 1e-14 });
    assert.equal(zero.converged, true);
    const kStar = zero.root;
    assert.ok(relErr(r.p[1], kStar) <= 1e-6, `k = ${r.p[1]}, zero of the derivative at ${kStar}`);
    assert.ok(seen.every((p) => p[0] >= 3 && p[1] >= 0));
  });

  it('moves a start outside the bounds onto them, and takes difference steps inward there', () => {
    const seen: number[][] = [];
    const r = fitLeastSquares(decayProblem({ p0: [1, 5], lower: [0, 0], upper: [10, 1] }, seen));
    assert.deepEqual(seen[0], [1, 1]);
    assert.ok(seen.every((p) => p[1] <= 1 && p[0] >= 0));
    assert.equal(r.converged, true);
    assert.ok(relErr(r.p[1], 0.5) <= 1e-6);
  });
});

describe('too few points and degrees of freedom', () => {
  it('fewer points than parameters: a clear status, the model never called', () => {
    let calls = 0;
    const r = fitLeastSquares({ m: 1, p0: [1, 1], residuals: () => { calls++; return true; } });
    assert.equal(r.status, 'too-few-points');
    assert.equal(r.converged, false);
    assert.equal(r.message, FIT_MESSAGES['too-few-points']);
    assert.match(r.detail ?? '', /1 data points cannot determine 2 parameters/);
    assert.equal(calls, 0);
    assert.equal(r.dof, -1);
    assertNoNaN(r);
  });

  it('as many points as parameters: fitted exactly, but no variance, errors or intervals', () => {
    // y = a·(1 − e^(−b·x)) through two points of a = 3, b = 0.2 (closed form data)
    const xs = [2, 10];
    const ys = xs.map((x) => 3 * (1 - Math.exp(-0.2 * x)));
    const r = fitLeastSquares({
      m: 2, p0: [1, 1],
      residuals: (p, out) => { xs.forEach((x, i) => { out[i] = p[0] * (1 - Math.exp(-p[1] * x)) - ys[i]; }); return true; },
    });
    assert.equal(r.converged, true, r.status);
    assert.ok(relErr(r.p[0], 3) <= 1e-8 && relErr(r.p[1], 0.2) <= 1e-8);
    assert.equal(r.dof, 0);
    assert.equal(r.covariance, null);
    assert.equal(r.standardErrors, null);
    assert.equal(r.ci95, null);
    assert.equal(r.residualSD, null);
    assert.ok(r.warnings.some((w) => w.kind === 'no-degrees-of-freedom'));
    assertNoNaN(r);
  });
});

describe('identifiability', () => {
  it('y = a·b·x with both free: converges on the product, flags both parameters, no covariance, no NaN', () => {
    // Only a·b is determined; it equals the least-squares slope Σxy/Σx² (closed form).
    const xs = [1, 2, 3, 4, 5, 6];
    const ys = xs.map((x, i) => 1.5 * x + [0.1, -0.05, 0.02, -0.08, 0.06, -0.03][i]);
    const slope = xs.reduce((a, x, i) => a + x * ys[i], 0) / xs.reduce((a, x) => a + x * x, 0);
    const r = fitLeastSquares({
      m: 6, p0: [1, 1],
      residuals: (p, out) => { xs.forEach((x, i) => { out[i] = p[0] * p[1] * x - ys[i]; }); return true; },
    });
    assert.equal(r.converged, true, r.status);
    assert.ok(relErr(r.p[0] * r.p[1], slope) <= 1e-9, `a·b = ${r.p[0] * r.p[1]}, slope ${slope}`);
    assert.equal(r.covariance, null);
    assert.equal(r.standardErrors, null);
    assert.equal(r.correlation, null);
    assert.equal(r.conditionNumber, Infinity);
    const w = r.warnings.find((x) => x.kind === 'not-identifiable');
    assert.ok(w, JSON.stringify(r.warnings));
    assert.deepEqual(w.parameters, [0, 1]);
    assert.match(w.message, /parameter 0 and parameter 1/);
    assert.ok(r.residualSD !== null && r.residualSD > 0);
    assertNoNaN(r);
  });

  it('a parameter the model ignores is named as having no effect', () => {
    const xs = [1, 2, 3, 4];
    const r = fitLeastSquares({
      m: 4, p0: [1, 7],
      residuals: (p, out) => { xs.forEach((x, i) => { out[i] = p[0] * x - 2 * x; }); return true; },
    });
    assert.equal(r.converged, true);
    assert.equal(r.p[1], 7);
    assert.deepEqual(r.warnings.filter((w) => w.kind === 'no-effect').map((w) => w.parameters), [[1]]);
    assert.equal(r.covariance, null);
    assertNoNaN(r);
  });

  it('nearly collinear columns: a warning naming both, with the condition number of the closed form', () => {
    // y = p0·x + p1·(x + ε·x²): for two parameters the column-scaled JᵀJ is [[1, c], [c, 1]],
    // whose condition number is (1 + |c|)/(1 − |c|) with c the cosine of the columns (closed form).
    const eps = 3e-5;
    const xs = Array.from({ length: 10 }, (_, i) => i + 1);
    const ys = xs.map((x, i) => 2 * x + 0.5 * (x + eps * x * x) + 0.01 * Math.sin(7 * i));
    const r = fitLeastSquares({
      m: xs.length, p0: [1, 1],
      residuals: (p, out) => { xs.forEach((x, i) => { out[i] = p[0] * x + p[1] * (x + eps * x * x) - ys[i]; }); return true; },
    });
    assert.equal(r.converged, true);
    const u = xs, v = xs.map((x) => x + eps * x * x);
    const dot = u.reduce((a, x, i) => a + x * v[i], 0);
    const c = dot / Math.sqrt(u.reduce((a, x) => a + x * x, 0) * v.reduce((a, x) => a + x * x, 0));
    const cond = (1 + c) / (1 - c);
    assert.ok(cond > 1e8 && cond < 1e12, `test set-up: cond ${cond}`);
    assert.ok(relErr(r.conditionNumber as number, cond) <= 1e-3, `cond ${r.conditionNumber} vs ${cond}`);
    const w = r.warnings.find((x) => x.kind === 'poorly-identified');
    assert.ok(w, JSON.stringify(r.warnings));
    assert.deepEqual(w.parameters, [0, 1]);
    assert.ok(r.covariance !== null && r.correlation !== null);
    assert.ok(r.correlation[1] < -0.9999, `correlation ${r.correlation[1]}`);
  });

  it('a well-posed fit reports the condition number of the closed form and no warning', () => {
    // decay y = A·e^(−k·t) at its optimum: analytic columns e^(−kt) and −A·t·e^(−kt)
    const r = fitLeastSquares(decayProblem());
    const [A, k] = r.p;
    const u = TIMES.map((t) => Math.exp(-k * t)), v = TIMES.map((t) => -A * t * Math.exp(-k * t));
    const c = Math.abs(u.reduce((a, x, i) => a + x * v[i], 0)) / Math.sqrt(u.reduce((a, x) => a + x * x, 0) * v.reduce((a, x) => a + x * x, 0));
    assert.ok(relErr(r.conditionNumber as number, (1 + c) / (1 - c)) <= 1e-6);
    assert.deepEqual(r.warnings, []);
  });
});

describe('a model that fails', () => {
  it('fails on a band of k the first step lands in: those steps are rejected and the fit still converges', () => {
    // From (10, 3) the first trial step lands near k = 0.63; the model refuses 0.6 < k < 1.5.
    const p = decayProblem({ p0: [10, 3] });
    const r = fitLeastSquares({ ...p, residuals: (x, out) => (x[1] > 0.6 && x[1] < 1.5 ? false : p.residuals(x, out)) });
    assert.equal(r.converged, true, r.status);
    assert.ok(r.modelFailures >= 1 && r.rejectedSteps >= r.modelFailures);
    assert.ok(relErr(r.p[0], 2) <= 1e-6 && relErr(r.p[1], 0.5) <= 1e-6);
  });

  it('a failing band it cannot cross: stops at its edge and says so', () => {
    // The model refuses 0.6 < k < 2.5, so from k = 3 the best reachable point is at k = 2.5.
    const p = decayProblem({ p0: [10, 3] });
    const r = fitLeastSquares({ ...p, residuals: (x, out) => (x[1] > 0.6 && x[1] < 2.5 ? false : p.residuals(x, out)) });
    assert.equal(r.status, 'model-failed-steps');
    assert.equal(r.converged, false);
    assert.ok(r.p[1] >= 2.5 && r.p[1] < 2.5 + 1e-6, `k = ${r.p[1]}`);
    assertNoNaN(r);
  });

  it('fails everywhere but the start: the derivatives cannot be formed, and the status says so', () => {
    const r = fitLeastSquares({
      m: 3, p0: [1, 2],
      residuals: (p, out) => { if (p[0] !== 1 || p[1] !== 2) return false; out.fill(1); return true; },
    });
    assert.equal(r.status, 'model-failed-jacobian');
    assert.deepEqual(Array.from(r.p), [1, 2]);
    assert.equal(r.jacobian, null);
    assert.equal(r.covariance, null);
    assert.ok(r.warnings.some((w) => w.kind === 'no-jacobian'));
    assertNoNaN(r);
  });

  it('fails at the start: one evaluation, a clear status', () => {
    const r = fitLeastSquares({ m: 3, p0: [1], residuals: () => false });
    assert.equal(r.status, 'model-failed-at-start');
    assert.equal(r.evaluations, 1);
    assert.equal(r.residuals, null);
    assertNoNaN(r);
  });

  it('NaN residuals and a thrown exception count as failures, with the exception in the detail', () => {
    const nan = fitLeastSquares({ m: 2, p0: [1], residuals: (_p, out) => { out[0] = 1; out[1] = Number.NaN; return true; } });
    assert.equal(nan.status, 'model-failed-at-start');
    const thrown = fitLeastSquares({ m: 2, p0: [1], residuals: () => { throw new Error('solver exploded'); } });
    assert.equal(thrown.status, 'model-failed-at-start');
    assert.match(thrown.detail ?? '', /solver exploded/);
    // thrown in the middle of a fit: a rejected step, recorded
    const p = decayProblem({ p0: [10, 3] });
    const r = fitLeastSquares({ ...p, residuals: (x, out) => { if (x[1] > 0.6 && x[1] < 1.5) throw new Error('stiff'); return p.residuals(x, out); } });
    assert.equal(r.converged, true);
    assert.equal(r.modelError, 'stiff');
  });
});

describe('budgets and cancellation', () => {
  it('stops at maxIterations with that status', () => {
    const r = fitLeastSquares(decayProblem({ p0: [0.2, 0.01] }), { maxIterations: 2 });
    assert.equal(r.status, 'max-iterations');
    assert.equal(r.iterations, 2);
    assert.equal(r.converged, false);
    assert.ok(r.covariance !== null, 'statistics at the best point so far');
  });

  it('stops at maxEvaluations, going over only by the final Jacobian', () => {
    let calls = 0;
    const p = decayProblem({ p0: [0.2, 0.01] });
    const r = fitLeastSquares({ ...p, residuals: (x, out) => { calls++; return p.residuals(x, out); } }, { maxEvaluations: 8 });
    assert.equal(r.status, 'max-evaluations');
    assert.equal(r.evaluations, calls);
    assert.ok(calls <= 8 + 2, `${calls} calls`);
  });

  it('a model that returns noise ends within its budget', () => {
    let seed = 1;
    const noise = () => { seed = (seed * 16807) % 2147483647; return seed / 2147483647 - 0.5; };
    let calls = 0;
    const r = fitLeastSquares({
      m: 10, p0: [1, 1, 1],
      residuals: (_p, out) => { calls++; for (let i = 0; i < 10; i++) out[i] = noise(); return true; },
    }, { maxEvaluations: 300 });
    assert.ok(calls <= 303, `${calls} calls`);
    assert.ok(Object.values(FitStatus).includes(r.status));
    assertNoNaN(r);
  });

  it('a cost with no minimum (the optimum runs off to infinity) ends within the default budget', () => {
    // y = e^p·x fitted to negative data: the cost decreases as p → −∞ and never reaches a minimum.
    let calls = 0;
    const r = fitLeastSquares({
      m: 3, p0: [0],
      residuals: (p, out) => { calls++; for (let i = 0; i < 3; i++) out[i] = Math.exp(p[0]) * (i + 1) + 1; return true; },
    });
    assert.ok(calls <= 200 * 2 + 1, `${calls} calls`);
    assertNoNaN(r);
  });

  it('cancellation stops before the next evaluation', () => {
    const signal = { aborted: false };
    let calls = 0;
    const p = decayProblem({ p0: [0.2, 0.01] });
    const r = fitLeastSquares({
      ...p, residuals: (x, out) => { calls++; if (calls === 5) signal.aborted = true; return p.residuals(x, out); },
    }, { signal });
    assert.equal(r.status, 'cancelled');
    assert.equal(calls, 5);
    assert.equal(r.evaluations, 5);
    assertNoNaN(r);
    const before = fitLeastSquares(decayProblem(), { signal: { aborted: true } });
    assert.equal(before.status, 'cancelled');
    assert.equal(before.evaluations, 0);
  });
});

describe('invalid input is a status naming the field, never an exception', () => {
  const cases: Array<[string, Partial<LeastSquaresProblem>, object, RegExp]> = [
    ['lower above upper', { lower: [0, 1], upper: [1, 0.5] }, {}, /lower\[1\]/],
    ['equal bounds', { lower: [0, 1], upper: [1, 1] }, {}, /lower\[1\]/],
    ['a NaN start', { p0: [1, Number.NaN] }, {}, /p0\[1\]/],
    ['an empty start', { p0: [] }, {}, /p0/],
    ['bounds of the wrong length', { lower: [0] }, {}, /lower must have one entry per parameter/],
    ['a zero scale', { scale: [1, 0] }, {}, /scale\[1\]/],
    ['m not an integer', { m: 2.5 }, {}, /m must be/],
    ['maxIterations 0', {}, { maxIterations: 0 }, /maxIterations/],
    ['a negative ftol', {}, { ftol: -1 }, /ftol/],
    ['diffStep 0', {}, { diffStep: 0 }, /diffStep/],
  ];
  for (const [name, change, options, field] of cases) {
    it(name, () => {
      let calls = 0;
      const p = decayProblem();
      const r = fitLeastSquares({ ...p, residuals: (x, out) => { calls++; return p.residuals(x, out); }, ...change }, options);
      assert.equal(r.status, 'invalid-input');
      assert.match(r.detail ?? '', field);
      assert.equal(calls, 0);
    });
  }
  it('a missing residuals function or problem', () => {
    assert.equal(fitLeastSquares({ m: 3, p0: [1] } as unknown as LeastSquaresProblem).status, 'invalid-input');
    assert.equal(fitLeastSquares(null as unknown as LeastSquaresProblem).status, 'invalid-input');
  });
});

describe('the status table', () => {
  it('has a message for every status, and a result carries its status\'s message', () => {
    for (const s of Object.values(FitStatus)) assert.ok(FIT_MESSAGES[s].length > 10, s);
    const r: FitResult = fitLeastSquares(decayProblem());
    assert.equal(r.message, FIT_MESSAGES[r.status]);
  });
});
