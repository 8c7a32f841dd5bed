/**
 * The band around a run's curves (a simulate cell with `band: true` whose answers an uncertainty
 * cell asks about): the 2.5 and 97.5 percentiles and the median of each state at fixed times,
 * from the same Monte Carlo samples as the cell's results.
 *
 * - The samples: the cell's own draws, made again from its seed in the same order (the drawer of
 *   uncertainty-inputs.ts on `seeded(seed)`), so sample s here is sample s of the results.
 * - Each sample: a what-if gives the values the run reads directly (its laws' and events'
 *   parameters, its states' starting values) with the inputs drawn, and the run's model
 *   (run-model.ts) runs at the run's own tolerances and is read at the grid.
 * - The grid: BAND_INTERVALS + 1 times evenly over the span, and both sides of each action time
 *   of the run as it stands (the first MOST_ACTION_TIMES of them), so a dose's jump stays sharp.
 * - Memory: the values are kept grid point by grid point (samples contiguous), then each grid
 *   point's values are sorted in place and read by the cell's quantile definition (Hyndman and
 *   Fan's 7, numerics/sampling/summary.ts). At most BAND_MOST_VALUES numbers are kept: past that,
 *   the band is drawn from the first samples that fit, and its note says how many.
 */
import type { Cell } from '../study/types.ts';
import type { RunContext, RunModel } from '../engine/node.ts';
import { cellRef } from '../engine/node.ts';
import type { UncertaintyBand } from '../engine/report.ts';
import type { WhatIf } from '../engine/what-if.ts';
import { valueIn } from '../units/quantity.ts';
import { TIME } from '../units/dimension.ts';
import { formatUnit } from '../units/units.ts';
import { seeded, type Random } from '../numerics/sampling/random.ts';
import { quantileSorted } from '../numerics/sampling/summary.ts';
import { charge } from '../numerics/work-meter.ts';
import type { Drawer, Input } from './uncertainty-inputs.ts';

/** The grid's even intervals over the span (201 times). */
export const BAND_INTERVALS = 200;
/** Action times whose two sides join the grid; later ones are met by the even times alone. */
export const MOST_ACTION_TIMES = 500;
/** The most numbers kept for the bands of one cell (8 Mi, 64 MB): samples × grid times × states, over its runs. */
export const BAND_MOST_VALUES = 8 * 1024 * 1024;

/** The simulate cells with `band: true` that answer a name in `of`, in the study's order. */
export function bandRuns(of: unknown, cells: readonly Cell[]): string[] {
  const names = new Set(Array.isArray(of) ? of.filter((n): n is string => typeof n === 'string') : []);
  if (!names.size) return [];
  return cells.filter((c) => c.kind === 'simulate' && c.band === true && Array.isArray(c.find)
    && c.find.some((f) => typeof f?.name === 'string' && names.has(f.name))).map((c) => c.id);
}

/** The grid of a run: SI times in order, 1 where the value just before the actions there is meant. */
export function bandGrid(model: RunModel): { times: Float64Array; before: Uint8Array } | string {
  const present = model.curve(new Map(), 2, true);
  if (!present.t) return present.message ?? 'the run gave no curve';
  const { from, to } = model;
  // a piece boundary inside the span shows twice in the curve (the end of one piece, the start of the next)
  const actions: number[] = [];
  for (let k = 1; k < present.t.length; k++) {
    const t = present.t[k];
    if (t === present.t[k - 1] && t > from && t < to && actions[actions.length - 1] !== t) actions.push(t);
  }
  const pts: Array<[number, number]> = [];
  for (let i = 0; i <= BAND_INTERVALS; i++) pts.push([i === BAND_INTERVALS ? to : from + ((to - from) * i) / BAND_INTERVALS, 0]);
  for (const t of actions.slice(0, MOST_ACTION_TIMES)) pts.push([t, 1], [t, 0]);
  // in time order, the side before an action first; one point per time and side
  pts.sort((a, b) => a[0] - b[0] || b[1] - a[1]);
  const kept = pts.filter((p, k) => k === 0 || p[0] !== pts[k - 1][0] || p[1] !== pts[k - 1][1]);
  return { times: Float64Array.from(kept, (p) => p[0]), before: Uint8Array.from(kept, (p) => p[1]) };
}

interface Plan {
  readonly run: string;
  readonly model: RunModel;
  readonly whatIf: WhatIf;
  readonly direct: readonly string[];
  readonly times: Float64Array;
  readonly before: Uint8Array;
  values?: Float64Array;
  good: number;
  failed: number;
  reason?: string;
}

/**
 * The bands of `runs` from the cell's draws (`inputs`, `drawer`, `samples`, `seed` as its Monte
 * Carlo results used them), at once. Cost per sample and run: one what-if of the run's direct
 * inputs, one run at its own tolerances, one read per grid time; then one sort per grid time
 * and state.
 */
export function sampleBands(runs: readonly string[], ctx: RunContext, inputs: readonly Input[], drawer: Drawer, samples: number, seed: number): UncertaintyBand[] {
  const work = new BandRun(runs, ctx, inputs, drawer, samples, seed);
  work.step(Infinity);
  return work.result();
}

/**
 * The bands as work done in slices (the app's worker draws them between messages, after the
 * cell's samples): the generator, the kept values and how far the sorting is are kept between
 * slices, so the bands are the same bit for bit however they are sliced. A unit of `done` is
 * one sample of one run; the grid times' sorting that follows is sliced too, and counted in
 * neither `done` nor `total`.
 */
export class BandRun {
  private readonly out: UncertaintyBand[] = [];
  private readonly plans: Plan[] = [];
  private readonly kept: number = 0;
  private readonly rng: Random;
  private readonly x: Float64Array;
  private scratch = new Float64Array(0);
  /** Samples drawn so far (of `kept`), and the next run, grid time and state to sort. */
  private drawn = 0;
  private sorting = { plan: 0, state: 0, time: 0 };
  private readonly curves = new Map<Plan, BandCurve[]>();

  constructor(runs: readonly string[], ctx: RunContext, inputs: readonly Input[], private readonly drawer: Drawer, private readonly samples: number, private readonly seed: number) {
    const names = inputs.map((x) => x.name);
    for (const run of runs) {
      const b = ctx.binding(cellRef(run));
      if (b?.kind !== 'model') { this.out.push({ run, reason: 'the run has no result now, so there is nothing to draw a band around' }); continue; }
      const model = b.model;
      const direct = [...model.reads, ...model.laws.map((l) => l.state)];
      const w = ctx.whatIf!(direct, names);
      if (!w.ok) { this.out.push({ run, reason: w.error.message }); continue; }
      if (w.plan.length === 0 && !direct.some((n) => names.includes(n))) {
        this.out.push({ run, reason: `the run's curves depend on no value with a spread (the spread of ${names.join(', ')} changes only what is asked of them), so every sample draws the same curve` });
        continue;
      }
      const grid = bandGrid(model);
      if (typeof grid === 'string') { this.out.push({ run, reason: grid }); continue; }
      this.plans.push({ run, model, whatIf: w, direct, ...grid, good: 0, failed: 0 });
      this.out.push({ run });
    }
    this.rng = seeded(seed);
    this.x = new Float64Array(inputs.length);
    if (!this.plans.length) return;
    const perSample = this.plans.reduce((a, p) => a + p.times.length * p.model.laws.length, 0);
    this.kept = Math.max(1, Math.min(samples, Math.floor(BAND_MOST_VALUES / perSample)));
    for (const p of this.plans) p.values = new Float64Array(p.times.length * p.model.laws.length * this.kept);
    this.scratch = new Float64Array(Math.max(...this.plans.map((p) => p.times.length * p.model.laws.length)));
  }

  /** Units of work: one sample of one run. */
  get total(): number {
    return this.kept * this.plans.length;
  }

  get done(): number {
    return this.drawn * this.plans.length;
  }

  /** Draws samples, then sorts grid times, until all is done or `until` (a performance.now() time) has passed, at least one unit; true when all is done. */
  step(until = Infinity): boolean {
    const { plans, kept, x } = this;
    while (this.drawn < kept) {
      this.drawer(this.rng, x);
      for (const p of plans) this.sample(p, x);
      this.drawn++;
      if (until !== Infinity && performance.now() > until) return false;
    }
    const at = this.sorting;
    while (at.plan < plans.length) {
      const p = plans[at.plan];
      const m = p.times.length;
      if (p.good === 0) { at.plan++; continue; }
      let curves = this.curves.get(p);
      if (!curves) this.curves.set(p, curves = p.model.laws.map((law) => ({ name: law.state, unit: formatUnit(law.initial.unit), p025: [], median: [], p975: [] })));
      const law = p.model.laws[at.state];
      const curve = curves[at.state];
      const shown = (si: number) => valueIn({ ...law.initial, si }, law.initial.unit);
      charge(1);
      const start = (at.state * m + at.time) * kept;
      const col = p.values!.subarray(start, start + p.good).sort();
      curve.p025.push(shown(quantileSorted(col, 0.025)));
      curve.median.push(shown(quantileSorted(col, 0.5)));
      curve.p975.push(shown(quantileSorted(col, 0.975)));
      if (++at.time === m) { at.time = 0; if (++at.state === p.model.laws.length) { at.state = 0; at.plan++; } }
      if (until !== Infinity && performance.now() > until && at.plan < plans.length) return false;
    }
    return true;
  }

  /** The bands, once `step` has returned true. */
  result(): UncertaintyBand[] {
    return this.out.map((o) => {
      const p = this.plans.find((q) => q.run === o.run);
      return p ? bandOf(p, this.curves.get(p) ?? [], this.kept, this.samples, this.seed) : o;
    });
  }

  /** One sample of one run: its curves read at the grid into the kept values. */
  private sample(p: Plan, x: Float64Array): void {
    charge(1 + p.times.length);
    const r = p.whatIf.evaluate(x);
    const missing = r.answers.find((a) => !a.ok);
    let message = missing && !missing.ok ? missing.reason : undefined;
    if (!message) {
      const replaced = new Map(p.direct.map((n, i) => [n, r.values[i]]));
      message = p.model.sampleAt(replaced, p.times, p.before, this.scratch);
    }
    if (message) { p.failed++; p.reason ??= message; return; }
    const width = p.times.length * p.model.laws.length;
    for (let j = 0; j < width; j++) p.values![j * this.kept + p.good] = this.scratch[j];
    p.good++;
  }
}

type BandCurve = { name: string; unit: string; p025: number[]; median: number[]; p975: number[] };

/** A run's band from its curves (each grid time's kept values sorted in place, read at 2.5%, 50% and 97.5%). */
function bandOf(p: Plan, states: BandCurve[], kept: number, samples: number, seed: number): UncertaintyBand {
  const failed = { failed: p.failed, ...(p.reason !== undefined ? { failedReason: p.reason } : {}) };
  if (p.good === 0) return { run: p.run, samples: 0, ...failed, reason: `the run gave no curve in any sample (${p.reason ?? 'no reason given'})` };
  const m = p.times.length;
  const unit = p.model.timeUnit;
  const t = Array.from(p.times, (si) => valueIn({ si, dim: TIME, unit }, unit));
  const first = kept < samples ? ` (the first ${kept.toLocaleString('en-US')} of the ${samples.toLocaleString('en-US')} samples: a band keeps at most ${BAND_MOST_VALUES.toLocaleString('en-US')} numbers)` : '';
  const without = p.failed ? `; ${p.failed.toLocaleString('en-US')} samples gave no curve (${p.reason})` : '';
  return {
    run: p.run, timeUnit: formatUnit(unit), t, states, samples: p.good, ...failed,
    note: `Band: 2.5 to 97.5 percentiles of ${p.good.toLocaleString('en-US')} Monte Carlo samples${first} (seed ${seed}), at ${m} times; the line inside it is the run at the present values${without}.`,
  };
}
