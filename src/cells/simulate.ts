/**
 * A simulate cell: integrates the named rate laws (and the laws coupled to them) from `from`
 * to `to` through the schedule of events, then answers the `find` queries on the dense
 * output. One graph node; it defines the names of its `find` entries.
 */
import type { SimulateCell, FindQuery, ScheduleEvent } from '../study/types.ts';
import { FIND_KINDS } from '../study/types.ts';
import type { Binding, CellError, GraphNode, Law, Outcome, RunContext, Use } from '../engine/node.ts';
import { cellRef } from '../engine/node.ts';
import { type Field, field, usesOf, lookupFrom, stateLookupFrom, finiteQuantityOf, FieldError, guarded, shownAs } from './fields.ts';
import { type Quantity, report, describe, valueIn, tidy, deltaUnit } from '../units/quantity.ts';
import { sameDim, describeDim, divDim, mulDim, TIME } from '../units/dimension.ts';
import { type DisplayUnit, formatUnit, mulUnits, unitFactor } from '../units/units.ts';
import { compileLaw } from '../simulate/compile-law.ts';
import { symbolsOf } from '../expression/ast.ts';
import { expandSchedule, type ScheduledEvent } from '../simulate/schedule.ts';
import { runSchedule, type SystemSpec } from '../simulate/run-schedule.ts';
import { stepPoints, type Trajectory } from '../simulate/trajectory.ts';
import { crossings, extreme, valueOfAt, integralOver, timeBeyond } from '../simulate/queries.ts';
import { linearCoefficients, compareWithExact } from '../simulate/closed-form.ts';
import { quantitySig } from './signatures.ts';
import { collectLaws } from './laws.ts';
import { Status } from '../numerics/ode/types.ts';
import { simulationPlot } from '../simulate/plot-data.ts';
import { simulationSummary, type FoundText, type StatePath } from '../output/summaries.ts';

/** Step attempts allowed in one run, all pieces together. */
const MAX_STEPS = 200_000;
const DEFAULT_RTOL = 1e-6;

interface Fields {
  from?: Field; to?: Field; step?: Field; atol?: Field;
  events: Array<{ at?: Field; every?: Field; for?: Field; targets: Array<{ name: string; value?: Field }>; kind: 'add' | 'set' | 'infuse'; raw: ScheduleEvent }>;
  finds: Array<{ q: FindQuery; kind: (typeof FIND_KINDS)[number] | undefined; level?: Field; at?: Field; from?: Field; to?: Field }>;
}

export function simulateNodes(cell: SimulateCell, at: string): GraphNode[] {
  const problems: CellError[] = [];
  const f: Fields = { events: [], finds: [] };
  const opt = (v: unknown, path: string) => (v === undefined ? undefined : field(v, path, problems));
  f.from = field(cell.from, `${at}.from`, problems);
  f.to = field(cell.to, `${at}.to`, problems);
  f.step = opt(cell.step, `${at}.step`);
  f.atol = opt(cell.tolerance?.absolute, `${at}.tolerance.absolute`);
  const refs: Use[] = [];
  const rates = Array.isArray(cell.rates) ? cell.rates : [];
  rates.forEach((r, i) => { if (typeof r === 'string') refs.push({ name: cellRef(r), path: `${at}.rates[${i}]` }); });
  (Array.isArray(cell.events) ? cell.events : []).forEach((e, i) => {
    const p = `${at}.events[${i}]`;
    const kind = (['add', 'set', 'infuse'] as const).find((k) => e && Object.prototype.hasOwnProperty.call(e, k)) ?? 'add';
    const targets = Object.entries((e?.[kind] ?? {}) as Record<string, unknown>).map(([name, v]) => {
      refs.push({ name, path: `${p}.${kind}`, readsStates: true });
      return { name, value: field(v, `${p}.${kind}.${name}`, problems) };
    });
    f.events.push({ at: opt(e?.at, `${p}.at`), every: opt(e?.every, `${p}.every`), for: opt(e?.for, `${p}.for`), targets, kind, raw: e });
  });
  const defines = (Array.isArray(cell.find) ? cell.find : []).flatMap((q, i) => {
    const p = `${at}.find[${i}]`;
    const kind = FIND_KINDS.find((k) => q && Object.prototype.hasOwnProperty.call(q, k));
    if (kind && typeof q[kind] === 'string') refs.push({ name: q[kind] as string, path: `${p}.${kind}`, readsStates: true });
    f.finds.push({ q, kind, level: opt(q?.level, `${p}.level`), at: opt(q?.at, `${p}.at`), from: opt(q?.from, `${p}.from`), to: opt(q?.to, `${p}.to`) });
    return typeof q?.name === 'string' ? [{ name: q.name, path: `${p}.name` }] : [];
  });
  // an event's amounts under add and infuse can read states (and are refused when they do);
  // every other field is a time, a level or a tolerance, where a state's name is a unit's
  const amounts = f.events.flatMap((e) => e.targets.map((t) => ({ value: t.value, states: e.kind !== 'set' })));
  const all = [f.from, f.to, f.step, f.atol, ...f.events.flatMap((e) => [e.at, e.every, e.for]), ...amounts.filter((a) => !a.states).map((a) => a.value),
    ...f.finds.flatMap((q) => [q.level, q.at, q.from, q.to])];
  return [{
    key: `${cell.id}/simulate`,
    cell: cell.id,
    defines,
    uses: [...usesOf(all), ...usesOf(amounts.filter((a) => a.states).map((a) => a.value), { states: true }), ...refs],
    allowsTime: true,
    pullsCoupledLaws: true,
    signature: JSON.stringify(cell),
    problems,
    run: (ctx) => guarded(() => runSimulation(cell, at, f, ctx)),
  }];
}

const fail = (path: string, message: string): never => { throw new FieldError({ path, message }); };

function runSimulation(cell: SimulateCell, at: string, f: Fields, ctx: RunContext): Outcome {
  const laws = collectLaws(cell.rates, `${at}.rates`, ctx);
  const states = laws.map((l) => l.state);
  const stateIndex = new Map(states.map((s, i) => [s, i]));
  const lookup = lookupFrom(ctx);
  const amountLookup = stateLookupFrom(ctx);
  const time = (fd: Field | undefined, what: string): Quantity => {
    const q = finiteQuantityOf(fd!, lookup);
    if (!sameDim(q.dim, TIME)) fail(fd!.path, `${what} must be a time (such as 8 h); it is ${describeDim(q.dim)} (${describe(q)})`);
    return q;
  };
  const from = time(f.from, 'the start');
  const to = time(f.to, 'the end');
  if (!(to.si > from.si)) fail(f.to!.path, `the end (${describe(to)}) must be after the start (${describe(from)})`);
  const timeUnit: DisplayUnit = to.unit.length ? to.unit : [['s', 1]];
  const asTime = (si: number): Quantity => ({ si, dim: TIME, unit: timeUnit });
  const stateQ = (i: number, si: number): Quantity => ({ ...laws[i].initial, si });

  // parameters the laws read, and those the schedule changes
  const params: string[] = [];
  for (const l of laws) for (const n of l.reads) if (n !== 't' && !stateIndex.has(n) && !params.includes(n)) params.push(n);
  const setTargets = new Map<string, string>();
  for (const [i, e] of f.events.entries()) {
    for (const t of e.targets) {
      const path = `${at}.events[${i}].${e.kind}`;
      const b = ctx.binding(t.name);
      if (e.kind === 'set') {
        if (b?.kind === 'state') fail(path, `"${t.name}" is a state: change it with "add", not "set"`);
        if (b?.kind !== 'value') fail(path, `"${t.name}" is not a parameter`);
        setTargets.set(t.name, path);
        if (!params.includes(t.name)) params.push(t.name);
      } else if (!stateIndex.has(t.name)) {
        fail(path, `"${t.name}" is not a state of this run (its states: ${states.join(', ')})`);
      }
    }
  }
  for (const l of laws) {
    for (const n of l.reads) {
      for (const [p, path] of setTargets) {
        if (n !== p && ctx.upstream(n).has(p)) {
          fail(path, `the law of ${l.state} reads "${n}", which is computed from "${p}"; an event changes "${p}" during the run, but "${n}" would keep its starting value. Write the law with "${p}" itself.`);
        }
      }
    }
  }
  // a law's parameters as it was checked (its binding changes when they do); set targets from the graph
  const paramQ = params.map((n) => laws.find((l) => l.scope.has(n))?.scope.get(n) ?? (ctx.binding(n) as Extract<Binding, { kind: 'value' }>).q);
  const paramIndex = new Map(params.map((n, i) => [n, i]));

  // the events, evaluated once at the start
  const scheduled: ScheduledEvent[] = f.events.map((e, i) => {
    const targets = e.targets.map((t) => {
      const fd = t.value!;
      // under set, a state's name is a unit (the field cannot read states)
      const bad = symbolsOf(fd.expr).find((s) => s === 't' || (e.kind !== 'set' && stateIndex.has(s)));
      if (bad) fail(fd.path, `an event's amount is fixed when the run starts, so it cannot read "${bad}"`);
      const q = finiteQuantityOf(fd, e.kind === 'set' ? lookup : amountLookup);
      let want = e.kind === 'set' ? paramQ[paramIndex.get(t.name)!].dim : laws[stateIndex.get(t.name)!].initial.dim;
      if (e.kind === 'infuse') want = divDim(want, TIME);
      if (!sameDim(q.dim, want)) fail(fd.path, `${e.kind === 'infuse' ? 'an infusion rate' : 'the amount'} for ${t.name} must be ${describeDim(want)}; it is ${describeDim(q.dim)} (${describe(q)})`);
      if (e.kind === 'add' && q.temp === 'point') fail(fd.path, `adding a temperature reading (${describe(q)}) is ambiguous: add a change of temperature in K or degR`);
      return { name: t.name, value: q.si };
    });
    const every = e.every ? time(e.every, 'the repeat interval').si : undefined;
    return {
      index: i, at: time(e.at, 'the event time').si, every, count: e.raw.count,
      duration: e.for ? time(e.for, 'the infusion duration').si : undefined, kind: e.kind, targets,
    };
  });
  const actions = expandSchedule(scheduled, from.si, to.si);
  if (!Array.isArray(actions)) fail(`${at}.events[${actions.event}]`, actions.error);
  const timeline = actions as Exclude<typeof actions, { error: string }>;

  // the queries, checked before the run
  const integrals: number[] = [];
  const finds = f.finds.map((fq, i) => {
    const path = `${at}.find[${i}]`;
    const state = fq.kind ? (fq.q[fq.kind] as string) : '';
    const si = stateIndex.get(state);
    if (si === undefined) fail(`${path}.${fq.kind}`, `"${state}" is not a state of this run (its states: ${states.join(', ')})`);
    const level = fq.level ? finiteQuantityOf(fq.level, lookup) : undefined;
    if (level && !sameDim(level.dim, laws[si!].initial.dim)) fail(fq.level!.path, `the level must be ${describeDim(laws[si!].initial.dim)} like ${state}; it is ${describe(level)}`);
    const span = [fq.from ? time(fq.from, 'the window start').si : from.si, fq.to ? time(fq.to, 'the window end').si : to.si];
    if (!(span[1] >= span[0])) fail(`${path}.to`, 'the window must end after it starts');
    const atT = fq.at ? time(fq.at, 'the time').si : undefined;
    if (atT !== undefined && (atT < from.si || atT > to.si)) fail(fq.at!.path, `the time ${describe(asTime(atT))} is outside the run`);
    let quadrature = -1;
    if (fq.kind === 'integralOf') { quadrature = states.length + integrals.length; integrals.push(si!); }
    return { ...fq, name: fq.q.name, state, si: si!, level, span, atT, quadrature, path, unitPath: `${path}.unit` };
  });

  // tolerances
  const rtol = cell.tolerance?.relative ?? DEFAULT_RTOL;
  const atolQ = f.atol ? finiteQuantityOf(f.atol, lookup) : undefined;
  // default absolute tolerance: a thousandth of the relative one, on the state's own scale
  // (its start, its jumps and infusions, the levels asked about, and the values of its kind
  // that its law reads); when all of those are zero, a billionth of the state's unit
  const atol = Float64Array.from(laws, (l, i) => {
    if (atolQ && sameDim(atolQ.dim, l.initial.dim)) return Math.abs(differenceSize(atolQ));
    const jumps = timeline.filter((a) => a.kind !== 'set').flatMap((a) => a.targets.filter((t) => t.name === l.state)
      .map((t) => Math.abs(t.value) * (a.kind === 'add' ? 1 : to.si - from.si)));
    const levels = finds.filter((q) => q.si === i && q.level).map((q) => Math.abs(q.level!.si));
    const alike = [...l.scope.values()].filter((q) => sameDim(q.dim, l.initial.dim)).map((q) => Math.abs(q.si));
    const scale = Math.max(Math.abs(l.initial.si), ...jumps, ...levels, ...alike);
    return scale > 0 && Number.isFinite(scale) ? scale * rtol * 1e-3 : 1e-9 * unitFactor(l.stateUnit);
  });
  if (atolQ && !laws.some((l) => sameDim(atolQ.dim, l.initial.dim))) fail(f.atol!.path, `the absolute tolerance must have the unit of a state (${laws.map((l) => formatUnit(l.stateUnit)).join(', ')}); it is ${describe(atolQ)}`);
  const method = cell.method ?? 'auto';
  const step = f.step ? time(f.step, 'the step').si : undefined;
  if (step !== undefined && !(step > 0)) fail(f.step!.path, 'the step must be longer than zero');
  if (step !== undefined && (to.si - from.si) / step > MAX_STEPS) fail(f.step!.path, `the step is too small for the run: it would take more than ${MAX_STEPS} steps`);

  if (ctx.mode === 'check') {
    return { ok: true, bindings: new Map(), output: { computed: false, message: 'checked; run the study to simulate' } };
  }

  // compile the system
  const inputs = ['t', ...states, ...params];
  const compiled = laws.map((l) => compileLaw(l, inputs));
  const x = new Float64Array(inputs.length);
  const n = states.length;
  const sys: SystemSpec = {
    n,
    quadratures: integrals,
    stateIndex,
    paramIndex,
    y0: Float64Array.from(laws, (l) => l.initial.si),
    p0: Float64Array.from(paramQ, (q) => q.si),
    autonomous: !laws.some((l) => l.reads.includes('t')),
    rates: (t, y, p, dy) => {
      x[0] = t;
      for (let i = 0; i < n; i++) x[1 + i] = y[i];
      for (let j = 0; j < p.length; j++) x[1 + n + j] = p[j];
      for (let i = 0; i < n; i++) dy[i] = compiled[i](x);
    },
  };
  const run = runSchedule(sys, timeline, from.si, to.si, { method, step, rtol, atol, maxSteps: MAX_STEPS });
  if (run.status !== Status.Success) {
    const fl = run.failure!;
    const where = states.map((s, i) => `${s} = ${describe(stateQ(i, fl.y[i]))}`).join(', ');
    fail(at, `the run stopped at t = ${describe(asTime(fl.t))}: ${FAILURE[fl.status]} (${where})`);
  }
  const tr = run.trajectory;

  // the answers
  const results: Record<string, unknown> = {};
  const bindings = new Map<string, Binding>();
  const reasons = new Map<string, string>();
  const found: FoundText[] = [];
  const marks: Array<{ name: string; state: string; t: number; value: Quantity; answer: string }> = [];
  const give = (name: string, given: Quantity, what: string) => {
    const fq = finds.find((f) => f.q.name === name);
    const q = fq ? shownAs(given, fq.q.unit, fq.unitPath) : given;
    results[name] = report(q);
    bindings.set(name, { kind: 'value', q, sig: quantitySig(q) });
    found.push({ name, what, answer: describe(q) });
  };
  const mark = (fq: (typeof finds)[number], t: number) => marks.push({ name: fq.name, state: fq.state, t, value: stateQ(fq.si, valueOfAt(tr, fq.si, t)!), answer: found[found.length - 1].answer });
  for (const fq of finds) {
    const [a, b] = fq.span;
    const law = laws[fq.si];
    const inWindow = fq.q.from !== undefined || fq.q.to !== undefined ? ` from ${describe(asTime(a))} to ${describe(asTime(b))}` : '';
    switch (fq.kind) {
      case 'crossing': {
        const dir = fq.q.direction ?? 'either';
        const all = crossings(tr, fq.si, fq.level!.si, a, b).filter((c) => dir === 'either' || c.direction === dir);
        const c = all[(fq.q.occurrence ?? 1) - 1];
        const what = `${fq.state} ${dir === 'up' ? 'rises through' : dir === 'down' ? 'falls through' : 'crosses'} ${describe(fq.level!)}${(fq.q.occurrence ?? 1) > 1 ? `, occurrence ${fq.q.occurrence}` : ''}`;
        if (c) {
          give(fq.name, asTime(c.t), what);
          mark(fq, c.t);
        } else {
          const message = `not reached: no ${what.replace(/^(\S+) (rises through|falls through|crosses)/, (_, s, v) => `${s} ${v === 'rises through' ? 'rising through' : v === 'falls through' ? 'falling through' : 'crossing'}`)} by the end of the run (${describe(asTime(b))})`;
          results[fq.name] = { notReached: true, message, end: report(asTime(b)) };
          reasons.set(fq.name, `"${fq.name}" is not defined: ${message}`);
          found.push({ name: fq.name, what, answer: `not reached by ${describe(asTime(b))}` });
        }
        break;
      }
      case 'maximum': case 'minimum': case 'timeOfMaximum': case 'timeOfMinimum': {
        const sign = fq.kind === 'maximum' || fq.kind === 'timeOfMaximum' ? 1 : -1;
        const e = extreme(tr, fq.si, sign, a, b)!;
        const what = `${fq.kind.startsWith('time') ? 'time of the ' : ''}${sign > 0 ? 'largest' : 'smallest'} ${fq.state}${inWindow}`;
        give(fq.name, fq.kind.startsWith('time') ? asTime(e.t) : stateQ(fq.si, e.value), what);
        mark(fq, e.t);
        break;
      }
      case 'valueOf':
        give(fq.name, stateQ(fq.si, valueOfAt(tr, fq.si, fq.atT!)!), `${fq.state} at ${describe(asTime(fq.atT!))}`);
        mark(fq, fq.atT!);
        break;
      case 'integralOf': {
        const area = integralOver(tr, fq.quadrature, a, b)!;
        give(fq.name, { si: area, dim: mulDim(law.initial.dim, TIME), unit: mulUnits(deltaUnit(law.stateUnit), timeUnit) }, `area under ${fq.state}${inWindow}`);
        break;
      }
      case 'timeAbove': case 'timeBelow':
        give(fq.name, asTime(timeBeyond(tr, fq.si, fq.level!.si, fq.kind === 'timeAbove' ? 1 : -1, a, b)),
          `time with ${fq.state} ${fq.kind === 'timeAbove' ? 'above' : 'below'} ${describe(fq.level!)}${inWindow}`);
        break;
    }
  }
  const last = tr.pieces[tr.pieces.length - 1];
  const paths: StatePath[] = laws.map((l, i) => ({
    name: l.state,
    start: stateQ(i, tr.pieces[0].y0[i]),
    end: stateQ(i, last.y1[i]),
    min: stateQ(i, extreme(tr, i, -1)!.value),
    max: stateQ(i, extreme(tr, i, 1)!.value),
  }));
  const plot = simulationPlot({
    tr, timeUnit, timeOf: asTime, actions: timeline, marks,
    states: laws.map((l) => ({ name: l.state, template: l.initial })),
    levels: finds.filter((fq) => fq.level).map((fq) => ({ state: fq.state, level: fq.level! })),
  });

  const output: Record<string, unknown> = {
    method: run.switchedToStiff !== null ? 'stiff' : [...run.methodsUsed].join(', '),
    steps: run.steps,
    evaluations: run.evaluations,
    results,
    closedForm: closedForms(laws, sys, tr, compiled, inputs.length, rtol, atol, timeUnit),
    series: seriesOf(tr, states),
    summary: simulationSummary(paths, found),
    // each question in words, as the summary puts it (for the printed sheet)
    questions: Object.fromEntries(found.map((f) => [f.name, f.what])),
    plot,
  };
  if (run.switchedToStiff !== null) {
    output.switchedToStiff = report(asTime(run.switchedToStiff));
    output.note = `the law turned out stiff; the run switched from Dormand–Prince to the stiff method at t = ${describe(asTime(run.switchedToStiff))}`;
  }
  return { ok: true, bindings, output, reasons };
}

const FAILURE: Record<string, string> = {
  [Status.Blowup]: 'the solution grows without bound (a finite-time blow-up)',
  [Status.UndefinedRate]: 'the rate is not a number there (a logarithm or square root of a negative value, or a division by zero?)',
  [Status.StepCollapse]: 'the step size collapsed (the rate may jump there; try the stiff method)',
  [Status.Budget]: `the run used its budget of ${MAX_STEPS} steps (shorten the run, loosen the tolerance, or try the stiff method)`,
};

/** A temperature reading used as a tolerance means a difference of that many degrees. */
function differenceSize(q: Quantity): number {
  if (q.temp !== 'point') return q.si;
  return valueIn(q, q.unit) * unitFactor(q.unit);
}


function seriesOf(tr: Trajectory, states: readonly string[]): Record<string, number[]> {
  const pts = stepPoints(tr);
  const out: Record<string, number[]> = { t: pts.t };
  states.forEach((s, i) => { out[s] = pts.y.map((y) => y[i]); });
  return out;
}

/** For each law linear in its own state alone: rate constant, time constant, half-life, and the run's error. */
function closedForms(laws: readonly Law[], sys: SystemSpec, tr: Trajectory, compiled: Array<(x: ArrayLike<number>) => number>, width: number, rtol: number, atol: Float64Array, timeUnit: DisplayUnit) {
  const out: Record<string, unknown> = {};
  const n = laws.length;
  const points = stepPoints(tr);
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
    const first = laws0[0]!;
    const check = compareWithExact(tr, i, (k) => laws0[k]!, rtol, atol[i]);
    const perTime: DisplayUnit = mulUnits([], timeUnit, -1);
    const entry: Record<string, unknown> = {
      form: `${l.state}' = a + b ${l.state}`,
      rateConstant: report({ si: first.b, dim: divDim(TIME.map(() => 0), TIME), unit: perTime }),
      maxError: report({ si: check.maxError, dim: l.initial.dim, unit: deltaUnit(l.stateUnit), ...(l.initial.temp ? { temp: 'delta' as const } : {}) }),
      maxErrorInTolerances: tidy(check.maxErrorInTolerances),
    };
    if (first.b !== 0) {
      entry.timeConstant = report({ si: 1 / Math.abs(first.b), dim: TIME, unit: timeUnit });
      entry[first.b < 0 ? 'halfLife' : 'doublingTime'] = report({ si: Math.LN2 / Math.abs(first.b), dim: TIME, unit: timeUnit });
      entry.equilibrium = report({ ...l.initial, si: -first.a / first.b });
      entry.stable = first.b < 0;
    }
    out[l.state] = entry;
  });
  return Object.keys(out).length ? out : undefined;
}

