// A fit's residuals: round-off of the data's scale is reported as exactly 0, a real misfit is
// not, and the plot of residuals gets a least half-height tied to the data's scale.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { ROUND_OFF_EPSILONS, RESIDUAL_AXIS_FLOOR, residualAxisFloor, withoutRoundOff } from '../../src/output/residuals.ts';
import { near, reportOf, cell } from './helpers.ts';

const EPS = Number.EPSILON;

/** First-order decay C' = -k C fitted to `rows` ([t in h, C in mg/L]) for k and the starting value. */
function decayFit(rows: number[][]) {
  return reportOf({ format: 'ratebook-study', version: 1, title: 'decay', cells: [
    { id: 'd', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows },
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.1 / h' }] },
    { id: 'plasma', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '10 mg / L' },
    { id: 'f', kind: 'fit', rates: ['plasma'], data: 'd', time: 't', observe: { C: 'C' },
      estimate: [{ parameter: 'k', as: 'k_fit', guess: '0.2 / h' }, { parameter: 'C', as: 'C0_fit', guess: '10 mg / L' }] },
  ] });
}

describe('the round-off rule', () => {
  it('zeroes a residual within 128 ε of the scale, and keeps anything larger', () => {
    assert.equal(ROUND_OFF_EPSILONS, 128);
    const scale = 0.01; // 10 mg/L in SI (kg/m³)
    assert.equal(withoutRoundOff(8.67e-18, scale), 0, '4 ε of the scale');
    assert.equal(withoutRoundOff(-128 * EPS * scale, scale), 0, 'at the bound');
    const above = 129 * EPS * scale;
    assert.equal(withoutRoundOff(above, scale), above, 'just above the bound');
    assert.equal(withoutRoundOff(1e-12, scale), 1e-12, 'a solver-sized error (1e-10 relative) is kept');
    assert.equal(withoutRoundOff(-3e-4, scale), -3e-4);
  });

  it('gives a residual axis at least a millionth of the scale high', () => {
    assert.equal(RESIDUAL_AXIS_FLOOR, 1e-6);
    assert.equal(residualAxisFloor(0.01), 1e-8);
    near(residualAxisFloor(-343.15), 343.15e-6, 1e-15);
  });
});

describe('a fit through as many points as estimates', () => {
  // closed form (first-order decay): C(t) = C0 e^(-k t) through (1 h, 8) and (4 h, 3) gives
  // k = ln(8/3) / 3 per hour and C0 = 8 e^k mg/L; the curve meets both points, so every
  // residual is zero: the model computes them as ~1e-15 mg/L (a few ε of 10 mg/L)
  const f = cell(decayFit([[1, 8], [4, 3]]), 'f');

  it('finds the closed form, and reports its residuals as exactly 0', () => {
    assert.equal(f.ok, true, JSON.stringify(f.error));
    const k = Math.log(8 / 3) / 3;
    near(f.estimates!.k_fit.value.value, k, 1e-7, 'k_fit (1/h)');
    near(f.estimates!.C0_fit.value.value, 8 * Math.exp(k), 1e-7, 'C0_fit (mg/L)');
    assert.deepEqual(f.residuals!.map((r) => r.residual.value), [0, 0]);
    assert.deepEqual(f.residuals!.map((r) => r.residual.si), [0, 0]);
    assert.ok(f.residuals!.every((r) => !Object.is(r.residual.si, -0)), 'no negative zero');
    // the objective is the sum of the squared residuals: of round-off, so 0 like them
    assert.equal(f.objective, 0);
  });

  it('gives the residual plot a floor of a millionth of the data\'s scale', () => {
    // hand-worked: the scale is the largest of 10 (the start), 8 and 3 mg/L: 1e-6 × 10 = 1e-5 mg/L
    assert.equal(f.residualFloor!.unit, 'mg / L');
    near(f.residualFloor!.value, 1e-5, 1e-12);
  });
});

describe('a fit that misses its points', () => {
  it('keeps its residuals, and their squares add up to residualSD² times the degrees of freedom', () => {
    // invented points off any one exponential (a bump at 2 h)
    const f = cell(decayFit([[0, 10], [1, 8.5], [2, 8], [4, 4.5], [8, 2]]), 'f');
    assert.equal(f.ok, true, JSON.stringify(f.error));
    const r = f.residuals!.map((x) => x.residual.value);
    assert.ok(r.every((x) => x !== 0), `residuals ${r}`);
    assert.ok(Math.max(...r.map(Math.abs)) > 0.05, 'a misfit of tenths of a mg/L');
    // the definition of the residual standard deviation: s² = Σ r² / (n - p)
    assert.equal(f.dof, 3);
    near(r.reduce((s, x) => s + x * x, 0), f.residualSD!.value ** 2 * 3, 1e-9, 'Σ r²');
    // the objective of an unweighted fit is Σ r² itself, in SI ((kg/m³)²)
    const si = f.residuals!.map((x) => x.residual.si);
    near(f.objective!, si.reduce((s, x) => s + x * x, 0), 1e-9, 'objective');
  });
});
