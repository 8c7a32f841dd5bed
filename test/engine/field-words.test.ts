// Places and problems in words (src/output/field-words.ts, problem-words.ts, sheet-notes.ts):
// the app and the sheet name a field as the editor shows it; the JSON report keeps paths.
// Expected words are hand-written from the study documents below.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { runStudy, fieldWords, cellWords, problemWords, waitWords, inspectorNotes, residualSdReason, type Report, type Study } from '../../src/index.ts';

const study = (cells: unknown[]): Study => ({ format: 'ratebook-study', version: 1, title: 't', cells } as unknown as Study);
function reportOf(doc: Study): Report {
  const r = runStudy(doc);
  assert.ok(r.ok);
  return (r as { report: Report }).report;
}

const DRUG = { id: 'drug', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '10 mg / L' };
const DOC = study([
  { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h', range: ['0.1 / h', '1 / h'] }] },
  DRUG,
  { id: 'run', kind: 'simulate', title: 'Dosing', rates: ['drug'], from: '0 h', to: '24 h',
    events: [{ at: '0 h', every: '8 h', add: { C: '5 mg / L' } }],
    tolerance: { absolute: '1e-9 mg / L' }, find: [{ name: 't_21', crossing: 'C', level: '2 mg / L', from: '0 h', to: '8 h' }] },
  { id: 'logger', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: [[0, 10], [1, 6]] },
  { id: 'k', kind: 'fit', rates: ['drug'], data: 'logger', time: 't', observe: { C: 'C' }, estimate: [{ parameter: 'k', as: 'k_fit', guess: '0.3 / h' }] },
  { id: 'sweep', kind: 'phase', rate: 'drug', from: '0 mg / L', to: '10 mg / L', sweep: { name: 'k', from: '0.1 / h', to: '1 / h', steps: 11 } },
]);

describe('a place in words', () => {
  it('names a solve cell\'s fields as its element labels them (hand-written)', () => {
    const doc = study([{ id: 's', kind: 'solve', title: 'Dose', vary: { parameter: 'dose', as: 'd2', choices: ['1 g', '2 g'] }, target: { value: 'x', equals: '1' } }]);
    assert.equal(fieldWords(doc, 'cells[0].vary.min'), 'Solve for "Dose", lowest value');
    assert.equal(fieldWords(doc, 'cells[0].vary.choices[1]'), 'Solve for "Dose", choice 2');
    assert.equal(fieldWords(doc, 'cells[0].target.equals'), 'Solve for "Dose", wanted value');
    assert.equal(fieldWords(doc, 'cells[0].vary.parameter', false), 'parameter varied');
  });

  it('names the cell by its kind and title (else id), then the field as the editor shows it', () => {
    // hand-written from DOC
    assert.equal(fieldWords(DOC, 'cells[4].estimate[0].as'), 'Fit "k", estimate 1, name');
    assert.equal(fieldWords(DOC, 'cells[2].find[0].from'), 'Run "Dosing", question "t_21", window start');
    assert.equal(fieldWords(DOC, 'cells[2].find[0].to'), 'Run "Dosing", question "t_21", window end');
    assert.equal(fieldWords(DOC, 'cells[2].find[0].crossing'), 'Run "Dosing", question "t_21", state');
    assert.equal(fieldWords(DOC, 'cells[2].events[0].every'), 'Run "Dosing", event 1, repeats every');
    assert.equal(fieldWords(DOC, 'cells[2].events[0].add.C'), 'Run "Dosing", event 1, amount added to C');
    assert.equal(fieldWords(DOC, 'cells[2].tolerance.absolute'), 'Run "Dosing", absolute tolerance');
    assert.equal(fieldWords(DOC, 'cells[0].items[0].value'), 'Parameters "p", parameter "k", value');
    assert.equal(fieldWords(DOC, 'cells[0].items[0].range[1]'), 'Parameters "p", parameter "k", slider range end');
    assert.equal(fieldWords(DOC, 'cells[1].rate'), 'Rate law "drug", rate law');
    assert.equal(fieldWords(DOC, 'cells[3].rows[1][1]'), 'Measurements "logger", row 2, column "C"');
    assert.equal(fieldWords(DOC, 'cells[4].observe.C'), 'Fit "k", observed columns, column for C');
    assert.equal(fieldWords(DOC, 'cells[5].sweep.from'), 'Where it settles "sweep", sweep start');
    assert.equal(fieldWords(DOC, 'cells[5]'), 'Where it settles "sweep"');
    assert.equal(cellWords(DOC, 'run'), 'Run "Dosing"');
  });

  it('inside its own cell the cell is left out; a path outside the study stays a path', () => {
    assert.equal(fieldWords(DOC, 'cells[4].estimate[0].guess', false), 'estimate 1, first guess');
    assert.equal(fieldWords(DOC, 'cells[4]', false), 'the cell');
    assert.equal(fieldWords(DOC, 'cells[9].items[0].value'), 'cells[9].items[0].value');
  });

  it('every path of every problem in a broken study has words with no brackets', () => {
    const doc = study([
      { id: 'p', kind: 'parameters', items: [{ name: 'a', value: '2 *' }, { name: 'b', value: 'nothere + 1' }, { name: 'a', value: '3' }, { name: 'x', value: 'y' }, { name: 'y', value: 'x' }] },
      { ...DRUG, rate: '-k * C +' },
      { id: 'run', kind: 'simulate', rates: ['drug'], from: '0 h', to: 'nope', find: [{ name: 'q', crossing: 'C', level: '1 m' }] },
    ]);
    const report = reportOf(doc);
    let seen = 0;
    for (const c of report.cells) for (const e of c.errors ?? (c.error ? [c.error] : [])) {
      seen++;
      assert.doesNotMatch(fieldWords(doc, e.path), /[[\]]|cells/, e.path);
      assert.doesNotMatch(problemWords(doc, report, e), /cells\[/, e.message);
    }
    assert.ok(seen >= 6, `only ${seen} problems`);
  });
});

describe('a problem in words', () => {
  it('a duplicate names the first definition in words; the report keeps its path', () => {
    const doc = study([{ id: 'p', kind: 'parameters', items: [{ name: 'k', value: '1 / h' }, { name: 'k', value: '2 / h' }] }]);
    const report = reportOf(doc);
    const c = report.cells[0];
    const e = (c.errors ?? [c.error!]).find((x) => x.kind === 'duplicate')!;
    assert.match(e.message, /cells\[0\]\.items\[0\]/, 'the JSON report keeps the path');
    assert.equal(problemWords(doc, report, e), '"k" is already defined in Parameters "p", parameter "k", name');
  });

  it('a wait is said once, with the chain of cells and the first problem in words', () => {
    const doc = study([
      { id: 'a', kind: 'parameters', items: [{ name: 'k', value: 'zz / h' }] },
      { id: 'b', kind: 'parameters', title: 'Derived', items: [{ name: 'k2', value: '2 * k' }] },
      { id: 'c', kind: 'parameters', items: [{ name: 'k3', value: '2 * k2' }, { name: 'k4', value: '3 * k2' }] },
    ]);
    const report = reportOf(doc);
    const c = report.cells[2];
    assert.equal(c.errors?.length, 2, 'two fields wait');
    // hand-written: c waits on b, which waits on a, whose value reads an unknown name
    assert.equal(waitWords(doc, report, 'b'), 'waits on Parameters "Derived", which waits on Parameters "a": parameter "k", value: unknown name "zz"');
    assert.equal(problemWords(doc, report, c.errors![0]), problemWords(doc, report, c.errors![1]));
    assert.match(c.errors![0].message, /^waits on cell "b"/, 'the JSON report keeps its message');
  });

  it('a unit hint names the definer in words', () => {
    const doc = study([
      { id: 'p', kind: 'parameters', items: [{ name: 'h', value: '10 W / (m^2 K)' }, { name: 'k', value: '0.5 / min' }] },
      { ...DRUG, rate: '-k * C' },
      { id: 'run', kind: 'simulate', rates: ['drug'], from: '0 min', to: '2 h' },
    ]);
    const report = reportOf(doc);
    const r = report.cells[2];
    const e = (r.errors ?? (r.error ? [r.error] : [])).find((x) => x.path === 'cells[2].to');
    assert.ok(e, 'an end written 2 h beside a parameter h is a unit problem');
    assert.match(e!.message, /cells\[0\]\.items\[0\]/, 'the JSON report keeps the path');
    const words = problemWords(doc, report, e!);
    assert.match(words, /here h is the parameter defined at Parameters "p", parameter "h"; for hours write hour/);
    assert.doesNotMatch(words, /cells\[/);
  });
});

describe('notes for an inspector', () => {
  it('the report warnings about names hiding units are engine-only', () => {
    const doc = study([
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.2 m^0.5 / min' }] },
      { id: 'tank', kind: 'rate', state: 'h', unit: 'm', rate: '-k * sqrt(h)', initial: '2 m' },
      { id: 'run', kind: 'simulate', rates: ['tank'], from: '0 min', to: '10 min', find: [{ name: 'h_end', valueOf: 'h', at: '10 min' }] },
    ]);
    const report = reportOf(doc);
    assert.ok(report.warnings.some((w) => /hides the unit h/.test(w)), report.warnings.join(' | '));
    for (const c of report.cells) for (const n of inspectorNotes(c)) assert.doesNotMatch(n, /hides the unit|cells\[/, n);
  });

  it('a fit with no degrees of freedom says why it has no residual SD and keeps its warning', () => {
    const doc = study([
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }] },
      { id: 'cool', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - 20 degC)', initial: '80 degC' },
      { id: 'logger', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'T', unit: 'degC' }], rows: [[0, 80], [1, 56]] },
      { id: 'fit', kind: 'fit', rates: ['cool'], data: 'logger', time: 't', observe: { T: 'T' }, estimate: [{ parameter: 'k', as: 'k_fit', guess: '0.3 / h' }, { parameter: 'T', as: 'T0_fit', guess: '75 degC' }] },
    ]);
    const fit = reportOf(doc).cells[3];
    assert.ok(fit.ok && fit.kind === 'fit');
    if (fit.kind !== 'fit') return;
    // hand-worked: 2 points, 2 estimates: 0 degrees of freedom
    assert.equal(fit.dof, 0);
    assert.equal(fit.residualSD, undefined);
    assert.equal(residualSdReason(fit), 'not available: 2 points for 2 estimates leave no degrees of freedom to estimate it from');
    assert.ok(inspectorNotes(fit).some((n) => /^As many data points as parameters/.test(n)), inspectorNotes(fit).join(' | '));
  });
});
