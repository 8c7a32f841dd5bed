/**
 * Speed of a Bayesian (MAP) fit cell through the engine: the template
 * examples/bayesian-two-levels.ratebook.json (two levels, priors on k and the starting level,
 * an additive and proportional error model), its fit cell replaced and fitted again each time
 * (a changed title, so the node runs again). The figure is the median of one whole apply: the
 * fit's iterations, the curvature for the intervals and the report. Goal: under 50 ms, so that
 * an edit of a prior answers at once.
 */
import { readFileSync } from 'node:fs';
import { openStudy } from '../src/index.ts';

export interface MapFitRow {
  readonly name: string;
  readonly ms: number;
  readonly goalMs: number;
}

export function mapFitBenchmarks(repeats = 40): MapFitRow[] {
  const study = JSON.parse(readFileSync(new URL('../examples/bayesian-two-levels.ratebook.json', import.meta.url), 'utf8'));
  const opened = openStudy(study);
  if (!opened.ok) throw new Error(opened.error.message);
  const s = opened.session;
  const at = study.cells.findIndex((c: { id: string }) => c.id === 'bayes');
  const cell = structuredClone(study.cells[at]);
  const times: number[] = [];
  let evaluations = 0;
  for (let i = 0; i < repeats + 5; i++) {
    cell.title = `Bayesian estimate ${i}`;
    const t0 = performance.now();
    const r = s.apply({ type: 'replace', cell });
    const dt = performance.now() - t0;
    const fit = r.ok ? r.report.cells[at] : undefined;
    if (!fit?.ok || fit.bayesian !== true) throw new Error(`the benchmark MAP fit failed: ${JSON.stringify(r.ok ? fit?.error : r.error)}`);
    evaluations = fit.evaluations as number;
    if (i >= 5) times.push(dt);
  }
  times.sort((a, b) => a - b);
  return [{ name: `Bayesian (MAP) fit cell, 2 levels, 2 priors, through the simulation (${evaluations} model runs, the curvature's included); median`, ms: times[Math.floor(times.length / 2)], goalMs: 50 }];
}

/**
 * A MAP fit through the regimen with two levels (invented numbers): 8 one-hour infusions of
 * 1000 mg every 12 h into C' = -CL/V C, two levels drawn in the last interval (a peak 1 h after
 * the last infusion ends, a trough before the next would start), log-normal priors on CL and V
 * and an additive and proportional error model. Each repeat replaces the fit cell (a changed
 * title, so it fits again) in an open session: every model run is the whole 8-dose schedule at
 * relative tolerance 1e-10, the curvature for the intervals included. Goal: under 50 ms in Node.
 */
export function mapFitRunBenchmarks(repeats = 30): MapFitRow[] {
  // levels from superposition with CL 4 L/h, V 45 L (the prior medians are 5 L/h and 50 L)
  const cl = 4, v = 45, k = cl / v, k0 = 1000;
  const level = (t: number) => Array.from({ length: 8 }, (_, i) => 12 * i).filter((s) => s < t)
    .reduce((c, s) => c + (t < s + 1 ? k0 / cl * (1 - Math.exp(-k * (t - s))) : k0 / cl * (1 - Math.exp(-k)) * Math.exp(-k * (t - s - 1))), 0);
  const study = {
    format: 'ratebook-study', version: 1, title: 'bench: MAP fit through a regimen',
    cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'CL', value: '5 L/h' }, { name: 'V', value: '50 L' }, { name: 'dose', value: '1000 mg' }, { name: 't_inf', value: '1 h' }] },
      { id: 'elim', kind: 'rate', state: 'C', unit: 'mg/L', rate: '-CL / V * C', initial: '0 mg/L' },
      { id: 'regimen', kind: 'simulate', rates: ['elim'], from: '0 h', to: '96 h', events: [{ at: '0 h', every: '12 h', count: 8, for: 't_inf', infuse: { C: 'dose / t_inf / V' } }] },
      { id: 'levels', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg/L' }], rows: [[86, level(86)], [95.5, level(95.5)]] },
      { id: 'fit', kind: 'fit', title: 'MAP', run: 'regimen', data: 'levels', time: 't', observe: { C: 'C' },
        estimate: [
          { parameter: 'CL', as: 'CL_i', guess: '5 L/h', prior: { median: '5 L/h', omega: 0.3 } },
          { parameter: 'V', as: 'V_i', guess: '50 L', prior: { median: '50 L', omega: 0.2 } }],
        error: { additive: '1 mg/L', proportional: 0.1 } },
    ],
  };
  const opened = openStudy(study);
  if (!opened.ok) throw new Error(opened.error.message);
  const s = opened.session;
  const cell = structuredClone(study.cells[4]);
  const times: number[] = [];
  let evaluations = 0;
  for (let i = 0; i < repeats + 5; i++) {
    cell.title = `MAP ${i}`;
    const t0 = performance.now();
    const r = s.apply({ type: 'replace', cell: cell as never });
    const dt = performance.now() - t0;
    const fit = r.ok ? r.report.cells[4] : undefined;
    if (!fit?.ok || fit.bayesian !== true) throw new Error(`the benchmark MAP fit through the regimen failed: ${JSON.stringify(r.ok ? fit?.error : r.error)}`);
    evaluations = fit.evaluations as number;
    if (i >= 5) times.push(dt);
  }
  times.sort((a, b) => a - b);
  return [{ name: `a MAP fit through the regimen with two levels: CL and V, 8 one-hour infusions q12h, levels at 86 h and 95.5 h (${evaluations} model runs, the curvature's included); median`, ms: times[Math.floor(times.length / 2)], goalMs: 50 }];
}
