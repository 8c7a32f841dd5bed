/** Evaluating a whole study in one call: what the command line and the tests use. */
import { openStudy } from './session.ts';
import type { WorkLimits } from './budget.ts';
import type { Report } from './report.ts';
import type { Problem } from '../study/validate.ts';

export type RunResult = { readonly ok: true; readonly report: Report } | { readonly ok: false; readonly error: Problem };

/** Reads and evaluates a study (JSON text or a parsed value), each cell within `limits`. Never throws. */
export function runStudy(input: unknown, mode: 'run' | 'check' = 'run', limits: WorkLimits = {}): RunResult {
  const opened = openStudy(input, { mode, ...limits });
  return opened.ok ? { ok: true, report: opened.session.report() } : opened;
}

/** The contract's exit status: 0 all cells ok, 1 a cell has an error, 2 not a study. */
export function exitCodeOf(result: RunResult): 0 | 1 | 2 {
  if (!result.ok) return 2;
  return result.report.ok ? 0 : 1;
}
