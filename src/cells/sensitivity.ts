/**
 * A sensitivity cell: for each name in `of` and each parameter (or state: its initial value),
 * the coefficient d of / d parameter and the normalized coefficient d ln of / d ln parameter.
 * The slopes come from the what-if evaluator (engine/what-if.ts, `RunContext.whatIf`) and
 * central differences (numerics/slopes.ts), so the study's own values are never touched.
 *
 * Steps: a run's answers carry the run's error, of relative size about its tolerance, so the
 * slopes assume a relative accuracy of `RUN_ACCURACY` (the default run tolerance): the step is
 * cbrt(1e-6) = 1% of the parameter's value (of its distance from 0 °C for a temperature, at
 * least 1 K), and a slope is good to about 1e-4 relative. The entries, ranking and words are
 * made in sensitivity-report.ts.
 */
import type { SensitivityCell } from '../study/types.ts';
import type { Binding, CellError, GraphNode, Outcome, RunContext, Use } from '../engine/node.ts';
import type { NodeOutput } from '../engine/report.ts';
import { fail, guarded } from './fields.ts';
import { slopes } from '../numerics/slopes.ts';
import { sensitivityOutput, type Followed, type Varied } from './sensitivity-report.ts';
import { unitFactor } from '../units/units.ts';

/** The relative accuracy of a run's answers assumed for the steps: the default run tolerance. */
export const RUN_ACCURACY = 1e-6;

/** Kelvin at 0 °C: a temperature is stepped by its distance from it. */
const ZERO_CELSIUS = 273.15;

export function sensitivityNodes(cell: SensitivityCell, at: string): Array<GraphNode<NodeOutput<'sensitivity'>>> {
  const of = Array.isArray(cell.of) ? cell.of.filter((x): x is string => typeof x === 'string') : [];
  const parameters = Array.isArray(cell.parameters) ? cell.parameters.filter((x): x is string => typeof x === 'string') : [];
  const uses: Use[] = [
    ...of.map((name, i) => ({ name, path: `${at}.of[${i}]` })),
    // a state's name is its initial value here
    ...parameters.map((name, j) => ({ name, path: `${at}.parameters[${j}]`, readsStates: true })),
  ];
  const problems: CellError[] = [];
  return [{
    key: `${cell.id}/sensitivity`,
    cell: cell.id,
    defines: [],
    uses,
    allowsTime: false,
    // the slopes depend on how `of` is computed from the parameters, not only on their values
    readsUpstream: true,
    signature: JSON.stringify(cell),
    problems,
    run: (ctx) => guarded(() => runSensitivity(at, cell.of, cell.parameters, ctx)),
  }];
}

type Valued = Extract<Binding, { kind: 'value' | 'state' }>;

/** The binding of a name that must be a quantity, or a problem on its path. */
function quantityBinding(ctx: RunContext, name: string, path: string, role: string): Valued {
  const b = ctx.binding(name);
  if (b?.kind !== 'value' && b?.kind !== 'state') fail(path, `"${name}" is not a value: ${role}`);
  if (b.kind === 'value' && b.truth !== undefined) fail(path, `"${name}" is true/false; a slope needs a quantity`);
  return b;
}

function runSensitivity(at: string, ofList: string[], parameterList: string[], ctx: RunContext): Outcome<NodeOutput<'sensitivity'>> {
  if (ctx.mode === 'check') return { ok: true, bindings: new Map(), output: { computed: false, message: 'checked; run the study to find the slopes' } };
  const followed: Followed[] = ofList.map((name, i) => ({ name, q: quantityBinding(ctx, name, `${at}.of[${i}]`, 'name an answer or a value to follow').q }));
  const varied: Varied[] = parameterList.map((name, j) => ({
    name,
    q: quantityBinding(ctx, name, `${at}.parameters[${j}]`, 'name a parameter, or a state (its initial value)').q,
  }));
  // which of the pairs can move at all: of computed from the parameter (or the parameter itself)
  const depends = followed.map((o) => {
    const up = ctx.upstream(o.name); // a walk of the graph: once per name followed
    return varied.map((p) => o.name === p.name || up.has(p.name));
  });
  const moving = varied.map((_, j) => depends.some((row) => row[j]));
  const inputs = varied.flatMap((p, j) => (moving[j] ? [{ ...p, j }] : []));

  const d = new Float64Array(followed.length * varied.length);
  const how: Array<'central' | 'forward' | 'backward' | 'failed'> = new Array(d.length).fill('central');
  const reasons = new Map<number, string>();
  let evaluations = 0;
  if (!ctx.whatIf) fail(at, 'this cell cannot vary values here (no what-if evaluation is available)', 'internal');
  // every parameter is prepared, so that one that cannot be replaced is refused on its path
  const prepared = ctx.whatIf(followed.map((o) => o.name), varied.map((p) => p.name));
  if (!prepared.ok) {
    const j = parameterList.indexOf(prepared.error.name ?? '');
    const i = ofList.indexOf(prepared.error.name ?? '');
    fail(j >= 0 ? `${at}.parameters[${j}]` : i >= 0 ? `${at}.of[${i}]` : at, prepared.error.message);
  }
  if (inputs.length) {
    // a temperature is stepped in its distance from 0 °C, every other value in its own
    const offset = inputs.map((p) => (p.q.temp === 'point' || p.q.temp === 'absolute' ? ZERO_CELSIUS : 0));
    const x0 = Float64Array.from(inputs, (p, k) => p.q.si - offset[k]);
    const scale = Float64Array.from(inputs, (p, k) => (offset[k] ? 1 : Math.abs(p.q.si) || unitFactor(p.q.unit) || 1));
    let firstReason: string | undefined;
    const all = Float64Array.from(varied, (p) => p.q.si);
    const f = (x: Float64Array) => {
      inputs.forEach((p, k) => { all[p.j] = x[k] + offset[k]; });
      const r = prepared.evaluate(all);
      if (!r.ok) for (const a of r.answers) if (!a.ok) firstReason ??= a.reason;
      return r.values;
    };
    const s = slopes(f, x0, scale, { accuracy: RUN_ACCURACY, f0: Float64Array.from(followed, (o) => o.q.si) });
    evaluations = s.evaluations;
    inputs.forEach((p, k) => {
      for (let i = 0; i < followed.length; i++) {
        const at = i * varied.length + p.j;
        d[at] = s.d[i * inputs.length + k];
        how[at] = s.how[i * inputs.length + k];
      }
    });
    for (const fl of s.failed) {
      const rows = fl.output < 0 ? followed.map((_, i) => i) : [fl.output];
      for (const i of rows) reasons.set(i * varied.length + inputs[fl.input].j, firstReason ? `${fl.reason} (${firstReason})` : fl.reason);
    }
  }
  return {
    ok: true,
    bindings: new Map(),
    output: sensitivityOutput({ followed, varied, depends, d, how, reasons, evaluations, accuracy: RUN_ACCURACY, studyUnits: ctx.studyUnits }),
  };
}
