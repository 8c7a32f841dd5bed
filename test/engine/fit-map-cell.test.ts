// The fit cell with priors and an error model (a Bayesian, MAP, estimate) through the engine,
// against outside references: the closed-form one-compartment decay C = C0·e^(−k·t) with the
// contract's objective written out by hand, minimised by ml-levenberg-marquardt (npm), its
// curvature by mathjs's symbolic derivative, and the limits of a very weak and a very strong prior.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { derivative } from 'mathjs';
import { runStudy, type CellReport } from '../../src/index.ts';
import { inverseSpd } from '../../src/numerics/fit/map-objective.ts';

type Q = { value: number; unit: string; si: number };
type Est = { value: Q; standardError?: Q; ci95?: Q[]; logSD?: number; prior?: { median: Q; omega: number; ratio: number; shift: number } };

// Two invented drug levels (mg/L) at 2 h and 10 h after a dose; demo numbers.
const LEVELS: number[][] = [[2, 7.9], [10, 2.6]];

function study(fit: Record<string, unknown>, rows = LEVELS, extraEstimates?: unknown[]): CellReport[] {
  const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [
    { id: 'levels', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows },
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.2 / h' }] },
    { id: 'drug', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '8 mg / L' },
    { id: 'f', kind: 'fit', rates: ['drug'], data: 'levels', time: 't', observe: { C: 'C' },
      estimate: extraEstimates ?? [
        { parameter: 'k', as: 'k_i', guess: '0.2 / h', prior: { median: '0.1 / h', omega: 0.4 } },
        { parameter: 'C', as: 'C0_i', guess: '8 mg / L', prior: { median: '10 mg / L', omega: 0.3 } }],
      error: { additive: '0.5 mg / L', proportional: 0.1 }, ...fit },
    { id: 'below', kind: 'parameters', items: [{ name: 't_half_i', value: 'log(2) / k_i' }] },
  ] });
  assert.ok(r.ok);
  return (r as { report: { cells: CellReport[] } }).report.cells;
}

/** The contract's objective on (log C0, log k) for the two levels, term by term, written out by hand. */
function handTerms(th: number[], add: number, prop: number, priors: Array<[number, number]>): number[] {
  return [
    ...LEVELS.map(([t, y]) => {
      const f = Math.exp(th[0] - Math.exp(th[1]) * t);
      return (y - f) / Math.sqrt(add ** 2 + (prop * f) ** 2);
    }),
    ...priors.map(([median, omega], j) => (th[j] - Math.log(median)) / omega),
  ];
}
const near = (x: number, want: number, rel: number, what: string) =>
  assert.ok(Math.abs(x - want) <= rel * Math.abs(want), `${what}: ${x} vs ${want}`);

describe('a Bayesian (MAP) fit cell', () => {
  it('answers with two levels and two parameters, at the minimum ml-levenberg-marquardt finds for the hand-written objective', () => {
    const [, , , fit, below] = study({});
    assert.equal(fit.ok, true, JSON.stringify(fit.error));
    assert.equal(fit.bayesian, true);
    const est = fit.estimates as Record<string, Est>;
    const priors: Array<[number, number]> = [[10, 0.3], [0.1, 0.4]];
    const ref = levenbergMarquardt({ x: [0, 1, 2, 3], y: [0, 0, 0, 0] }, (th: number[]) => (x: number) => handTerms(th, 0.5, 0.1, priors)[x], {
      initialValues: [Math.log(8), Math.log(0.2)], damping: 1e-2, maxIterations: 2000, errorTolerance: 0,
      gradientDifference: 1e-7, centralDifference: true, improvementThreshold: 1e-6,
    });
    const [u, v] = ref.parameterValues;
    near(est.C0_i.value.value, Math.exp(u), 1e-5, 'C0 (ml-levenberg-marquardt on the closed form)');
    near(est.k_i.value.value, Math.exp(v), 1e-5, 'k (ml-levenberg-marquardt on the closed form)');
    near(fit.objective as number, handTerms([u, v], 0.5, 0.1, priors).reduce((s, x) => s + x * x, 0), 1e-6, 'objective (hand-written)');
    // pulled toward the prior: between the prior median and the value through both points (closed form)
    const kThrough = Math.log(7.9 / 2.6) / 8;
    assert.ok(est.k_i.value.value > 0.1 && est.k_i.value.value < kThrough, `${est.k_i.value.value}`);
    // the prior beside the estimate, and how far the data moved it
    assert.equal(est.k_i.prior!.median.unit, '1 / h');
    near(est.k_i.prior!.median.value, 0.1, 1e-12, 'median');
    near(est.k_i.prior!.ratio, est.k_i.value.value / 0.1, 1e-9, 'ratio');
    near(est.k_i.prior!.shift, Math.log(est.k_i.value.value / 0.1) / 0.4, 1e-9, 'shift in omegas');
    // downstream names follow
    near((below.values as Record<string, Q>).t_half_i.si / 3600, Math.log(2) / est.k_i.value.value, 1e-9, 'half-life below');
    assert.match(String(fit.summary), /^Bayesian \(MAP\) estimate: /);
  });

  it('gives standard errors and intervals from the curvature (mathjs symbolic second derivative of the closed-form objective)', () => {
    const [, , , fit] = study({});
    const est = fit.estimates as Record<string, Est>;
    const term = (t: number, y: number) => `(${y} - exp(u - exp(v) * ${t}))^2 / (0.5^2 + (0.1 * exp(u - exp(v) * ${t}))^2)`;
    const obj = `${term(2, 7.9)} + ${term(10, 2.6)} + (u - log(10))^2 / 0.3^2 + (v - log(0.1))^2 / 0.4^2`;
    const at = { u: Math.log(est.C0_i.value.value), v: Math.log(est.k_i.value.value) };
    const d2 = (a: string, b: string) => derivative(derivative(obj, a, { simplify: false }), b, { simplify: false }).evaluate(at) as number;
    const cov = inverseSpd(Float64Array.from([d2('u', 'u'), d2('u', 'v'), d2('v', 'u'), d2('v', 'v')]), 2)!;
    const sdLogC0 = Math.sqrt(2 * cov[0]), sdLogK = Math.sqrt(2 * cov[3]);
    near(est.C0_i.logSD!, sdLogC0, 1e-3, 'SD of log C0');
    near(est.k_i.logSD!, sdLogK, 1e-3, 'SD of log k');
    near(est.k_i.standardError!.value, est.k_i.value.value * sdLogK, 1e-3, 'SE of k (first order)');
    near(est.k_i.ci95![0].value, est.k_i.value.value * Math.exp(-1.959964 * sdLogK), 1e-3, 'lower 95% (log scale)');
    near(est.k_i.ci95![1].value, est.k_i.value.value * Math.exp(1.959964 * sdLogK), 1e-3, 'upper 95% (log scale)');
    assert.deepEqual(fit.warnings ?? [], []);
  });

  it('with a very weak prior (omega 100) gives least squares; with a very strong one (omega 1e-4) the medians', () => {
    const weak = study({ error: { additive: '0.5 mg / L' } }, LEVELS, [
      { parameter: 'k', as: 'k_i', guess: '0.2 / h', prior: { median: '0.1 / h', omega: 100 } },
      { parameter: 'C', as: 'C0_i', guess: '8 mg / L', prior: { median: '10 mg / L', omega: 100 } }])[3];
    const k = Math.log(7.9 / 2.6) / 8; // through both points (closed form)
    near((weak.estimates as Record<string, Est>).k_i.value.value, k, 1e-4, 'k, weak prior');
    near((weak.estimates as Record<string, Est>).C0_i.value.value, 7.9 * Math.exp(2 * k), 1e-4, 'C0, weak prior');
    const strong = study({}, LEVELS, [
      { parameter: 'k', as: 'k_i', guess: '0.2 / h', prior: { median: '0.1 / h', omega: 1e-4 } },
      { parameter: 'C', as: 'C0_i', guess: '8 mg / L', prior: { median: '10 mg / L', omega: '1e-4' } }])[3];
    near((strong.estimates as Record<string, Est>).k_i.value.value, 0.1, 1e-5, 'k, strong prior');
    near((strong.estimates as Record<string, Est>).C0_i.value.value, 10, 1e-5, 'C0, strong prior');
  });

  it('with one level and a prior on k alone (C0 known) answers what a 1-D minimisation of the closed form gives', () => {
    const [, , , fit] = study({ error: { additive: '0.4 mg / L' } }, [[6, 3.0]], [{ parameter: 'k', as: 'k_i', guess: '0.2 / h', prior: { median: '0.15 / h', omega: 0.5 } }]);
    const terms = (v: number) => { const f = 8 * Math.exp(-Math.exp(v) * 6); return [(3.0 - f) / 0.4, (v - Math.log(0.15)) / 0.5]; };
    const ref = levenbergMarquardt({ x: [0, 1], y: [0, 0] }, ([v]: number[]) => (x: number) => terms(v)[x], {
      initialValues: [Math.log(0.2)], damping: 1e-2, maxIterations: 2000, errorTolerance: 0, gradientDifference: 1e-7, centralDifference: true, improvementThreshold: 1e-6,
    });
    near((fit.estimates as Record<string, Est>).k_i.value.value, Math.exp(ref.parameterValues[0]), 1e-5, 'k (ml-levenberg-marquardt)');
    assert.equal(fit.dof, 0);
  });

  it('without a prior and without degrees of freedom still says so', () => {
    const [, , , fit] = study({ error: undefined }, [[2, 7.9]], [{ parameter: 'k', as: 'k_i', guess: '0.2 / h' }, { parameter: 'C', as: 'C0_i', guess: '8 mg / L' }]);
    assert.equal(fit.ok, false);
    assert.match(fit.error!.message, /fewer data points than parameters/);
  });

  it('reports the objective of an ordinary fit: the sum of squared residuals', () => {
    const [, , , fit] = study({ error: undefined }, [[1, 6.5], [2, 5.6], [4, 3.9], [8, 2.1]], [{ parameter: 'k', as: 'k_i', guess: '0.2 / h' }]);
    const res = fit.residuals as Array<{ residual: Q }>;
    near(fit.objective as number, res.reduce((s, r) => s + r.residual.si ** 2, 0), 1e-9, 'Σ residual² (hand-worked from the report)');
    assert.equal(fit.bayesian, undefined);
  });
});

describe('bad priors and error models, each on its field', () => {
  const base = (prior: unknown, error: unknown = { additive: '0.5 mg / L' }, extra: Record<string, unknown> = {}) =>
    study({ error, ...extra }, LEVELS, [{ parameter: 'k', as: 'k_i', guess: '0.2 / h', prior }, { parameter: 'C', as: 'C0_i', guess: '8 mg / L' }])[3];
  const cases: Array<[string, CellReport, string, RegExp]> = [
    ['omega zero', base({ median: '0.1 / h', omega: 0 }), 'cells[3].estimate[0].prior.omega', /omega .* must be above zero/],
    ['omega negative', base({ median: '0.1 / h', omega: '-0.2' }), 'cells[3].estimate[0].prior.omega', /must be above zero/],
    ['omega with a unit', base({ median: '0.1 / h', omega: '0.2 h' }), 'cells[3].estimate[0].prior.omega', /plain number/],
    ['median of the wrong dimension', base({ median: '0.1 mg', omega: 0.3 }), 'cells[3].estimate[0].prior.median', /must be .* like k/],
    ['median not above zero', base({ median: '0 / h', omega: 0.3 }), 'cells[3].estimate[0].prior.median', /above zero/],
    ['a prior without an error model', study({ error: undefined }, LEVELS, [{ parameter: 'k', as: 'k_i', guess: '0.2 / h', prior: { median: '0.1 / h', omega: 0.3 } }])[3], 'cells[3].error', /needs an error model/],
    ['a negative additive SD', base({ median: '0.1 / h', omega: 0.3 }, { additive: '-0.5 mg / L' }), 'cells[3].error.additive', /must not be negative/],
    ['a negative proportional SD', base({ median: '0.1 / h', omega: 0.3 }, { proportional: -0.1 }), 'cells[3].error.proportional', /must not be negative/],
    ['both SDs zero', base({ median: '0.1 / h', omega: 0.3 }, { additive: '0 mg / L', proportional: 0 }), 'cells[3].error.additive', /cannot both be zero/],
    ['an additive SD of another dimension', base({ median: '0.1 / h', omega: 0.3 }, { additive: '0.5 mg' }), 'cells[3].error.additive', /like the column "C"/],
    ['a weighting beside the error model', base({ median: '0.1 / h', omega: 0.3 }, undefined, { error: { proportional: 0.1 }, weighting: 'relative' }), 'cells[3].weighting', /weighting must be "none"/],
  ];
  for (const [name, fit, path, message] of cases) {
    it(name, () => {
      assert.equal(fit.ok, false);
      const all = [fit.error, ...((fit.errors as Array<{ path: string; message: string }> | undefined) ?? [])].filter(Boolean) as Array<{ path: string; message: string }>;
      assert.ok(all.some((e) => e.path === path && message.test(e.message)), JSON.stringify(all));
    });
  }
  it('a guess not above zero under a prior', () => {
    const fit = study({}, LEVELS, [{ parameter: 'k', as: 'k_i', guess: '0 / h', prior: { median: '0.1 / h', omega: 0.3 } }])[3];
    assert.equal(fit.error?.path, 'cells[3].estimate[0].guess');
  });
});
