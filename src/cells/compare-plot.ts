/**
 * The overlay chart of a compare cell: every scenario's curves on one time axis, in the shape
 * of a run's plot (simulate/plot-data.ts), so the app draws it as it draws a run. Each curve is
 * named by its scenario (and its state, when the run has several). The time axis is the union
 * of the scenarios' sample times; a scenario with no sample at one of them (its schedule
 * differs) is evaluated there on its own run (it has no jump there: its jumps are its own
 * samples), so every value drawn is the run's.
 */
import type { ComparePlot } from '../engine/report.ts';
import type { RunModel } from '../engine/node.ts';
import { readingIn } from '../units/quantity.ts';
import { formatUnit } from '../units/units.ts';
import { timeAxisUnits } from '../output/display-units.ts';

/** One scenario's curve as the model drew it: SI times (both ends of every jump) and states. */
export interface ScenarioCurve {
  readonly scenario: string;
  readonly replaced: ReadonlyMap<string, number>;
  readonly t: readonly number[];
  readonly values: readonly Float64Array[];
}

/** Times in order, each as often as the scenario that repeats it most (a jump is a time twice). */
function unionTimes(curves: readonly ScenarioCurve[]): number[] {
  const count = new Map<number, number>();
  for (const c of curves) {
    const own = new Map<number, number>();
    for (const t of c.t) own.set(t, (own.get(t) ?? 0) + 1);
    for (const [t, n] of own) count.set(t, Math.max(count.get(t) ?? 0, n));
  }
  return [...count.keys()].sort((a, b) => a - b).flatMap((t) => new Array<number>(count.get(t)!).fill(t));
}

/** The overlay plot. Cost: one more run per scenario whose sample times differ from the union. */
export function comparePlot(model: RunModel, curves: readonly ScenarioCurve[]): ComparePlot {
  const unit = model.timeUnit;
  const times = unionTimes(curves);
  const laws = model.laws;
  const several = laws.length > 1;
  const states: ComparePlot['states'] = [];
  const series: ComparePlot['series'] = [];
  for (const c of curves) {
    // the scenario's own samples, k-th repeat of a time for the k-th in the union
    const at = new Map<number, number[]>();
    c.t.forEach((t, i) => { const l = at.get(t); if (l) l.push(i); else at.set(t, [i]); });
    const missing = [...new Set(times.filter((t) => !at.has(t)))];
    const extra = new Map<number, Float64Array>();
    if (missing.length) {
      const r = model.run(c.replaced, missing);
      missing.forEach((t, k) => { const v = r.values?.[k]; if (v) extra.set(t, v); });
    }
    const seen = new Map<number, number>();
    const rows = times.map((t) => {
      const own = at.get(t);
      const k = seen.get(t) ?? 0;
      seen.set(t, k + 1);
      return own ? c.values[own[Math.min(k, own.length - 1)]] : extra.get(t);
    });
    laws.forEach((l, i) => {
      const reading = readingIn(l.initial, l.initial.unit);
      states.push({
        name: several ? `${c.scenario}: ${l.state}` : c.scenario,
        unit: formatUnit(l.initial.unit),
        values: rows.map((v) => (v ? reading(v[i]) : NaN)),
      });
      series.push({ scenario: c.scenario, state: l.state });
    });
  }
  const timeReading = readingIn({}, unit);
  const t = times.map(timeReading);
  const span = t.length ? t[t.length - 1] - t[0] : 0;
  return { timeUnit: formatUnit(unit), timeUnits: timeAxisUnits(formatUnit(unit), span), t, states, events: [], levels: [], marks: [], series };
}
