// The uncertainty cell against the GUM documents: the law of propagation of uncertainty of
// JCGM 100:2008 (GUM) 5.1.2 and 5.2.2 for linear models, where the first-order (linear) method
// is exact, with independent inputs and with correlated ones (a fit's estimates with the fit's
// covariance); and the Monte Carlo method of JCGM 101:2008 (GUM Supplement 1) on its additive
// model Y = X1 + X2 + X3 + X4 of clause 9.2.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { cell, reportOf, near } from './helpers.ts';
import type { ReportOf } from '../../src/index.ts';

const Z975 = 1.959963984540054; // the standard normal's 97.5% point (Abramowitz & Stegun 26.2)

describe('uncertainty, linear method: the law of propagation of uncertainty (JCGM 100:2008, 5.1.2)', () => {
  it('y = 3 x1 - 2 x2, x1 normal (SD 0.2 mg), x2 uniform on [4, 6] mg: u(y)² = 9·0.2² + 4·2²/12 (rectangular: (b - a)²/12, 4.3.7)', () => {
    const r = cell(reportOf({
      format: 'ratebook-study', version: 1, title: 'linear model',
      cells: [
        { id: 'p', kind: 'parameters', items: [
          { name: 'x1', value: '10 mg', spread: { distribution: 'normal', sd: '0.2 mg' } },
          { name: 'x2', value: '5 mg', spread: { distribution: 'uniform', from: '4 mg', to: '6 mg' } },
          { name: 'y', value: '3 * x1 - 2 * x2' }] },
        { id: 'u', kind: 'uncertainty', of: ['y'], method: 'linear' },
      ],
    }), 'u') as ReportOf<'uncertainty'>;
    assert.ok(r.ok, JSON.stringify(r.error));
    const y = r.results!.y;
    const u = Math.sqrt(9 * 0.2 ** 2 + 4 * 2 ** 2 / 12); // hand-worked: sqrt(0.36 + 1.3333) = 1.30128 mg
    assert.equal(y.sd!.unit, 'mg');
    near(y.sd!.value, u, 1e-9, 'u(y)');
    near(y.mean!.value, 20, 1e-12, 'y at the present values');
    near(y.p025!.value, 20 - Z975 * u, 1e-9, 'p025 = y - 1.96 u');
    near(y.p975!.value, 20 + Z975 * u, 1e-9, 'p975 = y + 1.96 u');
    assert.equal(r.evaluations, 5); // the present values, then two per input
  });

  it('a log-normal input is linear in its log: t = C / k with σ = sqrt(ln(1 + cv²)) gives u(t) = t·σ to first order (c = dt/d ln k = -t)', () => {
    const r = cell(reportOf({
      format: 'ratebook-study', version: 1, title: 'log-normal input',
      cells: [
        { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.8 / h', spread: { distribution: 'lognormal', cv: 0.15 } }, { name: 'tc', value: 'log(2.5) / k' }] },
        { id: 'u', kind: 'uncertainty', of: ['tc'], method: 'linear' },
      ],
    }), 'u') as ReportOf<'uncertainty'>;
    const t = Math.log(2.5) / 0.8;
    // central differences on ln k: -t·sinh(h)/h, h about 1e-3 of σ, so within 1e-6 (hand-worked)
    near(r.results!.tc.sd!.value, t * Math.sqrt(Math.log(1 + 0.15 ** 2)), 1e-6, 'u(t)');
    near(r.results!.tc.mean!.value, t, 1e-12, 't at the median of k');
  });

  it('correlated inputs, a fit\'s two estimates: u(z)² = Σ c_i c_j r_ij u_i u_j (5.2.2) with the fit\'s own standard errors and correlation', () => {
    // two studies: the names each method defines (z_p025 ...) may have one definer only
    const doc = (how: object) => ({
      format: 'ratebook-study', version: 1, title: 'fitted decay (invented measurements)',
      cells: [
        { id: 'data', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }],
          rows: [[0, 10.3], [1, 7.2], [2, 5.6], [3, 4.3], [4, 3.1], [6, 1.9], [8, 1.0]] },
        { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.3 / h' }] },
        { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '10 mg / L' },
        { id: 'fit', kind: 'fit', rates: ['law'], data: 'data', time: 't', observe: { C: 'C' },
          estimate: [{ parameter: 'k', as: 'k_hat', guess: '0.3 / h' }, { parameter: 'C', as: 'C0_hat', guess: '10 mg / L' }] },
        { id: 'z', kind: 'parameters', items: [{ name: 'z', value: '50 * k_hat * 1 h + 3 * C0_hat / (1 mg / L)' }] },
        { id: 'how', kind: 'uncertainty', of: ['z'], ...how },
      ],
    });
    const report = reportOf(doc({ method: 'linear' }));
    const fit = cell(report, 'fit') as ReportOf<'fit'>;
    assert.ok(fit.ok, JSON.stringify(fit.error));
    const uk = fit.estimates!.k_hat.standardError!.value; // 1/h
    const uc = fit.estimates!.C0_hat.standardError!.value; // mg/L
    const rkc = fit.correlation!.matrix[0][1];
    assert.ok(Math.abs(rkc) > 0.3, `the estimates are correlated (r = ${rkc})`);
    const u = Math.sqrt((50 * uk) ** 2 + (3 * uc) ** 2 + 2 * (50 * uk) * (3 * uc) * rkc);
    const lin = cell(report, 'how') as ReportOf<'uncertainty'>;
    assert.ok(lin.ok, JSON.stringify(lin.error));
    near(lin.results!.z.sd!.value, u, 1e-6, 'linear u(z)');
    assert.deepEqual(lin.inputs!.map((i) => i.name), ['C0_hat', 'k_hat']);
    assert.ok(lin.inputs!.every((i) => i.cell === 'fit'));
    // Monte Carlo with correlated draws (Cholesky): a normal sample SD has SD u / sqrt(2(n - 1))
    const mc = cell(reportOf(doc({ samples: 20000, seed: 5 })), 'how') as ReportOf<'uncertainty'>;
    assert.ok(mc.ok, JSON.stringify(mc.error));
    const sd = mc.results!.z.sd!.value;
    assert.ok(Math.abs(sd - u) < 4 * u / Math.sqrt(2 * 19999), `MC u(z) ${sd}, law of propagation ${u}`);
    // without the correlation the SD would be far off: the draws are joint
    const independent = Math.sqrt((50 * uk) ** 2 + (3 * uc) ** 2);
    assert.ok(Math.abs(sd - independent) > 8 * u / Math.sqrt(2 * 19999), `${sd} ${independent} ${u} ${rkc} ${uk} ${uc}`);
  });
});

/** P(S ≤ s) for S the sum of 4 uniforms on [0, 1] (the Irwin–Hall distribution): Σ_k (-1)^k C(4, k) (s - k)^4 / 4!, k ≤ s. */
function irwinHall4(s: number): number {
  const choose = [1, 4, 6, 4, 1];
  let sum = 0;
  for (let k = 0; k <= Math.floor(s) && k <= 4; k++) sum += (-1) ** k * choose[k] * (s - k) ** 4;
  return sum / 24;
}

/** The p-quantile of Y = Σ X_i, X_i uniform with mean 0 and SD 1 (on [-√3, √3]): Y = 2√3 (S - 2), by bisection of the closed form. */
function rectangularSumQuantile(p: number): number {
  let lo = 0, hi = 4;
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (irwinHall4(mid) < p) lo = mid; else hi = mid;
  }
  return 2 * Math.sqrt(3) * ((lo + hi) / 2 - 2);
}

describe('uncertainty, Monte Carlo: the additive model of JCGM 101:2008, clause 9.2', () => {
  const doc = (method: 'monte-carlo' | 'linear') => ({
    format: 'ratebook-study', version: 1, title: 'additive model',
    cells: [
      { id: 'p', kind: 'parameters', items: [
        ...[1, 2, 3, 4].map((i) => ({ name: `x${i}`, value: '0', spread: { distribution: 'normal', sd: '1' } })),
        ...[1, 2, 3, 4].map((i) => ({ name: `r${i}`, value: '0', spread: { distribution: 'uniform', from: '-sqrt(3)', to: 'sqrt(3)' } })),
        { name: 'Y_normal', value: 'x1 + x2 + x3 + x4' }, { name: 'Y_rect', value: 'r1 + r2 + r3 + r4' }] },
      { id: 'u', kind: 'uncertainty', of: ['Y_normal', 'Y_rect'], method, samples: 20000, seed: 9 },
    ],
  });

  it('the linear method (the GUM uncertainty framework): u(y) = 2 and the interval ±3.92 for both (9.2.2, 9.2.3)', () => {
    const r = cell(reportOf(doc('linear')), 'u') as ReportOf<'uncertainty'>;
    for (const name of ['Y_normal', 'Y_rect']) {
      near(r.results![name].sd!.value, 2, 1e-9, `${name} u(y)`);
      near(r.results![name].p975!.value, 2 * Z975, 1e-9, `${name} 97.5%`);
    }
  });

  it('20,000 samples: normal inputs give ±3.92 (9.2.2, exact: 1.96·2); rectangular inputs a narrower interval, ±3.88 in 9.2.3 (from memory), exact by Irwin–Hall', () => {
    const r = cell(reportOf(doc('monte-carlo')), 'u') as ReportOf<'uncertainty'>;
    assert.ok(r.ok, JSON.stringify(r.error));
    const n = 20000;
    // a sample quantile's SD: sqrt(p(1 - p)/n) / f(x_p); for N(0, 4) at 3.92, f = φ(1.96)/2
    const fNormal = Math.exp(-(Z975 ** 2) / 2) / Math.sqrt(2 * Math.PI) / 2;
    const tol = (f: number) => 4 * Math.sqrt(0.975 * 0.025 / n) / f;
    const yn = r.results!.Y_normal;
    assert.ok(Math.abs(yn.p975!.value - 2 * Z975) < tol(fNormal), `normal p975 ${yn.p975!.value}`);
    assert.ok(Math.abs(yn.p025!.value + 2 * Z975) < tol(fNormal), `normal p025 ${yn.p025!.value}`);
    const exact = rectangularSumQuantile(0.975);
    // the density of the scaled Irwin–Hall sum at the quantile: by a central difference of the closed form
    const s = exact / (2 * Math.sqrt(3)) + 2;
    const fRect = (irwinHall4(s + 1e-6) - irwinHall4(s - 1e-6)) / 2e-6 / (2 * Math.sqrt(3));
    const yr = r.results!.Y_rect;
    assert.ok(Math.abs(yr.p975!.value - exact) < tol(fRect), `rectangular p975 ${yr.p975!.value}, exact ${exact}`);
    assert.ok(Math.abs(yr.p025!.value + exact) < tol(fRect), `rectangular p025 ${yr.p025!.value}, exact ${-exact}`);
    assert.ok(Math.abs(exact - 3.88) < 0.01, `the exact quantile ${exact} rounds to JCGM 101's 3.88 (from memory)`);
    near(yr.sd!.value, 2, 0.02, 'u(y) = 2 (each input has SD 1)');
  });
});
