/**
 * Speed of a least-squares fit through a run's schedule (`run` on a fit cell): CL and V of a
 * one-compartment law from two levels taken during the last interval of an 8-dose q12h regimen
 * (invented numbers). Each repeat replaces the fit cell (its weighting toggled, so it fits
 * again) in an open session; the median of the re-evaluations is reported. Goal: under 50 ms
 * in Node, so that editing a level answers at once.
 */
import { openStudy } from '../src/index.ts';
import type { SimulateRow } from './simulate.ts';

export function fitRunBenchmarks(repeats = 30): SimulateRow[] {
  // levels from superposition with CL 5 L/h, V 50 L (k = 0.1/h), doses of 1000 mg
  const level = (t: number) => Array.from({ length: 8 }, (_, i) => 12 * i).filter((ti) => ti <= t).reduce((s, ti) => s + 20 * Math.exp(-0.1 * (t - ti)), 0);
  const study = {
    format: 'ratebook-study', version: 1, title: 'bench: fit through a regimen',
    cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'CL', value: '5 L/h' }, { name: 'V', value: '50 L' }, { name: 'dose', value: '1000 mg' }] },
      { id: 'elim', kind: 'rate', state: 'C', unit: 'mg/L', rate: '-CL / V * C', initial: '0 mg/L' },
      { id: 'regimen', kind: 'simulate', rates: ['elim'], from: '0 h', to: '96 h', events: [{ at: '0 h', every: '12 h', count: 8, add: { C: 'dose / V' } }] },
      { id: 'levels', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg/L' }], rows: [[85, level(85)], [95.5, level(95.5)]] },
      { id: 'fit', kind: 'fit', run: 'regimen', data: 'levels', time: 't', observe: { C: 'C' },
        estimate: [{ parameter: 'CL', as: 'CL_i', guess: '3 L/h' }, { parameter: 'V', as: 'V_i', guess: '30 L' }] },
    ],
  };
  const opened = openStudy(study);
  if (!opened.ok) throw new Error(opened.error.message);
  const s = opened.session;
  const cell = structuredClone(study.cells[4]) as { weighting?: string };
  const times: number[] = [];
  let evaluations = 0;
  for (let i = 0; i < repeats + 5; i++) {
    cell.weighting = i % 2 ? 'none' : undefined;
    const t0 = performance.now();
    const r = s.apply({ type: 'replace', cell });
    const dt = performance.now() - t0;
    if (!r.ok || !r.report.cells[4].ok) throw new Error(`the benchmark fit failed: ${JSON.stringify(r.ok ? r.report.cells[4].error : r.error)}`);
    evaluations = r.report.cells[4].evaluations as number;
    if (i >= 5) times.push(dt);
  }
  times.sort((a, b) => a - b);
  return [{ name: `2-estimate fit through an 8-dose regimen, 2 levels (${evaluations} model runs); median`, ms: times[Math.floor(times.length / 2)], goalMs: 50, steps: evaluations }];
}
