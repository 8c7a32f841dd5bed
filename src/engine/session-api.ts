/**
 * The types of the session's API (`session.ts`): what opening a study, an edit and a slice of
 * deferred work answer, and the options a session is opened with.
 */
import type { Problem } from '../study/validate.ts';
import type { Report } from './report.ts';
import type { WorkLimits } from './budget.ts';
import type { Progress } from './sliced.ts';
import type { StudySession } from './session.ts';

export type EditResult =
  | { readonly ok: true; readonly rerun: readonly string[]; readonly changed: readonly string[]; readonly report: Report }
  | { readonly ok: false; readonly error: Problem };

export type OpenResult = { readonly ok: true; readonly session: StudySession } | { readonly ok: false; readonly error: Problem };

export interface SessionOptions extends WorkLimits {
  /** 'check' validates without the heavy numerics. */
  readonly mode?: 'run' | 'check';
  /**
   * Leave long cells (a Monte Carlo uncertainty cell) and what reads them pending in an
   * evaluation, for `work` to compute in slices afterwards (the app's worker); the figures are
   * the same as without.
   */
  readonly defer?: boolean;
}

/** What a slice of deferred work did: how far the running cell is, and the answer of an evaluation when a cell finished. */
export interface WorkStep {
  readonly progress?: Progress;
  /**
   * Nothing was done: every pending cell that could start had its inputs changed by an edit
   * after the `startable` time given. The earliest such edit's time (performance.now()).
   */
  readonly notBefore?: number;
  readonly answer?: { readonly rerun: readonly string[]; readonly changed: readonly string[]; readonly report: Report };
}
