/**
 * The machinery every ODE stepper shares: option checking and defaults, the counted
 * evaluation of f, the error norm, the initial step, the smallest resolvable step, and the
 * rules that tell a blow-up from an undefined rate or a collapsed step.
 *
 * The stepper contract (SciPy's `OdeSolver` shape): a stepper holds the accepted (t, y); its
 * `step(tEnd)` makes exactly one accepted step that never passes tEnd, or returns a failure
 * that says where. The run loop (`integrate.ts`) sits outside the steppers.
 */
import {
  type Counters, type DenseSegment, type MessageDetail, type Rhs, type SolverOptions, type Where,
  Status,
} from './types.ts';
import { charge } from '../work-meter.ts';

/** Defaults of the options in `SolverOptions`. */
export const DEFAULTS = {
  rtol: 1e-6,
  atol: 1e-9,
  maxSteps: 100_000,
  maxEvaluations: 10_000_000,
} as const;

const EPS = Number.EPSILON;

/**
 * A step is "collapsed" when it is below this many units in the last place of t: the time
 * grid can no longer resolve it (SciPy uses 10; any small multiple works).
 */
export const STEP_RESOLUTION_ULPS = 16;

/** A state component beyond this multiple of its scale is taken as a blow-up. */
export const BLOWUP_BOUND = 1e150;

/**
 * At a collapsed step, a component that has grown past this multiple of its scale and whose
 * e-folding time |y|/|f| is below `SINGULAR_TIME_FRACTION` of the run's span marks a
 * finite-time singularity (blow-up) rather than a jump in the rate.
 */
export const BLOWUP_GROWTH = 1e6;
export const SINGULAR_TIME_FRACTION = 1e-6;

/** Options after checking, with defaults filled in. */
export interface ResolvedOptions {
  readonly rtol: number;
  readonly atol: Float64Array;
  readonly firstStep: number | undefined;
  readonly maxStep: number;
  readonly maxSteps: number;
  readonly maxEvaluations: number;
}

function positive(name: string, x: unknown): number {
  if (typeof x !== 'number' || !Number.isFinite(x) || x <= 0) {
    throw new RangeError(`${name} must be a positive finite number; it is ${String(x)}`);
  }
  return x;
}

function count(name: string, x: unknown): number {
  if (x === Infinity) return Infinity;
  if (typeof x !== 'number' || !Number.isInteger(x) || x < 1) {
    throw new RangeError(`${name} must be a positive whole number; it is ${String(x)}`);
  }
  return x;
}

/** Checks the options for a system of n states over a span; throws a RangeError naming the bad option. */
export function resolveOptions(options: SolverOptions, n: number, span: number): ResolvedOptions {
  const rtol = positive('rtol', options.rtol ?? DEFAULTS.rtol);
  const atolIn = options.atol ?? DEFAULTS.atol;
  const atol = new Float64Array(n);
  if (typeof atolIn === 'number') {
    atol.fill(positive('atol', atolIn));
  } else {
    if (atolIn.length !== n) throw new RangeError(`atol must have one entry per state (${n}); it has ${atolIn.length}`);
    for (let i = 0; i < n; i++) atol[i] = positive(`atol[${i}]`, atolIn[i]);
  }
  const firstStep = options.firstStep === undefined ? undefined : positive('firstStep', options.firstStep);
  const maxStep = options.maxStep === undefined ? Math.max(span, Number.MIN_VALUE) : positive('maxStep', options.maxStep);
  return {
    rtol, atol, firstStep, maxStep,
    maxSteps: count('maxSteps', options.maxSteps ?? DEFAULTS.maxSteps),
    maxEvaluations: count('maxEvaluations', options.maxEvaluations ?? DEFAULTS.maxEvaluations),
  };
}

/** Calls f, counts the call, and tells whether every component came out finite. */
export class Evaluator {
  constructor(private readonly f: Rhs, private readonly counters: Counters) {}

  /** Writes f(t, y) into dy; false when some component is NaN or infinite. */
  call(t: number, y: Float64Array, dy: Float64Array): boolean {
    this.counters.evaluations++;
    charge();
    this.f(t, y, dy);
    for (let i = 0; i < dy.length; i++) if (!Number.isFinite(dy[i])) return false;
    return true;
  }
}

/** What one run shares between its steppers (a switch from dopri5 to the stiff method keeps it). */
export interface OdeContext {
  readonly n: number;
  readonly rhs: Evaluator;
  readonly options: ResolvedOptions;
  readonly counters: Counters;
  /** Scale of each state for blow-up tests: max(|y0_i|, atol_i). */
  readonly scale: Float64Array;
  /** Length of the whole run, t1 - t0. */
  readonly span: number;
  /** Step attempts so far, accepted or rejected. */
  attempts: number;
}

export function newContext(f: Rhs, y0: Float64Array, options: ResolvedOptions, counters: Counters, span: number): OdeContext {
  const n = y0.length;
  const scale = new Float64Array(n);
  for (let i = 0; i < n; i++) scale[i] = Math.max(Math.abs(y0[i]), options.atol[i]);
  return { n, rhs: new Evaluator(f, counters), options, counters, scale, span, attempts: 0 };
}

/** One accepted step, or where and why the run must stop. */
export type StepOutcome =
  | { readonly ok: true; readonly segment: DenseSegment }
  | { readonly ok: false; readonly status: Status; readonly at: Where; readonly detail?: MessageDetail };

/** A stepper: holds the accepted state and makes one accepted step at a time. */
export interface Stepper {
  readonly t: number;
  /** The accepted state; read only, owned by the stepper. */
  readonly y: Float64Array;
  /** Size of the next trial step. */
  readonly h: number;
  /** Makes one accepted step towards tEnd, landing on it exactly when within reach. */
  step(tEnd: number): StepOutcome;
}

export function failure(status: Status, t: number, y: ArrayLike<number>, detail?: MessageDetail): StepOutcome {
  return { ok: false, status, at: { t, y: Float64Array.from(y) }, detail };
}

/** A budget failure when the next attempt would exceed a budget, else null. Counts the attempt otherwise. */
export function spendAttempt(ctx: OdeContext, t: number, y: Float64Array): StepOutcome | null {
  const o = ctx.options;
  if (ctx.attempts >= o.maxSteps) return failure(Status.Budget, t, y, { budget: 'steps', limit: o.maxSteps });
  if (ctx.counters.evaluations >= o.maxEvaluations) {
    return failure(Status.Budget, t, y, { budget: 'evaluations', limit: o.maxEvaluations });
  }
  ctx.attempts++;
  return null;
}

/** The smallest step the time grid resolves at t. */
export function minStep(t: number): number {
  return Math.max(STEP_RESOLUTION_ULPS * EPS * Math.abs(t), Number.MIN_VALUE);
}

/**
 * Root-mean-square of err_i / (atol_i + rtol·max(|y0_i|, |y1_i|)): the step is acceptable
 * when this is at most 1 (Hairer, Nørsett & Wanner, Solving ODEs I, sec. II.4, eq. 4.11).
 */
export function errorNorm(err: Float64Array, y0: Float64Array, y1: Float64Array, o: ResolvedOptions): number {
  let sum = 0;
  for (let i = 0; i < err.length; i++) {
    const sc = o.atol[i] + o.rtol * Math.max(Math.abs(y0[i]), Math.abs(y1[i]));
    const r = err[i] / sc;
    sum += r * r;
  }
  return Math.sqrt(sum / err.length);
}

/** Root-mean-square of v_i / (atol_i + rtol·|y_i|). */
export function scaledRms(v: Float64Array, y: Float64Array, o: ResolvedOptions): number {
  let sum = 0;
  for (let i = 0; i < v.length; i++) {
    const r = v[i] / (o.atol[i] + o.rtol * Math.abs(y[i]));
    sum += r * r;
  }
  return Math.sqrt(sum / v.length);
}

/**
 * The starting step of Hairer, Nørsett & Wanner, Solving ODEs I, sec. II.4 ("Starting step
 * size"), for a method whose error estimate has order p: a first guess from |y0|/|f0|, one
 * explicit Euler probe to estimate the second derivative, then h ~ (0.01/|y''|)^(1/(p+1)).
 * The book's absolute fallback 1e-6 assumes unit time; here it is 1e-6 of the span, since
 * t is in seconds and spans run from milliseconds to years. Costs one evaluation of f.
 */
export function initialStep(ctx: OdeContext, t0: number, y0: Float64Array, f0: Float64Array, tEnd: number, p: number): number {
  const o = ctx.options;
  const span = tEnd - t0;
  const d0 = scaledRms(y0, y0, o);
  const d1 = scaledRms(f0, y0, o);
  let h0 = d0 < 1e-5 || d1 < 1e-5 ? 1e-6 * span : (0.01 * d0) / d1;
  h0 = Math.min(h0, o.maxStep, span);
  const n = ctx.n;
  const y1 = new Float64Array(n);
  for (let i = 0; i < n; i++) y1[i] = y0[i] + h0 * f0[i];
  const f1 = new Float64Array(n);
  if (!ctx.rhs.call(t0 + h0, y1, f1)) return Math.max(h0 * 1e-3, minStep(t0));
  for (let i = 0; i < n; i++) f1[i] = (f1[i] - f0[i]) / h0;
  const d2 = scaledRms(f1, y0, o);
  const big = Math.max(d1, d2);
  const h1 = big <= 1e-15 ? Math.max(1e-6 * span, h0 * 1e-3) : Math.pow(0.01 / big, 1 / (p + 1));
  return Math.max(Math.min(100 * h0, h1, o.maxStep, span), minStep(t0));
}

/** True when some component is not finite or beyond `BLOWUP_BOUND` times its scale. */
export function beyondBound(ctx: OdeContext, y: ArrayLike<number>): boolean {
  for (let i = 0; i < ctx.n; i++) {
    const v = Math.abs(y[i]);
    if (!(v <= BLOWUP_BOUND * ctx.scale[i])) return true;
  }
  return false;
}

/**
 * Whether the current state looks like the approach to a finite-time singularity: some
 * component has grown past `BLOWUP_GROWTH` times its scale and e-folds (|y|/|f|) within
 * `SINGULAR_TIME_FRACTION` of the span. `f` is f at (t, y).
 */
function nearSingularity(ctx: OdeContext, y: Float64Array, f: Float64Array): boolean {
  for (let i = 0; i < ctx.n; i++) {
    const v = Math.abs(y[i]);
    if (!(v > BLOWUP_GROWTH * ctx.scale[i])) continue;
    const rate = Math.abs(f[i]);
    if (!Number.isFinite(rate) || v < SINGULAR_TIME_FRACTION * ctx.span * rate) return true;
  }
  return false;
}

/**
 * Classifies f not finite at a stage state `arg` reached from the accepted state `y`: a
 * blow-up when the stage state is beyond the bound, or when f is infinite (not NaN) while
 * the accepted state has grown past `BLOWUP_GROWTH`; otherwise an undefined rate.
 */
export function nonFiniteStatus(ctx: OdeContext, y: Float64Array, arg: Float64Array, f: Float64Array): Status {
  if (beyondBound(ctx, arg)) return Status.Blowup;
  let infinite = false;
  let nan = false;
  for (let i = 0; i < ctx.n; i++) {
    if (Number.isNaN(f[i])) nan = true;
    else if (!Number.isFinite(f[i])) infinite = true;
  }
  if (infinite && !nan) {
    for (let i = 0; i < ctx.n; i++) if (Math.abs(y[i]) > BLOWUP_GROWTH * ctx.scale[i]) return Status.Blowup;
  }
  return Status.UndefinedRate;
}

/**
 * Where a trial stage gave a non-finite rate: kept by the adaptive steppers so that a step
 * that collapses while avoiding it can say where the rate was undefined.
 */
export class NonFiniteMark {
  t = NaN;
  status: Status = Status.UndefinedRate;
  y: Float64Array;
  constructor(n: number) {
    this.y = new Float64Array(n);
  }

  set(ctx: OdeContext, t: number, accepted: Float64Array, arg: Float64Array, f: Float64Array): void {
    this.t = t;
    this.y.set(arg);
    this.status = nonFiniteStatus(ctx, accepted, arg, f);
  }

  clear(): void {
    this.t = NaN;
  }

  get active(): boolean {
    return !Number.isNaN(this.t);
  }
}

/**
 * The failure for a step that fell below `minStep` at the accepted (t, y) with f0 = f(t, y):
 * an undefined rate at the trial state where f failed, when that forced the last
 * rejections; a blow-up (at the accepted state, the last one before the singularity) when
 * that failure looked like one or the state is near a singularity; else a collapsed step.
 */
export function collapseFailure(ctx: OdeContext, t: number, y: Float64Array, f0: Float64Array, mark: NonFiniteMark): StepOutcome {
  if (mark.active) return mark.status === Status.Blowup ? failure(Status.Blowup, t, y) : failure(mark.status, mark.t, mark.y);
  if (nearSingularity(ctx, y, f0)) return failure(Status.Blowup, t, y);
  return failure(Status.StepCollapse, t, y);
}

/**
 * The step to try from t towards tEnd: h capped by maxStep, stretched or cut to land on tEnd
 * when tEnd is within `LANDING_SLACK` of a step (so no sliver of a last step remains).
 */
export const LANDING_SLACK = 1.01;

export function trialStep(t: number, h: number, tEnd: number, maxStep: number): { h: number; last: boolean } {
  const hh = Math.min(h, maxStep);
  if (t + LANDING_SLACK * hh >= tEnd) return { h: tEnd - t, last: true };
  return { h: hh, last: false };
}
