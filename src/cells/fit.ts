/**
 * A fit cell: estimates parameters and starting values of rate laws from measurements, by
 * nonlinear least squares (numerics/fit/least-squares.ts) on the simulated states at the data's
 * times: the laws from t = 0 (simulate/model-run.ts), or a run with its whole schedule (`run`,
 * fit-through-run.ts). Defines each estimate under its `as` name, and its standard error and
 * 95% bounds (fit-uncertainty.ts), so cells below a fit follow the data.
 */
import type { FitCell } from '../study/types.ts';
import type { Binding, CellError, GraphNode, Law, MeasuredSeries, Outcome, RunContext, RunModel, Use } from '../engine/node.ts';
import { cellRef, measuredRef } from '../engine/node.ts';
import type { EstimateReport, FitFields, NodeOutput } from '../engine/report.ts';
import { type Field, field, usesOf, lookupFrom, finiteQuantityOf, FieldError, fail, guarded, shownAs } from './fields.ts';
import { type Quantity, report, describe, deltaUnit, valueIn } from '../units/quantity.ts';
import { sameDim, describeDim, TIME } from '../units/dimension.ts';
import { type DisplayUnit, formatUnit, unitDim } from '../units/units.ts';
import { fitLeastSquares } from '../numerics/fit/least-squares.ts';
import { runModelAt, FIT_RTOL, type ModelSpec } from '../simulate/model-run.ts';
import { collectLaws } from './laws.ts';
import { measuredPoints, type SimulationPlot } from '../simulate/plot-data.ts';
import { quantitySig } from './signatures.ts';
import { timeAxisUnits } from '../output/display-units.ts';
import { residualAxisFloor, withoutRoundOff } from '../output/residuals.ts';
import { priorFields, readMapSettings, type PriorFields } from './fit-prior.ts';
import { runMapFit, priorReport, errorModelReport, mapSummary } from './fit-map.ts';
import { runModelOf, runParameter, checkTimesInRun, jumpTimeNote } from './fit-through-run.ts';
import { jointOf, uncertaintyBindings, uncertaintyDefinitions } from './fit-uncertainty.ts';
import { spreadSig } from './spread.ts';

/**
 * One node: it defines each estimate under its `as` name, and the measurements it fits, by
 * state, under the hidden name `#id/measured` (plots of those states show them).
 */
export function fitNodes(cell: FitCell, at: string): Array<GraphNode<NodeOutput<'fit'>>> {
  const problems: CellError[] = [];
  const estimates = Array.isArray(cell.estimate) ? cell.estimate : [];
  const fields = estimates.map((e, i) => ({
    guess: field(e?.guess, `${at}.estimate[${i}].guess`, problems),
    min: e?.min !== undefined ? field(e.min, `${at}.estimate[${i}].min`, problems) : undefined,
    max: e?.max !== undefined ? field(e.max, `${at}.estimate[${i}].max`, problems) : undefined,
  }));
  const pf = priorFields(cell, at, problems);
  const refs: Use[] = [];
  (Array.isArray(cell.rates) ? cell.rates : []).forEach((r, i) => { if (typeof r === 'string') refs.push({ name: cellRef(r), path: `${at}.rates[${i}]` }); });
  // through a run: the run's model, made from its inputs alone (cells/run-model.ts)
  if (typeof cell.run === 'string') refs.push({ name: cellRef(cell.run), path: `${at}.run` });
  if (typeof cell.data === 'string') refs.push({ name: cellRef(cell.data), path: `${at}.data` });
  estimates.forEach((e, i) => { if (typeof e?.parameter === 'string') refs.push({ name: e.parameter, path: `${at}.estimate[${i}].parameter`, readsStates: true }); });
  return [{
    key: `${cell.id}/fit`,
    cell: cell.id,
    defines: [
      ...estimates.flatMap((e, i) => (typeof e?.as === 'string' ? [{ name: e.as, path: `${at}.estimate[${i}].as` }] : [])),
      ...estimates.flatMap((e, i) => uncertaintyDefinitions(e?.as, `${at}.estimate[${i}].as`)),
      { name: measuredRef(cell.id), path: `${at}.observe` },
    ],
    measures: { name: measuredRef(cell.id), states: cell.observe && typeof cell.observe === 'object' ? Object.keys(cell.observe) : [] },
    uses: [...usesOf(fields.flatMap((f) => [f.guess, f.min, f.max])), ...usesOf(pf.fields), ...refs],
    allowsTime: false,
    pullsCoupledLaws: true,
    signature: JSON.stringify(cell),
    problems,
    run: (ctx) => guarded(() => runFit(cell, at, fields as Array<{ guess: Field; min?: Field; max?: Field }>, pf, ctx)),
  }];
}

/**
 * The error of a model run, in tolerance units (|error| / (rtol·|y| + atol)), that the fit's
 * digits allow for: the integrators' global error at the fit's tolerance stays within a few
 * units on the work-precision problems (test/engine/ode-tolerance-units.test.ts).
 */
const RUN_ERROR_UNITS = 10;

interface Unknown {
  readonly kind: 'parameter' | 'initial';
  readonly name: string;
  readonly as: string;
  /** Index into the parameter vector, or into the states. */
  readonly index: number;
  readonly template: Quantity;
  readonly guess: number;
  readonly lower: number;
  readonly upper: number;
}

function runFit(cell: FitCell, at: string, fields: Array<{ guess: Field; min?: Field; max?: Field }>, pf: PriorFields, ctx: RunContext): Outcome<NodeOutput<'fit'>> {
  const through = cell.run !== undefined ? runModelOf(cell, at, ctx) : undefined;
  const laws = through ? [...through.laws] : collectLaws(cell.rates ?? [], `${at}.rates`, ctx);
  const states = laws.map((l) => l.state);
  const params: string[] = [];
  for (const l of laws) for (const n of l.reads) if (n !== 't' && !states.includes(n) && !params.includes(n)) params.push(n);
  const paramQ = params.map((n) => laws.find((l) => l.scope.has(n))!.scope.get(n)!);
  const lookup = lookupFrom(ctx);

  // the data
  const b = ctx.binding(cellRef(cell.data));
  if (b?.kind !== 'data') fail(`${at}.data`, `cell "${cell.data}" is not a data cell`);
  const table = (b as Extract<Binding, { kind: 'data' }>).table;
  const colOf = (name: string, path: string) => {
    const i = table.columns.findIndex((c) => c.name === name);
    if (i < 0) fail(path, `the data cell "${cell.data}" has no column "${name}" (its columns: ${table.columns.map((c) => c.name).join(', ')})`);
    return i;
  };
  const ti = colOf(cell.time, `${at}.time`);
  if (!sameDim(unitDim(table.columns[ti].unit), TIME)) fail(`${at}.time`, `the column "${cell.time}" must hold times`, 'unit');
  if (through) checkTimesInRun(through, cell.run!, table, ti, at);
  const observed = Object.entries(cell.observe).map(([state, column]) => {
    const si = states.indexOf(state);
    if (si < 0) fail(`${at}.observe`, `"${state}" is not a state of the laws fitted (their states: ${states.join(', ')})`);
    const ci = colOf(column, `${at}.observe.${state}`);
    if (!sameDim(unitDim(table.columns[ci].unit), laws[si].initial.dim)) {
      fail(`${at}.observe.${state}`, `the column "${column}" must be ${describeDim(laws[si].initial.dim)} like ${state}; its unit is ${formatUnit(table.columns[ci].unit)}`);
    }
    return { state, si, ci, column };
  });

  // the unknowns
  const unknowns: Unknown[] = cell.estimate.map((e, i) => {
    const path = `${at}.estimate[${i}]`;
    const si = states.indexOf(e.parameter);
    let template: Quantity;
    let kind: Unknown['kind'];
    let index: number;
    if (si >= 0) {
      kind = 'initial'; index = si; template = laws[si].initial;
    } else if (through) {
      kind = 'parameter'; index = -1; template = runParameter(through, cell.run!, e.parameter, `${path}.parameter`, ctx);
    } else {
      index = params.indexOf(e.parameter);
      if (index < 0) {
        const via = params.find((p) => ctx.upstream(p).has(e.parameter));
        fail(`${path}.parameter`, via
          ? `the laws read "${via}", which is computed from "${e.parameter}": estimate a name the laws read directly`
          : `the laws fitted do not read "${e.parameter}"`);
      }
      kind = 'parameter'; template = paramQ[index];
    }
    const bound = (f: Field | undefined, what: string, dflt: number) => {
      if (!f) return dflt;
      const q = finiteQuantityOf(f, lookup);
      if (!sameDim(q.dim, template.dim)) fail(f.path, `the ${what} must be ${describeDim(template.dim)} like ${e.parameter}; it is ${describe(q)}`, 'unit');
      return q.si;
    };
    const g = fields[i];
    const guess = bound(g.guess, 'guess', NaN);
    const lower = bound(g.min, 'lower bound', -Infinity);
    const upper = bound(g.max, 'upper bound', Infinity);
    if (!(lower < upper)) fail(`${path}.max`, 'the upper bound must be above the lower bound');
    if (guess < lower || guess > upper) fail(g.guess.path, `the guess lies outside the bounds`);
    const written = { ...template, unit: g.guess ? finiteQuantityOf(g.guess, lookup).unit : template.unit };
    return { kind, name: e.parameter, as: e.as, index, template: shownAs(written, e.unit, `${path}.unit`), guess, lower, upper };
  });

  // the residuals: every observed value with a time
  const points: Array<{ row: number; state: number; y: number; w: number }> = [];
  const weighting = cell.weighting ?? 'none';
  table.rows.forEach((row, r) => {
    for (const o of observed) {
      const y = row[o.ci];
      if (y === null || row[ti] === null) continue;
      if (weighting !== 'none' && y === 0) fail(`${at}.weighting`, `"${weighting}" weighting divides by the observed value, and row ${r + 1} of ${o.column} is zero`);
      const w = weighting === 'relative' ? 1 / Math.abs(y) : weighting === 'proportional' ? 1 / Math.sqrt(Math.abs(y)) : 1;
      points.push({ row: r, state: o.si, y, w });
    }
  });
  if (points.length === 0) fail(`${at}.data`, 'no observed values to fit');
  // priors and an error model make it a MAP estimate (cells/fit-prior.ts, cells/fit-map.ts)
  const map = readMapSettings(cell, at, pf, unknowns.map((u, i) => ({
    name: u.name, template: u.template, guess: u.guess, upper: u.upper, guessPath: `${at}.estimate[${i}].guess`, maxPath: `${at}.estimate[${i}].max`,
  })), observed.map((o) => ({ column: o.column, dim: laws[o.si].initial.dim })), lookup);
  const times = [...new Set(table.rows.map((r) => r[ti] as number))].sort((a, c) => a - c);
  const t0 = through ? through.from : Math.min(0, times[0]);
  const rowTime = table.rows.map((r) => times.indexOf(r[ti] as number));
  if (ctx.mode === 'check') return { ok: true, bindings: new Map(), output: { computed: false, message: 'checked; run the study to fit' } };

  const spec: ModelSpec = { laws, params };
  const scale = Float64Array.from(laws, (l, i) => Math.max(Math.abs(l.initial.si), ...points.filter((p) => p.state === i).map((p) => Math.abs(p.y)), 1e-300));
  const y0 = Float64Array.from(laws, (l) => l.initial.si);
  const p = Float64Array.from(paramQ, (q) => q.si);
  const apply = (v: ArrayLike<number>) => {
    unknowns.forEach((u, k) => { if (u.kind === 'initial') y0[u.index] = v[k]; else if (u.index >= 0) p[u.index] = v[k]; });
  };
  let lastFailure: string | undefined;
  const residuals = (v: Float64Array, out: Float64Array): boolean => {
    apply(v);
    const run = through ? through.run(new Map(unknowns.map((u, k) => [u.name, v[k]])), times) : runModelAt(spec, t0, y0, p, times, scale);
    if (!run.values) { lastFailure = run.message; return false; }
    points.forEach((pt, k) => { out[k] = pt.w * (run.values![rowTime[pt.row]][pt.state] - pt.y); });
    return true;
  };
  // a run good to its tolerance: central differences, a polished end and the digits it leaves
  const runError = (k: number, fitted: number) => RUN_ERROR_UNITS * FIT_RTOL * (Math.abs(fitted) + 1e-2 * scale[points[k].state]);
  const mapFit = map ? runMapFit(map, unknowns, points.map((pt) => pt.y), residuals, FIT_RTOL, (f, e) => {
    for (let k = 0; k < points.length; k++) e[k] = runError(k, f[k]);
  }) : undefined;
  const fit = mapFit ?? fitLeastSquares({
    residuals, m: points.length, p0: unknowns.map((u) => u.guess),
    lower: unknowns.map((u) => u.lower), upper: unknowns.map((u) => u.upper),
    scale: unknowns.map((u) => Math.abs(u.guess) || 1),
    names: unknowns.map((u) => `"${u.as}"`),
  }, {
    modelAccuracy: FIT_RTOL,
    residualError: (r, e) => points.forEach((pt, k) => { e[k] = pt.w * runError(k, r[k] / pt.w + pt.y); }),
  });
  if (!fit.residuals) fail(at, `the fit could not start: ${fit.message}${fit.detail ? ` (${fit.detail})` : ''}${lastFailure ? `; the model failed: ${lastFailure}` : ''}`, 'numeric');

  // the answers
  const estimates: Record<string, EstimateReport> = {};
  const bindings = new Map<string, Binding>();
  const joint = jointOf(cell.id, unknowns.map((u) => u.as), fit.p, fit.covariance, mapFit?.logScale);
  unknowns.forEach((u, k) => {
    const q: Quantity = { ...u.template, si: fit.p[k] };
    const delta = (si: number): Quantity => ({ si, dim: q.dim, unit: deltaUnit(q.unit), ...(q.temp ? { temp: 'delta' as const } : {}) });
    estimates[u.as] = {
      value: report(q),
      ...(map && mapFit ? priorReport(map, k, q, mapFit) : {}),
      ...(fit.standardErrors ? { standardError: report(delta(fit.standardErrors[k])) } : {}),
      ...(fit.ci95 ? { ci95: fit.ci95[k].map((x) => report({ ...q, si: x })) } : {}),
      ...(fit.atBound[k] ? { atBound: true as const } : {}),
    };
    const spread = joint ? { kind: 'joint' as const, joint, index: k } : undefined;
    bindings.set(u.as, spread ? { kind: 'value', q, sig: quantitySig(q) + spreadSig(spread), spread } : { kind: 'value', q, sig: quantitySig(q) });
  });
  // each estimate's standard error and 95% bounds as names, equal to the report's
  const spread = uncertaintyBindings(unknowns.map((u) => ({ as: u.as, template: u.template, report: estimates[u.as] })), fit.dof, fit.warnings.map((w) => w.message).join('; ') || undefined);
  for (const [name, b] of spread.bindings) bindings.set(name, b);
  const firstObserved = laws[observed[0].si];
  const difference = (law: Law, si: number): Quantity => ({ si, dim: law.initial.dim, unit: deltaUnit(law.stateUnit), ...(law.initial.temp ? { temp: 'delta' as const } : {}) });
  // residuals (and their SD) within round-off of the data's scale are 0 (output/residuals.ts)
  const sdSI = fit.residualSD === null ? null : weighting === 'none' ? withoutRoundOff(fit.residualSD, scale[observed[0].si]) : fit.residualSD;
  const residualSD = sdSI === null ? undefined
    : weighting === 'none' ? report(difference(firstObserved, sdSI))
      : { value: sdSI, unit: '', si: sdSI };
  const n = unknowns.length;
  const shownResiduals = points.map((pt, k) => {
    const r = difference(laws[pt.state], withoutRoundOff(-fit.residuals![k] / pt.w, scale[pt.state]));
    return { row: pt.row + 1, state: states[pt.state], time: report({ si: table.rows[pt.row][ti] as number, dim: TIME, unit: table.columns[ti].unit }), residual: report(r) };
  });
  // an ordinary fit whose residuals are all round-off (reported as 0) has an objective of round-off: 0 too
  const objective = mapFit ? mapFit.objective : fit.cost === null ? null : shownResiduals.every((r) => r.residual.si === 0) ? 0 : 2 * fit.cost;
  const output: Omit<FitFields, 'summary'> = {
    estimates,
    ...(objective !== null ? { objective } : {}),
    ...(map ? errorModelReport(map, firstObserved.initial) : {}),
    ...(residualSD ? { residualSD } : {}),
    n: points.length,
    dof: fit.dof,
    iterations: fit.iterations,
    evaluations: fit.evaluations,
    ...(fit.digits !== null ? { digits: fit.digits } : {}),
    converged: fit.converged,
    message: fit.message,
    ...(fit.correlation ? { correlation: { names: unknowns.map((u) => u.as), matrix: Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => fit.correlation![i * n + j])) } } : {}),
    ...(fit.warnings.length ? { warnings: fit.warnings.map((w) => w.message) } : {}),
    residuals: shownResiduals,
    residualFloor: report(difference(firstObserved, residualAxisFloor(scale[observed[0].si]))),
  };
  const summary = map && mapFit ? mapSummary(map, unknowns.map((u) => u.as), unknowns.map((u) => u.template), mapFit, points.length)
    : `${unknowns.map((u, k) => `${u.as} = ${describe({ ...u.template, si: fit.p[k] })}${fit.standardErrors ? ` (standard error ${describe({ si: fit.standardErrors[k], dim: u.template.dim, unit: deltaUnit(u.template.unit) })})` : ''}`).join('; ')}; ${points.length} points${residualSD && weighting === 'none' ? `, residual SD ${describe(difference(firstObserved, sdSI!))}` : ''}; ${fit.converged ? 'converged' : `not converged (${fit.message})`}.`;
  // the measurements in SI, so that plots of the same states elsewhere can show them
  const series = observed.map((o) => {
    const rows = table.rows.filter((r) => r[o.ci] !== null && r[ti] !== null);
    return { state: o.state, t: rows.map((r) => r[ti] as number), y: rows.map((r) => r[o.ci] as number) };
  });
  bindings.set(measuredRef(cell.id), { kind: 'measured', cell: cell.id, series, sig: JSON.stringify(series) });
  const plot = fitPlot(through ? throughCurve(through, unknowns, fit.p) : curve(spec, t0, y0, p, fit.p, apply, times, scale), laws, observed, series, table.columns[ti].unit);
  const atJump = through ? jumpTimeNote(through, cell.run!, table, ti) : undefined;
  const warnings = atJump ? { warnings: [...(output.warnings ?? []), atJump] } : {};
  return { ok: true, bindings, output: { ...output, summary, ...(plot ? { plot } : {}), ...warnings }, reasons: spread.reasons };
}

/** Points across the data's span for the fitted curve. */
const CURVE_POINTS = 200;

/** The fitted curve of a laws-only fit over the data's span. */
function curve(spec: ModelSpec, t0: number, y0: Float64Array, p: Float64Array, best: Float64Array, apply: (v: ArrayLike<number>) => void,
  times: readonly number[], scale: Float64Array): Curve | undefined {
  apply(best);
  const end = times[times.length - 1];
  const grid = Array.from({ length: CURVE_POINTS }, (_, i) => t0 + ((end - t0) * i) / (CURVE_POINTS - 1));
  const run = runModelAt(spec, t0, y0, p, grid, scale);
  return run.values ? { t: grid, values: run.values } : undefined;
}

/** The fitted curve of a fit through a run: the whole run with the estimates, every jump drawn. */
function throughCurve(model: RunModel, unknowns: readonly Unknown[], best: Float64Array): Curve | undefined {
  const drawn = model.curve(new Map(unknowns.map((u, k) => [u.name, best[k]])), 2 * CURVE_POINTS);
  const { t, values } = drawn;
  if (!t || !values) return undefined;
  const n = model.laws.length;
  return { t, values: t.map((_, k) => Float64Array.from({ length: n }, (_, i) => values[k * n + i])) };
}

/** Times (SI) and the states at each. */
interface Curve { readonly t: readonly number[]; readonly values: readonly Float64Array[] }

/**
 * What the plots of a fit draw, in the units the study shows: the fitted states (over the
 * data's span, or the run's), the measured points over them, and each residual at its time.
 */
function fitPlot(run: Curve | undefined, laws: readonly Law[], observed: ReadonlyArray<{ state: string; si: number }>,
  series: readonly MeasuredSeries[], tUnit: DisplayUnit): SimulationPlot | undefined {
  if (!run) return undefined;
  const t0 = run.t[0];
  const end = run.t[run.t.length - 1];
  const inTime = (si: number) => valueIn({ si, dim: TIME, unit: tUnit }, tUnit);
  const inState = (i: number, si: number) => valueIn({ ...laws[i].initial, si }, laws[i].initial.unit);
  const shown = observed.map((o) => o.si);
  return {
    timeUnit: formatUnit(tUnit),
    timeUnits: timeAxisUnits(formatUnit(tUnit), inTime(end) - inTime(t0)),
    t: run.t.map(inTime),
    states: shown.map((i) => ({ name: laws[i].state, unit: formatUnit(laws[i].initial.unit), values: run.values!.map((v) => inState(i, v[i])) })),
    events: [], levels: [], marks: [],
    points: measuredPoints(series, observed.map((o) => ({ name: o.state, template: laws[o.si].initial })), inTime),
  };
}

