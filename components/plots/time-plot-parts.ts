/**
 * The parts of `<time-plot>` that are not drawing: panels (states grouped by unit), time-axis
 * ticks, events grouped by time, the values a log axis cannot show and the ticks it labels, and the chart's data as
 * tables. They choose and arrange what the engine reported; they compute no new values (a time
 * read in another unit is multiplied by the engine's own factor, as the axis labels are).
 */
import type uPlot from 'uplot';
import { formatNumber, type SimulationPlot } from '../../src/index.ts';
import type { DataTable } from './data-table.ts';

/** Measured values of one state, times in the plot's time unit and values in the state's unit. */
export interface MeasuredPoints {
  readonly state: string;
  readonly t: readonly number[];
  readonly values: readonly number[];
}

/** States that share a chart: at most two units, one y axis each. */
export interface Panel {
  readonly units: string[];
  /** Indices into plot.states. */
  readonly states: number[];
  readonly data: uPlot.AlignedData;
}

/** Tick steps offered to the time axis, in the unit it is shown in. */
const NICE_STEPS = [-6, -5, -4, -3, -2, -1, 0, 1, 2, 3, 4, 5, 6, 7, 8, 9].flatMap((e) => [1, 2, 2.5, 5].map((m) => m * 10 ** e));
/** Least distance between time ticks, CSS pixels. */
const TICK_SPACE = 60;
const fmt = (v: number) => formatNumber(v, 6);

/**
 * Ticks for the time axis at round numbers of the unit it is shown in (`factor` of them per
 * data unit), at least TICK_SPACE pixels apart over `width` pixels; returned in data units.
 */
export function timeSplits(min: number, max: number, factor: number, width: number): number[] {
  const lo = min * factor;
  const hi = max * factor;
  if (!(hi > lo) || !(width > 0)) return [min];
  const step = NICE_STEPS.find((s) => (s / (hi - lo)) * width >= TICK_SPACE) ?? hi - lo;
  const first = Math.ceil(lo / step - 1e-9);
  const out: number[] = [];
  for (let i = first; i * step <= hi + 1e-9 * step; i++) out.push((i * step) / factor);
  return out;
}

/** Events grouped by time (two actions at one time get one marker). */
export function eventTimes(p: SimulationPlot): Array<{ time: number; labels: string[] }> {
  const out: Array<{ time: number; labels: string[] }> = [];
  for (const e of p.events) {
    const same = out.find((o) => o.time === e.time);
    if (same) {
      if (!same.labels.includes(e.label)) same.labels.push(e.label);
    } else out.push({ time: e.time, labels: [e.label] });
  }
  return out;
}

/** Groups the states by unit, two units to a chart, in the order the states come. */
export function panelsOf(p: SimulationPlot): Panel[] {
  const units = [...new Set(p.states.map((s) => s.unit))];
  const panels: Panel[] = [];
  for (let i = 0; i < units.length; i += 2) {
    const mine = units.slice(i, i + 2);
    const states = p.states.flatMap((s, j) => (mine.includes(s.unit) ? [j] : []));
    panels.push({ units: mine, states, data: [p.t, ...states.map((s) => p.states[s].values)] as uPlot.AlignedData });
  }
  return panels;
}


/**
 * A panel's data as drawn on a log axis: every value at or below zero (or not finite) becomes
 * a gap, since a log axis has no place for it. The plot's own arrays are left as they are.
 */
export function logDrawn(data: uPlot.AlignedData): uPlot.AlignedData {
  return [data[0], ...data.slice(1).map((col) => (col as Array<number | null>).map((v) => (v != null && v > 0 && Number.isFinite(v) ? v : null)))] as uPlot.AlignedData;
}

/** A value a log axis can place. */
export const onLogAxis = (v: number | null | undefined): v is number => v != null && v > 0 && Number.isFinite(v);

/** The extremes of the values on one y unit: all of them, and those a log axis can place. */
export interface Extent { readonly lo: number; readonly hi: number; readonly logLo: number; readonly logHi: number }
export const NO_EXTENT: Extent = { lo: Infinity, hi: -Infinity, logLo: Infinity, logHi: -Infinity };

/**
 * The extremes of the levels and measured points of each state unit (what a y range must show
 * besides the curves). One pass over the values, no argument lists: 100,000 points cost a
 * loop, not a spread into `Math.min`. Values that are not finite numbers are left out.
 */
export function extentsByUnit(p: SimulationPlot, points: readonly MeasuredPoints[]): Map<string, Extent> {
  const out = new Map<string, Extent>();
  const unitOf = (state: string) => p.states.find((s) => s.name === state)?.unit;
  const add = (unit: string | undefined, values: readonly number[]) => {
    if (unit === undefined) return;
    let { lo, hi, logLo, logHi } = out.get(unit) ?? NO_EXTENT;
    for (let i = 0; i < values.length; i++) {
      const v = values[i];
      if (typeof v !== 'number' || !(v - v === 0)) continue; // not a finite number
      if (v < lo) lo = v;
      if (v > hi) hi = v;
      if (v > 0 && v < logLo) logLo = v;
      if (v > 0 && v > logHi) logHi = v;
    }
    out.set(unit, { lo, hi, logLo, logHi });
  };
  for (const l of p.levels) add(unitOf(l.state), [l.value]);
  for (const m of points) add(unitOf(m.state), m.values);
  return out;
}

/**
 * What a log axis leaves out, in words, one sentence per state (its curve, its measured points,
 * its levels and found points): empty when everything can be drawn.
 */
export function leftOffLog(p: SimulationPlot, points: readonly MeasuredPoints[]): string[] {
  return p.states.flatMap((s) => {
    const curve = s.values.filter((v) => !onLogAxis(v)).length;
    const measured = points.filter((m) => m.state === s.name).reduce((n, m) => n + m.values.filter((v) => !onLogAxis(v)).length, 0);
    const levels = p.levels.filter((l) => l.state === s.name && !onLogAxis(l.value)).length;
    const marks = p.marks.filter((m) => m.state === s.name && !onLogAxis(m.value)).length;
    const parts = [
      curve ? `${curve} of its ${s.values.length} plotted values` : '',
      measured ? `${measured} measured point${measured === 1 ? '' : 's'}` : '',
      levels ? `${levels} level${levels === 1 ? '' : 's'}` : '',
      marks ? `${marks} found point${marks === 1 ? '' : 's'}` : '',
    ].filter(Boolean);
    if (!parts.length) return [];
    const none = curve === s.values.length ? ' (none of its curve can be drawn)' : '';
    return [`${s.name} at or below zero, not drawn on the log axis: ${parts.join(', ')}${none}.`];
  });
}

/**
 * The plot's data as tables, times read in `unit` (the engine's `factor` from the plot's time
 * unit): one table per chart panel (time and each state's values), then the measured points
 * and the found points when there are any.
 */
export function timePlotTables(p: SimulationPlot, panels: readonly Panel[], points: readonly MeasuredPoints[], factor: number, unit: string): DataTable[] {
  const time = (v: number) => fmt(v * factor);
  const value = (v: number | null | undefined) => (v == null || !Number.isFinite(v) ? '–' : fmt(v));
  const tables: DataTable[] = panels.map((panel) => ({
    caption: `${panel.states.map((s) => p.states[s].name).join(', ')} against time`,
    columns: [`time (${unit})`, ...panel.states.map((s) => `${p.states[s].name} (${p.states[s].unit})`)],
    rows: p.t.map((t, i) => [time(t), ...panel.states.map((s) => value(p.states[s].values[i]))]),
  }));
  const unitOf = (state: string) => p.states.find((s) => s.name === state)?.unit ?? '';
  for (const m of points) {
    tables.push({ caption: `${m.state} measured`, columns: [`time (${unit})`, `${m.state} (${unitOf(m.state)})`], rows: m.t.map((t, i) => [time(t), value(m.values[i])]) });
  }
  if (p.marks.length) {
    tables.push({
      caption: 'Points the run found', columns: ['name', `time (${unit})`, 'state', 'value'],
      rows: p.marks.map((m) => [m.name, time(m.time), m.state, `${value(m.value)} ${unitOf(m.state)}`]),
    });
  }
  return tables;
}

/** Least distance between labelled ticks on a log axis, CSS pixels. */
const LOG_TICK_SPACE = 18;

/**
 * The ticks a log axis labels: powers of ten, then 2 and 5 times them where there is room,
 * none closer than LOG_TICK_SPACE pixels to the one before (the others null, unlabelled).
 */
export function logSplits(u: uPlot, splits: number[], axisIdx: number): Array<number | null> {
  const scale = u.axes[axisIdx].scale ?? 'y0';
  const keep = new Set<number>();
  for (const mantissas of [[1], [2, 5]]) {
    const pos = (v: number) => u.valToPos(v, scale);
    const wanted = splits.filter((v) => mantissas.includes(Math.round(v / 10 ** Math.floor(Math.log10(v) + 1e-9))));
    const placed = [...keep].map(pos);
    for (const v of wanted) {
      if (placed.every((y) => Math.abs(y - pos(v)) >= LOG_TICK_SPACE)) { keep.add(v); placed.push(pos(v)); }
    }
    if (mantissas[0] === 1 && wanted.length > 1 && Math.abs(pos(wanted[0]) - pos(wanted[1])) < 3 * LOG_TICK_SPACE) break;
  }
  return splits.map((v) => (keep.has(v) ? v : null));
}

/**
 * The name a y axis gives the curve of state `s`: its state's name. A compare cell's plot names
 * its curves by scenario and says in `series` which state each one is; a run's names its states.
 */
export function axisNameOf(plot: SimulationPlot, s: number): string {
  const series = 'series' in plot ? (plot as SimulationPlot & { readonly series: ReadonlyArray<{ readonly state: string }> }).series : undefined;
  return series?.[s]?.state ?? plot.states[s].name;
}
