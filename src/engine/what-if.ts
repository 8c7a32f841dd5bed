/**
 * The what-if evaluator: some names of a study computed again with parameters (and the
 * initial values of states) replaced, without changing the study or its session. Solving for
 * a target, fitting through a schedule, uncertainty and sensitivity all re-run a study this
 * way, thousands of times.
 *
 * Preparing plans once: which nodes lie between the replaced names and the wanted ones (the
 * nodes downstream of a replaced name and upstream of a wanted one), in which order, and
 * where each of their inputs comes from. A call then only runs those nodes, in the 'what-if'
 * mode, in which a cell computes its bindings and skips its report (plot data, texts,
 * display formatting). Everything else is read from the session as it was when prepared.
 *
 * Values are given in SI units (seconds, kilograms, kelvin: `0.1 / h` is 0.1 / 3600), in
 * the order of `replaced`; answers come back in SI too, beside their quantity and binding.
 */
import type { Binding, CellError, GraphNode, Outcome, RunContext } from './node.ts';
import { type Graph, upstreamOf } from './graph.ts';
import type { Quantity } from '../units/quantity.ts';
import { sameDim, describeDim } from '../units/dimension.ts';
import { unitDim } from '../units/units.ts';
import { unitFromText } from '../expression/unit-text.ts';
import { nearest } from '../expression/suggest.ts';
import { quantitySig } from '../cells/signatures.ts';
import { rethrowWork } from '../numerics/work-meter.ts';

/** A name that cannot be read: its definer failed or computed nothing. */
export interface Unavailable {
  readonly kind: 'unavailable';
  readonly cell: string;
  readonly reason: string;
  /**
   * Where the failure began (the definer's cell, or the cell its chain of waits ends at) and
   * that cell's own reason: a cell waiting on this one names it once.
   */
  readonly root: { readonly cell: string; readonly reason: string; readonly name?: string };
  readonly sig: string;
}

/**
 * A name to replace: a parameter, or a state (its initial value). With `dimension`, a unit
 * text such as `1 / h` or `mg / L` (`1` for a plain number), the name's dimension is checked
 * against it when preparing; the values stay in SI either way.
 */
export type Replacement = string | { readonly name: string; readonly dimension?: string };

/** One wanted name after a call: its value, or why it has none. */
export type WhatIfAnswer =
  | { readonly name: string; readonly ok: true; readonly si: number; readonly q: Quantity; readonly binding: Extract<Binding, { kind: 'value' | 'state' }> }
  | { readonly name: string; readonly ok: false; readonly reason: string };

export interface WhatIfResult {
  /** Every wanted name has a value. */
  readonly ok: boolean;
  /** The wanted names' SI values in the order asked; NaN where there is none. */
  readonly values: Float64Array;
  readonly answers: readonly WhatIfAnswer[];
  /** Nodes run by this call. */
  readonly ran: number;
}

/** A prepared evaluator. */
export interface WhatIf {
  readonly wanted: readonly string[];
  /** The replaced names, in the order their values are given. */
  readonly replaced: readonly string[];
  /** Keys of the nodes a call runs, in order (`cellId/part`). */
  readonly plan: readonly string[];
  /**
   * The relative accuracy of the wanted names as the planned nodes declare it
   * (`GraphNode.accuracy`): the loosest of them, a run's relative tolerance; 0 when every
   * planned node is exact to round-off; NaN when one of them has no bound (a fixed step).
   */
  readonly accuracy: number;
  /** The wanted names with `values` (SI, one per replaced name) in place. Never throws. Cost: the planned nodes' numeric work. */
  evaluate(values: ArrayLike<number>): WhatIfResult;
}

export type WhatIfPrepared =
  | ({ readonly ok: true } & WhatIf)
  | { readonly ok: false; readonly error: { readonly message: string; readonly name?: string } };

type Slot = Binding | Unavailable;

/** What the session lends a what-if: its graph and bindings, and its own rules for failures. */
export interface SessionView {
  readonly graph: Graph;
  /** The units the study's inputs are written in: a what-if binding is shown as a real run's is. */
  readonly studyUnits?: RunContext['studyUnits'];
  slot(name: string): Slot | undefined;
  cellKind(id: string): string | undefined;
  /** The error of a node whose input is unavailable; undefined when all are bound. */
  waitingOn(node: GraphNode, slotOf: (name: string) => Slot | undefined): CellError | undefined;
  /** Why a name the node defines has no binding after it ran. */
  unavailable(node: GraphNode, name: string, outcome: Outcome): Unavailable;
  internalError(node: GraphNode, err: unknown): Outcome;
}

interface Step {
  readonly node: GraphNode;
  readonly problem?: CellError;
  readonly ctx: RunContext;
  /** Its inputs' slots, as they stand in this call. */
  readonly read: (name: string) => Slot | undefined;
  /** Slots of the names it defines (where it is their definer). */
  readonly out: ReadonlyArray<readonly [string, number]>;
}

const refuse = (message: string, name?: string): WhatIfPrepared => ({ ok: false, error: { message, ...(name !== undefined ? { name } : {}) } });

/** Plans a what-if over the session's current state. Refuses unknown names, names that cannot be replaced, and a wrong dimension. Cost: O(nodes + uses). */
export function prepareWhatIf(view: SessionView, wanted: readonly string[], replaced: readonly Replacement[]): WhatIfPrepared {
  const { graph } = view;
  const study = [...graph.definers.keys()].filter((n) => !n.startsWith('#'));
  const unknown = (name: string) => {
    const hint = nearest(name, study);
    return `no cell defines "${name}"${hint ? ` (did you mean "${hint}"?)` : ''}`;
  };

  // the replaced names: parameters and states that have a value now
  const names: string[] = [];
  const templates: Array<Extract<Binding, { kind: 'value' | 'state' }>> = [];
  for (const r of replaced) {
    const name = typeof r === 'string' ? r : r?.name;
    if (typeof name !== 'string' || name.startsWith('#')) return refuse(`a replaced name must be the name of a parameter or a state`, name);
    if (names.includes(name)) return refuse(`"${name}" is replaced twice`, name);
    const key = graph.definers.get(name);
    if (key === undefined) return refuse(unknown(name), name);
    const node = graph.nodes.get(key)!;
    const kind = view.cellKind(node.cell);
    // a fit's estimate, drawn from its joint normal by an uncertainty cell, may be replaced too
    const estimate = view.slot(name);
    const drawn = estimate?.kind === 'value' && estimate.spread?.kind === 'joint';
    if (kind !== 'parameters' && node.role !== 'state' && !drawn) {
      return refuse(`"${name}" is computed by ${kind ?? 'a'} cell "${node.cell}"; only parameters and the initial values of states can be replaced`, name);
    }
    const slot = view.slot(name);
    if (!slot || slot.kind === 'unavailable') return refuse(`"${name}" has no value now${slot ? `: ${slot.reason}` : ''}; it can be replaced once it has one`, name);
    if (slot.kind !== 'value' && slot.kind !== 'state') return refuse(`"${name}" is not a value`, name);
    if (slot.kind === 'value' && slot.truth !== undefined) return refuse(`"${name}" is true/false; only quantities can be replaced`, name);
    const dimension = typeof r === 'string' ? undefined : r.dimension;
    if (dimension !== undefined) {
      const unit = unitFromText(dimension);
      if (!unit) return refuse(`"${dimension}" (the dimension given for "${name}") is not a unit: write one such as 1 / h or mg / L, or 1 for a plain number`, name);
      if (!sameDim(unitDim(unit), slot.q.dim)) {
        return refuse(`"${name}" is ${describeDim(slot.q.dim)}, but its values were declared as ${describeDim(unitDim(unit))} ("${dimension}")`, name);
      }
    }
    names.push(name);
    templates.push(slot);
  }

  // the wanted names: values and states (a state answers with its initial value)
  for (const name of wanted) {
    if (typeof name !== 'string' || name.startsWith('#')) return refuse('a wanted name must be the name of a value: a parameter, a state or an answer', name);
    if (!graph.definers.has(name)) return refuse(unknown(name), name);
    const slot = view.slot(name);
    if (slot && slot.kind !== 'value' && slot.kind !== 'state' && slot.kind !== 'unavailable') return refuse(`"${name}" is not a value`, name);
  }

  // downstream of the replaced names (one pass in run order), upstream of the wanted ones
  const changed = new Set(names);
  const downstream = new Set<string>();
  const replacedKeys = new Set(names.map((n) => graph.definers.get(n)!));
  for (const key of graph.order) {
    if (replacedKeys.has(key)) continue;
    const reads = [...graph.sources.get(key)!].some(([n, s]) => 'node' in s && changed.has(n));
    if (!reads) continue;
    downstream.add(key);
    for (const d of graph.nodes.get(key)!.defines) if (graph.definers.get(d.name) === key) changed.add(d.name);
  }
  const upstream = new Set<string>();
  for (const name of wanted) {
    upstream.add(graph.definers.get(name)!);
    // measurements a run only draws on its plot are read as they are: a what-if skips reports
    for (const n of upstreamOf(graph, name, true)) upstream.add(graph.definers.get(n)!);
  }
  const plan = graph.order.filter((k) => downstream.has(k) && upstream.has(k));

  // one slot per name involved: the replaced ones, those the plan defines, and the rest as they are now
  const index = new Map<string, number>();
  const slots: Array<Slot | undefined> = [];
  const slotOf = (name: string): number => {
    let i = index.get(name);
    if (i === undefined) {
      i = slots.length;
      index.set(name, i);
      slots.push(view.slot(name));
    }
    return i;
  };
  const replacedAt = names.map(slotOf);
  // a name's slot as it stands in this call
  const nowOf = (name: string): Slot | undefined => { const i = index.get(name); return i === undefined ? view.slot(name) : slots[i]; };
  const steps: Step[] = plan.map((key) => {
    const node = graph.nodes.get(key)!;
    const sources = graph.sources.get(key)!;
    const local = new Map<string, number>();
    for (const [n, s] of sources) if ('node' in s) local.set(n, slotOf(n));
    const read = (name: string) => {
      const i = local.get(name);
      return i === undefined ? undefined : slots[i];
    };
    const ctx: RunContext = {
      mode: 'what-if',
      binding: (name) => {
        const s = read(name);
        return s && s.kind !== 'unavailable' ? s : undefined;
      },
      bindingsOf: (kind) => [...local.keys()].flatMap((name) => {
        const s = read(name);
        return s && s.kind === kind ? [s as Extract<Binding, { kind: typeof kind }>] : [];
      }),
      upstream: (name) => upstreamOf(graph, name),
      ...(view.studyUnits ? { studyUnits: view.studyUnits } : {}),
      // nested: a node that runs what-ifs of its own (a solve cell) plans over this call's values
      whatIf: (w, r) => prepareWhatIf({ ...view, slot: nowOf }, w, r),
      ...(node.readsUpstream ? { peek: (name: string) => { const s = nowOf(name); return s && s.kind !== 'unavailable' ? s : undefined; } } : {}),
    };
    const out = node.defines.filter((d) => graph.definers.get(d.name) === key).map((d) => [d.name, slotOf(d.name)] as const);
    return { node, problem: graph.problems.get(key), ctx, out, read };
  });
  const wantedAt = wanted.map(slotOf);
  // the slots a call writes start from their values as prepared, on every call
  const fixed = slots.slice();

  const evaluate = (values: ArrayLike<number>): WhatIfResult => {
    const bad = badValues(values, names);
    if (bad) return failed(wanted, bad);
    for (let i = 0; i < slots.length; i++) slots[i] = fixed[i];
    for (let j = 0; j < names.length; j++) slots[replacedAt[j]] = withValue(names[j], templates[j], values[j]);
    for (const step of steps) {
      const { node } = step;
      let outcome: Outcome;
      if (step.problem) outcome = { ok: false, error: step.problem };
      else {
        const waiting = view.waitingOn(node, step.read);
        if (waiting) outcome = { ok: false, error: waiting };
        else {
          try {
            outcome = node.run(step.ctx);
          } catch (err) {
            // a cell running what-ifs stops when its own budget is spent (numerics/work-meter.ts)
            rethrowWork(err);
            outcome = view.internalError(node, err);
          }
        }
      }
      for (const [name, i] of step.out) slots[i] = outcome.bindings?.get(name) ?? view.unavailable(node, name, outcome);
    }
    const out = new Float64Array(wanted.length);
    const answers: WhatIfAnswer[] = wanted.map((name, i) => {
      const s = slots[wantedAt[i]];
      if (s && (s.kind === 'value' || s.kind === 'state')) {
        out[i] = s.q.si;
        return { name, ok: true, si: s.q.si, q: s.q, binding: s };
      }
      out[i] = NaN;
      return { name, ok: false, reason: s?.kind === 'unavailable' ? s.reason : `"${name}" was not computed` };
    });
    return { ok: answers.every((a) => a.ok), values: out, answers, ran: steps.length };
  };
  const accuracy = steps.reduce((a, { node }) => (node.accuracy === undefined ? a : Number.isNaN(node.accuracy) || Number.isNaN(a) ? NaN : Math.max(a, node.accuracy)), 0);
  return { ok: true, wanted: [...wanted], replaced: names, plan, accuracy, evaluate };
}

/** The binding of a replaced name with a new SI value. */
function withValue(name: string, b: Extract<Binding, { kind: 'value' | 'state' }>, si: number): Binding {
  const q: Quantity = { ...b.q, si };
  // signatures as the parameters and rate cells write them
  return b.kind === 'value' ? { kind: 'value', q, sig: quantitySig(q) } : { ...b, q, sig: `${quantitySig(q)}|${name}` };
}

function badValues(values: ArrayLike<number>, names: readonly string[]): string | undefined {
  if (!values || values.length !== names.length) {
    return `expected ${names.length} value${names.length === 1 ? '' : 's'} (for ${names.map((n) => `"${n}"`).join(', ') || 'nothing'}), got ${values?.length ?? 0}`;
  }
  for (let j = 0; j < names.length; j++) {
    if (typeof values[j] !== 'number' || !Number.isFinite(values[j])) return `the value given for "${names[j]}" is not a finite number (${String(values[j])})`;
  }
  return undefined;
}

function failed(wanted: readonly string[], reason: string): WhatIfResult {
  return { ok: false, values: new Float64Array(wanted.length).fill(NaN), answers: wanted.map((name) => ({ name, ok: false, reason })), ran: 0 };
}
