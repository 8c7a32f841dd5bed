// The digits a Bayesian (MAP) fit vouches for, against the exact posterior mode. The fits go
// through the study format and the session: the laws are integrated (rtol 1e-10), differenced
// centrally and polished (src/numerics/fit/fit-polish.ts). The reference mode is computed
// outside the engine: the law's closed form (one-compartment IV bolus, C = D/V·e^(−k·t), by
// superposition for repeated doses: Gibaldi & Perrier, Pharmacokinetics, 2nd ed., 1982, ch. 1
// and 3), the study format's MAP objective written out by hand, its exact gradient and
// Hessian by mathjs's symbolic derivative, and Newton's method on them from the minimum
// ml-levenberg-marquardt (npm) finds, to rounding. Each estimate must agree with the mode to
// at least the digits claimed (log relative error, McCullough, The American Statistician 52,
// 1998), from several starts. Levels and priors are invented demo numbers.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { derivative, type EvalFunction, compile } from 'mathjs';
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { runStudy, type CellReport } from '../../src/index.ts';

type Q = { value: number; unit: string; si: number };
type FitOut = CellReport & { estimates: Record<string, { value: Q }>; digits?: number; converged: boolean; evaluations: number };

/** Significant digits two numbers share (log relative error). */
const lre = (x: number, c: number) => -Math.log10(Math.abs(x - c) / Math.abs(c));

/**
 * The exact zero of the gradient of `objective` (a mathjs expression in `vars`), from `start`:
 * ml-levenberg-marquardt on the residual `terms` first, then Newton's method on the symbolic
 * gradient and Hessian until the step is at rounding.
 */
function mode(objective: string, terms: string[], vars: string[], start: number[]): number[] {
  const termFns = terms.map((t) => compile(t));
  const scope = (x: number[]) => Object.fromEntries(vars.map((v, i) => [v, x[i]]));
  const rough = levenbergMarquardt({ x: terms.map((_, i) => i), y: terms.map(() => 0) },
    (x: number[]) => (i: number) => termFns[i].evaluate(scope(x)) as number,
    { initialValues: start, damping: 1e-2, maxIterations: 2000, errorTolerance: 0, gradientDifference: 1e-7, centralDifference: true, improvementThreshold: 1e-6 });
  const grad: EvalFunction[] = vars.map((v) => derivative(objective, v, { simplify: false }).compile() as unknown as EvalFunction);
  const hess: EvalFunction[][] = vars.map((a) => vars.map((b) => derivative(derivative(objective, a, { simplify: false }), b, { simplify: false }).compile() as unknown as EvalFunction));
  let x = [...rough.parameterValues];
  for (let it = 0; it < 50; it++) {
    const g = grad.map((f) => f.evaluate(scope(x)) as number);
    const h = hess.map((row) => row.map((f) => f.evaluate(scope(x)) as number));
    // 2×2 solve h·s = g
    const det = h[0][0] * h[1][1] - h[0][1] * h[1][0];
    assert.ok(h[0][0] > 0 && det > 0, 'the reference is a minimum (Hessian positive definite)');
    const s = [(g[0] * h[1][1] - g[1] * h[0][1]) / det, (h[0][0] * g[1] - h[1][0] * g[0]) / det];
    x = [x[0] - s[0], x[1] - s[1]];
    if (Math.abs(s[0]) <= 1e-15 * Math.max(1, Math.abs(x[0])) && Math.abs(s[1]) <= 1e-15 * Math.max(1, Math.abs(x[1]))) break;
  }
  return x;
}

/** The contract's residual term of one level: (y − f)/σ, σ² = additive² + (proportional·f)². */
const levelTerm = (f: string, y: number, add: number, prop: number) => `(${y} - (${f})) / sqrt(${add}^2 + (${prop} * (${f}))^2)`;
const priorTerm = (v: string, median: number, omega: number) => `(${v} - log(${median})) / ${omega}`;
const sumOfSquares = (terms: string[]) => terms.map((t) => `(${t})^2`).join(' + ');

/** Checks a fit against the reference values (same units), and returns the digits claimed. */
function checkDigits(fit: FitOut, names: string[], reference: number[], what: string): number {
  assert.equal(fit.ok, true, `${what}: ${JSON.stringify(fit.error)}`);
  assert.equal(fit.converged, true, what);
  assert.ok(fit.digits !== undefined && fit.digits >= 6, `${what}: digits ${fit.digits}`);
  names.forEach((name, j) => {
    const got = fit.estimates[name].value.value;
    assert.ok(lre(got, reference[j]) >= fit.digits!, `${what}: ${name} = ${got}, mode ${reference[j]}, agree to ${lre(got, reference[j]).toFixed(2)} digits, ${fit.digits} claimed`);
  });
  return fit.digits!;
}

describe('a MAP fit vouches for digits that the exact posterior mode confirms', () => {
  // A single IV bolus: C' = −k·C, C(0) = C0 estimated; four levels (invented), priors on k and C0.
  const LEVELS = [[1, 11.2], [3, 9.1], [6, 6.4], [12, 3.3]];
  const ADD = 0.2, PROP = 0.1;
  const lawsStudy = (estimate: unknown[]) => runStudy({ format: 'ratebook-study', version: 1, title: 'MAP digits', cells: [
    { id: 'levels', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: LEVELS },
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.2 / h' }] },
    { id: 'drug', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '8 mg / L' },
    { id: 'f', kind: 'fit', rates: ['drug'], data: 'levels', time: 't', observe: { C: 'C' }, estimate, error: { additive: `${ADD} mg / L`, proportional: PROP } },
  ] });
  const fitOf = (r: ReturnType<typeof runStudy>) => { assert.ok(r.ok); return (r as { report: { cells: CellReport[] } }).report.cells[3] as FitOut; };

  it('priors on k and C0: the same mode to the digits claimed from three starts (u = log C0, v = log k)', () => {
    const model = 'exp(u - exp(v) * T)';
    const terms = [...LEVELS.map(([t, y]) => levelTerm(model.replace('T', String(t)), y, ADD, PROP)), priorTerm('u', 10, 0.3), priorTerm('v', 0.1, 0.4)];
    const [u, v] = mode(sumOfSquares(terms), terms, ['u', 'v'], [Math.log(10), Math.log(0.1)]);
    const reference = [Math.exp(v), Math.exp(u)];
    for (const [k0, c0] of [[0.1, 10], [0.02, 3], [0.6, 40]]) {
      const fit = fitOf(lawsStudy([
        { parameter: 'k', as: 'k_i', guess: `${k0} / h`, prior: { median: '0.1 / h', omega: 0.4 } },
        { parameter: 'C', as: 'C0_i', guess: `${c0} mg / L`, prior: { median: '10 mg / L', omega: 0.3 } }]));
      checkDigits(fit, ['k_i', 'C0_i'], reference, `start k ${k0} / h, C0 ${c0} mg/L`);
    }
  });

  it('a prior on k alone, C0 flat (searched on its own scale): the digits count C0 relative to itself', () => {
    const f = (t: number) => `c * exp(-exp(v) * ${t})`;
    const terms = [...LEVELS.map(([t, y]) => levelTerm(f(t), y, ADD, PROP)), priorTerm('v', 0.1, 0.4)];
    const [c, v] = mode(sumOfSquares(terms), terms, ['c', 'v'], [10, Math.log(0.1)]);
    const reference = [Math.exp(v), c];
    for (const [k0, c0] of [[0.1, 10], [0.03, 20]]) {
      const fit = fitOf(lawsStudy([
        { parameter: 'k', as: 'k_i', guess: `${k0} / h`, prior: { median: '0.1 / h', omega: 0.4 } },
        { parameter: 'C', as: 'C0_i', guess: `${c0} mg / L` }]));
      checkDigits(fit, ['k_i', 'C0_i'], reference, `start k ${k0} / h, C0 ${c0} mg/L`);
    }
  });

  it('through a run of two doses: CL and V with priors, the mode of the superposition to the digits claimed', () => {
    // 500 mg at 0 h and 12 h into V; levels (invented) at 2, 11.5, 14 and 23.5 h
    const rows = [[2, 9.1], [11.5, 4.2], [14, 12.2], [23.5, 5.6]];
    const study = (cl0: number, v0: number) => runStudy({ format: 'ratebook-study', version: 1, title: 'MAP digits through a run', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'CL', value: '5 L / h' }, { name: 'V', value: '40 L' }, { name: 'dose', value: '500 mg' }] },
      { id: 'elim', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-CL / V * C', initial: '0 mg / L' },
      { id: 'regimen', kind: 'simulate', rates: ['elim'], from: '0 h', to: '24 h', events: [{ at: '0 h', every: '12 h', count: 2, add: { C: 'dose / V' } }] },
      { id: 'levels', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows },
      { id: 'f', kind: 'fit', run: 'regimen', data: 'levels', time: 't', observe: { C: 'C' },
        estimate: [
          { parameter: 'CL', as: 'CL_i', guess: `${cl0} L / h`, prior: { median: '5 L / h', omega: 0.3 } },
          { parameter: 'V', as: 'V_i', guess: `${v0} L`, prior: { median: '40 L', omega: 0.2 } }],
        error: { additive: '0.3 mg / L', proportional: 0.1 } },
    ] });
    // C(t) = Σ over doses given by t of 500/V·e^(−CL/V·(t − t_d)), CL = e^a, V = e^b
    const c = (t: number) => [0, 12].filter((d) => d <= t).map((d) => `500 / exp(b) * exp(-exp(a - b) * ${t - d})`).join(' + ');
    const terms = [...rows.map(([t, y]) => levelTerm(c(t), y, 0.3, 0.1)), priorTerm('a', 5, 0.3), priorTerm('b', 40, 0.2)];
    const [a, b] = mode(sumOfSquares(terms), terms, ['a', 'b'], [Math.log(5), Math.log(40)]);
    const reference = [Math.exp(a), Math.exp(b)];
    for (const [cl0, v0] of [[5, 40], [2, 80], [12, 20]]) {
      const r = study(cl0, v0);
      assert.ok(r.ok);
      checkDigits((r as { report: { cells: CellReport[] } }).report.cells[4] as FitOut, ['CL_i', 'V_i'], reference, `start CL ${cl0} L/h, V ${v0} L`);
    }
  });
});
