// A parameters cell with a problem of shape in one item: the problem is said once, on its own
// item's field, and the cell's other items still run and say their own errors. A bad spread's
// message came twice on its field (the document check's and the run's); a shape problem in a
// later item failed the cell's first item, which then neither defined its name nor showed its
// own error. The values checked are the study-format contract's own rules
// (docs/study-format.md: a spread's distribution is normal, lognormal or uniform; normal
// takes an SD, lognormal a CV, uniform from and to; an item is an object with a name and a value).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { runStudy, type Report } from '../../src/index.ts';

type Problem = { path: string; message: string };

/** The report of a study whose parameters cell holds `items`, with a second cell reading `Ta`. */
function reportOf(items: unknown[]): Report {
  const r = runStudy({ format: 'ratebook-study', version: 1, title: 'shape', cells: [
    { id: 'p', kind: 'parameters', items },
    { id: 'q', kind: 'parameters', items: [{ name: 'Ta_K', value: 'Ta', unit: 'K' }] }] });
  assert.ok(r.ok);
  return r.report;
}

/** Every problem the report gives on the first cell. */
function problems(report: Report): Problem[] {
  const c = report.cells[0];
  return (c.errors ?? (c.error ? [c.error] : [])).map((e) => ({ path: e.path, message: e.message }));
}

const on = (report: Report, path: string) => problems(report).filter((p) => p.path === path);

describe('a bad spread is said once, on its field', () => {
  const cases: Array<[string, unknown, string]> = [
    ['a distribution not in the format', { distribution: 'gamma', sd: '0.1 / h' }, 'distribution'],
    ['a distribution that is not text', { distribution: 3 }, 'distribution'],
    ['a normal spread without its SD', { distribution: 'normal' }, 'sd'],
    ['a uniform spread without its upper end', { distribution: 'uniform', from: '0.4 / h' }, 'to'],
    ['a log-normal spread without its CV', { distribution: 'lognormal' }, 'cv'],
  ];
  for (const [what, spread, field] of cases) {
    for (const j of [0, 1]) {
      it(`${what}, on item ${j + 1} of 2: one problem on items[${j}].spread.${field}, and the other item runs`, () => {
        const k = { name: 'k', value: '0.5 / h', spread };
        const Ta = { name: 'Ta', value: '20 degC' };
        const report = reportOf(j === 0 ? [k, Ta] : [Ta, k]);
        const path = `cells[0].items[${j}].spread.${field}`;
        assert.equal(on(report, path).length, 1, JSON.stringify(problems(report)));
        assert.deepEqual(problems(report).map((p) => p.path), [path]);
        // Ta is defined, so the cell reading it has its value: 20 °C = 293.15 K (the kelvin's definition, SI Brochure 9th ed.)
        assert.equal(report.cells[1].ok, true, JSON.stringify(report.cells[1]));
        assert.ok(Math.abs((report.cells[1] as { values?: Record<string, { value: number }> }).values!.Ta_K.value - 293.15) < 1e-9);
      });
    }
  }
  it('a missing figure says what the distribution needs', () => {
    const report = reportOf([{ name: 'Ta', value: '20 degC' }, { name: 'k', value: '0.5 / h', spread: { distribution: 'normal' } }]);
    assert.match(on(report, 'cells[0].items[1].spread.sd')[0].message, /normal spread needs an SD/);
  });
});

describe('a shape problem in one item stays on that item', () => {
  it('an item that is not an object: the problem on that item; the items before it run and say their own errors', () => {
    const report = reportOf([{ name: 'Ta', value: '20 degC' }, { name: 'k', value: '0.5 / h * kx' }, 42]);
    assert.equal(on(report, 'cells[0].items[2]').length, 1, JSON.stringify(problems(report)));
    assert.equal(report.cells[1].ok, true, 'Ta is defined: the first item was not failed by the third');
    const own = on(report, 'cells[0].items[1].value');
    assert.equal(own.length, 1, JSON.stringify(problems(report)));
    assert.match(own[0].message, /kx/);
  });
  it('a field of the wrong type in a later item: the first item\'s own error is still shown, on its own field', () => {
    const report = reportOf([{ name: 'Ta', value: '20 degC + Tx' }, { name: 'k', value: 5 }]);
    assert.equal(on(report, 'cells[0].items[1].value').length, 1, JSON.stringify(problems(report)));
    const own = on(report, 'cells[0].items[0].value');
    assert.equal(own.length, 1, JSON.stringify(problems(report)));
    assert.match(own[0].message, /Tx/);
  });
  it('a name of the wrong type: said on that name, the other item defines its own', () => {
    const report = reportOf([{ name: 7, value: '1' }, { name: 'Ta', value: '20 degC' }]);
    assert.deepEqual(problems(report).map((p) => p.path), ['cells[0].items[0].name']);
    assert.equal(report.cells[1].ok, true);
  });
});
