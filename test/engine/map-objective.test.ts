// The MAP estimate over plain numbers (src/numerics/fit/map-objective.ts) against outside
// references: the conjugate normal posterior (closed form), the Levenberg–Marquardt of the
// `ml-levenberg-marquardt` package (npm) on an independently written objective, and mathjs's
// symbolic derivative for the curvature.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { derivative } from 'mathjs';
import { curvature, fitMap, inverseSpd, objectiveParts, Z95, type MapProblem } from '../../src/numerics/fit/map-objective.ts';
import { fitLeastSquares } from '../../src/numerics/fit/least-squares.ts';

const near = (x: number, want: number, rel: number, what = '') =>
  assert.ok(Math.abs(x - want) <= rel * Math.max(Math.abs(want), 1e-300), `${what} ${x} vs ${want} (rel ${rel})`);

/**
 * A model linear in θ = log P with additive error: f_i = a_i + Σ_k B_ik·θ_k. With normal priors
 * on θ the posterior is normal (conjugate normal, e.g. Gelman et al., Bayesian Data Analysis,
 * 3rd ed., sec. 14.8): precision A = BᵀΣ⁻¹B + Ω⁻¹, mean A⁻¹(BᵀΣ⁻¹(y − a) + Ω⁻¹μ).
 */
function linearInLog(a: number[], b: number[][], y: number[], sd: number[], mu: number[], omega: number[]): MapProblem {
  return {
    predict: (p, f) => { a.forEach((ai, i) => { f[i] = ai + b[i].reduce((s, bik, k) => s + bik * Math.log(p[k]), 0); }); return true; },
    y, additive: sd, proportional: 0,
    priors: mu.map((m, k) => ({ median: Math.exp(m), omega: omega[k] })),
    p0: mu.map((m) => Math.exp(m + 0.3)),
  };
}

/** The closed-form posterior of `linearInLog` for one or two parameters (2×2 inverse by hand). */
function conjugate(a: number[], b: number[][], y: number[], sd: number[], mu: number[], omega: number[]) {
  const n = mu.length;
  const A = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) =>
    b.reduce((s, row, r) => s + (row[i] * row[j]) / sd[r] ** 2, 0) + (i === j ? 1 / omega[i] ** 2 : 0)));
  const rhs = Array.from({ length: n }, (_, i) => b.reduce((s, row, r) => s + (row[i] * (y[r] - a[r])) / sd[r] ** 2, 0) + mu[i] / omega[i] ** 2);
  let cov: number[][];
  if (n === 1) cov = [[1 / A[0][0]]];
  else {
    const det = A[0][0] * A[1][1] - A[0][1] * A[1][0];
    cov = [[A[1][1] / det, -A[0][1] / det], [-A[1][0] / det, A[0][0] / det]];
  }
  const mean = cov.map((row) => row.reduce((s, c, j) => s + c * rhs[j], 0));
  return { mean, cov };
}

describe('MAP estimate: conjugate normal closed form', () => {
  it('one parameter: mean, SD of log P and the interval exp(mean ± 1.96 SD)', () => {
    const args = [[1, 2, 0.5], [[2], [-1], [0.7]], [3.1, 0.4, 1.6], [0.2, 0.3, 0.25], [Math.log(2)], [0.4]] as const;
    const r = fitMap(linearInLog(...(args as unknown as Parameters<typeof linearInLog>)));
    const want = conjugate(...(args as unknown as Parameters<typeof conjugate>));
    assert.ok(r.converged, r.message);
    near(Math.log(r.p[0]), want.mean[0], 1e-7, 'posterior mean of log P (closed form)');
    near(r.workingSD![0], Math.sqrt(want.cov[0][0]), 1e-4, 'posterior SD of log P (closed form)');
    near(r.ci95![0][0], Math.exp(want.mean[0] - Z95 * Math.sqrt(want.cov[0][0])), 1e-4, 'lower 95% (closed form)');
    near(r.ci95![0][1], Math.exp(want.mean[0] + Z95 * Math.sqrt(want.cov[0][0])), 1e-4, 'upper 95% (closed form)');
    assert.equal(r.logScale[0], true);
  });

  it('two parameters from two observations: means, SDs and correlation (closed form)', () => {
    const a = [0.5, -0.2], b = [[1, 0.5], [0.3, -1.2]], y = [1.4, -0.9], sd = [0.1, 0.15], mu = [0.2, 1.1], omega = [0.3, 0.5];
    const r = fitMap(linearInLog(a, b, y, sd, mu, omega));
    const want = conjugate(a, b, y, sd, mu, omega);
    near(Math.log(r.p[0]), want.mean[0], 1e-7, 'mean θ1');
    near(Math.log(r.p[1]), want.mean[1], 1e-7, 'mean θ2');
    near(r.workingSD![0], Math.sqrt(want.cov[0][0]), 1e-4, 'SD θ1');
    near(r.workingSD![1], Math.sqrt(want.cov[1][1]), 1e-4, 'SD θ2');
    near(r.correlation![1], want.cov[0][1] / Math.sqrt(want.cov[0][0] * want.cov[1][1]), 1e-3, 'correlation');
  });

  it('property: random linear-in-log problems match the closed form', () => {
    fc.assert(fc.property(
      fc.array(fc.record({ a: fc.double({ min: -2, max: 2, noNaN: true }), b: fc.double({ min: 0.2, max: 3, noNaN: true }), e: fc.double({ min: -1, max: 1, noNaN: true }), sd: fc.double({ min: 0.05, max: 1, noNaN: true }) }), { minLength: 1, maxLength: 5 }),
      fc.double({ min: -3, max: 3, noNaN: true }), fc.double({ min: 0.05, max: 2, noNaN: true }),
      (pts, mu, omega) => {
        const a = pts.map((x) => x.a), b = pts.map((x) => [x.b]), sd = pts.map((x) => x.sd);
        const y = pts.map((x, i) => a[i] + b[i][0] * (mu + 0.5) + x.e * x.sd);
        const r = fitMap(linearInLog(a, b, y, sd, [mu], [omega]));
        const want = conjugate(a, b, y, sd, [mu], [omega]);
        near(Math.log(r.p[0]), want.mean[0], 1e-6, 'mean');
        near(r.workingSD![0], Math.sqrt(want.cov[0][0]), 1e-3, 'SD');
      }), { numRuns: 60 });
  });
});

// A nonlinear case: one-compartment decay C = C0·e^(−k·t), two levels, priors on C0 and k,
// combined additive and proportional error. Reference objective written out independently.
const times = [2, 10];
const levels = [7.9, 2.6];
const ADD = 0.5, PROP = 0.1;
const prior = [{ median: 10, omega: 0.3 }, { median: 0.1, omega: 0.4 }];
const decay: MapProblem = {
  predict: (p, f) => { times.forEach((t, i) => { f[i] = p[0] * Math.exp(-p[1] * t); }); return true; },
  y: levels, additive: [ADD, ADD], proportional: PROP, priors: prior, p0: [8, 0.2],
};
/** The contract's objective on θ = (log C0, log k) as four terms, each squared below, written out by hand. */
const handTerms = (th: number[]): number[] => [
  ...times.map((t, i) => {
    const f = Math.exp(th[0]) * Math.exp(-Math.exp(th[1]) * t);
    return (levels[i] - f) / Math.sqrt(ADD ** 2 + (PROP * f) ** 2);
  }),
  (th[0] - Math.log(10)) / 0.3, (th[1] - Math.log(0.1)) / 0.4,
];
const handObjective = (th: number[]): number => handTerms(th).reduce((s, x) => s + x * x, 0);
/** The same objective as a mathjs expression in u = log C0, v = log k. */
const term = (t: number, y: number) => `(${y} - exp(u) * exp(-exp(v) * ${t}))^2 / (${ADD}^2 + (${PROP} * exp(u) * exp(-exp(v) * ${t}))^2)`;
const symbolic = `${term(2, 7.9)} + ${term(10, 2.6)} + (u - log(10))^2 / 0.3^2 + (v - log(0.1))^2 / 0.4^2`;

describe('MAP estimate: a nonlinear model against reference libraries', () => {
  const r = fitMap(decay);
  it('the objective equals the independently written one', () => {
    const f = [10 * Math.exp(-0.2), 10 * Math.exp(-1)];
    const parts = objectiveParts(decay, [10, 0.1], f);
    near(parts.data + parts.prior, handObjective([Math.log(10), Math.log(0.1)]), 1e-12, 'hand-written objective');
    near(r.objective!, handObjective(Array.from(r.p, Math.log)), 1e-12, 'objective at the estimate');
  });

  it('its minimum is the one ml-levenberg-marquardt (npm) finds for the hand-written terms', () => {
    // the four terms as a "curve" at x = 0..3 fitted to zeros: the sum of squares is the objective
    const ref = levenbergMarquardt({ x: [0, 1, 2, 3], y: [0, 0, 0, 0] }, (th: number[]) => (x: number) => handTerms(th)[x], {
      initialValues: [Math.log(8), Math.log(0.2)], damping: 1e-2, maxIterations: 2000, errorTolerance: 0,
      gradientDifference: 1e-7, centralDifference: true, improvementThreshold: 1e-6,
    });
    near(Math.log(r.p[0]), ref.parameterValues[0], 1e-5, 'log C0 (ml-levenberg-marquardt)');
    near(Math.log(r.p[1]), ref.parameterValues[1], 1e-5, 'log k (ml-levenberg-marquardt)');
    assert.ok(r.objective! <= handObjective(ref.parameterValues) + 1e-9, `${r.objective} vs ${handObjective(ref.parameterValues)}`);
  });

  it('its curvature is mathjs\'s symbolic second derivative of the objective', () => {
    const u = Math.log(r.p[0]), v = Math.log(r.p[1]);
    const d2 = (x: string, y: string) => derivative(derivative(symbolic, x, { simplify: false }), y, { simplify: false }).evaluate({ u, v }) as number;
    const h = r.hessian!;
    near(h[0], d2('u', 'u'), 1e-4, 'H_uu (mathjs derivative)');
    near(h[3], d2('v', 'v'), 1e-4, 'H_vv (mathjs derivative)');
    near(h[1], d2('u', 'v'), 1e-3, 'H_uv (mathjs derivative)');
    // covariance 2·H⁻¹ (the objective is −2·log posterior)
    const cov = inverseSpd(Float64Array.from([d2('u', 'u'), d2('u', 'v'), d2('u', 'v'), d2('v', 'v')]), 2)!;
    near(r.workingSD![0], Math.sqrt(2 * cov[0]), 1e-4, 'SD of log C0');
    near(r.workingSD![1], Math.sqrt(2 * cov[3]), 1e-4, 'SD of log k');
    near(r.standardErrors![1], r.p[1] * r.workingSD![1], 1e-12, 'first-order SE on the natural scale');
  });

  it('a very weak prior (omega 100) gives the least-squares estimate; a very strong one (1e-4) the median', () => {
    const weak = fitMap({ ...decay, proportional: 0, priors: prior.map((p) => ({ ...p, omega: 100 })) });
    // least squares through two points with two parameters passes through both (closed form: k = ln(y1/y2)/(t2 − t1))
    const k = Math.log(7.9 / 2.6) / 8;
    near(weak.p[1], k, 1e-4, 'k through both points (closed form)');
    near(weak.p[0], 7.9 * Math.exp(2 * k), 1e-4, 'C0 through both points (closed form)');
    const ls = fitLeastSquares({ m: 2, p0: [8, 0.2], residuals: (p, out) => { times.forEach((t, i) => { out[i] = p[0] * Math.exp(-p[1] * t) - levels[i]; }); return true; } });
    near(weak.p[0], ls.p[0], 1e-4, 'C0 as the least-squares fitter');
    const strong = fitMap({ ...decay, priors: prior.map((p) => ({ ...p, omega: 1e-4 })) });
    near(strong.p[0], 10, 1e-5, 'median of C0');
    near(strong.p[1], 0.1, 1e-5, 'median of k');
    // with that prior the posterior SD of log P is about omega (the data add little curvature)
    near(strong.workingSD![0], 1e-4, 1e-3, 'SD ≈ omega');
  });

  it('curvature of a quadratic is exact (hand-worked: O = 3x² + 2xy + 5y², H = [[6, 2], [2, 10]])', () => {
    const h = curvature((x) => 3 * x[0] ** 2 + 2 * x[0] * x[1] + 5 * x[1] ** 2, [0.3, -1.2], [1e-3, 1e-3])!;
    [6, 2, 2, 10].forEach((want, i) => near(h[i], want, 1e-6, `H[${i}]`));
    assert.equal(inverseSpd(Float64Array.from([1, 2, 2, 1]), 2), null, 'an indefinite matrix has no Cholesky factor');
  });
});
