/** A parameters cell: one graph node per parameter, so that editing one re-runs only its users. */
import type { ParametersCell } from '../study/types.ts';
import type { Binding, CellError, GraphNode, Outcome, RunContext } from '../engine/node.ts';
import type { NodeOutput, ParameterValue } from '../engine/report.ts';
import { type Field, field, usesOf, lookupFrom, finiteQuantityOf, finite, valueOf, FieldError, guarded, shownAs } from './fields.ts';
import { type Quantity, report, describe, valueIn, shownUnit, plain } from '../units/quantity.ts';
import { formatUnit } from '../units/units.ts';
import { sameDim, describeDim } from '../units/dimension.ts';
import { quantitySig } from './signatures.ts';
import { type StudyUnits, simplestUnit } from '../units/simplest-unit.ts';
import { type SpreadFields, spreadFields, checkedSpread, spreadSig } from './spread.ts';

export function parameterNodes(cell: ParametersCell, at: string): Array<GraphNode<NodeOutput<'parameters'>>> {
  const items = Array.isArray(cell.items) ? cell.items : [];
  return items.map((item, j) => {
    const path = `${at}.items[${j}]`;
    const problems: CellError[] = [];
    const name = typeof item?.name === 'string' ? item.name : '';
    const value = field(item?.value, `${path}.value`, problems);
    const range = Array.isArray(item?.range) ? item.range.map((r, i) => field(r, `${path}.range[${i}]`, problems)) : [];
    const spread = spreadFields(item?.spread, `${path}.spread`, problems);
    return {
      key: `${cell.id}/${j}`,
      cell: cell.id,
      ownsFields: path,
      defines: name ? [{ name, path: `${path}.name` }] : [],
      uses: usesOf([value, ...range, spread?.sd, spread?.cv, spread?.from, spread?.to]),
      allowsTime: false,
      signature: JSON.stringify(item ?? null),
      problems,
      run: (ctx) => runParameter(name, value!, range, ctx, item?.unit, `${path}.unit`, spread),
    } satisfies GraphNode<NodeOutput<'parameters'>>;
  });
}

function runParameter(name: string, value: Field, range: ReadonlyArray<Field | undefined>, ctx: RunContext, shownIn: unknown, unitPath: string,
  spreadOf: SpreadFields | undefined): Outcome<NodeOutput<'parameters'>> {
  return guarded(() => {
    const lookup = lookupFrom(ctx);
    const v = valueOf(value, lookup);
    if (typeof v === 'boolean') {
      if (spreadOf) throw new FieldError({ kind: 'invalid', path: `${spreadOf.path}.distribution`, message: `${name} is true/false; a spread is for a quantity` });
      return truthParameter(name, v, range, shownIn, unitPath);
    }
    const computed = inSimplestUnit(finite(value, v), ctx.studyUnits);
    const q = shownAs(computed, shownIn, unitPath);
    let bounds: Quantity[] | undefined;
    if (range.length === 2) {
      const [lo, hi] = bounds = range.map((f) => finiteQuantityOf(f!, lookup));
      for (const [bound, f] of [[lo, range[0]!], [hi, range[1]!]] as const) {
        if (!sameDim(bound.dim, q.dim)) {
          throw new FieldError({ kind: 'unit', path: f.path, message: `range of ${name} must be ${describeDim(q.dim)} like its value; it is ${describeDim(bound.dim)} (${describe(bound)})` });
        }
      }
      if (!(lo.si < hi.si)) throw new FieldError({ kind: 'invalid', path: range[0]!.path, message: `range of ${name}: the low end (${describe(lo)}) must be below the high end (${describe(hi)})` });
    }
    const spread = spreadOf ? checkedSpread(name, q, spreadOf, lookup) : undefined;
    const binding: Binding = spread ? { kind: 'value', q, sig: quantitySig(q) + spreadSig(spread.spread), spread: spread.spread } : { kind: 'value', q, sig: quantitySig(q) };
    const bindings = new Map<string, Binding>([[name, binding]]);
    // a what-if run needs the value alone, not its display
    if (ctx.mode === 'what-if') return { ok: true, bindings, output: {} };
    const entry: ParameterValue = { ...report(q) };
    // the unit it had before one was picked, so that it can be picked back
    const original = formatUnit(shownUnit(computed));
    if (original !== entry.unit) entry.originalUnit = original;
    if (bounds) {
      const unit = shownUnit(q);
      entry.range = bounds.map((b) => ({ value: valueIn(b, unit), unit: formatUnit(unit), si: b.si }));
    }
    if (spread) {
      entry.spread = spread.report;
      const hidden = spreadsRead(value, ctx);
      if (hidden.length) entry.spread = { ...entry.spread, note: hiddenNote(name, hidden) };
    }
    return { ok: true, bindings, output: { values: { [name]: entry } } };
  });
}

/** The names `value` reads whose values carry a spread (or a fit's covariance), in the order first read. */
function spreadsRead(value: Field, ctx: RunContext): string[] {
  const names = [...new Set(usesOf([value]).map((u) => u.name))];
  return names.filter((n) => { const b = ctx.binding(n); return b?.kind === 'value' && b.spread !== undefined; });
}

function hiddenNote(name: string, hidden: readonly string[]): string {
  const list = hidden.length === 1 ? hidden[0] : `${hidden.slice(0, -1).join(', ')} and ${hidden[hidden.length - 1]}`;
  return `${name} is computed from ${list}, which ${hidden.length === 1 ? 'has a spread' : 'have spreads'} of ${hidden.length === 1 ? 'its' : 'their'} own: an uncertainty cell draws ${name} from this spread alone, without carrying the spread${hidden.length === 1 ? '' : 's'} of ${list} through it. Remove this spread to carry ${hidden.length === 1 ? 'it' : 'theirs'} instead.`;
}

/** q in the simplest unit of its dimension the study uses (units/simplest-unit.ts); a temperature keeps its own. */
function inSimplestUnit(q: Quantity, units: StudyUnits | undefined): Quantity {
  return units && !q.temp ? { ...q, unit: simplestUnit(q.unit, q.dim, units) } : q;
}

/**
 * A parameter that is a condition (`T_2h <= 21 degC`, `stage1_ok and stage2_ok`): reported as
 * 1 or 0 with `truth`, usable as true/false by other parameters (not by rate laws).
 */
function truthParameter(name: string, truth: boolean, range: ReadonlyArray<Field | undefined>, shownIn: unknown, unitPath: string): Outcome<NodeOutput<'parameters'>> {
  if (range.length) throw new FieldError({ kind: 'invalid', path: range[0]!.path, message: `${name} is true/false; a range is for a quantity` });
  if (typeof shownIn === 'string' && shownIn.trim()) throw new FieldError({ kind: 'invalid', path: unitPath, message: `${name} is true/false; it has no unit to show it in` });
  const one = Number(truth);
  const binding: Binding = { kind: 'value', q: plain(one), sig: `truth:${truth}`, truth };
  return { ok: true, bindings: new Map([[name, binding]]), output: { values: { [name]: { value: one, unit: '', si: one, truth } } } };
}
