/**
 * Messages between the app and the engine's worker. The worker holds one study session;
 * the app sends the study once, then batches of edits, each with a sequence number; every
 * answer carries the number of the last message it reflects, so a stale answer is known.
 * On the way to the page a fit cell's `residuals` travel as `residualColumns` (typed arrays,
 * transferred: `output/residual-columns.ts`); the page's client gives the report its
 * `residuals` back, made from the columns when first read.
 *
 * Long cells (a Monte Carlo uncertainty cell) are computed after the answer, in slices between
 * messages (`SessionOptions.defer`): the answer names them `pending` (their figures are the
 * previous ones) with the `progress` of the one computing; `progress` messages follow a few
 * times a second at most, and when a pending cell is done a `late` report, with the same `seq`
 * (no message came since). An edit that reaches their inputs starts them again.
 */
import type { Edit } from '../study/edit.ts';
import type { Report } from './report.ts';
import type { Problem } from '../study/validate.ts';
import type { Progress } from './sliced.ts';

export type ToWorker =
  | { readonly type: 'open'; readonly seq: number; readonly doc: unknown }
  | { readonly type: 'edits'; readonly seq: number; readonly edits: readonly Edit[] };

export type FromWorker =
  | {
    readonly type: 'report'; readonly seq: number; readonly report: Report; readonly rerun: readonly string[]; readonly changed: readonly string[];
    /** Time the engine spent, and when (ms since the epoch) the worker got the message and sent its answer. */
    readonly ms: number; readonly received?: number; readonly sent?: number;
    /** Ids of the cells whose figures are the previous ones, still computing; how far the one computing is. */
    readonly pending?: readonly string[]; readonly progress?: Progress;
    /** A pending cell finished after the answer to `seq`. */
    readonly late?: true;
  }
  | { readonly type: 'progress'; readonly seq: number; readonly progress: Progress }
  | { readonly type: 'refused'; readonly seq: number; readonly error: Problem };
