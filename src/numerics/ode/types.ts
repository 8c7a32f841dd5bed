/**
 * Shared types of the ODE solver layer: the right-hand side, the options every solver reads,
 * the status of a run with its message table, the counters, and dense output.
 *
 * Everything here is plain numbers: SI magnitudes of the states and of time, no units. A
 * numerical failure is a result (a status, a message, where it happened); an invalid option
 * is a `RangeError` whose message names the option.
 */

/**
 * The right-hand side of y' = f(t, y) for n states: writes f(t, y) into `dy` (length n).
 * It must not keep `y` or `dy` (the solver reuses them) and should not throw; a rate that
 * cannot be computed is reported by writing NaN.
 */
export type Rhs = (t: number, y: Float64Array, dy: Float64Array) => void;

/**
 * An analytic Jacobian ∂f/∂y at (t, y), written row-major into `jac` (n×n: jac[i*n + j] =
 * ∂f_i/∂y_j). Optional: the stiff method differences f when it is absent.
 */
export type Jacobian = (t: number, y: Float64Array, jac: Float64Array) => void;

/** Options read by every solver. Defaults are in `control.ts` (`DEFAULTS`). */
export interface SolverOptions {
  /** Relative tolerance, a positive number (default 1e-6). */
  readonly rtol?: number;
  /** Absolute tolerance, one positive number or one per state (default 1e-9). */
  readonly atol?: number | ArrayLike<number>;
  /** Size of the first trial step (for example `nextStep` of a previous run); chosen by the solver when absent. */
  readonly firstStep?: number;
  /** Largest step allowed (default: the whole span). */
  readonly maxStep?: number;
  /** Most step attempts, accepted or rejected, before the run stops with `budget` (default 100 000). */
  readonly maxSteps?: number;
  /** Most evaluations of f before the run stops with `budget`; checked between steps (default 10 000 000). */
  readonly maxEvaluations?: number;
  /** Analytic Jacobian for the stiff method. */
  readonly jacobian?: Jacobian;
  /**
   * Set when f does not depend on t: the stiff method then skips estimating ∂f/∂t, which
   * costs one evaluation per step. Default false.
   */
  readonly autonomous?: boolean;
  /**
   * The stiff method also bounds the estimated error of its dense output at mid-step, so
   * that values between steps (crossings, maxima) meet the tolerance too. On stiff problems
   * with smooth forcing this costs extra steps; set false when only step ends matter.
   * Default true.
   */
  readonly denseErrorControl?: boolean;
}

/** How a run ended. */
export const Status = {
  /** Reached the end time. */
  Success: 'success',
  /** The solution grew without bound (a finite-time singularity). */
  Blowup: 'blowup',
  /** f gave NaN or an infinity at a state the solver could not avoid. */
  UndefinedRate: 'undefined-rate',
  /** The step size fell to the resolution of t while the solution stayed bounded. */
  StepCollapse: 'step-collapse',
  /** The step or evaluation budget ran out. */
  Budget: 'budget',
} as const;
export type Status = (typeof Status)[keyof typeof Status];

/** Work done by a run. Evaluations count every call of f, Jacobian differencing included. */
export interface Counters {
  /** Accepted steps. */
  steps: number;
  /** Rejected step attempts (error too large, or f not finite at a trial stage). */
  rejected: number;
  evaluations: number;
  /** Jacobians formed (analytic or by differences). */
  jacobians: number;
  /** LU factorizations. */
  factorizations: number;
  /** Time at which `auto` switched from dopri5 to the stiff method, or null. */
  switchedToStiff: number | null;
}

export function newCounters(): Counters {
  return { steps: 0, rejected: 0, evaluations: 0, jacobians: 0, factorizations: 0, switchedToStiff: null };
}

/**
 * The continuous solution over one accepted step [t0, t1]. `eval` writes y(t) into `out`
 * (length n); t outside [t0, t1] is clamped to the nearer end, and the ends reproduce the
 * step's end states bit for bit.
 */
export interface DenseSegment {
  readonly t0: number;
  readonly t1: number;
  eval(t: number, out: Float64Array): void;
}

/** Where a run stopped: the time and the state there (a copy). */
export interface Where {
  readonly t: number;
  readonly y: Float64Array;
}

/** Extra facts a message may use. */
export interface MessageDetail {
  /** The budget that ran out. */
  readonly budget?: 'steps' | 'evaluations';
  readonly limit?: number;
  /** The run used an explicit method: a collapsed step suggests the stiff method. */
  readonly suggestStiff?: boolean;
}

/**
 * A short number for messages: six significant digits without trailing zeros
 * (0.99999999999996 → "1"), in exponent form below 1e-4 and from 1e6 up (3.9721e+13).
 */
export function formatForMessage(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return '0';
  const short = Number(x.toPrecision(6));
  const size = Math.abs(short);
  return size >= 1e6 || size < 1e-4 ? short.toExponential() : String(short);
}

function formatState(y: ArrayLike<number>): string {
  const parts: string[] = [];
  for (let i = 0; i < y.length; i++) parts.push(formatForMessage(y[i]));
  return `[${parts.join(', ')}]`;
}

/** The message for each status; each failure says where (time and state). */
export const MESSAGES: { readonly [S in Status]: (at: Where, detail?: MessageDetail) => string } = {
  [Status.Success]: (at) => `reached t = ${formatForMessage(at.t)}`,
  [Status.Blowup]: (at) =>
    `the solution grows without bound near t = ${formatForMessage(at.t)} (state ${formatState(at.y)})`,
  [Status.UndefinedRate]: (at) =>
    `the rate is not a finite number at t = ${formatForMessage(at.t)}, state ${formatState(at.y)}`,
  [Status.StepCollapse]: (at, detail) =>
    `the step size fell to the resolution of t near t = ${formatForMessage(at.t)} (state ${formatState(at.y)}); ` +
    'the rate may jump there or change faster than t can resolve' + (detail?.suggestStiff ? ' (try the stiff method)' : ''),
  [Status.Budget]: (at, detail) =>
    `stopped at t = ${formatForMessage(at.t)} (state ${formatState(at.y)}) after ` +
    (detail?.budget === 'evaluations'
      ? `${detail.limit ?? ''} evaluations of the rate (the evaluation budget)`
      : `${detail?.limit ?? ''} step attempts (the step budget)`),
};

/** The statuses that end a run early. */
export type FailureStatus = Exclude<Status, 'success'>;

/**
 * What each failure means and what to try, without where it happened: for a caller that
 * states the time and the states itself, in its own units (a simulate cell does, in the
 * units of the study). `detail.limit` is the step budget for `Budget`.
 */
export const FAILURE_CAUSES: { readonly [S in FailureStatus]: (detail?: MessageDetail) => string } = {
  [Status.Blowup]: () => 'the solution grows without bound (a finite-time blow-up)',
  [Status.UndefinedRate]: () => 'the rate is not a number there (a logarithm or square root of a negative value, or a division by zero?)',
  [Status.StepCollapse]: () => 'the step size collapsed (the rate may jump there; try the stiff method)',
  [Status.Budget]: (detail) => `the run used its budget of ${detail?.limit ?? ''} steps (shorten the run, loosen the tolerance, or try the stiff method)`,
};

/**
 * The shared start of every dense segment's `eval`: at or before t0 the step's first state,
 * at or after t1 its last, bit for bit (both stored in `data` from `at`, first then last).
 * Returns true when it wrote one of them, false when t is inside and the caller interpolates.
 */
export function writeStepEnd(t: number, t0: number, t1: number, data: Float64Array, n: number, out: Float64Array, at = 0): boolean {
  // element by element: a subarray would allocate on every call at a step's end
  if (t <= t0) {
    for (let i = 0; i < n; i++) out[i] = data[at + i];
    return true;
  }
  if (t >= t1) {
    for (let i = 0; i < n; i++) out[i] = data[at + n + i];
    return true;
  }
  return false;
}

/**
 * Numbers for dense output handed out in chunks, so that a step's segment costs no
 * allocation of its own (an array per step was a fifth of a schedule's run). A region is
 * never handed out twice: a segment's numbers stay its own for as long as it lives, which
 * keeps its chunk alive too (at most `CHUNK` numbers).
 */
export class DenseSlab {
  static readonly CHUNK = 2048;
  /** The chunk the last `take` gave a region of. */
  data = new Float64Array(0);
  private used = 0;

  /** The offset in `data` (read after the call) of `size` numbers that belong to no one else. */
  take(size: number): number {
    if (this.used + size > this.data.length) {
      this.data = new Float64Array(Math.max(DenseSlab.CHUNK, size));
      this.used = 0;
    }
    const at = this.used;
    this.used += size;
    return at;
  }
}
