/**
 * Benchmark rows for the simulate cell: one run of a 6-dose schedule (repeated IV bolus,
 * one compartment, with its four questions), re-run through the session as a user's edit of
 * the simulate cell would. Goal: under 1 ms.
 */
import { openStudy } from '../src/index.ts';
import { type StatRow, loopRows, timeLoop } from './loop-stats.ts';

export interface SimulateRow {
  readonly name: string;
  readonly ms: number;
  readonly goalMs: number;
  readonly steps: number;
}

/** One compartment, IV bolus every 8 h six times, four questions (also the what-if benchmark's study). */
export const SIX_DOSES = {
  format: 'ratebook-study', version: 1, title: 'bench: six doses',
  cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'dose', value: '500 mg' }, { name: 'V', value: '30 L' }, { name: 'k', value: '0.1 / h' }, { name: 'MIC', value: '4 mg / L' }] },
    { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
    { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '48 h',
      events: [{ at: '0 h', every: '8 h', count: 6, add: { C: 'dose / V' } }],
      find: [
        { name: 'Cmax', maximum: 'C' },
        { name: 'trough', minimum: 'C', from: '40 h', to: '48 h' },
        { name: 'auc', integralOf: 'C' },
        { name: 'above', timeAbove: 'C', level: 'MIC' },
      ] },
  ],
};

/**
 * The simulate cell re-run alone, `repeats` times after at least 500 untimed runs and 1 s:
 * the median and 95th percentile by the wall clock against the goal, with processor time,
 * garbage collections and allocation beside them (`loop-stats.ts`).
 */
export async function simulateBenchmarks(repeats = 2000): Promise<StatRow[]> {
  const opened = openStudy(SIX_DOSES);
  if (!opened.ok) throw new Error(opened.error.message);
  const s = opened.session;
  const cell = structuredClone(SIX_DOSES.cells[2]) as { to: string };
  let steps = 0;
  const stats = await timeLoop((i) => {
    cell.to = i % 2 ? '48 h' : '48.000001 h';
    const r = s.apply({ type: 'replace', cell: cell as never });
    if (!r.ok || !r.report.ok || r.rerun.length !== 1) throw new Error('the benchmark study did not run as expected');
    steps = r.report.cells[2].steps as number;
  }, { warmupRuns: 500, warmupMs: 1000, runs: repeats });
  return loopRows(`one simulation of a 6-dose schedule with 4 questions (${steps} steps), the cell re-run alone`, stats, 1);
}

/** A fit cell re-run: 3 estimates (k, the ambient and the start) from 20 logged points of a cooling curve, through the simulation. Goal: under 50 ms. */
export function fitCellBenchmarks(repeats = 40): SimulateRow[] {
  const rows = Array.from({ length: 20 }, (_, i) => {
    const t = i * 15;
    return [t, 4 + 70 * Math.exp(-0.8 * t / 60) + 0.2 * Math.sin(i * 2.3)];
  });
  const study = {
    format: 'ratebook-study', version: 1, title: 'bench: fit',
    cells: [
      { id: 'logger', kind: 'data', columns: [{ name: 't', unit: 'min' }, { name: 'T', unit: 'degC' }], rows },
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }, { name: 'Ta', value: '10 degC' }, { name: 'T0', value: '60 degC' }] },
      { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: 'T0' },
      { id: 'fit', kind: 'fit', rates: ['law'], data: 'logger', time: 't', observe: { T: 'T' },
        estimate: [{ parameter: 'k', as: 'k_hat', guess: '0.5 / h' }, { parameter: 'Ta', as: 'Ta_hat', guess: '10 degC' }, { parameter: 'T', as: 'T0_hat', guess: '60 degC' }] },
    ],
  };
  const opened = openStudy(study);
  if (!opened.ok) throw new Error(opened.error.message);
  const s = opened.session;
  const cell = structuredClone(study.cells[3]) as { weighting?: string };
  const times: number[] = [];
  let iterations = 0;
  for (let i = 0; i < repeats + 5; i++) {
    cell.weighting = i % 2 ? 'none' : undefined;
    const t0 = performance.now();
    const r = s.apply({ type: 'replace', cell });
    const dt = performance.now() - t0;
    if (!r.ok || !r.report.cells[3].ok) throw new Error(`the benchmark fit failed: ${JSON.stringify(r.ok ? r.report.cells[3].error : r.error)}`);
    iterations = r.report.cells[3].iterations as number;
    if (i >= 5) times.push(dt);
  }
  times.sort((a, b) => a - b);
  return [{ name: `3-estimate fit cell, 20 points, through the simulation (${iterations} iterations); median`, ms: times[Math.floor(times.length / 2)], goalMs: 50, steps: iterations }];
}
