/**
 * Benchmark rows for the sensitivity and compare cells on the 6-dose schedule of
 * `simulate.ts` (its four questions), each cell re-run alone after an edit of its own text,
 * as a user's edit would. Goals: a 5-parameter sensitivity (dose, V, k, MIC and the state's
 * start, 10 what-if runs) under 5 ms, and a 3-scenario compare (three values of k, with the
 * overlay curves) under 5 ms.
 */
import { openStudy } from '../src/index.ts';
import { SIX_DOSES } from './simulate.ts';

export interface ScenarioRow {
  readonly name: string;
  readonly ms: number;
  readonly goalMs: number;
  readonly evaluations: number;
}

const SENSITIVITY = { id: 'matters', kind: 'sensitivity', of: ['Cmax', 'trough', 'auc', 'above'], parameters: ['dose', 'V', 'k', 'MIC', 'tau'] };
const COMPARE = {
  id: 'side', kind: 'compare', run: 'run',
  scenarios: [{ name: 'slow', set: { k: '0.05 / h' } }, { name: 'usual', set: {} }, { name: 'fast', set: { k: '0.2 / h' } }],
};

/** The six-dose study with its interval as a parameter (`tau`, for the fifth parameter), and one more cell. */
function study(cell: object) {
  const doc = structuredClone(SIX_DOSES) as { cells: Array<Record<string, unknown>> };
  (doc.cells[0].items as object[]).push({ name: 'tau', value: '8 h' });
  (doc.cells[2].events as Array<Record<string, unknown>>)[0].every = 'tau';
  doc.cells.push(structuredClone(cell) as Record<string, unknown>);
  return doc;
}

function timeCell(cell: object, repeats: number): { median: number; p95: number; evaluations: number } {
  const opened = openStudy(study(cell));
  if (!opened.ok) throw new Error(opened.error.message);
  const s = opened.session;
  const times: number[] = [];
  let evaluations = 0;
  for (let i = 0; i < repeats + 10; i++) {
    // a new title re-runs nothing; the cell's signature changes with any field, so re-run it by its text
    const edited = { ...cell, title: `bench ${i}` };
    const t0 = performance.now();
    const r = s.apply({ type: 'replace', cell: edited as never });
    const dt = performance.now() - t0;
    const c = r.ok ? r.report.cells[3] : undefined;
    if (!r.ok || !c?.ok || r.rerun.length !== 1) throw new Error(`the benchmark cell did not run as expected: ${JSON.stringify(c?.error ?? r)}`);
    evaluations = c.evaluations as number;
    if (i >= 10) times.push(dt);
  }
  times.sort((a, b) => a - b);
  return { median: times[Math.floor(times.length / 2)], p95: times[Math.floor(times.length * 0.95)], evaluations };
}

export function scenarioBenchmarks(repeats = 100): ScenarioRow[] {
  const sens = timeCell(SENSITIVITY, repeats);
  const cmp = timeCell(COMPARE, repeats);
  return [
    { name: 'sensitivity of 4 answers of the 6-dose schedule to 5 parameters, the cell re-run alone; median', ms: sens.median, goalMs: 5, evaluations: sens.evaluations },
    { name: '  95th percentile', ms: sens.p95, goalMs: 5, evaluations: sens.evaluations },
    { name: 'compare: the 6-dose schedule under 3 scenarios of k, answers and overlay curves; median', ms: cmp.median, goalMs: 5, evaluations: cmp.evaluations },
    { name: '  95th percentile', ms: cmp.p95, goalMs: 5, evaluations: cmp.evaluations },
  ];
}
