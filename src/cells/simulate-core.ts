/**
 * The numeric core of a simulate cell: its fields evaluated, the schedule expanded, the laws
 * integrated through it, and the `find` questions answered as bindings. No report, plot or
 * text: a what-if run calls this alone (`simulate-report.ts` turns a core into the cell's
 * report). Cost: the integration plus a few microseconds; the compiled laws and the expanded
 * schedule are reused while their inputs stay the same.
 */
import type { SimulateCell, FindQuery, ScheduleEvent } from '../study/types.ts';
import { FIND_KINDS } from '../study/types.ts';
import type { Binding, Law, RunContext } from '../engine/node.ts';
import { type Field, lookupFrom, stateLookupFrom, finiteQuantityOf, fail, shownAs } from './fields.ts';
import { type Quantity, describe, valueIn, deltaUnit } from '../units/quantity.ts';
import { sameDim, describeDim, divDim, mulDim, TIME } from '../units/dimension.ts';
import { type DisplayUnit, formatUnit, mulUnits, unitFactor } from '../units/units.ts';
import { compileLaw } from '../simulate/compile-law.ts';
import type { Compiled } from '../expression/compile.ts';
import { symbolsOf } from '../expression/ast.ts';
import { expandSchedule, type Action, type ScheduledEvent } from '../simulate/schedule.ts';
import { runSchedule, type RunOutcome, type SystemSpec } from '../simulate/run-schedule.ts';
import { crossings, extreme, valueOfAt, integralOver, timeBeyond } from '../simulate/queries.ts';
import { quantitySig } from './signatures.ts';
import { repeatCount } from './repeat-count.ts';
import { collectLaws } from './laws.ts';
import { FAILURE_CAUSES, Status, formatForMessage, type FailureStatus } from '../numerics/ode/types.ts';
import { newOdeReuse, type OdeReuse } from '../numerics/ode/integrate.ts';
import { unstableStep } from '../simulate/unstable-step.ts';

/** Step attempts allowed in one run, all pieces together. */
export const MAX_STEPS = 200_000;
export const DEFAULT_RTOL = 1e-6;

/** The cell's expression fields, parsed once when its node is built. */
export interface Fields {
  from?: Field; to?: Field; step?: Field; atol?: Field;
  events: Array<{ at?: Field; every?: Field; count?: Field; for?: Field; targets: Array<{ name: string; value?: Field }>; kind: 'add' | 'set' | 'infuse'; raw: ScheduleEvent }>;
  finds: Array<{ q: FindQuery; kind: (typeof FIND_KINDS)[number] | undefined; level?: Field; at?: Field; from?: Field; to?: Field }>;
}

/** A `find` entry checked against the run: its state's index, its level, window and time in SI. */
export interface Find {
  readonly q: FindQuery;
  readonly kind: (typeof FIND_KINDS)[number] | undefined;
  readonly name: string;
  readonly state: string;
  /** Index of its state. */
  readonly si: number;
  readonly level?: Quantity;
  /** [start, end] of its window, SI seconds. */
  readonly span: readonly [number, number];
  readonly atT?: number;
  /** Column of its area in the trajectory, or -1. */
  readonly quadrature: number;
  readonly path: string;
  readonly unitPath: string;
}

/** The answer to one `find`: its quantity and where the plot marks it, or why there is none. */
export interface Answer {
  readonly find: Find;
  readonly q?: Quantity;
  /** The time the plot marks (crossings, extremes, values). */
  readonly markAt?: number;
  /**
   * The state's value (SI) the plot marks at `markAt`: the extreme itself, the value asked for,
   * a crossing's level. Not the trajectory at `markAt`, which after a dose at that time is the
   * value after it: a trough just before a dose would be marked at the next peak.
   */
  readonly markValue?: number;
  /** For a crossing not reached: the message. */
  readonly missing?: string;
}

/** Everything a run computed, for the bindings and for the report. */
export interface SimulationCore {
  readonly laws: readonly Law[];
  readonly states: readonly string[];
  readonly from: Quantity;
  readonly to: Quantity;
  readonly timeUnit: DisplayUnit;
  readonly timeline: readonly Action[];
  /** The events as the schedule read them (SI times), in the cell's order. */
  readonly scheduled: readonly ScheduledEvent[];
  readonly finds: readonly Find[];
  readonly sys: SystemSpec;
  readonly compiled: readonly Compiled[];
  readonly inputs: readonly string[];
  readonly rtol: number;
  readonly atol: Float64Array;
  readonly run: RunOutcome;
  readonly answers: readonly Answer[];
  readonly bindings: ReadonlyMap<string, Binding>;
  readonly reasons: ReadonlyMap<string, string>;
}

/**
 * What a node keeps between runs: each field's value with the bindings it was computed from,
 * and the last expanded schedule with the numbers it came from. A field is evaluated again
 * only when a binding it reads is another object; a schedule only when its numbers change.
 */
export interface CoreMemo {
  schedule?: { readonly key: readonly number[]; readonly actions: ReturnType<typeof expandSchedule> };
  /** The integrator's set-up, kept from run to run (`OdeReuse`). */
  ode?: OdeReuse;
  fields?: WeakMap<Field, { readonly names: readonly string[]; deps: Array<Binding | undefined>; q?: Quantity }>;
}

/** A time in the run's time unit. */
export function timeOf(core: Pick<SimulationCore, 'timeUnit'>, si: number): Quantity {
  return { si, dim: TIME, unit: core.timeUnit };
}

/** A value of state i, with the state's dimension, unit and temperature kind. */
export function stateValue(core: Pick<SimulationCore, 'laws'>, i: number, si: number): Quantity {
  return { ...core.laws[i].initial, si };
}

/**
 * Runs the cell's numerics. Throws FieldError for a problem on a field; returns null in
 * 'check' mode once every field has been checked, before anything is integrated.
 */
export function simulateCore(cell: SimulateCell, at: string, f: Fields, ctx: RunContext, memo: CoreMemo): SimulationCore | null {
  const laws = collectLaws(cell.rates, `${at}.rates`, ctx);
  const states = laws.map((l) => l.state);
  const stateIndex = new Map(states.map((s, i) => [s, i]));
  const lookup = lookupFrom(ctx);
  // an event's amount under add or infuse sees states; every other field does not
  const amountLookup = stateLookupFrom(ctx);
  const fields = (memo.fields ??= new WeakMap());
  const entry = (fd: Field) => {
    let m = fields.get(fd);
    if (!m) {
      m = { names: symbolsOf(fd.expr), deps: [] };
      fields.set(fd, m);
    }
    return m;
  };
  // a field's value, evaluated again only when a binding it reads changed
  const value = (fd: Field, from = lookup): Quantity => {
    const m = entry(fd);
    if (m.q && m.names.every((n, i) => ctx.binding(n) === m.deps[i])) return m.q;
    m.q = undefined;
    const q = finiteQuantityOf(fd, from);
    m.deps = m.names.map((n) => ctx.binding(n));
    m.q = q;
    return q;
  };
  const time = (fd: Field | undefined, what: string): Quantity => {
    const q = value(fd!);
    if (!sameDim(q.dim, TIME)) fail(fd!.path, `${what} must be a time (such as 8 h); it is ${describeDim(q.dim)} (${describe(q)})`, 'unit');
    return q;
  };
  const from = time(f.from, 'the start');
  const to = time(f.to, 'the end');
  if (!(to.si > from.si)) fail(f.to!.path, `the end (${describe(to)}) must be after the start (${describe(from)})`);
  const timeUnit: DisplayUnit = to.unit.length ? to.unit : [['s', 1]];
  const asTime = (si: number): Quantity => ({ si, dim: TIME, unit: timeUnit });

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
      const bad = entry(fd).names.find((s) => s === 't' || (e.kind !== 'set' && stateIndex.has(s)));
      if (bad) fail(fd.path, `an event's amount is fixed when the run starts, so it cannot read "${bad}"`);
      const q = value(fd, e.kind === 'set' ? lookup : amountLookup);
      let want = e.kind === 'set' ? paramQ[paramIndex.get(t.name)!].dim : laws[stateIndex.get(t.name)!].initial.dim;
      if (e.kind === 'infuse') want = divDim(want, TIME);
      if (!sameDim(q.dim, want)) fail(fd.path, `${e.kind === 'infuse' ? 'an infusion rate' : 'the amount'} for ${t.name} must be ${describeDim(want)}; it is ${describeDim(q.dim)} (${describe(q)})`, 'unit');
      if (e.kind === 'add' && q.temp === 'point') fail(fd.path, `adding a temperature reading (${describe(q)}) is ambiguous: add a change of temperature in K or degR`, 'unit');
      return { name: t.name, value: q.si };
    });
    const every = e.every ? time(e.every, 'the repeat interval').si : undefined;
    const count = e.count ? repeatCount(value(e.count), e.count.path) : (e.raw.count as number | undefined);
    if (e.count && every === undefined && count !== 1) fail(`${at}.events[${i}].every`, `is needed to repeat an event (${count} times)`);
    return {
      index: i, at: time(e.at, 'the event time').si, every, count,
      duration: e.for ? time(e.for, 'the infusion duration').si : undefined, kind: e.kind, targets,
    };
  });
  const actions = expandMemo(memo, scheduled, from.si, to.si);
  if (!Array.isArray(actions)) fail(`${at}.events[${actions.event}]`, actions.error);
  const timeline = actions as Action[];

  // the queries, checked before the run
  const integrals: number[] = [];
  const finds: Find[] = f.finds.map((fq, i) => {
    const path = `${at}.find[${i}]`;
    const state = fq.kind ? (fq.q[fq.kind] as string) : '';
    const si = stateIndex.get(state);
    if (si === undefined) fail(`${path}.${fq.kind}`, `"${state}" is not a state of this run (its states: ${states.join(', ')})`);
    const level = fq.level ? value(fq.level) : undefined;
    if (level && !sameDim(level.dim, laws[si!].initial.dim)) fail(fq.level!.path, `the level must be ${describeDim(laws[si!].initial.dim)} like ${state}; it is ${describe(level)}`, 'unit');
    const span: [number, number] = [fq.from ? time(fq.from, 'the window start').si : from.si, fq.to ? time(fq.to, 'the window end').si : to.si];
    // in words only when said: a what-if loop checks every question on every run
    const run = () => `the run (${describe(from)} to ${describe(to)})`;
    if (span[0] < from.si || span[0] > to.si) fail(`${path}.from`, `the window starts at ${describe(asTime(span[0]))}, outside ${run()}`);
    if (span[1] < from.si || span[1] > to.si) fail(`${path}.to`, `the window ends at ${describe(asTime(span[1]))}, outside ${run()}`);
    if (!(span[1] >= span[0])) fail(`${path}.to`, 'the window must end after it starts');
    const atT = fq.at ? time(fq.at, 'the time').si : undefined;
    if (atT !== undefined && (atT < from.si || atT > to.si)) fail(fq.at!.path, `the time ${describe(asTime(atT))} is outside the run`);
    if (atT !== undefined && (atT < span[0] || atT > span[1])) fail(fq.at!.path, `the time ${describe(asTime(atT))} is outside the question's window (${describe(asTime(span[0]))} to ${describe(asTime(span[1]))})`);
    let quadrature = -1;
    if (fq.kind === 'integralOf') { quadrature = states.length + integrals.length; integrals.push(si!); }
    return { q: fq.q, kind: fq.kind, name: fq.q.name, state, si: si!, level, span, atT, quadrature, path, unitPath: `${path}.unit` };
  });

  // tolerances
  const rtol = cell.tolerance?.relative ?? DEFAULT_RTOL;
  const atolQ = f.atol ? value(f.atol) : undefined;
  // default absolute tolerance: a thousandth of the relative one, on the state's own scale
  // (its start, its jumps and infusions, the levels asked about, and the values of its kind
  // that its law reads); when all of those are zero, a billionth of the state's unit
  // (the largest of those found in plain loops: Math.max taken one value at a time gives the
  // same number, NaN included, without the arrays a what-if loop would make on every run)
  const atol = Float64Array.from(laws, (l, i) => {
    if (atolQ && sameDim(atolQ.dim, l.initial.dim)) return Math.abs(differenceSize(atolQ));
    let scale = Math.abs(l.initial.si);
    for (const a of timeline) {
      if (a.kind === 'set') continue;
      for (const t of a.targets) if (t.name === l.state) scale = Math.max(scale, Math.abs(t.value) * (a.kind === 'add' ? 1 : to.si - from.si));
    }
    for (const q of finds) if (q.si === i && q.level) scale = Math.max(scale, Math.abs(q.level.si));
    for (const q of l.scope.values()) if (sameDim(q.dim, l.initial.dim)) scale = Math.max(scale, Math.abs(q.si));
    return scale > 0 && Number.isFinite(scale) ? scale * rtol * 1e-3 : 1e-9 * unitFactor(l.stateUnit);
  });
  if (atolQ && !laws.some((l) => sameDim(atolQ.dim, l.initial.dim))) fail(f.atol!.path, `the absolute tolerance must have the unit of a state (${laws.map((l) => formatUnit(l.stateUnit)).join(', ')}); it is ${describe(atolQ)}`, 'unit');
  const method = cell.method ?? 'auto';
  const step = f.step ? time(f.step, 'the step').si : undefined;
  if (step !== undefined && !(step > 0)) fail(f.step!.path, 'the step must be longer than zero');
  if (step !== undefined && (to.si - from.si) / step > MAX_STEPS) fail(f.step!.path, `the step is too small for the run: it would take more than ${MAX_STEPS} steps`);

  if (ctx.mode === 'check') return null;

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
  const run = runSchedule(sys, timeline, from.si, to.si, { method, step, rtol, atol, maxSteps: MAX_STEPS }, memo.ode ??= newOdeReuse());
  const core = { laws, states, from, to, timeUnit, timeline, scheduled, finds, sys, compiled, inputs, rtol, atol, run };
  if (run.status !== Status.Success) {
    const fl = run.failure!;
    const where = states.map((s, i) => `${s} = ${describe(stateValue(core, i, fl.y[i]))}`).join(', ');
    const unstable = fl.status === Status.Blowup && step !== undefined && (method === 'euler' || method === 'heun' || method === 'rk4')
      ? unstableStep((t, y, dy) => sys.rates(t, y, sys.p0, dy), from.si, sys.y0, step, method) : undefined;
    const cause = unstable
      ? `${method} is unstable with this step, though the law may stay bounded: the step (${describe(asTime(step!))}) is ${formatForMessage(unstable.product)} times the law's fastest time scale (${describe(asTime(1 / unstable.rho))}), above the ${unstable.limit} ${method} can take; use a step below ${describe(asTime(unstable.largestStep))}, or the auto or stiff method`
      : FAILURE_CAUSES[fl.status as FailureStatus]({ limit: MAX_STEPS });
    fail(at, `the run stopped at t = ${describe(asTime(fl.t))}: ${cause} (${where})`, 'numeric');
  }
  const { answers, bindings, reasons } = answer(core);
  return { ...core, answers, bindings, reasons };
}

/** The schedule expanded, or the last expansion when the numbers it came from are the same. */
function expandMemo(memo: CoreMemo, events: readonly ScheduledEvent[], from: number, to: number): ReturnType<typeof expandSchedule> {
  const key = [from, to];
  for (const e of events) {
    key.push(e.at, e.every ?? NaN, e.count ?? NaN, e.duration ?? NaN);
    for (const t of e.targets) key.push(t.value);
  }
  const last = memo.schedule;
  if (last && last.key.length === key.length && last.key.every((v, i) => Object.is(v, key[i]))) return last.actions;
  const actions = expandSchedule(events, from, to);
  memo.schedule = { key, actions };
  return actions;
}

type Integrated = Omit<SimulationCore, 'answers' | 'bindings' | 'reasons'>;

/** The answers to the `find` questions on the dense output, as bindings (in the unit each asks for). */
function answer(core: Integrated): Pick<SimulationCore, 'answers' | 'bindings' | 'reasons'> {
  const tr = core.run.trajectory;
  const answers: Answer[] = [];
  const bindings = new Map<string, Binding>();
  const reasons = new Map<string, string>();
  const give = (find: Find, given: Quantity, markAt?: number, markValue?: number) => {
    const q = shownAs(given, find.q.unit, find.unitPath);
    bindings.set(find.name, { kind: 'value', q, sig: quantitySig(q) });
    answers.push({ find, q, markAt, markValue });
  };
  for (const fq of core.finds) {
    const [a, b] = fq.span;
    const law = core.laws[fq.si];
    switch (fq.kind) {
      case 'crossing': {
        const dir = fq.q.direction ?? 'either';
        const all = crossings(tr, fq.si, fq.level!.si, a, b).filter((c) => dir === 'either' || c.direction === dir);
        const c = all[(fq.q.occurrence ?? 1) - 1];
        if (c) {
          give(fq, timeOf(core, c.t), c.t, fq.level!.si);
        } else {
          const end = fq.q.to === undefined ? 'the end of the run' : 'the end of the window';
          const message = `not reached: no ${fq.state} ${CROSSING_NOUN[dir]} ${crossingLevel(fq)}${windowText(core, fq)} by ${end} (${describe(timeOf(core, b))})`;
          reasons.set(fq.name, `"${fq.name}" was ${message}`);
          answers.push({ find: fq, missing: message });
        }
        break;
      }
      case 'maximum': case 'minimum': case 'timeOfMaximum': case 'timeOfMinimum': {
        const sign = fq.kind === 'maximum' || fq.kind === 'timeOfMaximum' ? 1 : -1;
        const e = extreme(tr, fq.si, sign, a, b)!;
        give(fq, fq.kind.startsWith('time') ? timeOf(core, e.t) : stateValue(core, fq.si, e.value), e.t, e.value);
        break;
      }
      case 'valueOf': {
        const v = valueOfAt(tr, fq.si, fq.atT!)!;
        give(fq, stateValue(core, fq.si, v), fq.atT!, v);
        break;
      }
      case 'integralOf': {
        const area = integralOver(tr, fq.quadrature, a, b)!;
        give(fq, { si: area, dim: mulDim(law.initial.dim, TIME), unit: areaUnit(law.stateUnit, core.timeUnit) });
        break;
      }
      case 'timeAbove': case 'timeBelow':
        give(fq, timeOf(core, timeBeyond(tr, fq.si, fq.level!.si, fq.kind === 'timeAbove' ? 1 : -1, a, b)));
        break;
    }
  }
  return { answers, bindings, reasons };
}

/** An area's unit (the state's difference unit times the run's time unit), cached by the two units' identity: units are immutable, and a what-if loop asks on every run. */
const areaUnits = new WeakMap<DisplayUnit, WeakMap<DisplayUnit, DisplayUnit>>();

function areaUnit(state: DisplayUnit, time: DisplayUnit): DisplayUnit {
  let byTime = areaUnits.get(state);
  if (!byTime) {
    byTime = new WeakMap();
    areaUnits.set(state, byTime);
  }
  let unit = byTime.get(time);
  if (!unit) {
    unit = mulUnits(deltaUnit(state), time);
    byTime.set(time, unit);
  }
  return unit;
}

/** A crossing in words, by direction: as a question ("T falls through 21 degC") and as a thing not found ("no T falling through"). */
const CROSSING_VERB = { up: 'rises through', down: 'falls through', either: 'crosses' } as const;
const CROSSING_NOUN = { up: 'rising through', down: 'falling through', either: 'crossing' } as const;

/** The level a crossing asks about, with its occurrence when not the first. */
function crossingLevel(fq: Find): string {
  return `${describe(fq.level!)}${(fq.q.occurrence ?? 1) > 1 ? `, occurrence ${fq.q.occurrence}` : ''}`;
}

/** A question's window in words (" from 60 h to 72 h"), or nothing when it asks over the whole run. */
function windowText(core: Pick<SimulationCore, 'timeUnit'>, fq: Find): string {
  const [a, b] = fq.span;
  return fq.q.from !== undefined || fq.q.to !== undefined ? ` from ${describe(timeOf(core, a))} to ${describe(timeOf(core, b))}` : '';
}

/** A `find` question in words, as the summary and the sheet put it: "T falls through 21 degC". */
export function questionText(core: Pick<SimulationCore, 'timeUnit'>, fq: Find): string {
  const inWindow = windowText(core, fq);
  switch (fq.kind) {
    case 'crossing': {
      const dir = fq.q.direction ?? 'either';
      return `${fq.state} ${CROSSING_VERB[dir]} ${crossingLevel(fq)}${inWindow}`;
    }
    case 'maximum': case 'minimum': case 'timeOfMaximum': case 'timeOfMinimum': {
      const sign = fq.kind === 'maximum' || fq.kind === 'timeOfMaximum' ? 1 : -1;
      return `${fq.kind.startsWith('time') ? 'time of the ' : ''}${sign > 0 ? 'largest' : 'smallest'} ${fq.state}${inWindow}`;
    }
    case 'valueOf':
      return `${fq.state} at ${describe(timeOf(core, fq.atT!))}`;
    case 'integralOf':
      return `area under ${fq.state}${inWindow}`;
    case 'timeAbove': case 'timeBelow':
      return `time with ${fq.state} ${fq.kind === 'timeAbove' ? 'above' : 'below'} ${describe(fq.level!)}${inWindow}`;
    default:
      return '';
  }
}


/** A temperature reading used as a tolerance means a difference of that many degrees. */
function differenceSize(q: Quantity): number {
  if (q.temp !== 'point') return q.si;
  return valueIn(q, q.unit) * unitFactor(q.unit);
}
