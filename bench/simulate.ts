/**
 * Benchmark rows for the simulate cell: one run of a 6-dose schedule (repeated IV bolus,
 * one compartment, with its four questions), re-run through the session as a user's edit of
 * the simulate cell would. Goal: under 1 ms.
 */
import { openStudy } from '../src/index.ts';

export interface SimulateRow {
  readonly name: string;
  readonly ms: number;
  readonly goalMs: number;
  readonly steps: number;
}

const STUDY = {
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

export function simulateBenchmarks(repeats = 2000): SimulateRow[] {
  const opened = openStudy(STUDY);
  if (!opened.ok) throw new Error(opened.error.message);
  const s = opened.session;
  const cell = structuredClone(STUDY.cells[2]) as { to: string };
  const times: number[] = [];
  let steps = 0;
  for (let i = 0; i < repeats + 200; i++) {
    cell.to = i % 2 ? '48 h' : '48.000001 h';
    const t0 = performance.now();
    const r = s.apply({ type: 'replace', cell });
    const dt = performance.now() - t0;
    if (!r.ok || !r.report.ok || r.rerun.length !== 1) throw new Error('the benchmark study did not run as expected');
    steps = r.report.cells[2].steps as number;
    if (i >= 200) times.push(dt);
  }
  times.sort((a, b) => a - b);
  return [
    { name: 'one simulation of a 6-dose schedule with 4 questions (the cell re-run alone); median', ms: times[Math.floor(times.length / 2)], goalMs: 1, steps },
    { name: '  95th percentile', ms: times[Math.floor(times.length * 0.95)], goalMs: 1, steps },
  ];
}
