// Every Monte Carlo figure of the uncertainty cell shown to the digits its own precision supports
// (numerics/sampling/mc-precision.ts, cells/uncertainty-digits.ts): the rounding rules on
// hand-computed cases, a normal input through a linear model whose mean, SD and standard errors
// are known in closed form, and every template's text (the terminal table and the summary): no
// figure with more decimals than its standard error's first digit, the precision words saying
// the place the digits are shown to, the linear method untouched.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readdirSync, readFileSync } from 'node:fs';
import { shownPlace, toPlace, uncertaintyText, leadingPlace, decimalsOf } from '../../src/numerics/sampling/mc-precision.ts';
import { formatReport } from '../../src/output/report-text.ts';
import { cell, reportOf } from './helpers.ts';
import type { Report, ReportOf } from '../../src/index.ts';

/** Decimals written after the point of a figure ("13.2 mg / L" → 1, "1230" → 0). */
const decimals = (text: string): number => (text.split(' ')[0].split('.')[1] ?? '').length;

describe('the rounding rules, on hand-computed cases', () => {
  it('a figure goes to the place of its standard error\'s first digit: 0.14 → one decimal, 0.0096 → three, 12 → tens', () => {
    assert.equal(shownPlace(13.1534, 0.14), 0.1);
    assert.equal(toPlace(13.1534, shownPlace(13.1534, 0.14)), '13.2');
    assert.equal(shownPlace(3.88612, 0.0096), 0.001);
    assert.equal(toPlace(3.88612, shownPlace(3.88612, 0.0096)), '3.886');
    assert.equal(shownPlace(1234.5, 12), 10);
    assert.equal(toPlace(1234.5, shownPlace(1234.5, 12)), '1230');
    // an exact power of ten is its own first digit's place; a value far above its error keeps 12 figures
    assert.equal(shownPlace(5, 0.1), 0.1);
    assert.equal(toPlace(3, shownPlace(3, 1e-16)), '3.00000000000');
  });

  it('a standard error with two digits from 100 to 354 of its first three, one from 355 to 949, rounded up to 1.0 from 950 (Particle Data Group, from memory)', () => {
    const cases: Array<[number, string]> = [
      [0.14, '0.14'], [0.2, '0.20'], [0.354, '0.35'], [0.355, '0.4'], [0.75, '0.8'], [0.949, '0.9'],
      [0.0096, '0.010'], [0.96, '1.0'], [12, '12'], [47, '50'], [960, '1000'], [1.085, '1.1'],
      [0.0063, '0.006'], [0, '0'], [3.2e-15, '3.2e-15'], [9.7e-15, '1.0e-14'],
    ];
    for (const [u, text] of cases) assert.equal(uncertaintyText(u), text, String(u));
  });
});

// w = 2·x + 1 g with x normal (mean 10 g, SD 2 g): w is normal with mean 21 g and SD 4 g, so at
// 2,000 samples the mean's standard error is 4/sqrt(2000) = 0.089 g (two decimals) and the SD's
// σ/sqrt(2n) = 0.063 g (normal theory; two decimals). The sample SD is within 5% of 4 g at this n,
// so neither place can change with the seed.
function linearModel(method?: 'linear') {
  return {
    format: 'ratebook-study', version: 1, title: 'w from x (invented numbers)',
    cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'x', value: '10 g', spread: { distribution: 'normal', sd: '2 g' } }, { name: 'w', value: '2 * x + 1 g' }] },
      { id: 'how', kind: 'uncertainty', of: ['w'], samples: 2000, seed: 17, ...(method ? { method } : {}) },
    ],
  };
}

describe('a normal input through a linear model (closed form: mean 21 g, SD 4 g)', () => {
  const r = cell(reportOf(linearModel()), 'how') as ReportOf<'uncertainty'>;
  const w = r.results!.w;

  it('the mean is shown with exactly two decimals, the place of its standard error 4/sqrt(2000) g, and within half a unit of the full mean', () => {
    assert.ok(Math.abs(w.meanSE!.value / (4 / Math.sqrt(2000)) - 1) < 0.05, `SE ${w.meanSE!.value} g`);
    assert.equal(w.shownFigures!.mean.endsWith(' g'), true);
    assert.equal(decimals(w.shownFigures!.mean), 2, w.shownFigures!.mean);
    assert.equal(decimals(w.shownFigures!.mean), decimalsOf(leadingPlace(w.meanSE!.value)));
    assert.ok(Math.abs(Number(w.shownFigures!.mean.split(' ')[0]) - w.mean!.value) <= 0.005 + 1e-12);
    // and the full mean is where the closed form puts it: within 4 standard errors of 21 g
    assert.ok(Math.abs(w.mean!.value - 21) < 4 * 4 / Math.sqrt(2000), `${w.mean!.value} g`);
  });

  it('the SD with two decimals, the place of its standard error σ/sqrt(2n) = 0.063 g; each standard error by the one rule', () => {
    assert.ok(Math.abs(w.sdSE!.value / (4 / Math.sqrt(4000)) - 1) < 0.1, `SD's SE ${w.sdSE!.value} g`);
    assert.equal(decimals(w.shownFigures!.sd), 2, w.shownFigures!.sd);
    assert.ok(Math.abs(Number(w.shownFigures!.sd.split(' ')[0]) - w.sd!.value) <= 0.005 + 1e-12);
    assert.equal(w.shownFigures!.meanSE, `${uncertaintyText(w.meanSE!.value)} g`);
    assert.equal(w.shownFigures!.sdSE, `${uncertaintyText(w.sdSE!.value)} g`);
    // about 0.089 → one digit (355 to 949 of its first three): 0.09 g
    assert.equal(w.shownFigures!.meanSE, '0.09 g');
    assert.match(w.shownFigures!.sdSE, /^0\.0\d g$/);
  });

  it('the precision words say the place the mean is shown to, and the report keeps the full values (the contract)', () => {
    assert.ok(w.precision!.startsWith(`Mean ${w.shownFigures!.mean.replace(/ g$/, '')} ± 0.09 g (Monte Carlo standard error, SD/√n), shown to 0.01 g,`), w.precision);
    assert.notEqual(w.mean!.value, Number(w.shownFigures!.mean.split(' ')[0]));
    assert.ok(w.sd!.value > 0 && decimals(String(w.sd!.value)) > 2, String(w.sd!.value));
  });

  it('the linear method keeps its 4 figures and says nothing of Monte Carlo precision', () => {
    const report = reportOf(linearModel('linear'));
    const x = (cell(report, 'how') as ReportOf<'uncertainty'>).results!.w;
    assert.equal(x.shownFigures, undefined);
    assert.equal(x.precision, undefined);
    const block = formatReport(report).split('\n\n').find((b) => b.includes('] how ('))!;
    assert.match(block, /w +mean 21 g, SD 4 g, median 21 g, 95% 13\.16 g to 28\.84 g/);
    assert.doesNotMatch(block, /Monte Carlo/);
  });
});

const examples = new URL('../../examples/', import.meta.url);
const templates = readdirSync(examples).filter((f) => f.endsWith('.ratebook.json')).sort()
  .map((file) => ({ file, study: JSON.parse(readFileSync(new URL(file, examples), 'utf8')) as { cells: Array<{ id: string; kind: string; method?: string }> } }))
  .filter((t) => t.study.cells.some((c) => c.kind === 'uncertainty' && (c.method ?? 'monte-carlo') === 'monte-carlo'));

/** The text table's block of cell `id`, and the text after a row's name. */
function rowOf(text: string, id: string, key: string): string {
  const block = text.split('\n\n').find((b) => b.includes(`] ${id} (`))!;
  const line = block.split('\n').find((l) => l.trimStart().startsWith(`${key} `));
  assert.ok(line, `no row ${key} in ${id}`);
  return line.trimStart().slice(key.length).trim();
}

describe('every template with a Monte Carlo uncertainty cell: the text shows no digit its standard error does not support', () => {
  assert.ok(templates.length >= 3, 'the templates with an uncertainty cell');
  for (const { file, study } of templates) {
    it(file, () => {
      const report: Report = reportOf(study);
      const text = formatReport(report);
      for (const c of study.cells.filter((x) => x.kind === 'uncertainty')) {
        const r = cell(report, c.id) as ReportOf<'uncertainty'>;
        assert.ok(r.ok, c.id);
        const summary = r.summary ?? '';
        for (const [name, x] of Object.entries(r.results ?? {})) {
          const row = rowOf(text, c.id, name);
          if (x.probability !== undefined) {
            // a verdict: its share to its standard uncertainty's place, at most a whole percent
            const shown = /^yes in ([\d.]+)% of samples/.exec(row)![1];
            const u = Math.max(x.probabilitySE!, (x.probabilityCI95!.high - x.probabilityCI95!.low) / 3.92);
            assert.ok(decimals(shown) <= Math.max(0, decimalsOf(leadingPlace(100 * u))), `${name} ${shown}%`);
            assert.ok(summary.includes(`${name}: yes in ${shown}% of samples (± ${uncertaintyText(100 * x.probabilitySE!)} points)`), summary);
            continue;
          }
          if (!x.mean) continue;
          const m = /^mean (\S+) .*?\(± (\S+) .*?Monte Carlo\), SD (\S+) .*?\(± (\S+) .*?Monte Carlo\), median (\S+) .*?, 95% (\S+) .*? to (\S+) /.exec(row);
          assert.ok(m, `${name}: ${row}`);
          const [, mean, meanSE, sd, sdSE, median, p025, p975] = m;
          // the mean and the SD to exactly their standard error's first digit (unless held at 12 figures)
          assert.equal(decimals(mean), decimalsOf(shownPlace(x.mean.value, x.meanSE!.value)), `${name} mean ${mean} ± ${x.meanSE!.value}`);
          assert.equal(decimals(mean), decimalsOf(leadingPlace(x.meanSE!.value)), `${name} mean ${mean}`);
          assert.equal(decimals(sd), decimalsOf(leadingPlace(x.sdSE!.value)), `${name} SD ${sd} ± ${x.sdSE!.value}`);
          // each standard error by the one rule: one or two significant digits
          assert.equal(meanSE, uncertaintyText(x.meanSE!.value));
          assert.equal(sdSE, uncertaintyText(x.sdSE!.value));
          // the percentiles to their own uncertainty's place, no finer
          for (const [shown, key] of [[median, 'median'], [p025, 'p025'], [p975, 'p975']] as const) {
            const u = x.percentiles![key].u;
            if (u) assert.ok(decimals(shown) <= decimalsOf(leadingPlace(u.value)), `${name} ${key} ${shown} ± ${u.value}`);
          }
          // the precision words say the place the digits are shown to, and the same digits
          const said = /^Mean (\S+) .*?± (\S+) .*?, shown to (\S+) .*?, the place of the standard error's first digit\./.exec(x.precision!);
          assert.ok(said, x.precision);
          assert.equal(said[1], mean);
          assert.equal(said[2], meanSE);
          assert.equal(decimals(said[3]), decimals(mean), `${name}: shown to ${said[3]}, digits ${mean}`);
          assert.equal(Number(said[3]), leadingPlace(x.meanSE!.value));
          // and the SD in the percentile words as in the table
          assert.ok(x.percentilePrecision!.includes(`SD ${sd} `), x.percentilePrecision);
          // every ± in the cell's words has one or two significant digits
          for (const t of `${row} ${x.precision} ${x.percentilePrecision}`.match(/± [\d.]+/g) ?? []) {
            assert.ok(t.replace(/^± /, '').replace('.', '').replace(/^0+/, '').length <= 2, `${name}: ${t}`);
          }
          // the summary says the median and the interval as shown
          assert.ok(summary.includes(`${name}: median ${x.percentiles!.median.shown}, 95% of samples between ${x.percentiles!.p025.shown} and ${x.percentiles!.p975.shown}`), summary);
        }
      }
    });
  }
});
