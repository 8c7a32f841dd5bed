/**
 * A simulate cell: integrates the named rate laws (and the laws coupled to them) from `from`
 * to `to` through the schedule of events, then answers the `find` queries on the dense
 * output. One graph node; it defines the names of its `find` entries. The numbers come from
 * `simulate-core.ts`, the report from `simulate-report.ts`; a what-if run skips the report.
 */
import type { SimulateCell } from '../study/types.ts';
import { FIND_KINDS } from '../study/types.ts';
import type { CellError, GraphNode, Outcome, RunContext, Use } from '../engine/node.ts';
import type { NodeOutput } from '../engine/report.ts';
import { cellRef } from '../engine/node.ts';
import { field, usesOf, guarded } from './fields.ts';
import { type CoreMemo, type Fields, DEFAULT_RTOL, simulateCore } from './simulate-core.ts';
import { simulationOutput } from './simulate-report.ts';
import { runModelNode } from './run-model.ts';

/**
 * Two nodes: the run, and its model for fits through it (`run-model.ts`, the cell's reference
 * `#id`, made from the run's inputs alone). The graph adds the measurements of its states (`pullsMeasurements`), which its plot shows. */
export function simulateNodes(cell: SimulateCell, at: string): Array<GraphNode<NodeOutput<'simulate'>>> {
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
    // a count written as text is an expression (a number stays a number)
    const count = typeof e?.count === 'string' ? field(e.count, `${p}.count`, problems) : undefined;
    f.events.push({ at: opt(e?.at, `${p}.at`), every: opt(e?.every, `${p}.every`), count, for: opt(e?.for, `${p}.for`), targets, kind, raw: e });
  });
  const defines = (Array.isArray(cell.find) ? cell.find : []).flatMap((q, i) => {
    const p = `${at}.find[${i}]`;
    const kind = FIND_KINDS.find((k) => q && Object.prototype.hasOwnProperty.call(q, k));
    if (kind && typeof q[kind] === 'string') refs.push({ name: q[kind] as string, path: `${p}.${kind}`, readsStates: true });
    f.finds.push({ q, kind, level: opt(q?.level, `${p}.level`), at: opt(q?.at, `${p}.at`), from: opt(q?.from, `${p}.from`), to: opt(q?.to, `${p}.to`) });
    return typeof q?.name === 'string' ? [{ name: q.name, path: `${p}.name` }] : [];
  });
  const memo: CoreMemo = {};
  // an event's amounts under add and infuse can read states (and are refused when they do);
  // every other field is a time, a level or a tolerance, where a state's name is a unit's
  const amounts = f.events.flatMap((e) => e.targets.map((t) => ({ value: t.value, states: e.kind !== 'set' })));
  const all = [f.from, f.to, f.step, f.atol, ...f.events.flatMap((e) => [e.at, e.every, e.count, e.for]), ...amounts.filter((a) => !a.states).map((a) => a.value),
    ...f.finds.flatMap((q) => [q.level, q.at, q.from, q.to])];
  const uses = [...usesOf(all), ...usesOf(amounts.filter((a) => a.states).map((a) => a.value), { states: true }), ...refs];
  return [{
    key: `${cell.id}/simulate`,
    cell: cell.id,
    defines,
    uses,
    allowsTime: true,
    pullsCoupledLaws: true,
    pullsMeasurements: true,
    accuracy: runAccuracy(cell),
    // the band is drawn from an uncertainty cell's samples: showing it runs nothing here
    signature: JSON.stringify({ ...cell, band: undefined }),
    problems,
    run: (ctx) => guarded(() => runSimulation(cell, at, f, ctx, memo)),
  }, runModelNode(cell, at, f, uses, problems)];
}

/** A run's answers are good to its relative tolerance (read as the core reads it); a fixed step bounds nothing. */
function runAccuracy(cell: SimulateCell): number {
  if (cell.method === 'euler' || cell.method === 'heun' || cell.method === 'rk4') return NaN;
  const rtol = cell.tolerance?.relative;
  return typeof rtol === 'number' && rtol > 0 ? rtol : DEFAULT_RTOL;
}

function runSimulation(cell: SimulateCell, at: string, f: Fields, ctx: RunContext, memo: CoreMemo): Outcome<NodeOutput<'simulate'>> {
  const core = simulateCore(cell, at, f, ctx, memo);
  if (!core) return { ok: true, bindings: new Map(), output: { computed: false, message: 'checked; run the study to simulate' } };
  // a what-if run wants the answers alone: no report, plot or text
  if (ctx.mode === 'what-if') return { ok: true, bindings: core.bindings, output: {}, reasons: core.reasons };
  return { ok: true, bindings: core.bindings, output: simulationOutput(core, ctx.bindingsOf('measured').flatMap((b) => b.series)), reasons: core.reasons };
}
