/**
 * A simulate cell's report from its numeric core: the answers as report values, the comparison
 * with the exact solution of linear laws, the step points, the summary, the questions in
 * words and the plot data. Not part of a what-if run.
 */
import { type Quantity, report, describe, tidy, deltaUnit } from '../units/quantity.ts';
import { divDim, TIME } from '../units/dimension.ts';
import { type DisplayUnit, mulUnits } from '../units/units.ts';
import type { SystemSpec } from '../simulate/run-schedule.ts';
import { stepPoints, type Trajectory } from '../simulate/trajectory.ts';
import { extreme } from '../simulate/queries.ts';
import { type Linear, linearCoefficients, compareWithExact, linearStretches } from '../simulate/closed-form.ts';
import { simulationPlot } from '../simulate/plot-data.ts';
import { timesInRun } from '../simulate/schedule.ts';
import { repeatsText } from '../output/event-words.ts';
import type { Law, MeasuredSeries } from '../engine/node.ts';
import type { ClosedFormReport, FindResult, LinearFigures, SimulateFields } from '../engine/report.ts';
import { simulationSummary, type FoundText, type StatePath } from '../output/summaries.ts';
import { type SimulationCore, questionText, stateValue, timeOf } from './simulate-core.ts';

/** The cell's report fields (the `output` merged into its cell's report). */
export function simulationOutput(core: SimulationCore, measured: readonly MeasuredSeries[]): SimulateFields {
  const { run, laws, timeUnit } = core;
  const tr = run.trajectory;
  const asTime = (si: number) => timeOf(core, si);
  const results: Record<string, FindResult> = {};
  const found: FoundText[] = [];
  const marks: Array<{ name: string; state: string; t: number; value: Quantity; answer: string }> = [];
  for (const { find, q, markAt, markValue, missing } of core.answers) {
    const what = questionText(core, find);
    if (q) {
      results[find.name] = report(q);
      found.push({ name: find.name, what, answer: describe(q) });
      if (markAt !== undefined && markValue !== undefined) marks.push({ name: find.name, state: find.state, t: markAt, value: stateValue(core, find.si, markValue), answer: describe(q) });
    } else {
      const end = asTime(find.span[1]);
      results[find.name] = { notReached: true, message: missing ?? '', end: report(end) };
      found.push({ name: find.name, what, answer: `not reached by ${describe(end)}` });
    }
  }
  const last = tr.pieces[tr.pieces.length - 1];
  // a computed value within the state's absolute tolerance of zero is zero to the run's
  // accuracy: the words say 0, not a round-off such as -1.79e-7 mg of a drug
  const said = (i: number, v: number) => stateValue(core, i, Math.abs(v) <= core.atol[i] ? 0 : v);
  const paths: StatePath[] = laws.map((l, i) => ({
    name: l.state,
    start: stateValue(core, i, tr.pieces[0].y0[i]),
    end: said(i, last.y1[i]),
    min: said(i, extreme(tr, i, -1)!.value),
    max: said(i, extreme(tr, i, 1)!.value),
  }));
  const plot = simulationPlot({
    tr, timeUnit, timeOf: asTime, actions: core.timeline, marks,
    states: laws.map((l) => ({ name: l.state, template: l.initial })),
    levels: core.finds.filter((fq) => fq.level).map((fq) => ({ state: fq.state, level: fq.level! })),
    measured,
  });

  const output: SimulateFields = {
    method: run.switchedToStiff !== null ? 'stiff' : [...run.methodsUsed].join(', '),
    steps: run.steps,
    evaluations: run.evaluations,
    results,
    closedForm: closedForms(laws, core.sys, tr, core.compiled, core.inputs.length, core.rtol, core.atol, timeUnit, asTime),
    series: seriesOf(tr, core.states),
    summary: simulationSummary(paths, found),
    // each question in words, as the summary puts it (for the printed sheet)
    questions: Object.fromEntries(found.map((f) => [f.name, f.what])),
    // each event's repeats, counted in the run and in words (for the printed sheet)
    schedule: timesInRun(core.timeline, core.scheduled.length).map((times, i) => {
      const e = core.scheduled[i];
      return { times, repeats: repeatsText(e.every === undefined ? undefined : describe(asTime(e.every)), e.count, times) };
    }),
    plot,
  };
  if (run.switchedToStiff !== null) {
    output.switchedToStiff = report(asTime(run.switchedToStiff));
    output.note = `the law turned out stiff; the run switched from ${run.switchedFrom === 'adams' ? 'the Adams formulas' : 'Dormand–Prince'} to the stiff method at t = ${describe(asTime(run.switchedToStiff))}`;
  }
  return output;
}

function seriesOf(tr: Trajectory, states: readonly string[]): Record<string, number[]> {
  const pts = stepPoints(tr);
  const out: Record<string, number[]> = { t: pts.t };
  states.forEach((s, i) => { out[s] = pts.y.map((y) => y[i]); });
  return out;
}

/**
 * For each law linear in its own state alone: rate constant, time constant, half-life, and the
 * run's error against the exact piecewise solution; with the law changed by an action within
 * the run, the figures of each stretch.
 */
function closedForms(laws: readonly Law[], sys: SystemSpec, tr: Trajectory, compiled: ReadonlyArray<(x: ArrayLike<number>) => number>, width: number, rtol: number, atol: Float64Array, timeUnit: DisplayUnit, asTime: (si: number) => Quantity) {
  const out: Record<string, ClosedFormReport> = {};
  const n = laws.length;
  const points = stepPoints(tr);
  const perTime: DisplayUnit = mulUnits([], timeUnit, -1);
  laws.forEach((l, i) => {
    if (l.reads.some((r) => r === 't' || (r !== l.state && sys.stateIndex.has(r)))) return;
    const x = new Float64Array(width);
    // Probe the law over the size the state actually reaches: a state that starts at zero
    // (a tank filling, a body falling from rest) would otherwise be probed over nothing, and
    // any law looks linear there.
    let reach = Math.abs(l.initial.si);
    for (const p of tr.pieces) reach = Math.max(reach, Math.abs(p.y0[i]));
    for (const y of points.y) reach = Math.max(reach, Math.abs(y[i]));
    const lawAt = (k: number) => {
      const piece = tr.pieces[k];
      x.set(piece.params, 1 + n);
      const fy = (y: number) => { x[1 + i] = y; return compiled[i](x) + piece.infusion[i]; };
      return linearCoefficients(fy, piece.y0[i], reach);
    };
    const laws0 = tr.pieces.map((_, k) => lawAt(k));
    if (laws0.some((c) => !c)) return;
    const linear = laws0 as Linear[];
    const check = compareWithExact(tr, i, (k) => linear[k], rtol, atol[i]);
    const figures = (c: Linear): LinearFigures => {
      const f: LinearFigures = { rateConstant: report({ si: c.b, dim: divDim(TIME.map(() => 0), TIME), unit: perTime }) };
      if (c.b !== 0) {
        f.timeConstant = report({ si: 1 / Math.abs(c.b), dim: TIME, unit: timeUnit });
        f[c.b < 0 ? 'halfLife' : 'doublingTime'] = report({ si: Math.LN2 / Math.abs(c.b), dim: TIME, unit: timeUnit });
        f.equilibrium = report({ ...l.initial, si: -c.a / c.b });
        f.stable = c.b < 0;
      }
      return f;
    };
    const { rateConstant, ...rest } = figures(linear[0]);
    const entry: ClosedFormReport = {
      form: `${l.state}' = a + b ${l.state}`,
      rateConstant,
      maxError: report({ si: check.maxError, dim: l.initial.dim, unit: deltaUnit(l.stateUnit), ...(l.initial.temp ? { temp: 'delta' as const } : {}) }),
      maxErrorInTolerances: tidy(check.maxErrorInTolerances),
      ...rest,
    };
    const stretches = linearStretches(linear);
    if (stretches.length > 1) {
      entry.stretches = stretches.map((s) => ({ from: report(asTime(tr.pieces[s.first].t0)), to: report(asTime(tr.pieces[s.last].t1)), ...figures(s.law) }));
    }
    out[l.state] = entry;
  });
  return Object.keys(out).length ? out : undefined;
}
