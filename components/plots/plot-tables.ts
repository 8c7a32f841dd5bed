/**
 * The data of the phase and sweep charts as tables for `<chart-data>`: the engine's plotted
 * values side by side, as text. Nothing here computes a value; it only arranges and writes
 * what the report holds.
 */
import type uPlot from 'uplot';
import { formatNumber } from '../../src/index.ts';
import type { DataTable } from './data-table.ts';
import type { PhaseEquilibrium, PhasePlotData } from './phase-plot.ts';
import type { SweepData } from './sweep-runs.ts';

const fmt = (v: number | null | undefined, gap = '–') => (v == null || !Number.isFinite(v) ? gap : formatNumber(v, 6));

/**
 * A phase plot's tables: the rate against the state (where the rate is not defined, it says
 * so), the equilibria, and the solutions over time (`solutions`: the chart's aligned table,
 * time first, one column per starting value).
 */
export function phaseTables(p: PhasePlotData, state: string, equilibria: readonly PhaseEquilibrium[], solutions: uPlot.AlignedData): DataTable[] {
  const tables: DataTable[] = [{
    caption: `Rate of ${state} against ${state}`,
    columns: [`${state} (${p.stateUnit})`, `d${state}/dt (${p.rateUnit})`],
    rows: p.y.flatMap((y, i) => (y === null ? [] : [[fmt(y), fmt(p.f[i], 'not defined')]])),
  }];
  if (equilibria.length) {
    tables.push({ caption: 'Equilibria', columns: [`${state} (${p.stateUnit})`, 'stability'], rows: equilibria.map((e) => [fmt(e.value), e.stability]) });
  }
  if (p.solutions.length && solutions.length > 1) {
    const [t, ...ys] = solutions as Array<ReadonlyArray<number | null>>;
    tables.push({
      caption: `${state} against time, from each starting value`,
      columns: [`time (${p.timeUnit})`, ...p.solutions.map((s) => `${state} from ${fmt(s.start)} ${p.stateUnit}`)],
      rows: t.map((v, i) => [fmt(v), ...ys.map((col) => fmt(col[i]))]),
    });
  }
  return tables;
}

/** A sweep's tables: every equilibrium found, by branch, with its stability; then the folds. */
export function sweepTables(s: SweepData, state: string): DataTable[] {
  const first = s.branches.find((b) => b.length)?.[0];
  const pUnit = first?.parameter.unit ?? '';
  const yUnit = first?.value.unit ?? '';
  const tables: DataTable[] = [{
    caption: `Equilibria of ${state} as ${s.parameter} runs`,
    columns: ['branch', `${s.parameter} (${pUnit})`, `${state} (${yUnit})`, 'stability'],
    rows: s.branches.flatMap((b, i) => b.map((pt) => [String(i + 1), fmt(pt.parameter.value), fmt(pt.value.value), pt.stability])),
  }];
  if (s.folds.length) {
    tables.push({
      caption: 'Folds', columns: [`${s.parameter} (${pUnit})`, `${state} (${yUnit})`, 'the pair'],
      rows: s.folds.map((f) => [fmt(f.parameter.value), fmt(f.value.value), f.pair ?? '']),
    });
  }
  return tables;
}
