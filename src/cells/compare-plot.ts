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
  /** In order (a jump is a time twice). */
  readonly t: readonly number[];
  /** State i at `t[k]` at `k * (the run's laws) + i`. */
  readonly values: readonly number[];
}

/** Times in order, each as often as the scenario that repeats it most (a jump is a time twice). */
function unionTimes(curves: readonly ScenarioCurve[]): number[] {
  const count = new Map<number, number>();
  for (const c of curves) {
    // a curve's times are in order, so its repeats of a time are side by side
    for (let k = 0, run = 1; k < c.t.length; k++, run++) {
      const t = c.t[k];
      if (k + 1 < c.t.length && c.t[k + 1] === t) continue;
      if (run > (count.get(t) ?? 0)) count.set(t, run);
      run = 0;
    }
  }
  const times = [...count.keys()].sort((a, b) => a - b);
  const out: number[] = [];
  for (const t of times) for (let k = count.get(t)!; k > 0; k--) out.push(t);
  return out;
}

/** The overlay plot. Cost: one more run per scenario whose sample times differ from the union. */
export function comparePlot(model: RunModel, curves: readonly ScenarioCurve[]): ComparePlot {
  const unit = model.timeUnit;
  const times = unionTimes(curves);
  const laws = model.laws;
  const n = laws.length;
  const several = n > 1;
  const states: ComparePlot['states'] = [];
  const series: ComparePlot['series'] = [];
  for (const c of curves) {
    // where each time's samples start in the scenario's own (in order: a time's repeats are side by side)
    const first = new Map<number, number>();
    for (let k = c.t.length - 1; k >= 0; k--) first.set(c.t[k], k);
    const missing = [...new Set(times.filter((t) => !first.has(t)))];
    const extra = new Map<number, Float64Array>();
    if (missing.length) {
      const r = model.run(c.replaced, missing);
      missing.forEach((t, k) => { const v = r.values?.[k]; if (v) extra.set(t, v); });
    }
    // per union time: the scenario's sample (its k-th repeat of the time for the k-th in the
    // union, its last when it has fewer), or -1 for a value of its own run at that time
    const rows = new Int32Array(times.length);
    for (let u = 0, k = 0; u < times.length; u++) {
      const t = times[u];
      k = u > 0 && times[u - 1] === t ? k + 1 : 0;
      const f = first.get(t);
      if (f === undefined) { rows[u] = -1; continue; }
      let last = f;
      while (last + 1 < c.t.length && c.t[last + 1] === t && last < f + k) last++;
      rows[u] = last;
    }
    for (let i = 0; i < n; i++) {
      const l = laws[i];
      const reading = readingIn(l.initial, l.initial.unit);
      const values = new Array<number>(times.length);
      for (let u = 0; u < times.length; u++) {
        const v = rows[u] >= 0 ? c.values[rows[u] * n + i] : extra.get(times[u])?.[i];
        values[u] = v === undefined ? NaN : reading(v);
      }
      states.push({ name: several ? `${c.scenario}: ${l.state}` : c.scenario, unit: formatUnit(l.initial.unit), values });
      series.push({ scenario: c.scenario, state: l.state });
    }
  }
  const timeReading = readingIn({}, unit);
  const t = times.map(timeReading);
  const span = t.length ? t[t.length - 1] - t[0] : 0;
  return { timeUnit: formatUnit(unit), timeUnits: timeAxisUnits(formatUnit(unit), span), t, states, events: [], levels: [], marks: [], series };
}
