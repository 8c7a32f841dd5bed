// The band an uncertainty cell draws around a run's curves, against exact distributions.
//
// Newton cooling T(t) = Ta + (T0 - Ta) e^(-k t) (closed form) with k log-normal (median m, CV c,
// sigma = sqrt(ln(1 + c²))): at each t > 0, T is a decreasing function of k, so the p-quantile of
// T(t) is T at k's (1 - p)-quantile (quantiles map across a monotone function). A sample
// quantile read back through the closed form gives the k it stands for, k̂ = -ln((T - Ta)/(T0 -
// Ta))/t; the exact probability of k at k̂, Φ((ln k̂ - ln m)/σ), is then the probability the
// sample quantile stands at. For n samples that probability has SD sqrt(p(1 - p)/n) (the
// uniform order statistic; Cramér; e.g. Serfling 1980, 2.3.3): 0.0035 at p = 0.025 and n = 2,000.
// Each check allows 4 of those SDs (a miss by chance about 6 in 100,000 per check), with the
// seed fixed. A bolus schedule checks both sides of each dose: C = D/V Σ e^(-k(t - tᵢ)),
// decreasing in k, with the dose's left and right limits each mapped the same way.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { normalQuantile, normalUpperTail } from '../../src/numerics/fit/student-t.ts';
import { cell, reportOf, near } from './helpers.ts';
import { runBand, readStudy, type ReportOf, type Report, type Cell } from '../../src/index.ts';
import { BAND_INTERVALS } from '../../src/cells/uncertainty-band.ts';

const MEDIAN_K = 0.8; // 1/h
const CV = 0.15;
const SIGMA = Math.sqrt(Math.log(1 + CV * CV));
const N = 2000;
const Phi = (z: number) => 1 - normalUpperTail(z);
/** The probability of k at or below k̂, for k log-normal. */
const probabilityOfK = (k: number) => Phi((Math.log(k) - Math.log(MEDIAN_K)) / SIGMA);
const allowed = (p: number, n = N) => 4 * Math.sqrt((p * (1 - p)) / n);

function cooling(extra: Record<string, unknown> = {}, seed = 7, method?: string) {
  return {
    format: 'ratebook-study', version: 1, title: 'cooling with k uncertain (invented numbers)',
    cells: [
      { id: 'p', kind: 'parameters', items: [
        { name: 'k', value: `${MEDIAN_K} / h`, spread: { distribution: 'lognormal', cv: CV } },
        { name: 'Ta', value: '20 degC' }, { name: 'L', value: '40 degC' }] },
      { id: 'cooling', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '70 degC' },
      { id: 'run', kind: 'simulate', band: true, rates: ['cooling'], from: '0 h', to: '6 h', tolerance: { relative: 1e-8 },
        find: [{ name: 't_L', crossing: 'T', level: 'L', direction: 'down' }, { name: 'T_90', valueOf: 'T', at: '1.5 h' }], ...extra },
      { id: 'how', kind: 'uncertainty', of: ['t_L', 'T_90'], samples: N, seed, ...(method ? { method } : {}) },
    ],
  };
}

const uncertaintyOf = (report: Report) => cell(report, 'how') as ReportOf<'uncertainty'>;

describe('the band around a run', () => {
  const report = reportOf(cooling());
  const u = uncertaintyOf(report);
  const band = u.bands?.[0];

  it('maps through k\'s quantiles at every grid time (closed form, within 4 SDs of a sample quantile)', () => {
    assert.ok(u.ok, JSON.stringify(u.error));
    assert.ok(band?.t && band.states, JSON.stringify(band));
    assert.equal(band.run, 'run');
    assert.equal(band.timeUnit, 'h');
    assert.equal(band.t.length, BAND_INTERVALS + 1);
    assert.equal(band.samples, N);
    assert.equal(band.failed, 0);
    const T = band.states[0];
    assert.equal(T.name, 'T');
    assert.equal(T.unit, 'degC');
    // at the start every sample is at T0: no spread at all
    assert.equal(T.p025[0], 70);
    assert.equal(T.p975[0], 70);
    for (let i = 1; i < band.t.length; i++) {
      const t: number = band.t[i];
      near(t, (6 * i) / BAND_INTERVALS, 1e-12, 'grid time');
      const kOf = (Tq: number) => -Math.log((Tq - 20) / 50) / t;
      // T's 2.5th percentile is at k's 97.5th, and the other way round
      for (const [curve, p] of [[T.p025, 0.975], [T.median, 0.5], [T.p975, 0.025]] as const) {
        const got = probabilityOfK(kOf(curve[i]));
        assert.ok(Math.abs(got - p) < allowed(p), `t = ${t} h: the band's value ${curve[i]} degC stands at probability ${got} of k, not ${p}`);
      }
      // and the exact quantile itself is inside the band
      const exact = (p: number): number => 20 + 50 * Math.exp(-MEDIAN_K * Math.exp(SIGMA * normalQuantile(p)) * t);
      assert.ok(T.p025[i] < exact(0.5) && exact(0.5) < T.p975[i], `t = ${t} h`);
      assert.ok(T.p025[i] <= T.median[i] && T.median[i] <= T.p975[i]);
    }
  });

  it('comes from the same samples as the cell\'s results (the question at 1.5 h, a grid time)', () => {
    const T = band!.states![0];
    const at = band!.t!.indexOf(1.5);
    assert.ok(at > 0);
    const r = u.results!.T_90;
    // the run is integrated the same way; other samples would differ by about a percent
    near(T.p025[at], r.p025!.value, 1e-7, 'p025');
    near(T.median[at], r.median!.value, 1e-7, 'median');
    near(T.p975[at], r.p975!.value, 1e-7, 'p975');
  });

  it('gives the same band for the same seed, another for another seed', () => {
    const again = uncertaintyOf(reportOf(cooling())).bands![0];
    assert.deepEqual(again.states, band!.states);
    const other = uncertaintyOf(reportOf(cooling({}, 8))).bands![0];
    assert.notDeepEqual(other.states![0].p975, band!.states![0].p975);
    assert.match(other.note!, /seed 8/);
  });

  it('is shown through runBand with its note', () => {
    const shown = runBand(cooling() as { cells: Cell[] }, report, 'run');
    assert.ok('band' in shown, JSON.stringify(shown));
    assert.equal(shown.cell, 'how');
    assert.match(shown.band.note, /2\.5 to 97\.5 percentiles of 2,000 Monte Carlo samples \(seed 7\)/);
  });

  it('is drawn only for a run with band: true; showing it changes no answer', () => {
    const off = reportOf(cooling({ band: false }));
    assert.equal(uncertaintyOf(off).bands, undefined);
    assert.deepEqual(uncertaintyOf(off).results, u.results);
    assert.deepEqual((cell(off, 'run') as ReportOf<'simulate'>).results, (cell(report, 'run') as ReportOf<'simulate'>).results);
    const reason = runBand(cooling({ band: false }) as { cells: Cell[] }, off, 'run');
    assert.ok('reason' in reason && /not drawn this run's band/.test(reason.reason), JSON.stringify(reason));
  });
});

describe('the band keeps a dose\'s jump', () => {
  // one compartment, bolus of 100 mg into 10 L at 0, 6 and 12 h: C = 10 mg/L Σ e^(-k(t - tᵢ))
  const doc = {
    format: 'ratebook-study', version: 1, title: 'three doses (invented numbers)',
    cells: [
      { id: 'p', kind: 'parameters', items: [
        { name: 'k', value: `${MEDIAN_K / 8} / h`, spread: { distribution: 'lognormal', cv: CV } },
        { name: 'V', value: '10 L' }, { name: 'dose', value: '100 mg' }] },
      { id: 'drug', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
      { id: 'doses', kind: 'simulate', band: true, rates: ['drug'], from: '0 h', to: '17 h', tolerance: { relative: 1e-9 },
        events: [{ at: '0 h', every: '6 h', count: 3, add: { C: 'dose / V' } }],
        find: [{ name: 'C_last', valueOf: 'C', at: '17 h' }] },
      { id: 'how', kind: 'uncertainty', of: ['C_last'], samples: N, seed: 3 },
    ],
  };
  const band = uncertaintyOf(reportOf(doc)).bands![0];

  it('holds both sides of each dose time, each mapped through k\'s quantiles', () => {
    assert.ok(band.t && band.states, JSON.stringify(band));
    const C = band.states[0];
    const k0 = MEDIAN_K / 8;
    for (const td of [6, 12]) {
      const at = band.t.indexOf(td);
      assert.ok(at > 0 && band.t[at + 1] === td, `both sides of ${td} h are on the grid`);
      for (const [side, i] of [['before', at], ['after', at + 1]] as const) {
        const doses = side === 'before' ? td / 6 : td / 6 + 1;
        // C(k) = 10 Σ e^(-k(td - 6j)), j < doses: decreasing in k; solve C(k) = value by bisection
        const Cof = (k: number) => { let s = 0; for (let j = 0; j < doses; j++) s += 10 * Math.exp(-k * (td - 6 * j)); return s; };
        const kOf = (v: number) => { let lo = 1e-6, hi = 10; for (let n = 0; n < 200; n++) { const mid = (lo + hi) / 2; if (Cof(mid) > v) lo = mid; else hi = mid; } return (lo + hi) / 2; };
        for (const [curve, p] of [[C.p025, 0.975], [C.p975, 0.025]] as const) {
          const got = Phi((Math.log(kOf(curve[i])) - Math.log(k0)) / SIGMA);
          assert.ok(Math.abs(got - p) < allowed(p), `${side} the dose at ${td} h: stands at ${got}, not ${p}`);
        }
      }
      assert.ok(C.median[at + 1] - C.median[at] > 9.99, `the dose's jump of 10 mg/L shows at ${td} h`);
    }
  });
});

describe('when there is no band to draw', () => {
  it('says so when the run\'s curves depend on no spread (a spread on the level asked about only)', () => {
    const doc = cooling();
    const items = doc.cells[0].items as Array<Record<string, unknown>>;
    items[0] = { name: 'k', value: `${MEDIAN_K} / h` };
    items[2] = { name: 'L', value: '40 degC', spread: { distribution: 'normal', sd: '1 K' } };
    const report = reportOf(doc);
    const b = uncertaintyOf(report).bands![0];
    assert.equal(b.t, undefined);
    assert.match(b.reason!, /depend on no value with a spread/);
    const shown = runBand(doc as { cells: Cell[] }, report, 'run');
    assert.ok('reason' in shown && /^No band from How sure "how": the run's curves depend on no value with a spread/.test(shown.reason), JSON.stringify(shown));
  });

  it('says so with no uncertainty cell, with none asking about the run, and under the linear method', () => {
    const none = cooling();
    none.cells.pop();
    const r1 = runBand(none as { cells: Cell[] }, reportOf(none), 'run');
    assert.ok('reason' in r1 && /^No uncertainty cell in this study/.test(r1.reason), JSON.stringify(r1));
    const other = cooling();
    (other.cells[3] as Record<string, unknown>).of = ['k'];
    const r2 = runBand(other as { cells: Cell[] }, reportOf(other), 'run');
    assert.ok('reason' in r2 && /^No uncertainty cell lists this run's answers \("t_L", "T_90"\)/.test(r2.reason), JSON.stringify(r2));
    const linear = cooling({}, 7, 'linear');
    const lr = reportOf(linear);
    assert.equal(uncertaintyOf(lr).bands, undefined);
    const r3 = runBand(linear as { cells: Cell[] }, lr, 'run');
    assert.ok('reason' in r3 && /linear method, which draws no samples/.test(r3.reason), JSON.stringify(r3));
  });

  it('refuses a band that is not true or false, on its field', () => {
    const read = readStudy(cooling({ band: 'yes' }));
    assert.ok(read.ok);
    const problems = [...read.cellProblems.values()].flat().map((p) => [p.path, p.message]);
    assert.deepEqual(problems, [['cells[2].band', 'must be true or false']]);
  });
});
