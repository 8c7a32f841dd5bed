/**
 * The work a cell may do (`numerics/work-meter.ts` counts it): evaluations of a rate, steps,
 * samples of a solution, points of a sweep, actions of a schedule, one unit each. A cell that
 * needs more is stopped with a message on the cell instead of running on for seconds; the
 * other cells still run. A time limit for a whole evaluation (the command line's `--timeout`)
 * stops the cell running when it passes, and the cells after it, the same way.
 */
import type { CellError, GraphNode } from './node.ts';
import type { WorkExceeded } from '../numerics/work-meter.ts';
import { CELL_PATH } from '../cells/index.ts';

/**
 * Units of work a cell may use by default: every template's cells use under 100,000
 * (`test/engine/bounded-work.test.ts`), and this many take about a second in Node.
 */
export const DEFAULT_CELL_WORK = 3_000_000;

/** The limits an evaluation runs under. */
export interface WorkLimits {
  /** Units of work per cell (default `DEFAULT_CELL_WORK`). */
  readonly cellWork?: number;
  /** Seconds an evaluation (opening the study, or one edit) may take; none by default. */
  readonly timeLimit?: number;
}

/** What to make smaller, said after a stopped cell's limit unless its node says otherwise (`GraphNode.workAdvice`). */
const RUN_ADVICE = 'shorten the run, loosen the tolerance, use a larger step or fewer sweep steps or repeats';

/** The error of a node stopped by its budget or by the time limit, on its cell. */
export function stoppedError(node: GraphNode, stop: WorkExceeded, limits: WorkLimits): CellError {
  const message = stop.reason === 'budget'
    ? `stopped: this cell needed more than ${stop.limit.toLocaleString('en-US')} units of work (evaluations of a rate, steps, samples, sweep points, doses), its limit; `
      + (node.workAdvice ?? RUN_ADVICE)
    : `stopped: the time limit (${limits.timeLimit} s) ran out while this cell was computing; allow more time or make the study smaller`;
  return { kind: 'numeric', message, path: CELL_PATH };
}
