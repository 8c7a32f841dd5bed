/**
 * Benchmark rows for the band around a run: the uncertainty cell of bench/uncertainty.ts (2,000
 * Monte Carlo samples of the 6-dose schedule, four answers) re-run after an edit of its seed,
 * with the run's `band` off and on (processor time, the fastest of 3 runs each, as the machine
 * may be shared), and the numbers a band keeps while it sorts: samples × grid times × states.
 */
import { openStudy } from '../src/index.ts';
import { sixDosesUncertain } from './uncertainty.ts';

export interface BandRow { readonly measure: string; readonly result: string }

function timed(band: boolean, repeats: number): { ms: number; kept: number; times: number } {
  const doc = sixDosesUncertain('monte-carlo') as { cells: Array<Record<string, unknown>> };
  const run = doc.cells.find((c) => c.id === 'run')!;
  if (band) run.band = true;
  const opened = openStudy(doc);
  if (!opened.ok) throw new Error(opened.error.message);
  const s = opened.session;
  const cell = { ...doc.cells[doc.cells.length - 1] };
  let best = Infinity, kept = 0, times = 0;
  for (let i = 0; i < repeats; i++) {
    cell.seed = i + 2;
    const t0 = process.cpuUsage();
    const r = s.apply({ type: 'replace', cell: cell as never });
    const used = process.cpuUsage(t0);
    const c = r.ok ? r.report.cells[r.report.cells.length - 1] : undefined;
    if (!r.ok || !c?.ok || c.kind !== 'uncertainty') throw new Error(`the uncertainty study did not run as expected: ${JSON.stringify(c?.error)}`);
    const b = c.bands?.[0];
    if (band && !b?.t) throw new Error(`no band: ${JSON.stringify(b)}`);
    if (b?.t) { times = b.t.length; kept = (b.samples ?? 0) * b.t.length * (b.states?.length ?? 0); }
    best = Math.min(best, (used.user + used.system) / 1000);
  }
  return { ms: best, kept, times };
}

export function bandRows(): BandRow[] {
  const off = timed(false, 3);
  const on = timed(true, 3);
  return [
    { measure: '2,000 samples of the 6-dose schedule, four answers, band off: processor time, fastest of 3', result: `${off.ms.toFixed(0)} ms` },
    { measure: `  band on (${on.times} grid times: the model run again per sample at the run's tolerance): fastest of 3`, result: `${on.ms.toFixed(0)} ms` },
    { measure: '  band on / band off', result: `${(on.ms / off.ms).toFixed(2)}x` },
    { measure: '  numbers kept for the band while sorting (samples × times × states, 8 bytes each)', result: `${on.kept.toLocaleString('en-US')} (${(on.kept * 8 / 2 ** 20).toFixed(1)} MiB)` },
  ];
}
