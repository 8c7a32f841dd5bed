/**
 * What a plot of a simulation needs, in the units the study shows: times in the run's time
 * unit and each state in its own unit, sampled evenly over every piece of the run (both sides
 * of every jump kept), the action times, the levels asked about and the points found.
 * The chart only draws these numbers; it converts nothing.
 */
import type { Quantity } from '../units/quantity.ts';
import { valueIn, readingIn, describe } from '../units/quantity.ts';
import type { DisplayUnit } from '../units/units.ts';
import { formatUnit } from '../units/units.ts';
import { type Trajectory, evalPiece } from './trajectory.ts';
import type { Action } from './schedule.ts';
import { timeAxisUnits, type AxisUnit } from '../output/display-units.ts';
import type { MeasuredSeries } from '../engine/node.ts';
import { charge } from '../numerics/work-meter.ts';

/** Points across the whole run (more land on longer pieces; at least two per piece). */
export const PLOT_POINTS = 400;

export interface SimulationPlot {
  readonly timeUnit: string;
  /** The units the time axis may be relabelled in, with their factors from `timeUnit` (see output/display-units.ts). */
  readonly timeUnits: readonly AxisUnit[];
  readonly t: number[];
  readonly states: Array<{ readonly name: string; readonly unit: string; readonly values: number[] }>;
  readonly events: Array<{ readonly time: number; readonly kind: string; readonly label: string }>;
  readonly levels: Array<{ readonly state: string; readonly value: number; readonly label: string }>;
  readonly marks: Array<{ readonly name: string; readonly state: string; readonly time: number; readonly value: number; readonly label: string }>;
  /** Measurements of the states (from fit cells that observe them), read through the graph. */
  readonly points?: MeasuredPoints[];
}

/** One state's measurements in the plot's units. */
export interface MeasuredPoints {
  readonly state: string;
  readonly t: number[];
  readonly values: number[];
}

export interface PlotInput {
  readonly tr: Trajectory;
  readonly states: ReadonlyArray<{ readonly name: string; readonly template: Quantity }>;
  readonly timeUnit: DisplayUnit;
  readonly timeOf: (si: number) => Quantity;
  readonly actions: readonly Action[];
  readonly levels: ReadonlyArray<{ readonly state: string; readonly level: Quantity }>;
  readonly marks: ReadonlyArray<{ readonly name: string; readonly state: string; readonly t: number; readonly value: Quantity; readonly answer: string }>;
  /** Measurements of states, in SI; those of the plotted states become `points`. */
  readonly measured: readonly MeasuredSeries[];
}

export function simulationPlot(p: PlotInput): SimulationPlot {
  const { tr } = p;
  const span = tr.t1 - tr.t0;
  const t: number[] = [];
  const cols: number[][] = p.states.map(() => []);
  const out = new Float64Array(tr.width);
  const timeIn = (si: number) => valueIn(p.timeOf(si), p.timeUnit);
  // the samples' conversions, looked up once: the same numbers as valueIn on each
  const timeReading = readingIn(p.timeOf(tr.t0), p.timeUnit);
  const readings = p.states.map((s) => readingIn(s.template, s.template.unit));
  for (const piece of tr.pieces) {
    const n = Math.max(2, Math.round((PLOT_POINTS * (piece.t1 - piece.t0)) / (span || 1)));
    charge(n);
    for (let j = 0; j < n; j++) {
      const at = j === n - 1 ? piece.t1 : piece.t0 + ((piece.t1 - piece.t0) * j) / (n - 1);
      evalPiece(piece, at, out);
      t.push(timeReading(at));
      for (let i = 0; i < readings.length; i++) cols[i].push(readings[i](out[i]));
    }
  }
  const seen = new Set<string>();
  const events = p.actions.flatMap((a) => {
    const key = `${a.time}|${a.kind}|${a.event}`;
    if (seen.has(key)) return [];
    seen.add(key);
    const what = a.kind === 'add' ? 'dose' : a.kind === 'set' ? 'change' : a.kind === 'infuse-start' ? 'infusion starts' : 'infusion ends';
    return [{ time: timeIn(a.time), kind: a.kind, label: `${what}: ${a.targets.map((x) => x.name).join(', ')}` }];
  });
  const points = measuredPoints(p.measured, p.states, timeIn);
  return {
    timeUnit: formatUnit(p.timeUnit),
    timeUnits: timeAxisUnits(formatUnit(p.timeUnit), t.length ? t[t.length - 1] - t[0] : 0),
    t,
    states: p.states.map((s, i) => ({ name: s.name, unit: formatUnit(s.template.unit), values: cols[i] })),
    events,
    levels: p.levels.map((l) => levelOf(l, stateUnitOf(p, l.state))),
    marks: p.marks.map((m) => ({ name: m.name, state: m.state, time: timeIn(m.t), value: valueIn(m.value, stateUnitOf(p, m.state)), label: `${m.name}: ${m.answer}` })),
    ...(points.length ? { points } : {}),
  };
}

/** A level in its state's unit, the unit of the axis it is drawn on, its label too. */
function levelOf(l: PlotInput['levels'][number], unit: DisplayUnit): SimulationPlot['levels'][number] {
  return { state: l.state, value: valueIn(l.level, unit), label: `${l.state} = ${describe({ ...l.level, unit })}` };
}

/**
 * Measurements of the plotted states as points: times by `timeIn`, values in each state's
 * unit, in the order of the states; measurements of other states are left out.
 */
export function measuredPoints(measured: readonly MeasuredSeries[], states: PlotInput['states'], timeIn: (si: number) => number): MeasuredPoints[] {
  return states.flatMap((s) => measured.filter((m) => m.state === s.name).map((m) => ({
    state: s.name,
    t: m.t.map(timeIn),
    values: m.y.map((y) => valueIn({ ...s.template, si: y }, s.template.unit)),
  })));
}

function stateUnitOf(p: PlotInput, state: string): DisplayUnit {
  return p.states.find((s) => s.name === state)!.template.unit;
}
