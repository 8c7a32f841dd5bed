// Results at a glance say how sure, where an uncertainty cell follows them (src/output/glance-sure.ts):
// a verdict's probability of yes with its Monte Carlo error beside the point verdict, an answer's
// 95% interval beside its point value, each as the uncertainty cell shows it; never a bare point
// verdict where the study asks how sure.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { erf } from 'mathjs';
import { runStudy, type Report, type GlanceEntry, type UncertaintyResult } from '../../src/index.ts';
import { openSession } from './helpers.ts';

/** The standard normal distribution function, from mathjs's error function: Φ(z) = (1 + erf(z/√2))/2. */
const Phi = (z: number) => (1 + (erf(z / Math.SQRT2) as number)) / 2;
/** The standard normal's 97.5% point (tables of the normal distribution; from memory). */
const Z975 = 1.959963984540054;

function run(doc: unknown): Report {
  const r = runStudy(doc);
  assert.ok(r.ok);
  return r.report;
}
const entry = (r: Report, name: string): GlanceEntry => { const e = r.glance!.find((g) => g.name === name); assert.ok(e, `${name} at a glance`); return e; };
const resultOf = (r: Report, cell: string, name: string) => (r.cells.find((c) => c.id === cell)!.results as Record<string, UncertaintyResult>)[name];

// x ~ N(10, 2) mg/L; above: x > 11 mg/L, so P(yes) = 1 - Φ((11 - 10)/2) = 1 - Φ(0.5) = 0.3085 (normal
// distribution); at the point value x = 10 mg/L it is no. y = 2x + 1 mg/L ~ N(21, 4): its 2.5 and
// 97.5 percentiles 21 ∓ 1.96 · 4 mg/L (normal quantiles, linear map).
const MU = 10, SD = 2, A = 11;
function study(method: 'monte-carlo' | 'linear', chosen: boolean, samples = 20000, more: Record<string, unknown> = {}) {
  const mark = chosen ? { glance: true } : {};
  return { format: 'ratebook-study', version: 1, title: 'normal through a linear verdict', cells: [
    { id: 'inputs', kind: 'parameters', items: [
      { name: 'x', value: `${MU} mg / L`, spread: { distribution: 'normal', sd: `${SD} mg / L` } },
      { name: 'above', value: `x > ${A} mg / L`, ...mark },
      { name: 'y', value: '2 * x + 1 mg / L', ...mark },
    ] },
    { id: 'how-sure', kind: 'uncertainty', of: ['above', 'y'], method, samples, seed: 3, ...more },
  ] };
}

describe('a verdict an uncertainty cell follows', () => {
  it('shows the probability of yes within its stated Monte Carlo error of 1 - Φ((a - μ)/σ), beside the point verdict', () => {
    const r = run(study('monte-carlo', false));
    const g = entry(r, 'above');
    assert.equal(g.value!.truth, false); // hand-worked: 10 > 11 mg/L is no at the point value
    const exact = 1 - Phi((A - MU) / SD); // 0.30854
    const mc = resultOf(r, 'how-sure', 'above');
    assert.ok(g.sure, 'how sure');
    assert.equal(g.sure.cell, 'how-sure');
    assert.equal(g.sure.method, 'monte-carlo');
    assert.equal(g.sure.probability, mc.probability);
    const se = Math.sqrt(exact * (1 - exact) / 20000); // binomial standard error: 0.0033
    assert.ok(Math.abs(g.sure.probability! - exact) <= 4 * se, `${g.sure.probability} vs ${exact} ± 4 × ${se}`);
    // the shown figure is the cell's own, and is within one unit of its last digit of the exact share
    assert.equal(g.sure.shown, mc.shown);
    assert.equal(g.sure.shown, '30.9%');
    assert.ok(Math.abs(Number.parseFloat(g.sure.shown!) - 100 * exact) <= 4 * 100 * se);
    assert.equal(g.sure.pointsSE, '0.33'); // sqrt(p(1 - p)/n) in points, 2 digits (100-354 rule)
    assert.equal(g.sure.samples, 20000);
    assert.equal(g.sure.words, 'yes in 30.9% of 20,000 samples (± 0.33 points, Monte Carlo)');
  });

  it('says the linear method gives no probability, rather than leaving the point verdict alone', () => {
    const g = entry(run(study('linear', false)), 'above');
    assert.equal(g.value!.truth, false);
    assert.equal(g.sure?.method, 'linear');
    assert.equal(g.sure?.probability, undefined);
    assert.match(g.sure!.unavailable!, /linear method gives none for a yes\/no verdict/);
  });
});

describe('an answer an uncertainty cell follows', () => {
  it('shows the 2.5-97.5 percentile interval of the samples beside the point value, within their stated uncertainty of the normal quantiles', () => {
    const r = run(study('monte-carlo', true));
    // the study's own choices: both chosen, in the parameters' order, nothing added
    assert.deepEqual(r.glance!.map((g) => [g.kind, g.name]), [['verdict', 'above'], ['parameter', 'y']]);
    const g = entry(r, 'y');
    assert.equal(g.value!.value, 21); // hand-worked: 2 · 10 + 1
    const lo = 21 - Z975 * 2 * SD, hi = 21 + Z975 * 2 * SD;
    const mc = resultOf(r, 'how-sure', 'y');
    const iv = g.sure!.interval!;
    assert.ok(Math.abs(iv.low.value - lo) <= 4 * mc.percentiles!.p025.u!.value, `${iv.low.value} vs ${lo}`);
    assert.ok(Math.abs(iv.high.value - hi) <= 4 * mc.percentiles!.p975.u!.value, `${iv.high.value} vs ${hi}`);
    assert.deepEqual([iv.lowShown, iv.highShown], [mc.percentiles!.p025.shown, mc.percentiles!.p975.shown]);
    assert.equal(g.sure!.words, `95% interval ${iv.lowShown} to ${iv.highShown} (2.5 to 97.5 percentile of 20,000 Monte Carlo samples)`);
  });

  it('shows the linear method\'s interval, marked as the linear method', () => {
    const g = entry(run(study('linear', true)), 'y');
    const iv = g.sure!.interval!;
    // y is linear in x: first-order propagation is exact, 21 ∓ 1.96 · 4 mg/L (to the slope's accuracy)
    assert.ok(Math.abs(iv.low.value - (21 - Z975 * 2 * SD)) < 1e-6 && Math.abs(iv.high.value - (21 + Z975 * 2 * SD)) < 1e-6, JSON.stringify(iv));
    assert.deepEqual([iv.lowShown, iv.highShown], ['13.16 mg / L', '28.84 mg / L']);
    assert.match(g.sure!.words!, /\(linear method: point value ∓ 1\.96 SD\)$/);
  });

  it('adds nothing to a result no uncertainty cell follows, nor to the list the study chose', () => {
    const r = run(study('monte-carlo', true, 200, { of: ['y'] }));
    assert.equal(entry(r, 'above').sure, undefined);
    assert.ok(entry(r, 'y').sure?.interval);
  });
});

describe('how sure, when the uncertainty cell has no figures', () => {
  it('says why: a problem of the cell, or still to compute in a deferring session, and gives no probability', () => {
    const g = entry(run(study('monte-carlo', false, 0)), 'above');
    assert.equal(g.sure?.probability, undefined);
    assert.match(g.sure!.unavailable!, /^not computed: /);

    const s = openSession(study('monte-carlo', false, 500), true);
    assert.deepEqual(s.pending(), ['how-sure']);
    const first = entry(s.report(), 'above');
    assert.deepEqual([first.sure?.cell, first.sure?.probability, first.sure?.unavailable], ['how-sure', undefined, 'not computed yet']);
    while (s.work(Infinity)) { /* to the end */ }
    assert.ok(entry(s.report(), 'above').sure!.probability! > 0);
  });
});

describe('the templates with an uncertainty cell', () => {
  const template = (id: string) => run(JSON.parse(readFileSync(new URL(`../../examples/${id}.ratebook.json`, import.meta.url), 'utf8')));

  it('trough in range: in range in 54% of patients, beside yes at the point values', () => {
    const r = template('trough-in-range-probability');
    const g = entry(r, 'in_range');
    assert.equal(g.value!.truth, true);
    const mc = resultOf(r, g.sure!.cell, 'in_range');
    assert.deepEqual([g.sure!.probability, g.sure!.shown], [mc.probability, mc.shown]);
    assert.equal(g.sure!.words, 'yes in 54% of 2,000 samples (± 1.1 points, Monte Carlo)');
    // the answers: their 95% interval as the cell shows it
    for (const name of ['trough', 'peak_last']) {
      const a = entry(r, name);
      const p = resultOf(r, a.sure!.cell, name).percentiles!;
      assert.deepEqual([a.sure!.interval!.lowShown, a.sure!.interval!.highShown], [p.p025.shown, p.p975.shown]);
    }
  });

  it('cooling fails: the probability that it fails beside "no" at the point values', () => {
    const r = template('cooling-fail-probability');
    const g = entry(r, 'fails');
    assert.equal(g.value!.truth, false);
    assert.equal(g.sure!.shown, resultOf(r, g.sure!.cell, 'fails').shown);
    assert.equal(g.sure!.words, 'yes in 0.3% of 2,000 samples (± 0.12 points, Monte Carlo)');
    // the verdicts no uncertainty cell follows stay as they were
    assert.equal(entry(r, 'stage1_ok').sure, undefined);
  });

  it('pump settings: the time to the limit with its Monte Carlo interval', () => {
    const r = template('flush-pump-settings');
    const g = entry(r, 't_limit');
    const p = resultOf(r, g.sure!.cell, 't_limit').percentiles!;
    assert.deepEqual([g.sure!.interval!.lowShown, g.sure!.interval!.highShown], [p.p025.shown, p.p975.shown]);
    assert.match(g.sure!.words!, /^95% interval \S+ min to \S+ min \(2\.5 to 97\.5 percentile of [\d,]+ Monte Carlo samples\)$/);
  });
});
