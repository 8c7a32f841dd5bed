// The uncertainty cell's Monte Carlo against exact distributions, with a statistical tolerance
// derived from the sampling distribution of each figure, at a fixed seed; and the seed's role.
//
// The model: Newton cooling dT/dt = -k (T - Ta) from T0, crossing the level L at
// t = ln((T0 - Ta)/(L - Ta)) / k (closed form). With k log-normal (median m, CV c, so
// sigma = sqrt(ln(1 + c²))), t = C/k is log-normal with median C/m and the same sigma: its
// p-quantile is the function at k's (1 - p)-quantile (a decreasing function maps quantiles
// across). Tolerances: a sample quantile's SD is about sqrt(p(1 - p)/n) / f(x_p), f the exact
// density (the asymptotic normality of sample quantiles, Cramér; e.g. Serfling 1980, 2.3.3);
// a mean's is SD/sqrt(n); a proportion's sqrt(p(1 - p)/n). Each check allows 4 of those SDs
// (a miss by chance about 6 in 100,000 per check).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { normalQuantile, normalUpperTail } from '../../src/numerics/fit/student-t.ts';
import { cell, reportOf } from './helpers.ts';
import type { ReportOf } from '../../src/index.ts';

const HOUR = 3600;
const MEDIAN_K = 0.8; // 1/h
const CV = 0.15;
const SIGMA = Math.sqrt(Math.log(1 + CV * CV));
const C = Math.log((70 - 20) / (40 - 20)); // ln((T0 - Ta)/(L - Ta)), T0 70 degC, Ta 20 degC, L 40 degC
const MEDIAN_T = C / MEDIAN_K; // hours

function study(samples: number, seed: number, through: 'run' | 'formula') {
  return {
    format: 'ratebook-study', version: 1, title: 'cooling, k uncertain (invented numbers)',
    cells: [
      { id: 'p', kind: 'parameters', items: [
        { name: 'k', value: `${MEDIAN_K} / h`, spread: { distribution: 'lognormal', cv: CV } },
        { name: 'Ta', value: '20 degC' }, { name: 'L', value: '40 degC' },
        ...(through === 'formula' ? [{ name: 't_L', value: 'log((70 degC - Ta) / (L - Ta)) / k' }] : []),
      ] },
      ...(through === 'run' ? [
        { id: 'cooling', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '70 degC' },
        { id: 'run', kind: 'simulate', rates: ['cooling'], from: '0 h', to: '12 h', tolerance: { relative: 1e-8 }, find: [{ name: 't_L', crossing: 'T', level: 'L', direction: 'down' }] },
      ] : []),
      { id: 'v', kind: 'parameters', items: [{ name: 'fast', value: 't_L < 1.3 h' }] },
      { id: 'how', kind: 'uncertainty', of: ['t_L', 'fast'], samples, seed },
    ],
  };
}

/** The exact p-quantile of t (hours) and its density there (per hour). */
function exact(p: number): { x: number; f: number } {
  const z = normalQuantile(p);
  const x = MEDIAN_T * Math.exp(SIGMA * z);
  return { x, f: Math.exp(-z * z / 2) / Math.sqrt(2 * Math.PI) / (x * SIGMA) };
}

function run(samples: number, seed: number, through: 'run' | 'formula') {
  return cell(reportOf(study(samples, seed, through)), 'how') as ReportOf<'uncertainty'>;
}

function checkAgainstExact(r: ReportOf<'uncertainty'>, n: number) {
  assert.ok(r.ok, JSON.stringify(r.error));
  const t = r.results!.t_L;
  assert.equal(t.failed, 0);
  for (const [key, p] of [['p025', 0.025], ['median', 0.5], ['p975', 0.975]] as const) {
    const { x, f } = exact(p);
    const sd = Math.sqrt(p * (1 - p) / n) / f;
    const got = t[key]!.si / HOUR;
    assert.ok(Math.abs(got - x) < 4 * sd, `${key}: ${got} h, exact ${x} h, allowed ±${4 * sd}`);
  }
  // closed form: the p025 of t is C over k's p975 (quantiles map across a decreasing function)
  const kP975 = MEDIAN_K * Math.exp(SIGMA * normalQuantile(0.975));
  assert.ok(Math.abs(C / kP975 - exact(0.025).x) < 1e-12);
  // the mean of a log-normal: median · exp(σ²/2); its SD: mean · sqrt(exp(σ²) - 1)
  const mean = MEDIAN_T * Math.exp(SIGMA ** 2 / 2);
  const sdT = mean * Math.sqrt(Math.expm1(SIGMA ** 2));
  assert.ok(Math.abs(t.mean!.si / HOUR - mean) < 4 * sdT / Math.sqrt(n), `mean ${t.mean!.si / HOUR}, exact ${mean}`);
  // the SD of a sample SD is about σ·sqrt((κ - 1)/(4n)), κ the kurtosis; for this mild log-normal
  // (σ = 0.149) κ ≈ 3 + 16σ² (its excess kurtosis to first order in σ²) is below 3.4
  assert.ok(Math.abs(t.sd!.si / HOUR - sdT) < 4 * sdT * Math.sqrt(2.4 / (4 * n)), `sd ${t.sd!.si / HOUR}, exact ${sdT}`);
  // the verdict: P(t < 1.3 h) = P(z < (ln 1.3 - ln median)/σ), a binomial share
  const p = 1 - normalUpperTail((Math.log(1.3) - Math.log(MEDIAN_T)) / SIGMA);
  const fast = r.results!.fast.probability!;
  assert.ok(Math.abs(fast - p) < 4 * Math.sqrt(p * (1 - p) / n), `P(fast) ${fast}, exact ${p}`);
  assert.equal(r.samples, n);
  assert.equal(r.evaluations, n);
}

describe('uncertainty: Monte Carlo against the exact distribution of a monotone function of a log-normal input', () => {
  it('2,000 samples through the run (seed 7): percentiles, mean, SD and a verdict within their sampling error', () => {
    checkAgainstExact(run(2000, 7, 'run'), 2000);
  });

  it('20,000 samples through the closed form (seed 11): the same, four times as tight', () => {
    checkAgainstExact(run(20000, 11, 'formula'), 20000);
  });

  it('defines <name>_p025, _p975, _sd and _probability downstream with the report\'s values', () => {
    const doc = study(2000, 7, 'formula');
    doc.cells.push({ id: 'after', kind: 'parameters', items: [{ name: 'width', value: 't_L_p975 - t_L_p025' }, { name: 'spread_sd', value: 't_L_sd' }, { name: 'p_fast', value: 'fast_probability' }] } as never);
    const report = reportOf(doc);
    const how = cell(report, 'how') as ReportOf<'uncertainty'>;
    const after = cell(report, 'after') as ReportOf<'parameters'>;
    assert.equal(after.values!.width.si, how.results!.t_L.p975!.si - how.results!.t_L.p025!.si);
    assert.equal(after.values!.spread_sd.si, how.results!.t_L.sd!.si);
    assert.equal(after.values!.p_fast.si, how.results!.fast.probability);
  });

  it('the histogram holds every sample, in bins from the least to the greatest', () => {
    const t = run(2000, 7, 'formula').results!.t_L;
    const h = t.histogram!;
    assert.equal(h.counts.reduce((a, b) => a + b, 0), 2000);
    assert.equal(h.edges.length, h.counts.length + 1);
    assert.equal(h.unit, 'h');
    assert.ok(h.edges[0] <= t.p025!.value && h.edges[h.edges.length - 1] >= t.p975!.value);
  });
});

describe('uncertainty: the seed', () => {
  it('the same seed gives the same figures bit for bit; another seed other figures', () => {
    const a = run(500, 3, 'run'), b = run(500, 3, 'run'), c = run(500, 4, 'run');
    assert.deepEqual(a.results, b.results);
    assert.notEqual(a.results!.t_L.mean!.si, c.results!.t_L.mean!.si);
    assert.notEqual(a.results!.t_L.p975!.si, c.results!.t_L.p975!.si);
  });
});
