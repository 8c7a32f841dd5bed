/**
 * The field checks of the cells that run the laws through time and read data: simulate (span,
 * method and tolerances, schedule, questions), solve (its target and the varied parameter) and
 * data (columns and rows). Shapes only: expressions are read later, by the parser, on the
 * same paths.
 */
import { FIND_KINDS, METHODS, NAME_PATTERN, PLOT_SCALES } from './types.ts';
import { type Checker, own } from './checker.ts';
import { shortJson } from './limits.ts';

/**
 * The relative tolerances a run accepts. Below 1e-12 the steps needed fall under what double
 * precision resolves (about 16 digits, less the digits a step's rounding costs), and the run
 * exhausts its steps at the start; above 0.1 it is no longer a tolerance (common practice).
 */
export const MIN_RTOL = 1e-12;
export const MAX_RTOL = 0.1;

export function checkSimulate(c: Record<string, unknown>, p: Checker): void {
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

export function checkSolve(c: Record<string, unknown>, p: Checker): void {
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

export function checkData(c: Record<string, unknown>, p: Checker): void {
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
