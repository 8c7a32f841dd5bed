// Errors carry their kind and, for a wait, the cell waited on; measurements reach the plots
// of a run through the graph like any other value.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { runStudy, openStudy, type Report, type CellReport, type ReportQuantity } from '../../src/index.ts';
import { buildCellNodes } from '../../src/cells/index.ts';
import { PROBLEM_KINDS } from '../../src/engine/node.ts';

function reportOf(cells: unknown[]): Report {
  const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells });
  assert.ok(r.ok, r.ok ? '' : r.error.message);
  return (r as { report: Report }).report;
}

const cell = (r: Report, id: string): CellReport => r.cells.find((c) => c.id === id)!;

const LOGGER = { id: 'logger', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: [[0, 10], [1, 6.1], [2, 3.7], [4, 1.35]] };
const DRUG = { id: 'drug', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '10 mg / L' };

describe('errors are data', () => {
  it('each problem has its kind, from the closed set', () => {
    const r = reportOf([
      { id: 'p', kind: 'parameters', items: [
        { name: 'a', value: '2 *' }, { name: 'b', value: 'nothere + 1' }, { name: 'c', value: '1 m + 1 s' },
        { name: 'a', value: '3' }, { name: 'x', value: 'y' }, { name: 'y', value: 'x' },
      ] },
    ]);
    const errors = cell(r, 'p').errors ?? [];
    const kindAt = (path: string) => errors.find((e) => e.path === path)?.kind;
    // hand-worked: each field has exactly one problem of a known kind
    assert.equal(kindAt('cells[0].items[0].value'), 'syntax');
    assert.equal(kindAt('cells[0].items[1].value'), 'unknown-name');
    assert.equal(kindAt('cells[0].items[2].value'), 'unit');
    assert.equal(kindAt('cells[0].items[3].name'), 'duplicate');
    assert.equal(kindAt('cells[0].items[4].name'), 'cycle');
    for (const e of errors) assert.ok((PROBLEM_KINDS as readonly string[]).includes(e.kind), e.kind);
  });

  it('a wait names the cell it waits on in waitsOn, and its message says it once', () => {
    const r = reportOf([
      { id: 'a', kind: 'parameters', items: [{ name: 'k', value: '1 / h +' }] },
      { id: 'b', kind: 'parameters', items: [{ name: 'k2', value: '2 * k' }] },
      DRUG,
      { id: 'c', kind: 'parameters', items: [{ name: 'k3', value: '2 * k2' }] },
    ]);
    const b = cell(r, 'b');
    assert.equal(b.error?.kind, 'waits');
    assert.equal(b.error?.waitsOn, 'a');
    assert.deepEqual(b.waitsOn, ['a']);
    // the cell further down names the one it reads and the cause, once: never the chain
    const c = cell(r, 'c');
    assert.equal(c.error?.waitsOn, 'b');
    assert.match(c.error!.message, /^waits on cell "b" \(the cause is in cell "a"\): "k" has an error \(cells\[0\]\.items\[0\]\.value: /);
    assert.equal(c.error!.message.split('waits on cell').length, 2, c.error!.message);
    assert.equal('cause' in c.error!, false, 'the cause travels inside the engine, not in the report');
  });

  it('a wait on a cell whose law waits on its own state names that cell once', () => {
    const r = reportOf([
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }] },
      { ...DRUG, initial: '10 mg / L +' },
      { id: 'run', kind: 'simulate', rates: ['drug'], from: '0 h', to: '6 h' },
    ]);
    const run = cell(r, 'run');
    assert.equal(run.error?.kind, 'waits');
    assert.equal(run.error?.waitsOn, 'drug');
    assert.match(run.error!.message, /^waits on cell "drug": "C" has an error/);
    assert.equal(run.error!.message.split('waits on cell').length, 2, run.error!.message);
  });
});

describe('measurements through the graph', () => {
  const FIT = { id: 'fitk', kind: 'fit', rates: ['drug'], data: 'logger', time: 't', observe: { C: 'C' }, estimate: [{ parameter: 'k', as: 'k_hat', guess: '0.4 / h' }] };
  const RUN = { id: 'run', kind: 'simulate', rates: ['drug'], from: '0 h', to: '6 h', find: [{ name: 'C_half', crossing: 'C', level: '5 mg / L' }] };

  it('a fit declares its measurements as a name of its own, and the states they are of', () => {
    const [node] = buildCellNodes(FIT as never);
    assert.ok(node.defines.some((d) => d.name === '#fitk/measured'));
    assert.deepEqual(node.measures, { name: '#fitk/measured', states: ['C'] });
  });

  it('a run shows the measurements once the fit computed, whatever the cells\' order', () => {
    const params = { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }] };
    for (const cells of [[LOGGER, params, DRUG, FIT, RUN], [LOGGER, params, DRUG, RUN, FIT]]) {
      const r = reportOf(cells);
      const plot = cell(r, 'run').plot;
      assert.ok(plot && 'points' in plot);
      // hand-worked: the points are the logger's rows, in h and mg/L as the run shows them
      assert.deepEqual(plot.points, [{ state: 'C', t: [0, 1, 2, 4], values: [10, 6.1, 3.7, 1.35] }]);
    }
  });

  it('a failing fit leaves the run computing, without points', () => {
    const r = reportOf([LOGGER, { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }] }, DRUG,
      { ...FIT, estimate: [{ parameter: 'k', as: 'k_hat', guess: '0.4 / h', min: '1 / h', max: '2 / h' }] }, RUN]);
    assert.equal(cell(r, 'fitk').ok, false);
    const run = cell(r, 'run');
    assert.ok(run.ok, JSON.stringify(run.error));
    assert.equal(run.plot && 'points' in run.plot ? run.plot.points : undefined, undefined);
  });

  it('a fit that reads the run\'s answer does not make a cycle: the run then shows no points', () => {
    const r = reportOf([LOGGER, { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }] }, DRUG, RUN,
      { id: 'g', kind: 'parameters', items: [{ name: 'k_guess', value: 'log(2) / C_half' }] },
      { ...FIT, estimate: [{ parameter: 'k', as: 'k_hat', guess: 'k_guess' }] }]);
    assert.ok(r.ok, JSON.stringify(r.cells.find((c) => !c.ok)?.error));
    const plot = cell(r, 'run').plot;
    assert.equal(plot && 'points' in plot ? plot.points : undefined, undefined);
    // closed form: C = 10 e^{-0.5 t} falls to 5 mg/L at ln 2 / 0.5 h = 1.386 h
    assert.ok(Math.abs((cell(r, 'run').results!.C_half as ReportQuantity).value - Math.LN2 / 0.5) < 1e-5);
  });

  it('editing a fit\'s guess leaves the run alone: its measurements did not change', () => {
    const o = openStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [LOGGER, { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }] }, DRUG, FIT, RUN] });
    assert.ok(o.ok);
    if (!o.ok) return;
    const e = o.session.apply({ type: 'replace', cell: { ...FIT, estimate: [{ parameter: 'k', as: 'k_hat', guess: '0.45 / h' }] } });
    assert.ok(e.ok);
    if (e.ok) assert.deepEqual(e.rerun, ['fitk']);
  });
});

describe('fit warnings', () => {
  it('name the estimates they are about', () => {
    const r = reportOf([LOGGER,
      { id: 'p', kind: 'parameters', items: [{ name: 'k1', value: '0.2 / h' }, { name: 'k2', value: '0.3 / h' }] },
      { id: 'drug', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-(k1 + k2) * C', initial: '10 mg / L' },
      { id: 'fitk', kind: 'fit', rates: ['drug'], data: 'logger', time: 't', observe: { C: 'C' },
        estimate: [{ parameter: 'k1', as: 'k1_hat', guess: '0.2 / h' }, { parameter: 'k2', as: 'k2_hat', guess: '0.3 / h' }] }]);
    // hand-worked: only k1 + k2 enters the law, so the two cannot be told apart
    const warnings = cell(r, 'fitk').warnings ?? [];
    assert.ok(warnings.some((w) => /"k1_hat" and "k2_hat" cannot be told apart/.test(w)), warnings.join('\n'));
  });
});
