/**
 * Expression fields of a cell: parsing (cached by text, so an unchanged field costs a map
 * look-up on every edit), the names a field reads, and evaluation against the graph.
 */
import { parseExpression, type ParseResult } from '../expression/parse.ts';
import { symbolsOf, type Expr } from '../expression/ast.ts';
import { evaluateExpression, type Lookup, type Value } from '../expression/evaluate.ts';
import { literalOf, type Literal } from '../expression/literal.ts';
import type { CellError, Outcome, ProblemKind, RunContext, Use } from '../engine/node.ts';
import type { Quantity } from '../units/quantity.ts';
import { describe, plain } from '../units/quantity.ts';
import { unitDim, type DisplayUnit } from '../units/units.ts';
import { TIME, sameDim, describeDim } from '../units/dimension.ts';
import { unitFromText } from '../expression/unit-text.ts';
import { findWord } from '../expression/find-word.ts';

export interface Field {
  readonly path: string;
  readonly text: string;
  readonly expr: Expr;
}

/** parseExpression keeps the texts it parsed lately (expression/parse.ts). */
const parseCached = (text: string): ParseResult => parseExpression(text);

/** Parses the expression at `path`; on failure records a problem and returns undefined. */
export function field(value: unknown, path: string, problems: CellError[]): Field | undefined {
  if (typeof value !== 'string') {
    problems.push({ kind: 'shape', path, message: value === undefined ? 'is missing' : 'must be an expression written as text' });
    return undefined;
  }
  const r = parseCached(value);
  if (!r.ok) {
    problems.push({ kind: 'syntax', path, message: `${label(path)} ${r.error.message}`, ...(r.error.span ? { span: r.error.span } : {}) });
    return undefined;
  }
  return { path, text: value, expr: r.expr };
}

/**
 * The names the fields read (units and constants too: the graph sorts them out). `states`
 * marks fields that can read states (rate laws, event amounts under add or infuse).
 */
export function usesOf(fields: ReadonlyArray<Field | undefined>, { states = false } = {}): Use[] {
  const uses: Use[] = [];
  for (const f of fields) {
    if (!f) continue;
    for (const name of symbolsOf(f.expr)) uses.push({ name, path: f.path, text: f.text, ...(states ? { readsStates: true } : {}) });
  }
  return uses;
}

/** A short label for a field path in messages: `cells[0].items[1].value` -> `value`. */
export function label(path: string): string {
  const m = /\.([A-Za-z]+)(\[\d+\])?$/.exec(path);
  return m ? m[1] : 'the expression';
}

/**
 * The graph's values as an expression lookup, for a field that cannot read states (values,
 * times, levels, ranges, bounds): a state's name is not seen, so one spelled like a unit is
 * that unit there (`12 h` is twelve hours beside a state `h`).
 */
export function lookupFrom(ctx: RunContext, extra?: ReadonlyMap<string, Quantity>): Lookup {
  return (name) => {
    const x = extra?.get(name);
    if (x) return x;
    const b = ctx.binding(name);
    if (b?.kind === 'value') return b.truth ?? b.q;
    return undefined;
  };
}

/** Like lookupFrom, for a field that can read states (a rate law, an event amount): states read as their initial values. */
export function stateLookupFrom(ctx: RunContext, extra?: ReadonlyMap<string, Quantity>): Lookup {
  const values = lookupFrom(ctx, extra);
  return (name) => {
    const b = ctx.binding(name);
    return b?.kind === 'state' && !extra?.has(name) ? b.q : values(name);
  };
}

/** The time `t` while a law is checked: the start of a run. */
export const TIME_ZERO: Quantity = { ...plain(0), dim: TIME, unit: [['s', 1]] };

/** A problem on one field, thrown inside a node's run and turned into its error by `guarded`. */
export class FieldError extends Error {
  constructor(readonly error: CellError) {
    super(error.message);
  }
}

/** Throws the problem `kind` on the field at `path`. */
export function fail(path: string, message: string, kind: ProblemKind = 'invalid'): never {
  throw new FieldError({ kind, path, message });
}

/**
 * `q` to be shown in the unit the study picked for it (a parameter's or an answer's `unit`),
 * or `q` as it is when none was picked. A text that is not a unit, or a unit of another
 * dimension, is an error on that field.
 */
export function shownAs(q: Quantity, text: unknown, path: string): Quantity {
  if (typeof text !== 'string' || text.trim() === '') return q;
  const unit = unitFromText(text);
  if (!unit) throw new FieldError({ kind: 'unit', path, message: `"${text}" is not a unit (write it as in a value, such as mg / L or degF)` });
  if (!sameDim(unitDim(unit), q.dim)) {
    throw new FieldError({ kind: 'unit', path, message: `${describe(q)} cannot be shown in ${text}: it is ${describeDim(q.dim)}, and ${text} is ${describeDim(unitDim(unit))}` });
  }
  return { ...q, unit };
}

/** Runs a node's work; a FieldError thrown inside becomes the node's error on its field. */
export function guarded<O extends object>(run: () => Outcome<O>): Outcome<O> {
  try {
    return run();
  } catch (err) {
    if (err instanceof FieldError) return { ok: false, error: err.error };
    throw err;
  }
}

/** Evaluates a field to a quantity or true/false, or throws FieldError with a message on the field. */
export function valueOf(f: Field, lookup: Lookup): Value {
  const r = evaluateExpression(f.expr, lookup);
  if (!r.ok) {
    const span = r.error.token ? findWord(f.text, r.error.token) : undefined;
    throw new FieldError({ kind: r.error.units ? 'unit' : 'invalid', path: f.path, message: `${label(f.path)}: ${r.error.message}`, ...(span ? { span } : {}) });
  }
  return r.value;
}

/** Evaluates a field to a quantity, or throws FieldError with a message on the field. */
export function quantityOf(f: Field, lookup: Lookup): Quantity {
  const r = { value: valueOf(f, lookup) };
  if (typeof r.value === 'boolean') {
    throw new FieldError({ kind: 'invalid', path: f.path, message: `${label(f.path)} gives true/false; it must give a quantity` });
  }
  return r.value;
}

/** Like quantityOf, and the value must be a finite number. */
export function finiteQuantityOf(f: Field, lookup: Lookup): Quantity {
  return finite(f, quantityOf(f, lookup));
}

/** `q` if it is finite; otherwise a FieldError on `f` that says why it is not. */
export function finite(f: Field, q: Quantity): Quantity {
  if (!Number.isFinite(q.si)) {
    const why = Number.isNaN(q.si) ? 'is not a number (a logarithm or square root of a negative value?)' : 'is infinite (a division by zero?)';
    throw new FieldError({ kind: 'numeric', path: f.path, message: `${label(f.path)} ${why}: ${describe(q)}` });
  }
  return q;
}

/** A unit field ("mg / L"): numbers and units only, no study names; "1" for a plain number (a fraction, a ratio). */
export function unitOf(f: Field): DisplayUnit {
  const lit: Literal | null = literalOf(f.expr, () => false, new WeakMap());
  if (lit && lit.unit.length === 0 && lit.coef === 1 && f.text.trim() === '1') return lit.unit;
  if (!lit || lit.unit.length === 0) throw new FieldError({ kind: 'unit', path: f.path, message: `unit "${f.text}" is not a unit: write one such as degC, mg / L or 1 / h (or 1 for a plain number)` });
  if (lit.coef !== 1) throw new FieldError({ kind: 'unit', path: f.path, message: `unit "${f.text}" must be a unit without a number, such as mg / L` });
  return lit.unit;
}

