// The report's types: each kind's report type is what its builder outputs. The checks below
// are types, compiled by `npm run typecheck` (a wrong type fails the compile); the runtime
// tests check a real report against the same kinds.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import type { GraphNode } from '../../src/engine/node.ts';
import type { CellFields, CellReport, NodeOutput, ReportOf, ReportQuantity, Unfinished } from '../../src/engine/report.ts';
import type { CellKind } from '../../src/study/types.ts';
import { parameterNodes } from '../../src/cells/parameters.ts';
import { rateNodes } from '../../src/cells/rate.ts';
import { phaseNodes } from '../../src/cells/phase.ts';
import { simulateNodes } from '../../src/cells/simulate.ts';
import { dataNodes } from '../../src/cells/data.ts';
import { fitNodes } from '../../src/cells/fit.ts';
import { ncaNodes } from '../../src/cells/nca.ts';
import { noteNodes } from '../../src/cells/note.ts';
import { runStudy, isKind } from '../../src/index.ts';

/** True when A and B are the same type (neither wider). */
type Equals<A, B> = (<T>() => T extends A ? 1 : 2) extends (<T>() => T extends B ? 1 : 2) ? true : false;
const check = <T extends true>(): T | undefined => undefined;

/** What the nodes of a builder output. */
type OutputOf<B> = B extends (...args: never[]) => Array<GraphNode<infer O>> ? O : never;

// each builder outputs exactly its kind's fields
check<Equals<OutputOf<typeof parameterNodes>, NodeOutput<'parameters'>>>();
check<Equals<OutputOf<typeof rateNodes>, NodeOutput<'rate'>>>();
check<Equals<OutputOf<typeof phaseNodes>, NodeOutput<'phase'>>>();
check<Equals<OutputOf<typeof simulateNodes>, NodeOutput<'simulate'>>>();
check<Equals<OutputOf<typeof dataNodes>, NodeOutput<'data'>>>();
check<Equals<OutputOf<typeof fitNodes>, NodeOutput<'fit'>>>();
check<Equals<OutputOf<typeof ncaNodes>, NodeOutput<'nca'>>>();
check<Equals<OutputOf<typeof noteNodes>, NodeOutput<'note'>>>();

// a report of kind K holds what K's nodes output, and its `kind` is K
type Holds<K extends CellKind> = NodeOutput<K> extends Pick<ReportOf<K>, keyof NodeOutput<K>> ? true : false;
check<Holds<'parameters'>>();
check<Holds<'rate'>>();
check<Holds<'phase'>>();
check<Holds<'simulate'>>();
check<Holds<'data'>>();
check<Holds<'fit'>>();
check<Holds<'nca'>>();
check<Holds<'note'>>();
check<Equals<Extract<CellReport, { kind: 'fit' }>, ReportOf<'fit'>>>();
check<Equals<CellReport['kind'], CellKind>>();

// one quantity shape everywhere
check<Equals<ReportQuantity, { value: number; unit: string; si: number }>>();
check<Equals<NonNullable<ReportOf<'rate'>['initial']>, ReportQuantity>>();
check<Equals<NonNullable<ReportOf<'fit'>['residualSD']>, ReportQuantity>>();

// a kind's fields are absent from the other kinds' reports
check<Equals<ReportOf<'parameters'>['results'], undefined>>();
check<Equals<ReportOf<'rate'>['estimates'], undefined>>();
// @ts-expect-error a simulate report's `results` holds answers, not text
const badResult: ReportOf<'simulate'> = { id: 'r', kind: 'simulate', ok: true, results: { t_21: 'soon' } };
// @ts-expect-error a parameters report cannot carry a fit's estimates
const badEstimates: ReportOf<'parameters'> = { id: 'p', kind: 'parameters', ok: true, estimates: {} };
// @ts-expect-error a node of a rate cell cannot output a field no kind has
const badOutput: NodeOutput<'rate'> = { observed: [] };
void [badResult, badEstimates, badOutput];

// every kind has its fields (adding a kind without them fails here)
check<Equals<keyof CellFields, CellKind>>();
check<Equals<keyof Unfinished, 'computed' | 'message'>>();

/** Every field of every kind, as the JSON report may carry it. */
const DECLARED = {
  parameters: ['values', 'tex'],
  rate: ['state', 'unit', 'originalUnit', 'initial', 'rateAtStart', 'warning', 'tex'],
  phase: ['equilibria', 'intervals', 'poles', 'jumps', 'gaps', 'zeroIntervals', 'evaluations', 'notes', 'plot', 'summary', 'sweep'],
  simulate: ['method', 'steps', 'evaluations', 'results', 'closedForm', 'series', 'summary', 'questions', 'plot', 'schedule', 'switchedToStiff', 'note'],
  data: ['columns', 'rowCount', 'missing', 'note', 'csv'],
  fit: ['estimates', 'objective', 'bayesian', 'errorModel', 'residualSD', 'n', 'dof', 'iterations', 'evaluations', 'digits', 'converged', 'message', 'correlation', 'warnings', 'residuals', 'residualFloor', 'summary', 'plot'],
  nca: ['values', 'pointsUsed', 'note', 'warnings'],
  solve: ['solution', 'digits', 'achieved', 'rounded', 'achievedRounded', 'solutions', 'targetRange', 'undefinedIn', 'choices', 'evaluations', 'message'],
  uncertainty: ['method', 'results', 'inputs', 'samples', 'seed', 'failed', 'failedReason', 'evaluations', 'notes', 'summary', 'bands', 'warnings'],
  note: [],
  sensitivity: ['results', 'ranking', 'accuracy', 'accuracyWords', 'evaluations', 'summary'],
  compare: ['scenarios', 'plot', 'questions', 'evaluations', 'summary'],
} as const satisfies { [K in CellKind]: ReadonlyArray<keyof CellFields[K]> };
// the list above names every field the types declare (a field added to a kind must be added there)
check<Equals<{ [K in CellKind]: Exclude<keyof CellFields[K], (typeof DECLARED)[K][number]> }[CellKind], never>>();

const STUDY = {
  format: 'ratebook-study', version: 1, title: 'every kind',
  cells: [
    { id: 'logger', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: [[0, 10], [1, 6.1], [2, 3.7], [4, 1.35], [6, 0.5]] },
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }] },
    { id: 'drug', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '10 mg / L' },
    { id: 'settle', kind: 'phase', rate: 'drug', from: '-1 mg / L', to: '20 mg / L' },
    { id: 'fitk', kind: 'fit', rates: ['drug'], data: 'logger', time: 't', observe: { C: 'C' }, estimate: [{ parameter: 'k', as: 'k_hat', guess: '0.4 / h' }] },
    { id: 'run', kind: 'simulate', rates: ['drug'], from: '0 h', to: '8 h', find: [{ name: 'C_end', valueOf: 'C', at: '8 h' }] },
    { id: 'prof', kind: 'nca', data: 'logger', time: 't', concentration: 'C', dose: '100 mg', route: 'iv-bolus' },
    { id: 'find-k', kind: 'solve', vary: { parameter: 'k', as: 'k_new', min: '0.1 / h', max: '2 / h' }, target: { value: 'C_end', equals: '1 mg / L' } },
    { id: 'n', kind: 'note', text: 'every kind once' },
  ],
};

describe('the typed report', () => {
  it('narrows on kind to each kind\'s fields', () => {
    const r = runStudy(STUDY);
    assert.ok(r.ok);
    if (!r.ok) return;
    assert.ok(r.report.ok, JSON.stringify(r.report.cells.find((c) => !c.ok)?.error));
    for (const c of r.report.cells) {
      if (isKind(c, 'parameters')) assert.equal(c.values?.k.unit, '1 / h');
      if (isKind(c, 'rate')) assert.equal(c.initial?.value, 10);
      if (isKind(c, 'phase')) assert.equal(c.equilibria?.[0].stability, 'attractor'); // closed form: y' = -k y settles at 0
      // closed form: C(8 h) = 10 mg/L · exp(-0.5/h · 8 h)
      if (isKind(c, 'simulate')) assert.ok(Math.abs((c.results?.C_end as ReportQuantity).value - 10 * Math.exp(-4)) < 1e-4);
      if (isKind(c, 'data')) assert.equal(c.rowCount, 5);
      if (isKind(c, 'fit')) assert.equal(c.estimates?.k_hat.value.unit, '1 / h');
      if (isKind(c, 'nca')) assert.equal(c.values?.Cmax.value, 10);
      // closed form: 10 mg/L · exp(-k · 8 h) = 1 mg/L at k = ln(10) / 8 h
      if (isKind(c, 'solve')) assert.ok(Math.abs((c.solution?.value ?? 0) - Math.log(10) / 8) < 1e-5);
    }
  });

  it('has no field that no kind declares (the measurements reach plots through the graph)', () => {
    const r = runStudy(STUDY);
    assert.ok(r.ok);
    if (!r.ok) return;
    const common = ['id', 'kind', 'title', 'ok', 'error', 'errors', 'waitsOn', 'computed', 'message'];
    for (const c of r.report.cells) {
      const extra = Object.keys(c).filter((k) => !common.includes(k) && !(DECLARED[c.kind] as readonly string[]).includes(k));
      assert.deepEqual(extra, [], `${c.id} (${c.kind})`);
    }
  });
});
