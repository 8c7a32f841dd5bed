// A parameter's spread and the uncertainty cell's fields: the text the report gives each
// spread, a fit's estimates as a joint normal, and bad input refused on its own field.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { cell, reportOf, near } from './helpers.ts';
import { runStudy, type ReportOf } from '../../src/index.ts';

const study = (items: object[], more: object[] = []) => ({ format: 'ratebook-study', version: 1, title: 'spreads', cells: [{ id: 'p', kind: 'parameters', items }, ...more] });
const params = (items: object[]) => cell(reportOf(study(items)), 'p') as ReportOf<'parameters'>;
const errorsOf = (doc: object, id: string) => {
  const c = cell(reportOf(doc), id);
  assert.ok(!c.ok, `${id} should fail`);
  return c.errors ?? [c.error!];
};

describe('a parameter\'s spread', () => {
  it('is reported with its text, in the value\'s unit, computed by the engine', () => {
    const r = params([
      { name: 'k', value: '0.6 / h', spread: { distribution: 'lognormal', cv: 0.15 } },
      { name: 'k2', value: '0.6 / h', spread: { distribution: 'normal', sd: '0.05 / h' } },
      { name: 'k3', value: '0.6 / h', spread: { distribution: 'uniform', from: '0.5 / h', to: '0.7 / h' } },
      { name: 'k4', value: '0.6 / h', spread: { distribution: 'normal', sd: '5 / (100 h)' }, unit: '1 / min' },
      { name: 'T', value: '4 degC', spread: { distribution: 'normal', sd: '0.5 degC' } },
      { name: 'cv_pct', value: '10 L', spread: { distribution: 'lognormal', cv: '20%' } },
    ]);
    assert.equal(r.values!.k.spread!.text, '0.6 /h ± 15%');
    assert.equal(r.values!.k2.spread!.text, '0.6 /h ± 0.05 /h');
    assert.equal(r.values!.k3.spread!.text, '0.5–0.7 /h');
    // shown in the value's picked unit: 0.05 /h is 0.05/60 /min (hand-worked)
    assert.equal(r.values!.k4.spread!.text, '0.01 /min ± 0.0008333 /min');
    // a temperature's SD is a difference: 0.5 degC read as a size of degree, shown in K
    assert.equal(r.values!.T.spread!.text, '4 degC ± 0.5 K');
    near(r.values!.T.spread!.sd!.si, 0.5, 1e-12);
    assert.equal(r.values!.cv_pct.spread!.cv, 0.2);
  });

  it('changes no value: the parameter reports the same value with or without it', () => {
    const a = params([{ name: 'k', value: '0.6 / h' }]);
    const b = params([{ name: 'k', value: '0.6 / h', spread: { distribution: 'normal', sd: '0.05 / h' } }]);
    assert.deepEqual({ ...b.values!.k, spread: undefined }, { ...a.values!.k, spread: undefined });
  });

  const bad: Array<[string, object, string, string]> = [
    ['a negative SD', { distribution: 'normal', sd: '-0.05 / h' }, 'sd', 'above zero'],
    ['a zero SD', { distribution: 'normal', sd: '0 / h' }, 'sd', 'above zero'],
    ['an SD of the wrong dimension', { distribution: 'normal', sd: '0.05 h' }, 'sd', 'time'],
    ['a CV of zero', { distribution: 'lognormal', cv: 0 }, 'cv', 'above zero'],
    ['a negative CV', { distribution: 'lognormal', cv: -0.1 }, 'cv', 'above zero'],
    ['a CV with a unit', { distribution: 'lognormal', cv: '0.2 h' }, 'cv', 'plain number'],
    ['a uniform with from above to', { distribution: 'uniform', from: '0.7 / h', to: '0.5 / h' }, 'from', 'lower to a higher'],
    ['a uniform with from equal to to', { distribution: 'uniform', from: '0.6 / h', to: '0.6 / h' }, 'from', 'lower to a higher'],
    ['a uniform end of the wrong dimension', { distribution: 'uniform', from: '0.5 h', to: '0.7 / h' }, 'from', 'time'],
    ['a uniform that leaves out the value', { distribution: 'uniform', from: '0.7 / h', to: '0.9 / h' }, 'from', 'outside'],
    ['an unknown distribution', { distribution: 'gamma', sd: '1 / h' }, 'distribution', 'normal, lognormal, uniform'],
    ['a figure of another distribution', { distribution: 'normal', sd: '0.05 / h', cv: 0.1 }, 'cv', 'not a figure of a normal'],
    ['a missing SD', { distribution: 'normal' }, 'sd', 'missing'],
  ];
  for (const [what, spread, field, words] of bad) {
    it(`refuses ${what} on items[0].spread.${field}`, () => {
      const errors = errorsOf(study([{ name: 'k', value: '0.6 / h', spread }, { name: 'other', value: '2 h' }]), 'p');
      const e = errors.find((x) => x.path === `cells[0].items[0].spread.${field}`);
      assert.ok(e, `no error on spread.${field}: ${JSON.stringify(errors)}`);
      assert.ok(e.message.includes(words), e.message);
    });
  }

  it('refuses a spread on a yes/no verdict, and a log-normal spread on a temperature reading', () => {
    const e1 = errorsOf(study([{ name: 'ok', value: '1 < 2', spread: { distribution: 'normal', sd: '1' } }]), 'p');
    assert.equal(e1[0].path, 'cells[0].items[0].spread.distribution');
    const e2 = errorsOf(study([{ name: 'T', value: '4 degC', spread: { distribution: 'lognormal', cv: 0.1 } }]), 'p');
    assert.equal(e2[0].path, 'cells[0].items[0].spread.cv');
  });
});

describe('a fit\'s estimates as a joint normal', () => {
  it('the linear method over one estimate alone gives its standard error (the fit\'s covariance, JCGM 100:2008 5.1.2 with c = 1)', () => {
    const report = reportOf({
      format: 'ratebook-study', version: 1, title: 'fit (invented measurements)',
      cells: [
        { id: 'data', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: [[0, 10.3], [1, 7.2], [2, 5.6], [3, 4.3], [4, 3.1], [6, 1.9], [8, 1.0]] },
        { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.3 / h' }] },
        { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '10 mg / L' },
        { id: 'fit', kind: 'fit', rates: ['law'], data: 'data', time: 't', observe: { C: 'C' }, estimate: [{ parameter: 'k', as: 'k_hat', guess: '0.3 / h' }, { parameter: 'C', as: 'C0', guess: '10 mg / L' }] },
        { id: 'how', kind: 'uncertainty', of: ['k_hat'], method: 'linear' },
      ],
    });
    const fit = cell(report, 'fit') as ReportOf<'fit'>;
    const how = cell(report, 'how') as ReportOf<'uncertainty'>;
    assert.ok(how.ok, JSON.stringify(how.error));
    near(how.results!.k_hat.sd!.si, fit.estimates!.k_hat.standardError!.si, 1e-9, 'SD = standard error');
    assert.equal(how.results!.k_hat.sd!.unit, '1 / h');
  });
});

describe('the uncertainty cell: bad input on its field', () => {
  const base = [{ name: 'k', value: '0.6 / h', spread: { distribution: 'normal', sd: '0.05 / h' } }, { name: 'x', value: '2 h' }, { name: 't_half', value: 'log(2) / k' }];
  const withCell = (c: object) => study(base, [{ id: 'how', kind: 'uncertainty', of: ['t_half'], ...c }]);

  it('samples above the stated limit (100,000), or not a whole number', () => {
    for (const [samples, words] of [[200000, 'at most 100,000'], [0, 'from 1 to 100,000'], [2.5, 'from 1 to 100,000']] as const) {
      const e = errorsOf(withCell({ samples }), 'how');
      assert.equal(e[0].path, 'cells[1].samples');
      assert.ok(e[0].message.includes(words), e[0].message);
    }
  });

  it('a name that nothing defines (with the nearest), a name listed twice, a seed out of range, an unknown method', () => {
    const unknown = errorsOf(withCell({ of: ['t_hlf'] }), 'how');
    assert.equal(unknown[0].path, 'cells[1].of[0]');
    assert.ok(unknown[0].message.includes('t_half'), unknown[0].message);
    assert.equal(errorsOf(withCell({ of: ['t_half', 't_half'] }), 'how')[0].path, 'cells[1].of[1]');
    assert.equal(errorsOf(withCell({ seed: -1 }), 'how')[0].path, 'cells[1].seed');
    assert.equal(errorsOf(withCell({ method: 'bootstrap' }), 'how')[0].path, 'cells[1].method');
  });

  it('a name that depends on no spread', () => {
    const e = errorsOf(withCell({ of: ['x'] }), 'how');
    assert.equal(e[0].path, 'cells[1].of');
    assert.ok(e[0].message.includes('no value with a spread'), e[0].message);
  });

  it('samples in which a name has no value are counted with the first reason, never dropped', () => {
    const doc = {
      format: 'ratebook-study', version: 1, title: 'a level not always reached',
      cells: [
        { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h', spread: { distribution: 'uniform', from: '0.1 / h', to: '0.9 / h' } }] },
        { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '10 mg / L' },
        // C falls to 1 mg/L at ln(10)/k: within 6 h only when k > ln(10)/6 h = 0.384 /h
        { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '6 h', find: [{ name: 't1', crossing: 'C', level: '1 mg / L', direction: 'down' }] },
        { id: 'how', kind: 'uncertainty', of: ['t1'], samples: 4000, seed: 2 },
      ],
    };
    const r = runStudy(doc);
    assert.ok(r.ok);
    const how = r.report.cells[3] as ReportOf<'uncertainty'>;
    assert.ok(how.ok, JSON.stringify(how.error));
    const t1 = how.results!.t1;
    // the share not reached: P(k < ln(10)/6 h) = (0.38376 - 0.1) / 0.8 = 0.3547 (hand-worked), a binomial share of 4,000
    const p = (Math.log(10) / 6 - 0.1) / 0.8;
    assert.ok(Math.abs(t1.failed / 4000 - p) < 4 * Math.sqrt(p * (1 - p) / 4000), `failed ${t1.failed}`);
    assert.equal(how.failed, t1.failed);
    assert.ok(t1.reason!.includes('not reached'), t1.reason);
    assert.equal(how.results!.t1.histogram!.counts.reduce((a, b) => a + b, 0) + t1.failed, 4000);
  });
});
