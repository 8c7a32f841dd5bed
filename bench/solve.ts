/**
 * Benchmark rows for the solve cell: the dose that puts the trough of an 8-dose regimen (a
 * dose every 12 h, C' = -k C) at a target, re-solved after an edit of the target alone, so that
 * only the solve cell runs. Goal: under 20 ms in Node.
 */
import { openStudy } from '../src/index.ts';

export interface SolveRow {
  readonly name: string;
  readonly ms: number;
  readonly goalMs: number;
  readonly evaluations: number;
}

/** Invented numbers: 1 g every 12 h, 8 doses, V 50 L, k 0.1 / h; the dose for a trough of 12.5 mg/L, in 100 mg to 5 g. */
export const EIGHT_DOSES = {
  format: 'ratebook-study', version: 1, title: 'bench: eight doses, solved for the dose',
  cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'dose', value: '1000 mg' }, { name: 'V', value: '50 L' }, { name: 'k', value: '0.1 / h' }] },
    { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
    { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '96 h',
      events: [{ at: '0 h', every: '12 h', count: 8, add: { C: 'dose / V' } }],
      find: [{ name: 'trough', minimum: 'C', from: '84 h', to: '96 h' }] },
    { id: 'new-dose', kind: 'solve', vary: { parameter: 'dose', as: 'dose_new', min: '100 mg', max: '5000 mg', roundTo: '250 mg' },
      target: { value: 'trough', equals: '12.5 mg / L' } },
  ],
};

export function solveBenchmarks(repeats = 60): SolveRow[] {
  const opened = openStudy(EIGHT_DOSES);
  if (!opened.ok) throw new Error(opened.error.message);
  const s = opened.session;
  const cell = structuredClone(EIGHT_DOSES.cells[3]) as { target: { equals: string } };
  const times: number[] = [];
  let evaluations = 0;
  for (let i = 0; i < repeats + 10; i++) {
    cell.target.equals = `${12 + (i % 10) * 0.1} mg / L`;
    const t0 = performance.now();
    const r = s.apply({ type: 'replace', cell: cell as never });
    const dt = performance.now() - t0;
    const c = r.ok ? r.report.cells[3] : undefined;
    if (!r.ok || !c?.ok || r.rerun.length !== 1) throw new Error(`the benchmark study did not solve as expected: ${JSON.stringify(c?.error)}`);
    evaluations = c.evaluations as number;
    if (i >= 10) times.push(dt);
  }
  times.sort((a, b) => a - b);
  return [
    { name: 'solve for the dose of an 8-dose regimen (trough in the last interval), the cell re-run alone; median', ms: times[Math.floor(times.length / 2)], goalMs: 20, evaluations },
    { name: '  95th percentile', ms: times[Math.floor(times.length * 0.95)], goalMs: 20, evaluations },
  ];
}
