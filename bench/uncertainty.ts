/**
 * Benchmark rows for the uncertainty cell: 2,000 Monte Carlo samples of the 6-dose schedule
 * of `simulate.ts` with its four questions (k log-normal, CV 30%; V normal, SD 3 L: invented
 * figures), re-run after an edit of the cell's seed alone, so that only the uncertainty cell
 * runs. Goal: under 0.5 s of processor time in Node (the fastest of 5 runs, as the machine
 * may be shared). Also the linear method on the same study (median of 20; goal 5 ms).
 */
import { openStudy } from '../src/index.ts';
import { SIX_DOSES } from './simulate.ts';

export interface UncertaintyRow {
  readonly name: string;
  readonly ms: number;
  readonly goalMs: number;
  readonly evaluations: number;
}

/** The 6-dose study with spreads on k and V and an uncertainty cell over its four answers. */
export function sixDosesUncertain(method: 'monte-carlo' | 'linear', samples = 2000): object {
  const [p, ...rest] = SIX_DOSES.cells;
  const items = (p as { items: Array<{ name: string; value: string }> }).items.map((it) => (
    it.name === 'k' ? { ...it, spread: { distribution: 'lognormal', cv: 0.3 } }
      : it.name === 'V' ? { ...it, spread: { distribution: 'normal', sd: '3 L' } } : it));
  return { ...SIX_DOSES, cells: [{ ...p, items }, ...rest, { id: 'how', kind: 'uncertainty', of: ['Cmax', 'trough', 'auc', 'above'], method, samples, seed: 1 }] };
}

function timed(method: 'monte-carlo' | 'linear', repeats: number): UncertaintyRow {
  const doc = sixDosesUncertain(method) as { cells: Array<Record<string, unknown>> };
  const opened = openStudy(doc);
  if (!opened.ok) throw new Error(opened.error.message);
  const s = opened.session;
  const cell = { ...doc.cells[doc.cells.length - 1] };
  const times: number[] = [];
  let evaluations = 0;
  for (let i = 0; i < repeats + 1; i++) {
    cell.seed = i + 2;
    if (method === 'linear') cell.of = i % 2 ? ['Cmax', 'trough', 'auc', 'above'] : ['trough', 'Cmax', 'auc', 'above'];
    // processor time: the machine may be shared, and wall time then counts other work
    const t0 = process.cpuUsage();
    const r = s.apply({ type: 'replace', cell: cell as never });
    const used = process.cpuUsage(t0);
    const dt = (used.user + used.system) / 1000;
    const c = r.ok ? r.report.cells[r.report.cells.length - 1] : undefined;
    if (!r.ok || !c?.ok || r.rerun.length !== 1) throw new Error(`the uncertainty study did not run as expected: ${JSON.stringify(c?.error)}`);
    evaluations = c.evaluations as number;
    if (i > 0) times.push(dt);
  }
  times.sort((a, b) => a - b);
  const name = method === 'linear' ? 'the linear method over k and V, four answers: processor time, median'
    : '2,000 Monte Carlo samples of the 6-dose schedule (k and V uncertain), four answers: processor time, fastest';
  return { name, ms: method === 'linear' ? times[Math.floor(times.length / 2)] : times[0], goalMs: method === 'linear' ? 5 : 500, evaluations };
}

export function uncertaintyBenchmarks(): UncertaintyRow[] {
  return [timed('monte-carlo', 5), timed('linear', 20)];
}
