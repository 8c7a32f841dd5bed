/**
 * Benchmark rows for the sensitivity and compare cells on the 6-dose schedule of
 * `simulate.ts` (its four questions), each cell re-run alone after an edit of its own text,
 * as a user's edit would. Goals: a 5-parameter sensitivity (dose, V, k, MIC and the dosing
 * interval tau, 10 what-if runs) under 5 ms, and a 3-scenario compare (three values of k, with the
 * overlay curves) under 5 ms, median and 95th percentile by the wall clock.
 */
import { openStudy } from '../src/index.ts';
import { SIX_DOSES } from './simulate.ts';
import { type LoopStats, type StatRow, loopRows, timeLoop } from './loop-stats.ts';

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

/** The cell re-run alone `repeats` times, after at least 50 untimed runs and 1 s. */
async function timeCell(cell: object, repeats: number): Promise<{ stats: LoopStats; evaluations: number }> {
  const opened = openStudy(study(cell));
  if (!opened.ok) throw new Error(opened.error.message);
  const s = opened.session;
  let evaluations = 0;
  const stats = await timeLoop((i) => {
    // a new title re-runs nothing; the cell's signature changes with any field, so re-run it by its text
    const edited = { ...cell, title: `bench ${i}` };
    const r = s.apply({ type: 'replace', cell: edited as never });
    const c = r.ok ? r.report.cells[3] : undefined;
    if (!r.ok || !c?.ok || r.rerun.length !== 1) throw new Error(`the benchmark cell did not run as expected: ${JSON.stringify(c?.error ?? r)}`);
    evaluations = c.evaluations as number;
  }, { warmupRuns: 50, warmupMs: 1000, runs: repeats });
  return { stats, evaluations };
}

export async function scenarioBenchmarks(repeats = 500): Promise<StatRow[]> {
  const sens = await timeCell(SENSITIVITY, repeats);
  const cmp = await timeCell(COMPARE, repeats);
  return [
    ...loopRows(`sensitivity of 4 answers of the 6-dose schedule to 5 parameters (${sens.evaluations} what-if runs), the cell re-run alone`, sens.stats, 5),
    ...loopRows(`compare: the 6-dose schedule under 3 scenarios of k, answers and overlay curves (${cmp.evaluations} what-if runs)`, cmp.stats, 5),
  ];
}
