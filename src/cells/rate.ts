/**
 * A rate cell: dState/dt = rate. Two graph nodes: the state (its unit and initial value),
 * which other laws may read, and the law itself, checked for dimensions at the start state.
 * Splitting them lets two laws read each other's states without a circular definition.
 */
import type { RateCell } from '../study/types.ts';
import type { Binding, CellError, GraphNode, Law, Outcome, RunContext } from '../engine/node.ts';
import { cellRef } from '../engine/node.ts';
import type { NodeOutput } from '../engine/report.ts';
import { type Field, field, usesOf, lookupFrom, stateLookupFrom, quantityOf, finiteQuantityOf, unitOf, FieldError, TIME_ZERO, label, guarded } from './fields.ts';
import { type Quantity, report, describe, shownUnit } from '../units/quantity.ts';
import { sameDim, describeDim, divDim, TIME, TEMPERATURE } from '../units/dimension.ts';
import { type DisplayUnit, formatUnit, lookupUnit, isOffsetTemperature, unitDim, mulUnits } from '../units/units.ts';
import { quantitySig } from './signatures.ts';

export function rateNodes(cell: RateCell, at: string): Array<GraphNode<NodeOutput<'rate'>>> {
  const problems: CellError[] = [];
  const state = typeof cell.state === 'string' ? cell.state : '';
  const unit = field(cell.unit, `${at}.unit`, problems);
  const initial = field(cell.initial, `${at}.initial`, problems);
  const lawProblems: CellError[] = [];
  const rate = field(cell.rate, `${at}.rate`, lawProblems);
  const stateNode: GraphNode<NodeOutput<'rate'>> = {
    key: `${cell.id}/state`,
    cell: cell.id,
    role: 'state',
    defines: state ? [{ name: state, path: `${at}.state` }] : [],
    uses: usesOf([initial]),
    allowsTime: false,
    signature: JSON.stringify([cell.state, cell.unit, cell.initial]),
    problems,
    run: (ctx) => guarded(() => runState(cell.id, state, unit!, initial!, ctx)),
  };
  const lawUses = usesOf([rate], { states: true });
  if (state && !lawUses.some((u) => u.name === state)) lawUses.push({ name: state, path: `${at}.state`, readsStates: true });
  const lawNode: GraphNode<NodeOutput<'rate'>> = {
    key: `${cell.id}/law`,
    cell: cell.id,
    role: 'law',
    defines: [{ name: cellRef(cell.id), path: `${at}.id` }],
    uses: lawUses,
    couples: lawUses.map((u) => u.name).filter((n) => n !== state),
    allowsTime: true,
    signature: JSON.stringify([cell.state, cell.rate]),
    problems: lawProblems,
    run: (ctx) => guarded(() => runLaw(cell.id, state, rate!, ctx)),
  };
  return [stateNode, lawNode];
}


function runState(cellId: string, state: string, unitField: Field, initialField: Field, ctx: RunContext): Outcome<NodeOutput<'rate'>> {
  const unit = unitOf(unitField);
  const dim = unitDim(unit);
  const q0 = finiteQuantityOf(initialField, lookupFrom(ctx));
  if (!sameDim(q0.dim, dim)) {
    throw new FieldError({ kind: 'unit', path: initialField.path, message: `initial value of ${state} must be ${describeDim(dim)} (such as ${example(unit)}); it is ${describeDim(q0.dim)} (${describe(q0)})` });
  }
  const point = unit.length === 1 && isOffsetTemperature(lookupUnit(unit[0][0])!);
  if (point && q0.temp === 'delta') {
    throw new FieldError({ kind: 'unit', path: initialField.path, message: `initial value of ${state} is a temperature difference (${describe(q0)}); it must be a temperature, such as 20 ${unit[0][0]}` });
  }
  const temp = sameDim(dim, TEMPERATURE) ? (point ? 'point' : q0.temp === 'delta' ? 'delta' : 'absolute') : undefined;
  const q: Quantity = temp ? { si: q0.si, dim, unit, temp } : { si: q0.si, dim, unit };
  const binding: Binding = { kind: 'state', q, unit, cell: cellId, sig: `${quantitySig(q)}|${state}` };
  if (ctx.mode === 'what-if') return { ok: true, bindings: new Map([[state, binding]]), output: {} };
  // the unit the initial value is written in, so that the state can be shown in it again
  const written = q0.temp === 'point' || !q0.temp ? formatUnit(shownUnit(q0)) : '';
  const original = written && written !== formatUnit(unit) ? { originalUnit: written } : {};
  return { ok: true, bindings: new Map([[state, binding]]), output: { state, unit: formatUnit(unit), ...original, initial: report(q) } };
}

function runLaw(cellId: string, state: string, rate: Field, ctx: RunContext): Outcome<NodeOutput<'rate'>> {
  const own = ctx.binding(state);
  if (own?.kind !== 'state') {
    throw new FieldError({ kind: 'invalid', path: rate.path, message: `the state of this cell is not available` });
  }
  const scope = new Map<string, Quantity>();
  const reads: string[] = [];
  const lookup = stateLookupFrom(ctx, new Map([['t', TIME_ZERO]]));
  const recording = (name: string) => {
    const q = lookup(name);
    if (typeof q === 'boolean') {
      throw new FieldError({ kind: 'invalid', path: rate.path, message: `"${name}" is true/false; a rate law reads quantities only (choose a quantity with "? :" in a parameter)` });
    }
    if (q && !scope.has(name)) {
      scope.set(name, q);
      reads.push(name);
    }
    return q;
  };
  const r = quantityOf(rate, recording);
  const want = divDim(own.q.dim, TIME);
  if (!sameDim(r.dim, want)) {
    throw new FieldError({
      kind: 'unit',
      path: rate.path,
      message: `rate of ${state} must be ${describeDim(want)} (such as ${formatUnit(rateUnit(own.unit, r))}); it is ${formatUnit(shownUnit(r)) || describeDim(r.dim)}`,
    });
  }
  const states = new Map<string, string>();
  for (const n of reads) {
    const b = ctx.binding(n);
    if (b?.kind === 'state') states.set(n, b.cell);
  }
  const law: Law = { cell: cellId, state, stateUnit: own.unit, initial: own.q, expr: rate.expr, text: rate.text, reads, states, scope };
  const sig = `${rate.text}|${own.sig}|${reads.map((n) => `${n}=${quantitySig(scope.get(n)!)}`).join(';')}`;
  const bindings = new Map([[cellRef(cellId), { kind: 'law', law, sig } as const]]);
  if (ctx.mode === 'what-if') return { ok: true, bindings, output: {} };
  const shown: Quantity = { si: r.si, dim: r.dim, unit: rateUnit(own.unit, r) };
  const output: NodeOutput<'rate'> = { rateAtStart: report(shown) };
  if (!Number.isFinite(r.si)) output.warning = `${label(rate.path)} is not finite at the initial state (${describe(r)})`;
  return { ok: true, bindings, output };
}

/** The unit a rate is shown in: the state's unit per the first time unit the law mentions. */
function rateUnit(stateUnit: DisplayUnit, r: Quantity): DisplayUnit {
  const time = r.unit.find(([n]) => sameDim(lookupUnit(n)!.dim, TIME))?.[0] ?? 'h';
  return mulUnits(stateUnit, [[time, 1]], -1);
}

function example(unit: DisplayUnit): string {
  return `1 ${formatUnit(unit)}`.replace('1 1 / ', '1 / ');
}
