/**
 * A simulate cell's run as a model for fits: a second node of the cell, which defines the
 * cell's reference `#id` with a `model` binding (engine/node.ts `RunModel`). It reads only the
 * run's inputs (its laws, span, events, step and tolerances; never its questions or results),
 * so a fit through the run does not wait on the run, a second run may use the fit's
 * estimates, and a run that reads the estimates of a fit through itself closes a cycle that
 * the graph reports. Running the model again calls `simulateCore` with some names replaced.
 */
import type { SimulateCell } from '../study/types.ts';
import type { Binding, CellError, GraphNode, Law, RunContext, RunModel, Use } from '../engine/node.ts';
import { cellRef } from '../engine/node.ts';
import type { NodeOutput } from '../engine/report.ts';
import type { Quantity } from '../units/quantity.ts';
import { symbolsOf } from '../expression/ast.ts';
import { type CoreMemo, type Fields, simulateCore } from './simulate-core.ts';
import { FieldError, guarded, lookupFrom, finiteQuantityOf } from './fields.ts';
import { collectLaws } from './laws.ts';
import { evalPiece, valueAt, valueBefore, type Trajectory } from '../simulate/trajectory.ts';

/** Relative tolerance of a model run: tight enough that differences of runs are not spoiled by the run's own error. */
export const MODEL_RTOL = 1e-10;

/**
 * The model node of a simulate cell. `uses` and `problems` are the cell's; those of its
 * questions (`find`) are left out, as the model does not answer them.
 */
export function runModelNode(cell: SimulateCell, at: string, f: Fields, uses: readonly Use[], problems: readonly CellError[]): GraphNode<NodeOutput<'simulate'>> {
  const notFind = (path: string) => !path.startsWith(`${at}.find[`);
  const own = uses.filter((u) => notFind(u.path));
  const fields: Fields = { ...f, atol: undefined, finds: [] };
  // the inputs of the model only: a question edited does not make the fits through the run run again
  const { find: _find, title: _title, plotScale: _scale, band: _band, ...inputs } = cell as SimulateCell & { plotScale?: unknown };
  return {
    key: `${cell.id}/model`,
    cell: cell.id,
    defines: [{ name: cellRef(cell.id), path: `${at}.rates` }],
    uses: own,
    allowsTime: true,
    pullsCoupledLaws: true,
    sharesShapeProblems: true,
    cycleHint: `a fit through the run "${cell.id}" cannot feed that run's own laws or events: use the fit's estimates in another run`,
    signature: JSON.stringify(inputs),
    problems: problems.filter((p) => notFind(p.path)),
    run: (ctx) => guarded(() => {
      // every field the model reads is checked as the run checks it (no integration)
      simulateCore(cell, at, fields, { ...ctx, mode: 'check' }, {});
      const laws = collectLaws(cell.rates, `${at}.rates`, ctx);
      const lookup = lookupFrom(ctx);
      const from = finiteQuantityOf(f.from!, lookup);
      const to = finiteQuantityOf(f.to!, lookup);
      const snapshot = new Map<string, Binding | undefined>();
      for (const u of own) snapshot.set(u.name, ctx.binding(u.name));
      for (const b of ctx.bindingsOf('law')) snapshot.set(cellRef(b.law.cell), b);
      const states = new Set(laws.map((l) => l.state));
      const direct = new Set<string>();
      for (const l of laws) for (const n of l.reads) direct.add(n);
      for (const e of f.events) {
        for (const fd of [e.at, e.every, e.count, e.for, ...e.targets.map((t) => t.value)]) if (fd) for (const n of symbolsOf(fd.expr)) direct.add(n);
        if (e.kind === 'set') for (const t of e.targets) direct.add(t.name);
      }
      // a parameter's value: as the laws were checked with it, else as the events read it
      const values = new Map<string, Quantity>();
      for (const n of direct) {
        if (states.has(n)) continue;
        const b = snapshot.get(n);
        const q = laws.find((l) => l.scope.has(n))?.scope.get(n) ?? (b?.kind === 'value' && b.truth === undefined ? b.q : undefined);
        if (q) values.set(n, q);
      }
      const sig = `${JSON.stringify(inputs)}|${[...snapshot].map(([n, b]) => `${n}=${b?.sig ?? ''}`).join('|')}`;
      const model = makeModel(cell, at, fields, ctx, snapshot, laws, { from: from.si, to: to.si, timeUnit: to.unit.length ? to.unit : [['s', 1]], values });
      return { ok: true, bindings: new Map([[cellRef(cell.id), { kind: 'model', cell: cell.id, sig, model } as const]]), output: {} };
    }),
  };
}

function makeModel(cell: SimulateCell, at: string, fields: Fields, ctx: RunContext, snapshot: ReadonlyMap<string, Binding | undefined>, laws: readonly Law[],
  span: Pick<RunModel, 'from' | 'to' | 'timeUnit' | 'values'>): RunModel {
  const tight: SimulateCell = { ...cell, tolerance: { relative: Math.min(cell.tolerance?.relative ?? MODEL_RTOL, MODEL_RTOL) }, find: [] };
  const memo: CoreMemo = {};
  const upstream = ctx.upstream.bind(ctx);
  const studyUnits = ctx.studyUnits;
  let lastJumps: number[] = [];
  // the run's trajectory with the names replaced, or a message
  const ownMemo: CoreMemo = {};
  const trajectory = (replaced: ReadonlyMap<string, number>, own = false): Trajectory | string => {
    const lawsNow = new Map<string, Binding | undefined>();
    for (const [name, b] of snapshot) if (b?.kind === 'law') lawsNow.set(name, withReplaced(b, replaced));
    const binding = (name: string): Binding | undefined => {
      if (lawsNow.has(name)) return lawsNow.get(name);
      const b = snapshot.get(name);
      const v = replaced.get(name);
      if (v === undefined || !b) return b;
      if (b.kind === 'value') return { kind: 'value', q: { ...b.q, si: v }, sig: '' };
      if (b.kind === 'state') return { ...b, q: { ...b.q, si: v } };
      return b;
    };
    const proxy: RunContext = {
      mode: 'run',
      binding,
      bindingsOf: (kind) => [...snapshot.keys()].flatMap((n) => {
        const b = binding(n);
        return b?.kind === kind ? [b as Extract<Binding, { kind: typeof kind }>] : [];
      }),
      upstream,
      studyUnits,
    };
    try {
      const core = own ? simulateCore({ ...cell, find: [] }, at, fields, proxy, ownMemo)! : simulateCore(tight, at, fields, proxy, memo)!;
      lastJumps = core.timeline.filter((a) => a.kind === 'add').map((a) => a.time);
      return core.run.trajectory;
    } catch (err) {
      if (err instanceof FieldError) return err.error.message;
      throw err;
    }
  };
  const n = laws.length;
  return {
    laws, reads: [...span.values.keys()], ...span,
    jumps: () => lastJumps,
    run(replaced, times) {
      const tr = trajectory(replaced);
      if (typeof tr === 'string') return { message: tr };
      const out = new Float64Array(tr.width);
      const values: Float64Array[] = [];
      for (const t of times) {
        if (!valueAt(tr, t, out)) return { message: `no value at t = ${t} s, outside the run` };
        values.push(out.slice(0, n));
      }
      return { values };
    },
    sampleAt(replaced, times, before, out) {
      const tr = trajectory(replaced, true);
      if (typeof tr === 'string') return tr;
      const v = new Float64Array(tr.width);
      const m = times.length;
      for (let k = 0; k < m; k++) {
        if (!(before[k] ? valueBefore(tr, times[k], v) : valueAt(tr, times[k], v))) return `no value at t = ${times[k]} s, outside the run`;
        for (let i = 0; i < n; i++) out[i * m + k] = v[i];
      }
      return undefined;
    },
    curve(replaced, points, own) {
      const tr = trajectory(replaced, own);
      if (typeof tr === 'string') return { message: tr };
      const t: number[] = [];
      const values: number[] = [];
      const out = new Float64Array(tr.width);
      const step = (tr.t1 - tr.t0) / Math.max(1, points - 1);
      // each piece drawn from its start to its end, so every jump shows as one
      for (const p of tr.pieces) {
        const push = (x: number) => { evalPiece(p, x, out); t.push(x); for (let i = 0; i < n; i++) values.push(out[i]); };
        push(p.t0);
        for (let x = Math.ceil((p.t0 - tr.t0) / step) * step + tr.t0; x < p.t1; x += step) if (x > p.t0) push(x);
        push(p.t1);
      }
      return { t, values };
    },
  };
}

/** A law binding with its parameters and its starting value replaced where `replaced` names them; the same binding when it names none. */
function withReplaced(b: Extract<Binding, { kind: 'law' }>, replaced: ReadonlyMap<string, number>): Binding {
  const law = b.law;
  let scope: Map<string, Quantity> | undefined;
  for (const [name, q] of law.scope) {
    const v = replaced.get(name);
    if (v !== undefined && name !== law.state) (scope ??= new Map(law.scope)).set(name, { ...q, si: v });
  }
  const start = replaced.get(law.state);
  if (!scope && start === undefined) return b;
  return { ...b, law: { ...law, scope: scope ?? law.scope, initial: start === undefined ? law.initial : { ...law.initial, si: start } } };
}
