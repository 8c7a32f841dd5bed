// The simulate cell's optional display field `plotScale` (docs/study-format.md, "Simulate: how
// this version answers"): "linear" or "log", anything else an error on its path; it changes no
// number the run reports. Sources: the project's format note (the field's values and path);
// the run's results are compared with the same study without the field (an identity, not a
// value from memory).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readStudy, runStudy } from '../../src/index.ts';

const rate = { id: 'cooling', kind: 'rate', state: 'T', unit: 'degC', initial: '74 degC', rate: '-0.35 / h * (T - 4 degC)' };
const run = (extra: Record<string, unknown>) => ({
  id: 'run', kind: 'simulate', rates: ['cooling'], from: '0 h', to: '8 h',
  find: [{ name: 't_21', crossing: 'T', level: '21 degC' }], ...extra,
});
const study = (extra: Record<string, unknown>) => ({ format: 'ratebook-study', version: 1, title: 'scale', cells: [rate, run(extra)] });
const problemsOf = (extra: Record<string, unknown>) => {
  const read = readStudy(study(extra));
  assert.ok(read.ok);
  return [...read.cellProblems.values()].flat().map((p) => [p.path, p.message]);
};

describe('simulate plotScale (a display field)', () => {
  it('accepts "linear", "log" and no field at all', () => {
    assert.deepEqual(problemsOf({}), []);
    assert.deepEqual(problemsOf({ plotScale: 'linear' }), []);
    assert.deepEqual(problemsOf({ plotScale: 'log' }), []);
  });

  it('refuses anything else on cells[i].plotScale, keeping the cell and its other fields', () => {
    assert.deepEqual(problemsOf({ plotScale: 'semilog' }), [['cells[1].plotScale', 'must be one of linear, log, not "semilog"']]);
    assert.deepEqual(problemsOf({ plotScale: true }), [['cells[1].plotScale', 'must be one of linear, log, not true']]);
    const read = readStudy(study({ plotScale: 'Log' }));
    assert.ok(read.ok);
    assert.equal((read.study.cells[1] as { plotScale?: unknown }).plotScale, 'Log', 'the text the user wrote is kept');
  });

  it('changes no number the run reports', () => {
    const plain = runStudy(study({}));
    const log = runStudy(study({ plotScale: 'log' }));
    assert.ok(plain.ok && log.ok);
    const cellOf = (r: typeof plain) => (r.ok ? r.report.cells.find((c) => c.id === 'run') : undefined) as unknown as Record<string, unknown>;
    const a = cellOf(plain);
    const b = cellOf(log);
    assert.equal(b.ok, true);
    assert.deepEqual(b.results, a.results);
    assert.deepEqual(b.plot, a.plot);
    assert.deepEqual(b.summary, a.summary);
  });
});

// The fit cell's `plotScale` (docs/study-format.md, "Fit: how this version answers"): the same
// two values; the estimates are the same with and without it (an identity).
describe('fit plotScale (a display field)', () => {
  const data = { id: 'logger', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'T', unit: 'degC' }], rows: [[1, 56.3], [2, 43.8], [4, 28.4]] };
  const fit = (extra: Record<string, unknown>) => ({ id: 'fit', kind: 'fit', rates: ['cooling'], data: 'logger', time: 't', observe: { T: 'T' },
    estimate: [{ parameter: 'T', as: 'T0_hat', guess: '70 degC' }], ...extra });
  const fitStudy = (extra: Record<string, unknown>) => ({ format: 'ratebook-study', version: 1, title: 'fit scale', cells: [rate, data, fit(extra)] });
  const fitProblems = (extra: Record<string, unknown>) => {
    const read = readStudy(fitStudy(extra));
    assert.ok(read.ok);
    return [...read.cellProblems.values()].flat().map((p) => [p.path, p.message]);
  };

  it('accepts "linear", "log" and no field, and refuses anything else on cells[i].plotScale', () => {
    assert.deepEqual(fitProblems({}), []);
    assert.deepEqual(fitProblems({ plotScale: 'linear' }), []);
    assert.deepEqual(fitProblems({ plotScale: 'log' }), []);
    assert.deepEqual(fitProblems({ plotScale: 'semilog' }), [['cells[2].plotScale', 'must be one of linear, log, not "semilog"']]);
  });

  it('changes no estimate the fit reports', () => {
    const plain = runStudy(fitStudy({}));
    const log = runStudy(fitStudy({ plotScale: 'log' }));
    assert.ok(plain.ok && log.ok);
    const cellOf = (r: typeof plain) => (r.ok ? r.report.cells.find((c) => c.id === 'fit') : undefined) as unknown as Record<string, unknown>;
    assert.equal(cellOf(log).ok, true);
    assert.deepEqual(cellOf(log).estimates, cellOf(plain).estimates);
  });
});
