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
