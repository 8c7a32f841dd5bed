/**
 * A phase cell: where an autonomous one-state law y' = f(y) settles. Every equilibrium in
 * [from, to] with its stability, the sign of f between them, poles and gaps; with `sweep`,
 * the equilibrium branches as a parameter runs over a range, and the folds where two meet
 * and vanish. The numerics are in numerics/phase/equilibria.ts and numerics/phase/sweep.ts.
 */
import type { PhaseCell } from '../study/types.ts';
import type { Binding, CellError, GraphNode, Law, Outcome, RunContext, Use } from '../engine/node.ts';
import { cellRef } from '../engine/node.ts';
import type { NodeOutput, PhaseFields } from '../engine/report.ts';
import { type Field, field, usesOf, lookupFrom, finiteQuantityOf, FieldError, fail, guarded } from './fields.ts';
import { type Quantity, report, describe, valueIn, deltaUnit } from '../units/quantity.ts';
import { phasePortrait } from '../numerics/phase/portrait.ts';
import { phaseSummary, sweepSummary } from '../output/summaries.ts';
import { sameDim, describeDim, TIME, DIMENSIONLESS, divDim } from '../units/dimension.ts';
import { lookupUnit, formatUnit, mulUnits } from '../units/units.ts';
import { compileLaw } from '../simulate/compile-law.ts';
import { derivative } from '../expression/derivative.ts';
import { findEquilibria, type PhaseAnalysis } from '../numerics/phase/equilibria.ts';
import { sweepEquilibria } from '../numerics/phase/sweep.ts';
import { attractsFrom } from '../numerics/phase/approach.ts';

export function phaseNodes(cell: PhaseCell, at: string): Array<GraphNode<NodeOutput<'phase'>>> {
  const problems: CellError[] = [];
  const from = field(cell.from, `${at}.from`, problems);
  const to = field(cell.to, `${at}.to`, problems);
  const sweep = cell.sweep && typeof cell.sweep === 'object' ? cell.sweep : undefined;
  const sFrom = sweep ? field(sweep.from, `${at}.sweep.from`, problems) : undefined;
  const sTo = sweep ? field(sweep.to, `${at}.sweep.to`, problems) : undefined;
  const refs: Use[] = [];
  if (typeof cell.rate === 'string') refs.push({ name: cellRef(cell.rate), path: `${at}.rate` });
  if (sweep && typeof sweep.name === 'string') refs.push({ name: sweep.name, path: `${at}.sweep.name`, readsStates: true });
  return [{
    key: `${cell.id}/phase`,
    cell: cell.id,
    defines: [],
    uses: [...usesOf([from, to, sFrom, sTo]), ...refs],
    allowsTime: false,
    signature: JSON.stringify(cell),
    problems,
    run: (ctx) => guarded(() => runPhase(cell, at, { from: from!, to: to!, sFrom, sTo }, ctx)),
  }];
}

function runPhase(cell: PhaseCell, at: string, f: { from: Field; to: Field; sFrom?: Field; sTo?: Field }, ctx: RunContext): Outcome<NodeOutput<'phase'>> {
  const b = ctx.binding(cellRef(cell.rate));
  if (b?.kind !== 'law') fail(`${at}.rate`, `cell "${cell.rate}" is not a rate cell`);
  const law = (b as Extract<Binding, { kind: 'law' }>).law;
  if (law.reads.includes('t')) fail(`${at}.rate`, `the phase line needs a law that does not change with time; the law of ${law.state} reads t`);
  const other = [...law.states.keys()].find((s) => s !== law.state);
  if (other) fail(`${at}.rate`, `the phase line needs a law of one state; the law of ${law.state} also reads the state ${other} (cell "${law.states.get(other)}")`);

  const lookup = lookupFrom(ctx);
  const stateQ = (si: number): Quantity => ({ ...law.initial, si });
  const bound = (fd: Field, what: string) => {
    const q = finiteQuantityOf(fd, lookup);
    if (!sameDim(q.dim, law.initial.dim)) fail(fd.path, `${what} must be ${describeDim(law.initial.dim)} like ${law.state}; it is ${describe(q)}`, 'unit');
    return q;
  };
  const from = bound(f.from, 'the lower end');
  const to = bound(f.to, 'the upper end');
  if (!(to.si > from.si)) fail(f.to.path, `the upper end (${describe(to)}) must be above the lower end (${describe(from)})`);
  const timeUnit = timeUnitOf(law);
  const slopeQ = (si: number): Quantity => ({ si, dim: divDim(DIMENSIONLESS, TIME), unit: [[timeUnit, -1]] });

  if (ctx.mode === 'check') return { ok: true, bindings: new Map(), output: { computed: false, message: 'checked; run the study to find the equilibria' } };

  const fy = compileLaw(law, [law.state]);
  const d = derivative(law.expr, law.state);
  const dfy = d ? compileLaw(law, [law.state], d) : undefined;
  const y = new Float64Array(1);
  const analysis = findEquilibria((v) => { y[0] = v; return fy(y); }, from.si, to.si,
    dfy ? { derivative: (v) => { y[0] = v; return dfy(y); } } : {});
  const output: NodeOutput<'phase'> = { ...describeAnalysis(analysis, stateQ, slopeQ, law) };
  const portrait = phasePortrait((v) => { y[0] = v; return fy(y); }, from.si, to.si, analysis.equilibria.map((e) => e.slope));
  const rateQ = (si: number): Quantity => ({ si, dim: divDim(law.initial.dim, TIME), unit: mulUnits(deltaUnit(law.stateUnit), [[timeUnit, 1]], -1) });
  const timeQ = (si: number): Quantity => ({ si, dim: TIME, unit: [[timeUnit, 1]] });
  const inState = (v: number | null) => (v === null ? null : valueIn(stateQ(v), law.initial.unit));
  output.plot = {
    stateUnit: formatUnit(law.initial.unit),
    rateUnit: formatUnit(rateQ(0).unit),
    timeUnit,
    y: portrait.y.map(inState),
    f: portrait.f.map((v) => (v === null ? null : valueIn(rateQ(v), rateQ(0).unit))),
    solutions: portrait.solutions.map((sol) => ({ start: inState(sol.start), t: sol.t.map((t) => valueIn(timeQ(t), timeQ(0).unit)), y: sol.y.map(inState) })),
  };
  output.summary = phaseSummary(law.state,
    analysis.equilibria.map((e) => ({ value: stateQ(e.value), stability: e.stability })),
    analysis.intervals.map((iv) => ({ ...(iv.from !== null ? { from: stateQ(iv.from) } : {}), ...(iv.to !== null ? { to: stateQ(iv.to) } : {}), sign: iv.sign })),
    analysis.poles.map((p) => stateQ(p.at)));

  if (cell.sweep) {
    const name = cell.sweep.name;
    const pb = ctx.binding(name);
    if (pb?.kind !== 'value') fail(`${at}.sweep.name`, `"${name}" is not a parameter`);
    const p0 = (pb as Extract<Binding, { kind: 'value' }>).q;
    if (!law.reads.includes(name)) {
      const via = law.reads.find((r) => ctx.upstream(r).has(name));
      fail(`${at}.sweep.name`, via
        ? `the law of ${law.state} reads "${via}", which is computed from "${name}": sweep a name the law reads directly`
        : `the law of ${law.state} does not read "${name}"`);
    }
    const pq = (fd: Field | undefined, what: string) => {
      const q = finiteQuantityOf(fd!, lookup);
      if (!sameDim(q.dim, p0.dim)) fail(fd!.path, `${what} must be ${describeDim(p0.dim)} like ${name}; it is ${describe(q)}`, 'unit');
      return q;
    };
    const pFrom = pq(f.sFrom, 'the sweep start');
    const pTo = pq(f.sTo, 'the sweep end');
    if (pFrom.si === pTo.si) fail(f.sTo!.path, 'the sweep must run over a range: its start and end are equal');
    const fyp = compileLaw(law, [law.state, name]);
    const dfyp = d ? compileLaw(law, [law.state, name], d) : undefined;
    const x = new Float64Array(2);
    const result = sweepEquilibria((v, p) => { x[0] = v; x[1] = p; return fyp(x); }, from.si, to.si, pFrom.si, pTo.si, cell.sweep.steps,
      dfyp ? { derivative: (v, p) => { x[0] = v; x[1] = p; return dfyp(x); } } : {});
    const paramQ = (si: number): Quantity => ({ ...p0, si });
    const sweepText = sweepSummary(name, law.state, result.branches.length,
      result.folds.map((fo) => ({ parameter: paramQ(fo.parameter), value: stateQ(fo.value), pair: fo.pair })));
    output.sweep = {
      parameter: name,
      range: [report(pFrom), report(pTo)],
      branches: result.branches.map((br) => br.points.map((pt) => ({ parameter: report(paramQ(pt.parameter)), value: report(stateQ(pt.value)), stability: pt.stability }))),
      folds: result.folds.map((fo) => ({ parameter: report(paramQ(fo.parameter)), value: report(stateQ(fo.value)), pair: fo.pair, located: fo.method, converged: fo.converged })),
      evaluations: result.evaluations,
      summary: sweepText,
      ...(result.warnings.length ? { warnings: [...result.warnings] } : {}),
      ...(result.budgetExhausted ? { incomplete: 'the evaluation budget ran out; the sweep may be incomplete' } : {}),
    };
  }
  return { ok: true, bindings: new Map(), output };
}

function describeAnalysis(a: PhaseAnalysis, stateQ: (si: number) => Quantity, slopeQ: (si: number) => Quantity, law: Law): Omit<PhaseFields, 'plot' | 'summary' | 'sweep'> {
  const end = (v: number | null) => (v === null ? null : report(stateQ(v)));
  const notes = [...a.warnings];
  for (const p of a.poles) notes.push(`the rate has a pole at ${law.state} = ${describe(stateQ(p.at))}: it changes sign there without passing through zero, so that point is not an equilibrium`);
  for (const g of a.gaps) notes.push(`the rate is not defined for ${law.state} from ${describe(stateQ(g.from))} to ${describe(stateQ(g.to))}`);
  for (const z of a.zeroIntervals) notes.push(`the rate is zero for every ${law.state} from ${describe(stateQ(z.from))} to ${describe(stateQ(z.to))}: each of those values is an equilibrium`);
  if (a.budgetExhausted) notes.push('the evaluation budget ran out; the analysis may be incomplete');
  return {
    equilibria: a.equilibria.map((e) => {
      const side = attractsFrom(e);
      return { ...report(stateQ(e.value)), stability: e.stability, slope: report(slopeQ(e.slope)), ...(side ? { attractsFrom: side } : {}) };
    }),
    intervals: a.intervals.map((iv) => ({ from: end(iv.from), to: end(iv.to), sign: iv.sign })),
    ...(a.poles.length ? { poles: a.poles.map((p) => report(stateQ(p.at))) } : {}),
    ...(a.jumps.length ? { jumps: a.jumps.map((p) => report(stateQ(p.at))) } : {}),
    ...(a.gaps.length ? { gaps: a.gaps.map((g) => ({ from: report(stateQ(g.from)), to: report(stateQ(g.to)) })) } : {}),
    ...(a.zeroIntervals.length ? { zeroIntervals: a.zeroIntervals.map((g) => ({ from: report(stateQ(g.from)), to: report(stateQ(g.to)) })) } : {}),
    evaluations: a.evaluations,
    ...(notes.length ? { notes } : {}),
  };
}

/** The time unit a law is written in: the first time unit among the values it reads; hours otherwise. */
function timeUnitOf(law: Law): string {
  for (const q of law.scope.values()) {
    const hit = q.unit.find(([n, p]) => p < 0 && sameDim(lookupUnit(n)!.dim, TIME));
    if (hit) return hit[0];
  }
  return 'h';
}


