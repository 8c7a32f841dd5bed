/**
 * The one entry point of the ODE layer: `integrate` runs y' = f(t, y) from t0 to t1 with a
 * chosen method and returns the end state, the dense output over the covered span, the work
 * done and, on failure, where and why it stopped. `denseAt` evaluates that dense output at
 * any covered time.
 *
 * Events and schedules are the caller's: it calls `integrate` piecewise between event
 * times, passing `nextStep` of one piece as `firstStep` of the next.
 */
import {
  type OdeContext, type Stepper, beyondBound, newContext, resolveOptions,
} from './control.ts';
import { AdamsStepper } from './adams.ts';
import { Dopri5Stepper } from './dopri5.ts';
import { Dp853Stepper } from './dp853.ts';
import { EmbeddedRkStepper } from './embedded-rk.ts';
import { type StiffFormula, formulaNow, stiffStepper } from './stiff-choice.ts';
import { FixedStepper } from './fixed-step.ts';
import { EULER, HEUN, RK4 } from './explicit-rk.ts';
import {
  type Counters, type DenseSegment, type MessageDetail, type Rhs, type SolverOptions, type Where,
  MESSAGES, Status, newCounters,
} from './types.ts';

/**
 * `auto` starts with an explicit method (dopri5, or the variable-order Adams formulas when
 * rtol <= `ADAMS_FROM_RTOL`) and switches to `stiff` when that method reports
 * stiffness; `rk4`, `heun` and `euler` are fixed-step and need `step`.
 */
export const METHODS = ['auto', 'dopri5', 'stiff', 'rk4', 'heun', 'euler', 'dp853', 'adams'] as const;
export type Method = (typeof METHODS)[number];
export type MethodUsed = Exclude<Method, 'auto'>;

/**
 * `auto` starts with the Adams formulas (orders up to 13) rather than dopri5 (order 5) at
 * this rtol and below. At 1e-6, the simulate cell's default, they need fewer evaluations than
 * dopri5 on logistic growth, Bateman, the 6 IV doses and within 3 % of its count on the two
 * others, within 1 tolerance unit; with their step updated in place (`adams-history.ts`) and
 * PECE's longer steps, a run of the 6-dose study costs about the processor time of dopri5's
 * (bench/README.md, "ODE step cost" and the dosing and Monte Carlo loops).
 */
export const ADAMS_FROM_RTOL = 1e-6;

/**
 * The explicit method `auto` starts with at this rtol; for a piece of a schedule with doses
 * still to come (`piecewise`), only below `ADAMS_FROM_RTOL`. Each piece starts the Adams
 * formulas again (a dopri5 step and a new history) while dopri5 carries its step across the
 * dose, so on a schedule of cheap laws dopri5 costs less processor time at 1e-6 (the 6-dose
 * study: 650 µs median and 1.10 ms at the 95th percentile with Adams, 438 / 656 µs with
 * dopri5, quiet machine, bench/README.md) for evaluations still 0.68x LSODA's there.
 */
export function autoExplicit(rtol: number, piecewise = false): 'dopri5' | 'adams' {
  return (piecewise ? rtol < ADAMS_FROM_RTOL : rtol <= ADAMS_FROM_RTOL) ? 'adams' : 'dopri5';
}

export interface IntegrateOptions extends SolverOptions {
  /** Default 'auto'. */
  readonly method?: Method;
  /** The step of the fixed-step methods (same unit as t). */
  readonly step?: number;
  /** The formula the stiff method runs, whatever the problem; default: chosen by `stiff-choice.ts`. */
  readonly stiffFormula?: StiffFormula;
  /** The run is a piece of a schedule with doses still to come: see `autoExplicit`. */
  readonly piecewise?: boolean;
}

export interface IntegrateResult {
  readonly status: Status;
  /** From `MESSAGES`: says where the run stopped. */
  readonly message: string;
  /** Time reached: t1 on success, else the last accepted time. */
  readonly t: number;
  /** State at `t` (a copy). */
  readonly y: Float64Array;
  /** One per accepted step, in order, covering [t0, t] without gaps. */
  readonly segments: readonly DenseSegment[];
  readonly counters: Counters;
  /** The method that made the last step ('dopri5', 'adams' or 'stiff' for auto). */
  readonly method: MethodUsed;
  /**
   * The formula the stiff method ran last ('ndf' for a run that is stiff over its span, or
   * once RODAS handed it over on the way; else 'rodas': see `stiff-choice.ts`), or null when
   * it did not run.
   */
  readonly stiffFormula: StiffFormula | null;
  /** Time at which auto switched to the stiff method, or null. */
  readonly switchedToStiff: number | null;
  /** Time at which dopri5, dp853 or adams first found the problem stiff (auto then switches), or null. */
  readonly stiffnessDetected: number | null;
  /** Step size to start a continuation with (pass as `firstStep`). */
  readonly nextStep: number;
  /** On failure, the time and state the message speaks of (may be a trial state past `t`). */
  readonly failure: Where | null;
  readonly detail?: MessageDetail;
}

/** A run's result; its message is put in words when read (the pieces of a schedule, the runs of a what-if seldom read it). */
class Result implements IntegrateResult {
  readonly #at: Where;
  readonly switchedToStiff: number | null;
  readonly failure: Where | null;
  constructor(
    readonly status: Status, at: Where, readonly t: number, readonly y: Float64Array, readonly segments: readonly DenseSegment[],
    readonly counters: Counters, readonly method: MethodUsed, readonly stiffFormula: StiffFormula | null,
    readonly stiffnessDetected: number | null, readonly nextStep: number, readonly detail: MessageDetail | undefined,
  ) {
    this.#at = at;
    this.switchedToStiff = counters.switchedToStiff;
    this.failure = status === Status.Success ? null : at;
  }

  get message(): string {
    return MESSAGES[this.status](this.#at, this.detail);
  }
}

function checkInputs(t0: number, y0: ArrayLike<number>, t1: number, method: Method, step: number | undefined): void {
  if (!Number.isFinite(t0)) throw new RangeError(`t0 must be a finite number; it is ${t0}`);
  if (!Number.isFinite(t1)) throw new RangeError(`t1 must be a finite number; it is ${t1}`);
  if (t1 < t0) throw new RangeError(`t1 must not be before t0 (t0 = ${t0}, t1 = ${t1})`);
  if (y0.length < 1) throw new RangeError('y0 must hold at least one state');
  for (let i = 0; i < y0.length; i++) {
    if (!Number.isFinite(y0[i])) throw new RangeError(`y0[${i}] must be a finite number; it is ${y0[i]}`);
  }
  if (!(METHODS as readonly string[]).includes(method)) {
    throw new RangeError(`method must be one of ${METHODS.join(', ')}; it is ${String(method)}`);
  }
  const fixed = method === 'rk4' || method === 'heun' || method === 'euler';
  if (fixed && step === undefined) throw new RangeError(`step is required for method ${method}`);
  if (step !== undefined && !(Number.isFinite(step) && step > 0)) {
    throw new RangeError(`step must be a positive finite number; it is ${String(step)}`);
  }
}

/**
 * What one integration leaves for the next: the explicit pairs' and the Adams steppers with
 * their work arrays (`EmbeddedRkStepper.restart`, `AdamsStepper.restart`), so that the pieces of a schedule, or the runs of a
 * what-if loop, set them up once. Results are the same bit for bit as with new steppers
 * (`test/engine/ode-reuse.test.ts`). One integration at a time: a call made while another
 * holds it (an f that integrates) sets up its own.
 */
export interface OdeReuse {
  dopri5?: Dopri5Stepper;
  dp853?: Dp853Stepper;
  adams?: AdamsStepper;
  busy: boolean;
}

export function newOdeReuse(): OdeReuse {
  return { busy: false };
}

/** The explicit pair's stepper: the one `reuse` holds, started again, or a new one. */
function explicitStepper(ctx: OdeContext, method: 'dopri5' | 'dp853', t0: number, y0: ArrayLike<number>, reuse: OdeReuse | undefined): Stepper {
  const first = ctx.options.firstStep;
  const kept = reuse === undefined ? undefined : method === 'dopri5' ? reuse.dopri5 : reuse.dp853;
  if (kept !== undefined && kept.y.length === ctx.n) {
    kept.restart(ctx, t0, y0, first);
    return kept;
  }
  if (method === 'dopri5') {
    const made = new Dopri5Stepper(ctx, t0, y0, first);
    if (reuse) reuse.dopri5 = made;
    return made;
  }
  const made = new Dp853Stepper(ctx, t0, y0, first);
  if (reuse) reuse.dp853 = made;
  return made;
}

/** The Adams stepper: the one `reuse` holds, started again (`AdamsStepper.restart`), or a new one. */
function adamsStepper(ctx: OdeContext, t0: number, y0: ArrayLike<number>, reuse: OdeReuse | undefined): AdamsStepper {
  const kept = reuse?.adams;
  if (kept !== undefined && kept.y.length === ctx.n) {
    kept.restart(ctx, t0, y0, ctx.options.firstStep);
    return kept;
  }
  const made = new AdamsStepper(ctx, t0, y0, ctx.options.firstStep);
  if (reuse) reuse.adams = made;
  return made;
}

function makeStepper(ctx: OdeContext, method: Exclude<MethodUsed, 'stiff'>, t0: number, y0: ArrayLike<number>, options: IntegrateOptions, reuse?: OdeReuse): Stepper {
  switch (method) {
    case 'dopri5': case 'dp853': return explicitStepper(ctx, method, t0, y0, reuse);
    case 'adams': return adamsStepper(ctx, t0, y0, reuse);
    case 'rk4': return new FixedStepper(ctx, RK4, t0, y0, options.step!);
    case 'heun': return new FixedStepper(ctx, HEUN, t0, y0, options.step!);
    case 'euler': return new FixedStepper(ctx, EULER, t0, y0, options.step!);
  }
}

/**
 * Integrates y' = f(t, y), y(t0) = y0 from t0 to t1 (t1 ≥ t0), never evaluating f past t1.
 * Numerical failure is a result (`status` other than success, with `message` and
 * `failure`); invalid input throws a RangeError naming the input. Every loop is bounded by
 * `maxSteps` step attempts. Cost: about 6 evaluations per step for dopri5, 15 for dp853 (11
 * per rejected attempt), 1 for adams (one more every eighth step, its stiffness test); n + 8 per step
 * for the stiff method (one less when `autonomous`, another less without
 * `denseErrorControl`, n less with an analytic `jacobian`); s per step for a fixed-step
 * method of s stages; plus one or two to start. With `reuse`, the explicit pairs' set-up is
 * kept from the last call that used it (see `OdeReuse`).
 */
export function integrate(f: Rhs, t0: number, y0: ArrayLike<number>, t1: number, options: IntegrateOptions = {}, reuse?: OdeReuse): IntegrateResult {
  if (!reuse || reuse.busy) return run(f, t0, y0, t1, options, undefined);
  reuse.busy = true;
  try {
    return run(f, t0, y0, t1, options, reuse);
  } finally {
    reuse.busy = false;
  }
}

function run(f: Rhs, t0: number, y0: ArrayLike<number>, t1: number, options: IntegrateOptions, reuse: OdeReuse | undefined): IntegrateResult {
  const method = options.method ?? 'auto';
  checkInputs(t0, y0, t1, method, options.step);
  const start = Float64Array.from(y0);
  const resolved = resolveOptions(options, start.length, t1 - t0);
  const counters = newCounters();
  const ctx = newContext(f, start, resolved, counters, t1 - t0);
  let used: MethodUsed = method === 'auto' ? autoExplicit(resolved.rtol, options.piecewise) : method;
  let stiffFormula: StiffFormula | null = null;
  let stepper: Stepper;
  if (used === 'stiff') {
    ({ stepper, formula: stiffFormula } = stiffStepper(ctx, t0, start, t1, resolved.firstStep, options, false));
  } else {
    stepper = makeStepper(ctx, used, t0, start, options, reuse);
  }
  const segments: DenseSegment[] = [];
  let stiffnessDetected: number | null = null;

  const finish = (status: Status, at: Where, detail?: MessageDetail): IntegrateResult => new Result(
    status, at, stepper.t, status === Status.Success ? at.y : Float64Array.from(stepper.y), segments, counters, used,
    stiffFormula && formulaNow(stepper, stiffFormula), stiffnessDetected, Number.isFinite(stepper.h) ? stepper.h : resolved.firstStep ?? t1 - t0, detail);

  while (stepper.t < t1) {
    const outcome = stepper.step(t1);
    if (!outcome.ok) {
      const hint = outcome.status === Status.StepCollapse && used !== 'stiff';
      return finish(outcome.status, outcome.at, hint ? { ...outcome.detail, suggestStiff: true } : outcome.detail);
    }
    segments.push(outcome.segment);
    if (beyondBound(ctx, stepper.y)) return finish(Status.Blowup, { t: stepper.t, y: Float64Array.from(stepper.y) });
    if ((stepper instanceof EmbeddedRkStepper || stepper instanceof AdamsStepper) && stepper.stiffAt !== null) {
      if (stiffnessDetected === null) stiffnessDetected = stepper.stiffAt;
      if (method === 'auto' && stepper.t < t1) {
        counters.switchedToStiff = stepper.t;
        used = 'stiff';
        ({ stepper, formula: stiffFormula } = stiffStepper(ctx, stepper.t, stepper.y, t1, stepper.h, options, true));
      }
    }
  }
  return finish(Status.Success, { t: stepper.t, y: Float64Array.from(stepper.y) });
}

/**
 * Index of the segment whose [t0, t1] holds t (binary search; at a shared end the later
 * segment), or -1 when t is outside the covered span. O(log segments).
 */
export function findSegment(segments: readonly DenseSegment[], t: number): number {
  const count = segments.length;
  if (count === 0 || !(t >= segments[0].t0) || !(t <= segments[count - 1].t1)) return -1;
  let lo = 0;
  let hi = count - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (segments[mid].t0 <= t) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** Writes the dense solution at t into out; false (out untouched) when t is outside the covered span. */
export function denseAt(segments: readonly DenseSegment[], t: number, out: Float64Array): boolean {
  const i = findSegment(segments, t);
  if (i < 0) return false;
  segments[i].eval(t, out);
  return true;
}
