/**
 * The document checks of the `sensitivity` and `compare` cells (called by `checkCell` in
 * validate.ts): lists of names, scenarios with a name that can end a defined name, unique
 * names. Messages name the path.
 */
import { NAME_PATTERN } from './types.ts';
import { shortJson } from './limits.ts';
import type { Checker } from './checker.ts';

/** At most this many names in `of` and in `parameters`; a sensitivity runs the study twice per parameter. */
export const MAX_SENSITIVITY_NAMES = 20;
/** At most this many scenarios in a compare cell (each is a run of the study). */
export const MAX_SCENARIOS = 20;
/** What a scenario's name may be: letters, digits and `_`, so that `<question>_<scenario>` is a name. */
export const SCENARIO_NAME = /^[A-Za-z0-9_]+$/;

/** A list of 1 to `max` names, none twice, each problem on its entry's path. */
function names(c: Record<string, unknown>, field: string, p: Checker, what: string, max: number): void {
  const v = c[field];
  if (!Array.isArray(v) || v.length === 0) {
    p.add(`${p.at}.${field}`, v === undefined ? `is missing: list the ${what}` : `must be a list of one or more ${what}`);
    return;
  }
  if (v.length > max) p.add(`${p.at}.${field}`, `lists ${v.length} names; at most ${max} can be taken`);
  const seen = new Set<string>();
  v.forEach((x, i) => {
    const at = `${p.at}.${field}[${i}]`;
    if (typeof x !== 'string' || !NAME_PATTERN.test(x)) p.add(at, `${shortJson(x)} is not a name: use letters, digits and "_", starting with a letter`);
    else if (seen.has(x)) p.add(at, `"${x}" is listed twice`);
    else seen.add(x);
  });
}

export function checkSensitivity(c: Record<string, unknown>, p: Checker): void {
  names(c, 'of', p, 'results to follow (names of answers or values)', MAX_SENSITIVITY_NAMES);
  names(c, 'parameters', p, 'parameters to vary', MAX_SENSITIVITY_NAMES);
}

export function checkCompare(c: Record<string, unknown>, p: Checker): void {
  p.id(c, 'run');
  if (!p.list(c, 'scenarios')) return;
  const list = c.scenarios as unknown[];
  if (list.length === 0) p.add(`${p.at}.scenarios`, 'must list at least one scenario');
  if (list.length > MAX_SCENARIOS) p.add(`${p.at}.scenarios`, `lists ${list.length} scenarios; at most ${MAX_SCENARIOS} can be run`);
  const seen = new Set<string>();
  list.forEach((s, j) => {
    const path = `scenarios[${j}]`;
    if (!p.object(s, path)) return;
    if (p.text(s, 'name', path)) {
      const name = s.name as string;
      if (!SCENARIO_NAME.test(name)) {
        p.add(`${p.at}.${path}.name`, `"${name}" cannot end a name: use letters, digits and "_" (each answer is defined as <question>_${name || '…'})`);
      } else if (seen.has(name)) p.add(`${p.at}.${path}.name`, `the scenario name "${name}" is used twice`);
      else seen.add(name);
    }
    if (p.object(s.set, `${path}.set`)) {
      for (const [name, v] of Object.entries(s.set)) {
        if (!NAME_PATTERN.test(name)) p.add(`${p.at}.${path}.set`, `"${name}" is not a name`);
        if (typeof v !== 'string') p.add(`${p.at}.${path}.set.${name}`, 'must be an expression written as text, with its unit');
      }
    }
  });
}
