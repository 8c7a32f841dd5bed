// The uncertainty cell's percentiles and SD with their own Monte Carlo precision
// (cells/uncertainty-percentiles.ts over numerics/sampling/order-statistics.ts): coverage of the
// reported intervals over 400 seeds against exact quantiles, the SD's standard error against its
// spread over those seeds, the digits shown, too few samples, and the words in the text table.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { orderRanks } from '../../src/numerics/sampling/order-statistics.ts';
import { leadingPlace, uncertaintyText } from '../../src/numerics/sampling/mc-precision.ts';
import { formatReport } from '../../src/output/report-text.ts';
import { cell, reportOf } from './helpers.ts';
import type { ReportOf } from '../../src/index.ts';

// w = 2·x + 1 g with x normal (mean 10 g, SD 2 g): w is normal, mean 21 g, SD 4 g.
// half = ln 2 / k with k log-normal (median 0.8 /h, CV 15%): half is log-normal, and its p
// quantile is ln 2 / (k's 1 − p quantile) (a decreasing function maps quantiles across).
const Z = 1.959963984540054; // the standard normal's 97.5% point (Abramowitz & Stegun table 26.1)
const SIGMA = Math.sqrt(Math.log(1 + 0.15 ** 2)); // sigma of the log for a CV of 15% (as the spread defines it)
const EXACT = {
  w: { p025: (21 - 4 * Z) / 1000, median: 21 / 1000, p975: (21 + 4 * Z) / 1000 }, // in kg, as the report's si
  half: { p025: Math.LN2 / (0.8 * Math.exp(SIGMA * Z)) * 3600, median: Math.LN2 / 0.8 * 3600, p975: Math.LN2 / (0.8 * Math.exp(-SIGMA * Z)) * 3600 },  // in s
};

function study(samples: number, seed: number, method?: 'linear') {
  return {
    format: 'ratebook-study', version: 1, title: 'x and k uncertain (invented numbers)',
    cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'x', value: '10 g', spread: { distribution: 'normal', sd: '2 g' } }, { name: 'k', value: '0.8 / h', spread: { distribution: 'lognormal', cv: 0.15 } }] },
      { id: 'v', kind: 'parameters', items: [{ name: 'w', value: '2 * x + 1 g' }, { name: 'half', value: 'log(2) / k' }] },
      { id: 'how', kind: 'uncertainty', of: ['w', 'half'], samples, seed, ...(method ? { method } : {}) },
    ],
  };
}

function how(samples: number, seed: number): ReportOf<'uncertainty'> {
  const r = cell(reportOf(study(samples, seed)), 'how') as ReportOf<'uncertainty'>;
  assert.ok(r.ok, JSON.stringify(r.error));
  return r;
}

const KEYS = ['p025', 'median', 'p975'] as const;
const P = { p025: 0.025, median: 0.5, p975: 0.975 };

describe('the reported percentile intervals over 400 seeds (Conover 1999, sec. 3.2: distribution-free)', () => {
  // 400 runs of 200 samples. The number of runs whose interval holds the exact quantile is
  // Binomial(400, c), c the exact coverage P(r ≤ B < s) (at least 95%; 98.1% for the 2.5 and
  // 97.5 percentiles at 200 samples, 96.0% for the median). Allowed: 4 of its SDs,
  // 4·sqrt(c(1 − c)/400): 2.7 points for the outer percentiles, 3.9 for the median.
  const N = 200, RUNS = 400;
  const runs = Array.from({ length: RUNS }, (_, i) => how(N, 5000 + i));
  for (const name of ['w', 'half'] as const) {
    for (const key of KEYS) {
      it(`${name}'s ${key}: its 95% interval holds the exact quantile in c ± 4 SD of the runs`, () => {
        const c = orderRanks(N, P[key]).coverage;
        const exact = EXACT[name][key];
        const held = runs.filter((r) => {
          const ci = r.results![name].percentiles![key].ci95!;
          return ci.low.si <= exact && exact <= ci.high.si;
        }).length / RUNS;
        assert.ok(c >= 0.95);
        assert.ok(Math.abs(held - c) <= 4 * Math.sqrt(c * (1 - c) / RUNS), `held ${held}, coverage ${c}`);
      });
    }
  }

  it('the SD\'s standard error matches the SD of the SDs over the runs (both results)', () => {
    // The SD of 400 values is within 1/sqrt(2·399) = 3.5% of the true one; allowed 4 of those, 14%.
    const tol = 4 / Math.sqrt(2 * (RUNS - 1));
    for (const name of ['w', 'half'] as const) {
      const sds = runs.map((r) => r.results![name].sd!.si);
      const m = sds.reduce((a, b) => a + b, 0) / RUNS;
      const seen = Math.sqrt(sds.reduce((a, b) => a + (b - m) ** 2, 0) / (RUNS - 1));
      const stated = Math.sqrt(runs.reduce((a, r) => a + r.results![name].sdSE!.si ** 2, 0) / RUNS);
      assert.ok(Math.abs(seen / stated - 1) < tol, `${name}: seen ${seen}, stated ${stated}`);
    }
    // w is normal: its SD's standard error is close to σ/sqrt(2n) = 4 g/20 = 0.2 g (normal theory)
    const w = Math.sqrt(runs.reduce((a, r) => a + r.results!.w.sdSE!.si ** 2, 0) / RUNS);
    assert.ok(Math.abs(w / (0.004 / Math.sqrt(2 * N)) - 1) < 0.1, `${w} kg`);
  });
});

describe('the digits shown and the words', () => {
  const r = how(2000, 3);

  it('each percentile is shown to the place of its standard uncertainty\'s first digit, within half a unit of that place', () => {
    for (const name of ['w', 'half'] as const) {
      const x = r.results![name];
      for (const key of KEYS) {
        const pc = x.percentiles![key];
        const place = leadingPlace(pc.u!.value);
        const [digits, unit] = [pc.shown.split(' ')[0], pc.shown.split(' ').slice(1).join(' ')];
        assert.equal(unit, x[key]!.unit.replace(/^1 \//, '/').replace(/^\/ /, '/'), pc.shown);
        assert.ok(Math.abs(Number(digits) - x[key]!.value) <= place / 2 + 1e-12, `${pc.shown} against ${x[key]!.value}`);
        // the decimals written are those of the place: no more, no fewer
        assert.equal((digits.split('.')[1] ?? '').length, Math.max(0, -Math.round(Math.log10(place))), pc.shown);
        assert.deepEqual(pc.ranks, [orderRanks(2000, P[key]).r, orderRanks(2000, P[key]).s]);
        // u is the interval's width over 2·1.96, in the SD's unit
        assert.ok(Math.abs(pc.u!.si - (pc.ci95!.high.si - pc.ci95!.low.si) / (2 * Z)) < 1e-12 * pc.u!.si);
        assert.equal(pc.u!.unit, x.sd!.unit);
        assert.ok(pc.ci95!.low.si <= x[key]!.si && x[key]!.si <= pc.ci95!.high.si, 'the sample percentile inside its interval');
      }
    }
  });

  it('the words say each percentile as shown with its uncertainty and interval, and the SD as shown with its standard error and the kurtosis', () => {
    const x = r.results!.w;
    const words = x.percentilePrecision!;
    for (const [key, label] of [['p025', '2.5 percentile'], ['median', 'median'], ['p975', '97.5 percentile']] as const) {
      const pc = x.percentiles![key];
      // the digits shown, ± u in the same unit, then the interval's ends one digit finer
      const digits = pc.shown.replace(/ g$/, '');
      const finer = Math.max(0, -Math.round(Math.log10(leadingPlace(pc.u!.value)))) + 1;
      const ends = `${pc.ci95!.low.value.toFixed(finer)} to ${pc.ci95!.high.value.toFixed(finer)} g`;
      assert.ok(words.includes(`${label} ${digits} ± ${uncertaintyText(pc.u!.value)} g (${ends})`), `${label}: ${words}`);
    }
    // the SD as shown, with its standard error by the same rule
    assert.ok(words.includes(`SD ${x.shownFigures!.sd.replace(/ g$/, '')} ± ${uncertaintyText(x.sdSE!.value)} g, to the place of its Monte Carlo standard error's first digit`), words);
    assert.match(words, /the samples' kurtosis κ \d\.\d\)\.$/);
    assert.ok(r.summary!.includes(`w: median ${x.percentiles!.median.shown}, 95% of samples between ${x.percentiles!.p025.shown} and ${x.percentiles!.p975.shown}`), r.summary);
  });

  it('the text table shows the percentiles as rounded, the SD\'s error, and the words on their own row', () => {
    const text = formatReport(reportOf(study(2000, 3)));
    const x = r.results!.w;
    assert.ok(text.includes(`median ${x.percentiles!.median.shown}, 95% ${x.percentiles!.p025.shown} to ${x.percentiles!.p975.shown}`), text);
    assert.match(text, /SD [\d.]+ g \(± [\d.]+ g Monte Carlo\)/);
    assert.match(text, /w percentiles +Percentiles, each to the place of its own Monte Carlo uncertainty/);
  });

});

describe('too few samples, and the linear method', () => {
  it('100 samples: the 2.5 and 97.5 percentiles have no interval (146 are needed), shown to 4 figures; the median has one', () => {
    const x = how(100, 1).results!.w;
    assert.equal(x.percentiles!.p025.ci95, undefined);
    assert.equal(x.percentiles!.p975.u, undefined);
    assert.equal(x.percentiles!.p025.shown, `${Number(x.p025!.value.toPrecision(4))} g`);
    assert.ok(x.percentiles!.median.ci95);
    assert.match(x.percentilePrecision!, /2\.5 percentile [\d.]+ g \(fewer than 146 samples: no interval from order statistics\)/);
    assert.match(x.percentilePrecision!, /97\.5 percentile [\d.]+ g \(fewer than 146 samples: no interval from order statistics\)/);
  });

  it('a spread far below the value\'s 12th digit: the percentiles shown to 12 significant digits, not to the binary noise past them', () => {
    const r = cell(reportOf({
      format: 'ratebook-study', version: 1, title: 'a tiny spread (invented numbers)',
      cells: [
        { id: 'p', kind: 'parameters', items: [{ name: 'x', value: '1 g', spread: { distribution: 'normal', sd: '1e-14 g' } }, { name: 'w', value: 'x * 3' }] },
        { id: 'how', kind: 'uncertainty', of: ['w'], samples: 2000, seed: 1 },
      ],
    }), 'how') as ReportOf<'uncertainty'>;
    const pc = r.results!.w.percentiles!;
    assert.ok(pc.median.u!.value < 1e-14, 'the uncertainty is below the 12th digit');
    for (const key of KEYS) assert.equal(pc[key].shown, '3.00000000000 g');
  });

  it('the linear method has no Monte Carlo precision fields', () => {
    const x = (cell(reportOf(study(2000, 1, 'linear')), 'how') as ReportOf<'uncertainty'>).results!.w;
    assert.equal(x.percentiles, undefined);
    assert.equal(x.sdSE, undefined);
    assert.equal(x.percentilePrecision, undefined);
  });

  it('a temperature in degC: each percentile shown in degC, its uncertainty a difference in K', () => {
    const r = cell(reportOf({
      format: 'ratebook-study', version: 1, title: 'a temperature (invented numbers)',
      cells: [
        { id: 'p', kind: 'parameters', items: [{ name: 'T', value: '5 degC', spread: { distribution: 'normal', sd: '0.5 K' } }, { name: 'T2', value: 'T + 1 K' }] },
        { id: 'how', kind: 'uncertainty', of: ['T2'], samples: 2000, seed: 4 },
      ],
    }), 'how') as ReportOf<'uncertainty'>;
    const x = r.results!.T2;
    assert.match(x.percentiles!.median.shown, /^[56]\.\d+ degC$/);
    assert.ok(Math.abs(Number(x.percentiles!.median.shown.split(' ')[0]) - 6) < 0.1);
    assert.equal(x.percentiles!.median.u!.unit, 'K');
    assert.match(x.percentilePrecision!, /median [\d.]+ degC ± [\d.]+ K \([\d.]+ to [\d.]+ degC\)/);
    assert.equal(x.sdSE!.unit, 'K');
  });
});
