/**
 * The checks of a non-compartmental analysis's input (nca.ts): every problem found, each on
 * its field and row, worded for the cell, and the usable samples when there is none.
 */
import type { NcaFailure, NcaInput, NcaProblem } from './nca.ts';

/** At most this many problems are listed; the message says how many more there were. */
export const MAX_PROBLEMS = 20;

const ROUTES: readonly string[] = ['iv-bolus', 'infusion', 'extravascular'];
const AUC_RULES: readonly string[] = ['linear', 'linear-up-log-down'];

/** A value the caller passed, described for a message. */
function describe(v: unknown): string {
  if (typeof v === 'string') return `"${v.length > 20 ? `${v.slice(0, 20)}...` : v}" (text)`;
  if (typeof v === 'number') return String(v);
  if (v === null || v === undefined) return 'missing';
  return `a ${typeof v}`;
}

const isFiniteNumber = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);

/** One usable sample: its row (0-based), time and concentration. */
export interface Sample { readonly row: number; readonly t: number; readonly c: number }

/** Checks the input; returns the usable samples, or the problems found. */
export function checkInput(input: NcaInput): { samples: Sample[] } | { problems: NcaProblem[] } {
  const problems: NcaProblem[] = [];
  const add = (p: NcaProblem) => { problems.push(p); };
  if (typeof input !== 'object' || input === null) {
    return { problems: [{ field: 'input', message: 'the input must be an object with t, c, dose, route, auc and terminal' }] };
  }
  const { t, c, dose, route, duration, auc, terminal } = input;
  if (!Array.isArray(t)) add({ field: 't', message: `t must be a list of times; it is ${describe(t)}` });
  if (!Array.isArray(c)) add({ field: 'c', message: `c must be a list of concentrations; it is ${describe(c)}` });
  if (!isFiniteNumber(dose) || dose <= 0) add({ field: 'dose', message: `dose must be a positive amount; it is ${describe(dose)}` });
  if (!ROUTES.includes(route)) add({ field: 'route', message: `route must be iv-bolus, infusion or extravascular; it is ${describe(route)}` });
  if (route === 'infusion' && !(isFiniteNumber(duration) && duration > 0)) {
    add({ field: 'duration', message: `an infusion needs its duration, a positive time; it is ${describe(duration)}` });
  }
  if (!AUC_RULES.includes(auc)) add({ field: 'auc', message: `auc must be linear or linear-up-log-down; it is ${describe(auc)}` });
  if (terminal !== 'auto' && !(Number.isInteger(terminal) && terminal >= 2)) {
    add({ field: 'terminal', message: `terminal must be auto or a whole number of last points, at least 2; it is ${describe(terminal)}` });
  }
  const samples: Sample[] = [];
  if (Array.isArray(t) && Array.isArray(c)) {
    if (t.length !== c.length) {
      add({ field: 'c', message: `t has ${t.length} rows but c has ${c.length}; each time needs its concentration (null when missing)` });
    }
    const rows = Math.min(t.length, c.length);
    for (let i = 0; i < rows; i++) {
      const ti: unknown = t[i];
      const ci: unknown = c[i];
      if (!isFiniteNumber(ti)) {
        add({ field: 't', index: i, message: `row ${i + 1}: the time ${describe(ti)} is not a finite number` });
      } else if (ti < 0) {
        add({ field: 't', index: i, message: `row ${i + 1}: the time ${ti} is before the dose; times are counted from the dose at 0` });
      } else if (i > 0 && isFiniteNumber(t[i - 1]) && ti <= t[i - 1]) {
        add({
          field: 't', index: i,
          message: `row ${i + 1}: the time ${ti} ${ti === t[i - 1] ? 'repeats' : 'comes before'} the time of row ${i} (${t[i - 1]}); times must increase`,
        });
      }
      if (ci === null || ci === undefined) continue;
      if (!isFiniteNumber(ci)) {
        add({ field: 'c', index: i, message: `row ${i + 1}: the concentration ${describe(ci)} is not a finite number (use null for a missing sample)` });
      } else if (isFiniteNumber(ti)) {
        samples.push({ row: i, t: ti, c: ci });
      }
    }
  }
  if (problems.length > 0) return { problems };
  if (samples.length < 3) {
    return { problems: [{ field: 'c', message: `only ${samples.length} row${samples.length === 1 ? ' has' : 's have'} a concentration; at least 3 are needed` }] };
  }
  const first = samples[0].c;
  if (samples.every((s) => s.c === first)) {
    const what = first === 0 ? 'every concentration is zero' : `every concentration is ${first}`;
    return { problems: [{ field: 'c', message: `${what}: there is no peak and no decline to analyse` }] };
  }
  if (samples.every((s) => s.c <= 0)) {
    return { problems: [{ field: 'c', message: 'no concentration is above zero: there is nothing to analyse' }] };
  }
  return { samples };
}

export function failure(problems: readonly NcaProblem[]): NcaFailure {
  const shown = problems.slice(0, MAX_PROBLEMS);
  const more = problems.length - shown.length;
  return { ok: false, message: more > 0 ? `${shown[0].message} (and ${problems.length - 1} more problems)` : shown[0].message, problems: shown };
}
