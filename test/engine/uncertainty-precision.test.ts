// The precision of the uncertainty cell's Monte Carlo figures: the Wilson score interval
// against published values, the standard errors it states against the spread actually seen
// over many seeds, and the digits it shows.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { wilsonInterval, proportionSE, leadingPlace, settled, Z975 } from '../../src/numerics/sampling/mc-precision.ts';
import { sharePrecision, meanPrecision } from '../../src/cells/uncertainty-precision.ts';
import { normalUpperTail } from '../../src/numerics/fit/student-t.ts';
import { cell, reportOf } from './helpers.ts';
import type { ReportOf } from '../../src/index.ts';

describe('Wilson score interval (Wilson 1927)', () => {
  // Newcombe, Statistics in Medicine 17 (1998) 857–872, Table II, method 3 (score interval
  // without continuity correction), to the four decimals printed there (typed from memory).
  const NEWCOMBE: Array<[number, number, number, number]> = [
    [81, 263, 0.2553, 0.3662],
    [15, 148, 0.0624, 0.1605],
    [0, 20, 0, 0.1611],
    [1, 29, 0.0061, 0.1718],
  ];
  for (const [yes, n, low, high] of NEWCOMBE) {
    it(`${yes}/${n}: ${low} to ${high}, as printed by Newcombe (1998), to 4 decimals`, () => {
      const ci = wilsonInterval(yes, n);
      assert.ok(Math.abs(ci.low - low) <= 5e-5, `low ${ci.low}, published ${low}`);
      assert.ok(Math.abs(ci.high - high) <= 5e-5, `high ${ci.high}, published ${high}`);
    });
  }

  it('each end inside (0, 1) solves the score equation |p − π| = z·sqrt(π(1 − π)/n) that defines it (Wilson 1927)', () => {
    for (const [yes, n] of [[81, 263], [1, 29], [1000, 2000], [1999, 2000], [3, 100000]]) {
      const p = yes / n;
      const ci = wilsonInterval(yes, n);
      for (const pi of [ci.low, ci.high]) {
        if (pi === 0 || pi === 1) continue;
        assert.ok(Math.abs(Math.abs(p - pi) - Z975 * Math.sqrt(pi * (1 - pi) / n)) < 1e-13, `${yes}/${n} at ${pi}`);
      }
    }
  });

  it('at no yes the upper end is z²/(n + z²), at all yes the lower end is n/(n + z²): the interval keeps a width where p ± z·SE is a point', () => {
    const n = 2000, z2 = Z975 ** 2;
    assert.deepEqual(wilsonInterval(0, n), { low: 0, high: wilsonInterval(0, n).high });
    assert.ok(Math.abs(wilsonInterval(0, n).high - z2 / (n + z2)) < 1e-15);
    assert.ok(Math.abs(wilsonInterval(n, n).low - n / (n + z2)) < 1e-15);
    assert.equal(wilsonInterval(n, n).high, 1);
    assert.equal(proportionSE(0, n), 0);
  });
});

describe('the digits a probability is shown with (JCGM 101:2008 7.9)', () => {
  it('0.62 of 2,000: SE 1.085 points, shown as "62%"; about 38,000 samples would settle the whole percent', () => {
    const x = sharePrecision(1240, 2000);
    assert.ok(Math.abs(x.probabilitySE - Math.sqrt(0.62 * 0.38 / 2000)) < 1e-15);
    assert.equal(x.shown, '62%');
    // 7.9.4: 2·SE ≤ δ = ½ unit of the last digit (0.5 points) needs n·(2·SE/δ)² = 4·p(1 − p)/δ² = 37,696 samples
    assert.ok(Math.abs(settled(x.probabilitySE, 2000, 0.01).samplesNeeded - 4 * 0.62 * 0.38 / 0.005 ** 2) <= 1);
    assert.match(x.precision, /about 38,000 samples would settle the whole percent shown/);
    assert.match(x.precision, /95% interval 59\.9% to 64\.1% \(Wilson score\)/);
  });

  it('0.5 of 100,000: SE 0.16 points, shown to a tenth of a point', () => {
    const x = sharePrecision(50123, 100000);
    assert.equal(x.shown, '50.1%');
    assert.match(x.precision, /more than the 100,000 a cell may draw/);
  });

  it('no yes in 2,000: "0%", its standard error is 0 and says so; the Wilson interval still gives an upper end', () => {
    const x = sharePrecision(0, 2000);
    assert.equal(x.shown, '0%');
    assert.equal(x.probabilitySE, 0);
    assert.match(x.precision, /says nothing/);
    assert.match(x.precision, /0\.000% to 0\.192%/);
  });

  it('a mean is shown to its standard error\'s first digit, and the words say how many samples would settle that digit', () => {
    const q = (value: number) => ({ value, unit: 'h', si: 3600 * value });
    // SD 0.0521 h at 2,000 samples: SE 0.001165 h, so the mean to 0.001 h; δ = 0.0005 h, and
    // JCGM 101:2008 7.9.4 asks 2·SE ≤ δ: 2,000·(2·0.001165/0.0005)² = 43,400 samples
    const se = 0.0521 / Math.sqrt(2000);
    const words = meanPrecision(q(1.23456), q(se), 2000);
    assert.match(words, /^Mean 1\.235 ± 0\.0012 h \(Monte Carlo standard error, SD\/√n\), shown to 0\.001 h, the place of the standard error's first digit\./);
    assert.match(words, /about 0\.0023 h \(2 SE\); about 43,000 samples would settle its 0\.001 h digit/);
    assert.equal(settled(se, 2000, 0.001).samplesNeeded, Math.ceil(2000 * (2 * se / 0.0005) ** 2));
    // at 10 samples the SE is 0.0165 h: the mean to 0.01 h, settled at 10·(2·0.0165/0.005)² = 435 samples
    assert.match(meanPrecision(q(1.23456), q(0.0521 / Math.sqrt(10)), 10), /^Mean 1\.23 ± 0\.016 h .*about 435 samples would settle its 0\.01 h digit/);
    assert.match(meanPrecision(q(1.23456), q(0), 10), /has no Monte Carlo error/);
    assert.equal(leadingPlace(0.0521), 0.01);
    assert.equal(leadingPlace(1000), 1000);
  });
});

// A study in which the verdict's probability and the mean are known in closed form: k
// log-normal (median 0.8 /h, CV 15%), the verdict k > 0.9 /h. P = 1 − Φ(ln(0.9/0.8)/σ).
const SIGMA = Math.sqrt(Math.log(1 + 0.15 ** 2));
const P_EXACT = normalUpperTail(Math.log(0.9 / 0.8) / SIGMA);

function how(samples: number, seed: number): ReportOf<'uncertainty'> {
  const r = cell(reportOf({
    format: 'ratebook-study', version: 1, title: 'k uncertain (invented numbers)',
    cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.8 / h', spread: { distribution: 'lognormal', cv: 0.15 } }] },
      { id: 'v', kind: 'parameters', items: [{ name: 'fast', value: 'k > 0.9 / h' }, { name: 'half', value: 'log(2) / k' }] },
      { id: 'how', kind: 'uncertainty', of: ['fast', 'half'], samples, seed },
    ],
  }), 'how') as ReportOf<'uncertainty'>;
  assert.ok(r.ok, JSON.stringify(r.error));
  return r;
}

describe('the standard errors stated against the spread seen over 400 seeds', () => {
  // 400 runs of 200 samples each. The SD of 400 values is within about 1/sqrt(2·399) = 3.5% of
  // the true SD (normal theory); each ratio may miss 1 by 4 of those (14%). The Wilson interval
  // covers the exact P in about 95% of runs: a binomial share of 400 with SD 1.1 points, allowed
  // 4 SDs either way.
  const N = 200, RUNS = 400;
  const runs = Array.from({ length: RUNS }, (_, i) => how(N, 1000 + i));
  const sdOf = (xs: number[]) => {
    const m = xs.reduce((a, b) => a + b, 0) / xs.length;
    return Math.sqrt(xs.reduce((a, b) => a + (b - m) ** 2, 0) / (xs.length - 1));
  };
  const meanOf = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
  const tol = 4 / Math.sqrt(2 * (RUNS - 1));

  it('the probability\'s: sqrt(p(1 − p)/n) matches the SD of the probabilities over the seeds', () => {
    const seen = sdOf(runs.map((r) => r.results!.fast.probability!));
    const stated = Math.sqrt(meanOf(runs.map((r) => r.results!.fast.probabilitySE! ** 2)));
    assert.ok(Math.abs(seen / stated - 1) < tol, `seen ${seen}, stated ${stated}`);
    assert.ok(Math.abs(stated / Math.sqrt(P_EXACT * (1 - P_EXACT) / N) - 1) < 0.05, `stated ${stated} against the exact P's`);
  });

  it('the mean\'s: SD/sqrt(n) matches the SD of the means over the seeds', () => {
    const seen = sdOf(runs.map((r) => r.results!.half.mean!.si));
    const stated = Math.sqrt(meanOf(runs.map((r) => r.results!.half.meanSE!.si ** 2)));
    assert.ok(Math.abs(seen / stated - 1) < tol, `seen ${seen}, stated ${stated}`);
    // the mean's SE is a difference in the result's unit
    assert.equal(runs[0].results!.half.meanSE!.unit, runs[0].results!.half.sd!.unit);
  });

  it('the Wilson 95% interval covers the exact probability in about 95% of the runs', () => {
    const covered = runs.filter((r) => r.results!.fast.probabilityCI95!.low <= P_EXACT && P_EXACT <= r.results!.fast.probabilityCI95!.high).length / RUNS;
    assert.ok(Math.abs(covered - 0.95) < 4 * Math.sqrt(0.95 * 0.05 / RUNS), `covered ${covered}`);
  });
});

describe('the report\'s words', () => {
  it('the summary, the probability shown and each result\'s precision come from the same samples', () => {
    const r = how(2000, 7);
    const fast = r.results!.fast;
    assert.equal(fast.shown, sharePrecision(Math.round(fast.probability! * 2000), 2000).shown);
    assert.ok(r.summary!.includes(`fast: yes in ${fast.shown} of samples`), r.summary);
    assert.ok(r.results!.half.precision!.startsWith(`Mean ${r.results!.half.shownFigures!.mean.replace(/ h$/, '')} ± ${r.results!.half.shownFigures!.meanSE}`), r.results!.half.precision);
  });
});

describe('the terminal table', () => {
  it('prints the probability as shown, with its standard error and interval, and each mean\'s Monte Carlo error', async () => {
    const { formatReport } = await import('../../src/output/report-text.ts');
    const r = how(2000, 7);
    const text = formatReport(reportOf({
      format: 'ratebook-study', version: 1, title: 'k uncertain (invented numbers)',
      cells: [
        { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.8 / h', spread: { distribution: 'lognormal', cv: 0.15 } }] },
        { id: 'v', kind: 'parameters', items: [{ name: 'fast', value: 'k > 0.9 / h' }, { name: 'half', value: 'log(2) / k' }] },
        { id: 'how', kind: 'uncertainty', of: ['fast', 'half'], samples: 2000, seed: 7 },
      ],
    }));
    assert.ok(text.includes(`yes in ${r.results!.fast.shown} of samples, ${r.results!.fast.precision}`), text);
    assert.match(text, /mean [\d.]+ h \(± [\d.e-]+ h Monte Carlo\)/);
    assert.ok(text.includes(r.results!.half.precision!));
  });
});

describe('the digits of a mean in the unit it is shown in', () => {
  it('a time in minutes is shown to a power of ten of minutes, not of seconds', () => {
    const r = cell(reportOf({
      format: 'ratebook-study', version: 1, title: 'minutes (invented numbers)',
      cells: [
        { id: 'p', kind: 'parameters', items: [{ name: 'Q', value: '100 L / min', spread: { distribution: 'lognormal', cv: 0.1 } }, { name: 't_fill', value: '2000 L / Q', unit: 'min' }] },
        { id: 'how', kind: 'uncertainty', of: ['t_fill'], samples: 2000, seed: 2 },
      ],
    }), 'how') as ReportOf<'uncertainty'>;
    const t = r.results!.t_fill;
    assert.equal(t.sd!.unit, 'min');
    // SD about 2 min, SE about 0.045 min: the mean to 0.01 min (not to a power of ten of seconds)
    assert.match(t.precision!, /shown to 0\.01 min, the place of the standard error's first digit/);
    assert.match(t.shownFigures!.mean, /^\d+\.\d\d min$/);
    assert.equal(t.meanSE!.unit, 'min');
    assert.ok(Math.abs(t.meanSE!.si - t.sd!.si / Math.sqrt(2000)) < 1e-12 * t.sd!.si);
  });
});
