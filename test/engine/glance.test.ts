// Results at a glance (src/output/glance.ts): the engine's choice of the results a reader looks
// for first, with the study's own `glance: true` choices honoured.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { runStudy, readStudy, type Report, type GlanceEntry } from '../../src/index.ts';

function reportOf(cells: unknown[]): Report {
  const r = runStudy({ format: 'ratebook-study', version: 1, title: 'glance', cells });
  assert.ok(r.ok);
  return r.report;
}
const near = (a: number, b: number, rel = 1e-6) => assert.ok(Math.abs(a - b) <= rel * Math.abs(b), `${a} vs ${b}`);
const brief = (g: readonly GlanceEntry[]) => g.map((e) => [e.kind, e.name, e.cell]);

// C' = -k C with k = 0.5 / h from 10 mg/L: C(2 h) = 10 e^{-1} = 3.6788 mg/L; C falls through
// 5 mg/L at ln 2 / k = 1.3863 h; it never falls through 0.001 mg/L by 10 h (C(10 h) = 0.0674)
// (closed form of first-order decay)
const inputs = { id: 'inputs', kind: 'parameters', items: [
  { name: 'k', value: '0.5 / h' }, { name: 'C0', value: '10 mg / L' }, { name: 'fast', value: 'k > 0.1 / h' },
] };
const decay = { id: 'decay', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: 'C0' };
const finds: Array<Record<string, unknown>> = [
  { name: 'C2', valueOf: 'C', at: '2 h' },
  { name: 't5', crossing: 'C', level: '5 mg / L', direction: 'down' },
  { name: 't_trace', crossing: 'C', level: '0.001 mg / L', direction: 'down' },
];
const run = { id: 'run', kind: 'simulate', rates: ['decay'], from: '0 h', to: '10 h', find: finds };
// a mono-exponential profile C = 10 ug/mL e^{-0.2 t/h} after a 500 mg bolus (see nca-cell.test.ts)
const times = [0.5, 1, 2, 4, 6, 8, 12];
const samples = { id: 'samples', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'ug / mL' }], rows: times.map((t) => [t, 10 * Math.exp(-0.2 * t)]) };
const pk = { id: 'pk', kind: 'nca', data: 'samples', time: 't', concentration: 'C', dose: '500 mg', route: 'iv-bolus', prefix: 'iv_' };

describe('results at a glance, by default', () => {
  it('lists verdicts first, then the answers, then the main profile results, each with its cell', () => {
    const report = reportOf([samples, pk, inputs, decay, run]);
    assert.deepEqual(brief(report.glance!), [
      ['verdict', 'fast', 'inputs'],
      ['answer', 'C2', 'run'], ['answer', 't5', 'run'], ['answer', 't_trace', 'run'],
      ...['Cmax', 'tmax', 'AUCinf', 't_half', 'CL', 'Vz'].map((n) => ['profile', `iv_${n}`, 'pk']),
    ]);
    const by = new Map(report.glance!.map((e) => [e.name, e]));
    assert.equal(by.get('fast')!.value!.truth, true); // hand-worked: 0.5 / h > 0.1 / h
    near(by.get('C2')!.value!.value, 10 * Math.exp(-1)); // closed form
    near(by.get('t5')!.value!.value, Math.log(2) / 0.5); // closed form
    assert.equal(by.get('t_trace')!.notReachedBy!.value, 10); // the run's end, 10 h
    near(by.get('iv_Cmax')!.value!.value, 10 * Math.exp(-0.1)); // hand-worked: the first sample, at 0.5 h
    near(by.get('iv_AUCinf')!.value!.value, 50, 1e-9); // closed form: C0 / k = 10 / 0.2
  });

  it('lists every fitted estimate with its standard error', () => {
    const doc = JSON.parse(readFileSync(new URL('../../examples/plasma-levels.ratebook.json', import.meta.url), 'utf8'));
    const r = runStudy(doc);
    assert.ok(r.ok);
    const fit = r.report.cells.find((c) => c.kind === 'fit')!;
    const estimates = r.report.glance!.filter((e) => e.kind === 'estimate');
    assert.deepEqual(estimates.map((e) => e.name), Object.keys(fit.estimates as object));
    for (const e of estimates) {
      const from = (fit.estimates as Record<string, { value: unknown; standardError: unknown }>)[e.name];
      assert.deepEqual([e.value, e.standardError], [from.value, from.standardError]);
    }
    assert.deepEqual(brief(r.report.glance!).map((x) => x[0]), [...r.report.glance!.map((e) => e.kind)].sort((a, b) =>
      ['verdict', 'answer', 'parameter', 'profile', 'estimate'].indexOf(a) - ['verdict', 'answer', 'parameter', 'profile', 'estimate'].indexOf(b)));
  });
});

describe('results at a glance, as the study chooses them', () => {
  it('lists only the items marked glance: true, answers before parameters', () => {
    const chosen = { ...inputs, items: inputs.items.map((i) => (i.name === 'k' ? { ...i, glance: true } : i)) };
    const runChosen = { ...run, find: run.find.map((f) => (f.name === 'C2' ? { ...f, glance: true } : f)) };
    const report = reportOf([samples, pk, chosen, decay, runChosen]);
    assert.deepEqual(brief(report.glance!), [['answer', 'C2', 'run'], ['parameter', 'k', 'inputs']]);
    near(report.glance![1].value!.value, 0.5); // as written: 0.5 / h
  });

  it('keeps a chosen result whose cell failed, with the reason instead of a value', () => {
    const broken = { ...run, to: '-1 h', find: [{ ...run.find[0], glance: true }] };
    const report = reportOf([inputs, decay, broken]);
    assert.equal(report.glance!.length, 1);
    assert.equal(report.glance![0].value, undefined);
    assert.equal(report.glance![0].unavailable, report.cells.find((c) => c.id === 'run')!.error!.message);
  });

  it('refuses a glance that is not true or false, on its path', () => {
    const read = readStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [
      { ...inputs, items: [{ name: 'k', value: '1 / h', glance: 'yes' }] },
      { ...run, find: [{ ...run.find[0], glance: 1 }] },
    ] });
    assert.ok(read.ok);
    const problems = [...read.cellProblems.values()].flat();
    assert.deepEqual(problems.filter((p) => p.path.endsWith('.glance')).map((p) => [p.path, p.message]), [
      ['cells[0].items[0].glance', 'must be true or false'],
      ['cells[1].find[0].glance', 'must be true or false'],
    ]);
  });
});
