/**
 * A solve cell: the value of a parameter (or of a state's initial value) at which a target
 * expression equals a wanted value. It varies the parameter with the what-if evaluator
 * (engine/what-if.ts, `RunContext.whatIf`), so only what lies between the two runs again and
 * the study's own values are never touched; over [min, max] it finds every solution
 * (numerics/roots-in-range.ts: a grid, then Brent's method), and over `choices` it tries each.
 * The searches and the report are in solve-search.ts; this file holds the fields and the node.
 */
import type { SolveCell } from '../study/types.ts';
import type { CellError, GraphNode, Outcome, RunContext, Use } from '../engine/node.ts';
import type { NodeOutput } from '../engine/report.ts';
import { symbolsOf } from '../expression/ast.ts';
import { evaluateExpression } from '../expression/evaluate.ts';
import { isConstantName } from '../expression/constants.ts';
import { isUnitName } from '../engine/hidden-units.ts';
import { type Field, field, usesOf, lookupFrom, finiteQuantityOf, fail, guarded } from './fields.ts';
import { type Quantity, describe } from '../units/quantity.ts';
import { sameDim, describeDim } from '../units/dimension.ts';
import { lookupUnit } from '../units/units.ts';
import { searchChoices, searchRange, type SolveProblem, type TargetAt } from './solve-search.ts';

interface SolveFields {
  readonly min?: Field;
  readonly max?: Field;
  readonly roundTo?: Field;
  readonly guess?: Field;
  readonly choices?: ReadonlyArray<Field | undefined>;
  readonly value?: Field;
  readonly equals?: Field;
}

export function solveNodes(cell: SolveCell, at: string): Array<GraphNode<NodeOutput<'solve'>>> {
  const problems: CellError[] = [];
  const vary = (cell.vary && typeof cell.vary === 'object' ? cell.vary : {}) as Partial<SolveCell['vary']>;
  const target = (cell.target && typeof cell.target === 'object' ? cell.target : {}) as Partial<SolveCell['target']>;
  const emptyEquals = typeof target.equals === 'string' && target.equals.trim() === '';
  const opt = (v: unknown, path: string) => (v !== undefined ? field(v, path, problems) : undefined);
  const f: SolveFields = {
    min: opt(vary.min, `${at}.vary.min`),
    max: opt(vary.max, `${at}.vary.max`),
    roundTo: opt(vary.roundTo, `${at}.vary.roundTo`),
    guess: opt(vary.guess, `${at}.vary.guess`),
    choices: Array.isArray(vary.choices) ? vary.choices.map((c, i) => field(c, `${at}.vary.choices[${i}]`, problems)) : undefined,
    value: field(target.value, `${at}.target.value`, problems),
    equals: emptyEquals ? undefined : field(target.equals, `${at}.target.equals`, problems),
  };
  // an empty wanted value is said when the node runs, with an example in the target's own unit
  const parameter = typeof vary.parameter === 'string' ? vary.parameter : '';
  const as = typeof vary.as === 'string' ? vary.as : '';
  const uses: Use[] = [
    ...usesOf([f.min, f.max, f.roundTo, f.guess, ...(f.choices ?? []), f.equals]),
    // a state's name is its initial value here
    ...(parameter ? [{ name: parameter, path: `${at}.vary.parameter`, readsStates: true }] : []),
    // the target may have no value now (a level not reached at the present dose) and still
    // have one elsewhere in the range: the cell runs without it, and says where it has none
    ...usesOf([f.value]).map((u) => ({ ...u, optional: true })),
  ];
  return [{
    key: `${cell.id}/solve`,
    cell: cell.id,
    defines: as ? [{ name: as, path: `${at}.vary.as` }] : [],
    uses,
    allowsTime: false,
    readsUpstream: true,
    signature: JSON.stringify(cell),
    problems,
    run: (ctx) => {
      try {
        if (emptyEquals) return guarded(() => fail(`${at}.target.equals`, emptyEqualsWords(f.value, ctx), 'syntax'));
        return guarded(() => runSolve(at, parameter, as, f, ctx));
      } catch (err) {
        if (err instanceof Refused) return { ok: false, error: err.error, output: err.output };
        throw err;
      }
    },
  }];
}

const EMPTY_EQUALS = 'equals is empty: write the value the target must equal, in the target\'s unit';

/**
 * The words for an empty wanted value: an example in the target's own unit, its value now
 * (`such as "8.274 mg / L", the value of trough now`), else the plain words when the target has
 * no value now (a level not reached, a name waiting on another cell).
 */
export function emptyEqualsWords(value: Field | undefined, ctx: RunContext): string {
  if (!value || ctx.mode === 'check') return EMPTY_EQUALS;
  const e = evaluateExpression(value.expr, lookupFrom(ctx));
  if (!e.ok || typeof e.value === 'boolean' || !Number.isFinite(e.value.si)) return EMPTY_EQUALS;
  return `equals is empty: write the value ${value.text.trim()} must equal, in its unit, such as "${describe(e.value)}" (its value now)`;
}

/** A search that found no answer: its error, and what it found on the way (the target's range). */
class Refused extends Error {
  constructor(readonly error: CellError, readonly output: NodeOutput<'solve'>) {
    super(error.message);
  }
}

function runSolve(at: string, parameter: string, as: string, f: SolveFields, ctx: RunContext): Outcome<NodeOutput<'solve'>> {
  if (ctx.mode === 'check') return { ok: true, bindings: new Map(), output: { computed: false, message: 'checked; run the study to solve' } };
  const value = f.value!, equals = f.equals!;
  const lookup = lookupFrom(ctx);
  const varied = ctx.binding(parameter);
  if (varied?.kind !== 'value' && varied?.kind !== 'state') fail(`${at}.vary.parameter`, `"${parameter}" is not a value that can be varied: name a parameter, or a state (its initial value)`);
  if (varied.kind === 'value' && varied.truth !== undefined) fail(`${at}.vary.parameter`, `"${parameter}" is true/false; only a quantity can be varied`);
  const present = varied.q;
  const same = (q: Quantity, path: string, what: string): Quantity => {
    if (!sameDim(q.dim, present.dim)) fail(path, `${what} must be ${describeDim(present.dim)} like ${parameter} (${describe(present)}); it is ${describeDim(q.dim)} (${describe(q)})`, 'unit');
    return q;
  };
  const wantedValue = finiteQuantityOf(equals, lookup);
  // the wanted value is read once, at the present values: it must not move with the varied name
  const moving = [...new Set(symbolsOf(equals.expr))].find((n) => n === parameter || ctx.upstream(n).has(parameter));
  if (moving !== undefined) {
    fail(equals.path, `the wanted value reads "${moving}", which changes with ${parameter}: move it into the target (target ${value.text} - (${equals.text}), wanted value 0 in its unit)`);
  }

  // the study names the target reads; the what-if computes them again with the parameter replaced
  const names = [...new Set(symbolsOf(value.expr))].filter((n) => n !== 't'
    && (ctx.binding(n) !== undefined || ctx.upstream(n).size > 0 || !(isUnitName(n) || isConstantName(n))));
  if (!names.some((n) => n === parameter || ctx.upstream(n).has(parameter))) {
    fail(value.path, names.length
      ? `the target does not depend on ${parameter}: ${names.map((n) => `"${n}"`).join(', ')} ${names.length === 1 ? 'is' : 'are'} not computed from it, so changing ${parameter} cannot change the target`
      : `the target does not depend on ${parameter}: it reads no name of the study, so changing ${parameter} cannot change it`);
  }
  if (!ctx.whatIf) fail(at, 'this cell cannot vary values here (no what-if evaluation is available)', 'internal');
  const prepared = ctx.whatIf(names, [parameter]);
  if (!prepared.ok) fail(prepared.error.name === parameter ? `${at}.vary.parameter` : value.path, prepared.error.message);

  // the target's dimension is checked before any search when it has a value now
  const checkDim = (q: Quantity) => {
    if (!sameDim(q.dim, wantedValue.dim)) {
      fail(equals.path, `the target is ${describeDim(q.dim)} (${describe(q)}), so the value it must equal must be too; ${equals.text} is ${describeDim(wantedValue.dim)}`, 'unit');
    }
  };
  const now = evaluateExpression(value.expr, lookup);
  if (now.ok && typeof now.value !== 'boolean') checkDim(now.value);

  let evaluations = 0;
  let firstReason: string | undefined;
  const targetAt: TargetAt = (si) => {
    evaluations++;
    const r = prepared.evaluate([si]);
    const answers = new Map(r.answers.map((a) => [a.name, a]));
    const missing = r.answers.find((a) => !a.ok);
    if (missing && !missing.ok) {
      firstReason ??= missing.reason;
      return { ok: false, reason: missing.reason };
    }
    const e = evaluateExpression(value.expr, (n) => {
      const a = answers.get(n);
      if (a?.ok) return a.binding.kind === 'value' && a.binding.truth !== undefined ? a.binding.truth : a.q;
      return lookup(n);
    });
    if (!e.ok) fail(value.path, `target: ${e.error.message}`, e.error.units ? 'unit' : 'invalid');
    if (typeof e.value === 'boolean') fail(value.path, 'the target gives true/false; it must give a quantity to equal a value');
    checkDim(e.value);
    if (!Number.isFinite(e.value.si)) {
      const reason = `the target is not a finite number (${describe(e.value)})`;
      firstReason ??= reason;
      return { ok: false, reason };
    }
    return { ok: true, q: e.value };
  };

  const problem = (p: SolveProblem): never => {
    const path = p.field === 'equals' ? equals.path : p.field === 'value' ? value.path : `${at}.vary.${p.field}`;
    throw new Refused({ kind: p.kind ?? 'invalid', path, message: p.message }, p.output ?? {});
  };
  const common = { parameter, as, present, wanted: wantedValue, targetText: value.text, targetAt, problem, count: () => evaluations };
  if (f.choices) {
    const choices = f.choices.map((c) => same(finiteQuantityOf(c!, lookup), c!.path, 'a choice'));
    return searchChoices({ ...common, choices });
  }
  const min = same(finiteQuantityOf(f.min!, lookup), f.min!.path, 'min');
  const max = same(finiteQuantityOf(f.max!, lookup), f.max!.path, 'max');
  if (!(min.si < max.si)) fail(f.min!.path, `min (${describe(min)}) must be below max (${describe(max)})`);
  const roundTo = f.roundTo ? same(finiteQuantityOf(f.roundTo, lookup), f.roundTo.path, 'roundTo') : undefined;
  if (roundTo && !(stepOf(roundTo) > 0)) fail(f.roundTo!.path, `roundTo must be above zero; it is ${describe(roundTo)}`);
  const guess = f.guess ? same(finiteQuantityOf(f.guess, lookup), f.guess.path, 'guess') : undefined;
  return searchRange({ ...common, min, max, ...(roundTo ? { step: stepOf(roundTo) } : {}), ...(guess ? { guess } : {}), accuracy: prepared.accuracy, reason: () => firstReason });
}

/** The size of a rounding step in SI: a temperature written as a reading (`0.5 degC`) counts as a size of degree. */
export function stepOf(q: Quantity): number {
  if (q.temp !== 'point' || q.unit.length !== 1) return q.si;
  return q.si - (lookupUnit(q.unit[0][0])?.zero ?? 0);
}
