/**
 * Reading a study document: the checks of the contract, with messages that name the path.
 *
 * Two levels. A document that is not a study (another format, a newer version, a duplicate
 * cell id, an unknown kind) is refused whole. A cell whose fields are wrong is kept, with its
 * problems, so that the rest of the study still computes and nothing the user wrote is lost.
 */
import {
  type Cell, type Study, CELL_KINDS, CURRENT_VERSION, FORMAT, ID_PATTERN, NAME_PATTERN,
  METHODS, PLOT_SCALES, FIND_KINDS, WEIGHTINGS, ROUTES, AUC_RULES, NCA_RESULTS,
} from './types.ts';
import { migrate } from './migrate.ts';
import { checkSpread, checkUncertainty } from './validate-uncertainty.ts';
import { checkSensitivity, checkCompare } from './validate-scenarios.ts';
import { shortJson, textLimitProblem, valueLimitProblem, withoutByteOrderMark } from './limits.ts';

export interface Problem {
  readonly message: string;
  readonly path: string;
}

export type ReadResult =
  | { ok: true; study: Study; cellProblems: ReadonlyMap<string, readonly Problem[]>; notes: readonly string[] }
  | { ok: false; error: Problem };

/**
 * Reads a study from JSON text or a parsed value. Never throws. The bounds of `limits.ts` are
 * checked first (a byte-order mark before the text is dropped), so nothing after walks a
 * value nested too deeply.
 */
export function readStudy(input: unknown): ReadResult {
  let doc: unknown = input;
  if (typeof input === 'string') {
    const text = withoutByteOrderMark(input);
    const bound = textLimitProblem(text);
    if (bound) return { ok: false, error: bound };
    try {
      doc = JSON.parse(text);
    } catch (err) {
      return refuse(`the file is not valid JSON: ${(err as Error).message}`, '');
    }
  }
  const bound = valueLimitProblem(doc);
  if (bound) return { ok: false, error: bound };
  if (!isObject(doc)) return refuse('a study must be a JSON object', '');
  if (doc.format !== FORMAT) {
    return refuse(`this is not a Ratebook study: "format" must be "${FORMAT}"${doc.format === undefined ? '' : `, not ${shortJson(doc.format)}`}`, 'format');
  }
  const version = doc.version;
  if (!Number.isInteger(version) || (version as number) < 1) return refuse('"version" must be a whole number, 1 or more', 'version');
  if ((version as number) > CURRENT_VERSION) {
    return refuse(`this study was written by a newer Ratebook (format version ${version}); this one reads up to version ${CURRENT_VERSION}`, 'version');
  }
  let notes: string[] = [];
  try {
    ({ doc, notes } = migrate(doc, version as number));
  } catch (err) {
    return refuse((err as Error).message, 'version');
  }
  const d = doc as Record<string, unknown>;
  if (d.title !== undefined && typeof d.title !== 'string') return refuse('"title" must be text', 'title');
  if (d.description !== undefined && typeof d.description !== 'string') return refuse('"description" must be text', 'description');
  if (d.author !== undefined && typeof d.author !== 'string') return refuse('"author" must be text', 'author');
  if (!Array.isArray(d.cells)) return refuse('"cells" must be a list of cells', 'cells');
  const seen = new Map<string, number>();
  const cellProblems = new Map<string, Problem[]>();
  for (let i = 0; i < d.cells.length; i++) {
    const c = d.cells[i];
    const at = `cells[${i}]`;
    if (!isObject(c)) return refuse('a cell must be an object', at);
    if (typeof c.id !== 'string' || !ID_PATTERN.test(c.id)) {
      return refuse(`a cell id must be lower-case letters, digits, "-" or "_", starting with a letter${typeof c.id === 'string' ? `; "${c.id}" is not` : ''}`, `${at}.id`);
    }
    if (seen.has(c.id)) return refuse(`the cell id "${c.id}" is used twice (first at cells[${seen.get(c.id)}])`, `${at}.id`);
    seen.set(c.id, i);
    if (typeof c.kind !== 'string' || !(CELL_KINDS as readonly string[]).includes(c.kind)) {
      return refuse(`unknown cell kind ${shortJson(c.kind)}; the kinds are ${CELL_KINDS.join(', ')}`, `${at}.kind`);
    }
    const problems = checkCell(c, at);
    if (problems.length) cellProblems.set(c.id, problems);
  }
  const study: Study = {
    format: FORMAT,
    version: CURRENT_VERSION,
    title: typeof d.title === 'string' ? d.title : 'Untitled study',
    ...(typeof d.description === 'string' ? { description: d.description } : {}),
    ...(typeof d.author === 'string' ? { author: d.author } : {}),
    cells: d.cells as Cell[],
  };
  return { ok: true, study, cellProblems, notes };
}

function refuse(message: string, path: string): ReadResult {
  return { ok: false, error: { message, path } };
}

/** An own field: never one inherited from Object.prototype (a find named "valueOf"). */
export function own(o: Record<string, unknown>, key: string): boolean {
  return Object.prototype.hasOwnProperty.call(o, key) && o[key] !== undefined;
}

export function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/** The field-level problems of one cell; empty when its shape is right. */
export function checkCell(c: Record<string, unknown>, at: string): Problem[] {
  const p = new Checker(at);
  if (c.title !== undefined) p.text(c, 'title');
  switch (c.kind) {
    case 'parameters':
      if (p.list(c, 'items')) {
        (c.items as unknown[]).forEach((item, j) => {
          const path = `items[${j}]`;
          if (!p.object(item, path)) return;
          p.name(item, 'name', path);
          p.expr(item, 'value', path);
          if (item.range !== undefined) {
            if (!Array.isArray(item.range) || item.range.length !== 2 || item.range.some((r) => typeof r !== 'string')) {
              p.add(`${at}.${path}.range`, 'must be a list of two expressions, [low, high]');
            }
          }
          p.optionalText(item, 'note', path);
          p.optionalText(item, 'unit', path);
          p.optionalFlag(item, 'glance', path);
          if (item.spread !== undefined) checkSpread(item.spread, p, path);
        });
      }
      break;
    case 'rate':
      p.name(c, 'state');
      p.expr(c, 'unit');
      p.expr(c, 'rate');
      p.expr(c, 'initial');
      break;
    case 'phase':
      p.id(c, 'rate');
      p.expr(c, 'from');
      p.expr(c, 'to');
      if (c.sweep !== undefined && p.object(c.sweep, 'sweep')) {
        p.name(c.sweep, 'name', 'sweep');
        p.expr(c.sweep, 'from', 'sweep');
        p.expr(c.sweep, 'to', 'sweep');
        p.integer(c.sweep, 'steps', 'sweep', 2, 10000);
      }
      break;
    case 'simulate':
      checkSimulate(c, p);
      break;
    case 'data':
      checkData(c, p);
      break;
    case 'fit':
      // the model: the laws named in `rates`, or the run named in `run`, never both
      if (c.run !== undefined && c.rates !== undefined) p.add(`${at}.run`, 'name either the laws ("rates") or a run ("run"), not both');
      else if (c.run !== undefined) p.id(c, 'run');
      else if (c.rates === undefined) p.add(`${at}.rates`, 'is missing: name the laws to fit ("rates") or a run to fit through ("run")');
      else p.ids(c, 'rates');
      p.id(c, 'data');
      p.text(c, 'time');
      p.oneOf(c, 'plotScale', PLOT_SCALES, true);
      if (p.object(c.observe, 'observe')) {
        const entries = Object.entries(c.observe);
        if (entries.length === 0) p.add(`${at}.observe`, 'must name at least one state and its data column');
        for (const [state, col] of entries) {
          if (!NAME_PATTERN.test(state)) p.add(`${at}.observe`, `"${state}" is not a state name`);
          if (typeof col !== 'string') p.add(`${at}.observe.${state}`, 'must be the name of a data column');
        }
      }
      if (p.list(c, 'estimate')) {
        if ((c.estimate as unknown[]).length === 0) p.add(`${at}.estimate`, 'must list at least one parameter to estimate');
        (c.estimate as unknown[]).forEach((e, j) => {
          const path = `estimate[${j}]`;
          if (!p.object(e, path)) return;
          p.name(e, 'parameter', path);
          p.name(e, 'as', path);
          p.expr(e, 'guess', path);
          if (e.min !== undefined) p.expr(e, 'min', path);
          if (e.max !== undefined) p.expr(e, 'max', path);
          p.optionalText(e, 'unit', path);
          if (e.prior !== undefined && p.object(e.prior, `${path}.prior`)) {
            p.expr(e.prior, 'median', `${path}.prior`);
            p.numberOrExpr(e.prior, 'omega', `${path}.prior`, false);
          }
        });
      }
      p.oneOf(c, 'weighting', WEIGHTINGS, true);
      if (c.error !== undefined && p.object(c.error, 'error')) {
        if (c.error.additive !== undefined) p.expr(c.error, 'additive', 'error');
        p.numberOrExpr(c.error, 'proportional', 'error', true);
        if (c.error.additive === undefined && c.error.proportional === undefined) p.add(`${at}.error`, 'must give an additive SD, a proportional SD, or both');
      }
      break;
    case 'nca':
      p.id(c, 'data');
      p.text(c, 'time');
      p.text(c, 'concentration');
      p.expr(c, 'dose');
      p.oneOf(c, 'route', ROUTES, false);
      if (c.route === 'infusion') p.expr(c, 'duration');
      else if (c.duration !== undefined) p.expr(c, 'duration');
      p.oneOf(c, 'auc', AUC_RULES, true);
      if (c.units !== undefined && p.object(c.units, 'units')) {
        for (const [name, unit] of Object.entries(c.units)) {
          if (!NCA_RESULTS.includes(name)) p.add(`${at}.units.${name}`, `"${name}" is not a result of the profile summary (they are ${NCA_RESULTS.join(', ')})`);
          else if (typeof unit !== 'string') p.add(`${at}.units.${name}`, 'must be a unit, as text');
        }
      }
      if (c.terminal !== undefined && c.terminal !== 'auto' && !(Number.isInteger(c.terminal) && (c.terminal as number) >= 3)) {
        p.add(`${at}.terminal`, 'must be "auto" or a whole number of last points, 3 or more');
      }
      if (c.prefix !== undefined && (typeof c.prefix !== 'string' || !/^[A-Za-z0-9_]*$/.test(c.prefix))) {
        p.add(`${at}.prefix`, 'must be letters, digits or "_"');
      }
      break;
    case 'solve':
      checkSolve(c, p);
      break;
    case 'uncertainty':
      checkUncertainty(c, p);
      break;
    case 'note':
      p.text(c, 'text');
      break;
    case 'sensitivity':
      checkSensitivity(c, p);
      break;
    case 'compare':
      checkCompare(c, p);
      break;
  }
  return p.problems;
}

/**
 * The relative tolerances a run accepts. Below 1e-12 the steps needed fall under what double
 * precision resolves (about 16 digits, less the digits a step's rounding costs), and the run
 * exhausts its steps at the start; above 0.1 it is no longer a tolerance (common practice).
 */
export const MIN_RTOL = 1e-12;
export const MAX_RTOL = 0.1;

function checkSimulate(c: Record<string, unknown>, p: Checker): void {
  p.ids(c, 'rates');
  p.expr(c, 'from');
  p.expr(c, 'to');
  p.oneOf(c, 'method', METHODS, true);
  p.oneOf(c, 'plotScale', PLOT_SCALES, true);
  p.optionalFlag(c, 'band');
  const fixed = c.method === 'rk4' || c.method === 'heun' || c.method === 'euler';
  if (fixed || c.step !== undefined) p.expr(c, 'step');
  if (c.tolerance !== undefined && p.object(c.tolerance, 'tolerance')) {
    const t = c.tolerance;
    if (t.relative !== undefined && !(typeof t.relative === 'number' && t.relative >= MIN_RTOL && t.relative <= MAX_RTOL)) {
      p.add(`${p.at}.tolerance.relative`, typeof t.relative === 'number' && t.relative > 0 && t.relative < MIN_RTOL
        ? `${t.relative} is tighter than a run can resolve (numbers carry about 16 digits): use ${MIN_RTOL} or more, such as 1e-6`
        : `must be a number from ${MIN_RTOL} to ${MAX_RTOL}, such as 1e-6`);
    }
    if (t.absolute !== undefined) p.expr(t, 'absolute', 'tolerance');
  }
  if (c.events !== undefined && p.list(c, 'events')) {
    (c.events as unknown[]).forEach((e, j) => {
      const path = `events[${j}]`;
      if (!p.object(e, path)) return;
      p.expr(e, 'at', path);
      if (e.every !== undefined) p.expr(e, 'every', path);
      // a count is a whole number, or an expression checked when the run evaluates it
      if (typeof e.count === 'string') p.expr(e, 'count', path);
      else if (e.count !== undefined) p.integer(e, 'count', path, 1, 100000);
      if (typeof e.count === 'number' && e.every === undefined && e.count !== 1) p.add(`${p.at}.${path}.every`, 'is needed to repeat an event (count more than 1)');
      const actions = ['add', 'set', 'infuse'].filter((k) => own(e, k));
      if (actions.length !== 1) {
        p.add(`${p.at}.${path}`, 'must have exactly one of "add", "set" or "infuse"');
        return;
      }
      const action = actions[0];
      if (p.object(e[action], `${path}.${action}`)) {
        const entries = Object.entries(e[action] as object);
        if (entries.length === 0) p.add(`${p.at}.${path}.${action}`, 'must name at least one state or parameter');
        for (const [name, v] of entries) {
          if (!NAME_PATTERN.test(name)) p.add(`${p.at}.${path}.${action}`, `"${name}" is not a name`);
          if (typeof v !== 'string') p.add(`${p.at}.${path}.${action}.${name}`, 'must be an expression written as text');
        }
      }
      if (action === 'infuse') p.expr(e, 'for', path);
      else if (e.for !== undefined) p.add(`${p.at}.${path}.for`, 'only an "infuse" event has a duration');
    });
  }
  if (c.find !== undefined && p.list(c, 'find')) {
    (c.find as unknown[]).forEach((f, j) => {
      const path = `find[${j}]`;
      if (!p.object(f, path)) return;
      p.name(f, 'name', path);
      p.optionalText(f, 'unit', path);
      p.optionalFlag(f, 'glance', path);
      const kinds = FIND_KINDS.filter((k) => own(f, k));
      if (kinds.length !== 1) {
        p.add(`${p.at}.${path}`, `must have exactly one of ${FIND_KINDS.join(', ')}`);
        return;
      }
      const kind = kinds[0];
      p.name(f, kind, path);
      if (kind === 'crossing' || kind === 'timeAbove' || kind === 'timeBelow') p.expr(f, 'level', path);
      if (kind === 'valueOf') p.expr(f, 'at', path);
      if (kind === 'crossing') {
        p.oneOf(f, 'direction', ['up', 'down', 'either'] as const, true, path);
        if (f.occurrence !== undefined) p.integer(f, 'occurrence', path, 1, 1e6);
      }
      if (f.from !== undefined) p.expr(f, 'from', path);
      if (f.to !== undefined) p.expr(f, 'to', path);
    });
  }
}

function checkSolve(c: Record<string, unknown>, p: Checker): void {
  if (p.object(c.vary, 'vary')) {
    const v = c.vary;
    p.name(v, 'parameter', 'vary');
    p.name(v, 'as', 'vary');
    const range = v.min !== undefined || v.max !== undefined;
    if (v.choices !== undefined) {
      if (!Array.isArray(v.choices) || v.choices.length === 0 || v.choices.some((x) => typeof x !== 'string')) {
        p.add(`${p.at}.vary.choices`, 'must be a list of one or more values, each an expression written as text');
      } else if (v.choices.length > 100) p.add(`${p.at}.vary.choices`, `lists ${v.choices.length} values; at most 100 can be tried`);
      if (range) p.add(`${p.at}.vary.${v.min !== undefined ? 'min' : 'max'}`, 'give either min and max, or choices, not both');
      if (v.roundTo !== undefined) p.add(`${p.at}.vary.roundTo`, 'rounds a solution found in a range; the choices are used as they are');
    } else {
      p.expr(v, 'min', 'vary');
      p.expr(v, 'max', 'vary');
      if (v.roundTo !== undefined) p.expr(v, 'roundTo', 'vary');
    }
    if (v.guess !== undefined) p.expr(v, 'guess', 'vary');
  }
  if (p.object(c.target, 'target')) {
    p.expr(c.target, 'value', 'target');
    p.expr(c.target, 'equals', 'target');
  }
}

function checkData(c: Record<string, unknown>, p: Checker): void {
  if (p.list(c, 'columns')) {
    const cols = c.columns as unknown[];
    if (cols.length === 0) p.add(`${p.at}.columns`, 'must list at least one column');
    const names = new Set<string>();
    cols.forEach((col, j) => {
      const path = `columns[${j}]`;
      if (!p.object(col, path)) return;
      if (p.name(col, 'name', path)) {
        if (names.has(col.name as string)) p.add(`${p.at}.${path}.name`, `the column name "${col.name}" is used twice`);
        names.add(col.name as string);
      }
      p.expr(col, 'unit', path);
    });
  }
  if (c.rows !== undefined && c.csv !== undefined) p.add(`${p.at}.csv`, 'give either "rows" or "csv", not both');
  if (c.rows === undefined && c.csv === undefined) p.add(`${p.at}.rows`, 'is missing: give the measurements as "rows" or as "csv" text');
  if (c.csv !== undefined) p.text(c, 'csv');
  if (c.rows !== undefined && p.list(c, 'rows')) {
    const width = Array.isArray(c.columns) ? c.columns.length : 0;
    let lastTime = -Infinity;
    (c.rows as unknown[]).forEach((row, j) => {
      const path = `${p.at}.rows[${j}]`;
      if (!Array.isArray(row)) return p.add(path, `row ${j + 1} must be a list of numbers`);
      if (width && row.length !== width) return p.add(path, `row ${j + 1} has ${row.length} values; the table has ${width} columns`);
      const bad = row.findIndex((v) => v !== null && !(typeof v === 'number' && Number.isFinite(v)));
      if (bad >= 0) return p.add(`${path}[${bad}]`, `row ${j + 1} has ${shortJson(row[bad])} where a number (or null for a missing value) belongs`);
      const t = row[0];
      if (t === null) return p.add(`${path}[0]`, `row ${j + 1} has no time`);
      if (t < lastTime) p.add(`${path}[0]`, `row ${j + 1}: the time ${t} goes backwards (the row before has ${lastTime})`);
      lastTime = Math.max(lastTime, t as number);
    });
  }
}

/** Collects field problems of one cell, with full paths. */
export class Checker {
  readonly problems: Problem[] = [];
  constructor(readonly at: string) {}

  add(path: string, message: string): void {
    this.problems.push({ path, message });
  }

  private where(field: string, within?: string): string {
    return within ? `${this.at}.${within}.${field}` : `${this.at}.${field}`;
  }

  object(v: unknown, within: string): v is Record<string, unknown> {
    if (isObject(v)) return true;
    this.add(`${this.at}.${within}`, v === undefined ? 'is missing' : 'must be an object');
    return false;
  }

  list(o: Record<string, unknown>, field: string): boolean {
    if (Array.isArray(o[field])) return true;
    this.add(this.where(field), o[field] === undefined ? 'is missing' : 'must be a list');
    return false;
  }

  text(o: Record<string, unknown>, field: string, within?: string): boolean {
    if (typeof o[field] === 'string') return true;
    this.add(this.where(field, within), o[field] === undefined ? 'is missing' : 'must be text');
    return false;
  }

  optionalText(o: Record<string, unknown>, field: string, within?: string): void {
    if (o[field] !== undefined) this.text(o, field, within);
  }

  /** An optional yes/no field: true or false, nothing else. */
  optionalFlag(o: Record<string, unknown>, field: string, within?: string): void {
    if (o[field] !== undefined && typeof o[field] !== 'boolean') this.add(this.where(field, within), 'must be true or false');
  }

  /** An expression field: its text is checked later, by the parser, on the same path. */
  expr(o: Record<string, unknown>, field: string, within?: string): boolean {
    if (typeof o[field] === 'string') return true;
    const v = o[field];
    this.add(this.where(field, within), v === undefined ? 'is missing'
      : typeof v === 'number' ? `must be an expression written as text, with its unit, such as "${v} h"` : 'must be an expression written as text');
    return false;
  }

  name(o: Record<string, unknown>, field: string, within?: string): boolean {
    if (!this.text(o, field, within)) return false;
    if (NAME_PATTERN.test(o[field] as string)) return true;
    this.add(this.where(field, within), `"${o[field]}" is not a valid name: use letters, digits and "_", starting with a letter`);
    return false;
  }

  id(o: Record<string, unknown>, field: string): void {
    if (this.text(o, field) && !ID_PATTERN.test(o[field] as string)) this.add(this.where(field), `"${o[field]}" is not a cell id`);
  }

  ids(o: Record<string, unknown>, field: string): void {
    const v = o[field];
    if (!Array.isArray(v) || v.length === 0 || v.some((x) => typeof x !== 'string')) {
      this.add(this.where(field), v === undefined ? 'is missing' : 'must be a list of one or more cell ids');
    }
  }

  integer(o: Record<string, unknown>, field: string, within: string, min: number, max: number): void {
    const v = o[field];
    if (!Number.isInteger(v) || (v as number) < min || (v as number) > max) {
      this.add(this.where(field, within), `must be a whole number from ${min} to ${max}`);
    }
  }

  /** A plain number written as a number or as an expression (checked later, by the parser). */
  numberOrExpr(o: Record<string, unknown>, field: string, within: string, optional: boolean): void {
    const v = o[field];
    if (v === undefined && optional) return;
    if (typeof v === 'string') return;
    if (typeof v !== 'number' || !Number.isFinite(v)) this.add(this.where(field, within), v === undefined ? 'is missing' : 'must be a number, or an expression written as text');
  }

  oneOf(o: Record<string, unknown>, field: string, allowed: readonly string[], optional: boolean, within?: string): void {
    const v = o[field];
    if (v === undefined && optional) return;
    if (typeof v !== 'string' || !allowed.includes(v)) {
      this.add(this.where(field, within), `must be one of ${allowed.join(', ')}${v === undefined ? '' : `, not ${shortJson(v)}`}`);
    }
  }
}
