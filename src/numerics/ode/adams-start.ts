/**
 * The start of the Adams formulas (`adams.ts`): a Runge–Kutta starting procedure that gives
 * them a history of several past rates at once, so that they begin at a high order and a long
 * step instead of climbing from order 1 and a tiny step. A run of doses restarts the formulas
 * after every dose (the state jumps, so the rates of the old history no longer hold), and that
 * climb cost about two thirds of each piece's evaluations.
 *
 * The idea is Gear's: start a multistep method with a one-step method of high order, and take
 * the history it needs from that (Gear, "Runge–Kutta starters for multistep methods", ACM
 * TOMS 6, 1980; Hairer, Nørsett & Wanner, Solving ODEs I, sec. III.1, "Starting procedures";
 * Shampine & Gordon 1975, ch. 5 discuss the cost of the order-1 start this replaces).
 *
 * Here the one-step method is the Dormand–Prince 5(4) pair (`dopri5.ts`), one step H under a
 * tolerance `START_TOLERANCE` times the run's (the Adams steps aim at a tenth of theirs too:
 * `ADAMS_CONTROL.target`). Its continuous extension of order 4 gives the state at the
 * interior points t0 + jH/(P − 1), and f there gives the rates: P points, equally spaced,
 * f at both ends being the step's own first and last stage. The cost is 6 evaluations for the
 * step (f(t0) is the caller's) and P − 2 for the interior rates; the Adams formulas then go
 * on at order P − 1 with steps up to twice the spacing.
 */
import {
  type OdeContext, type ResolvedOptions, NonFiniteMark, collapseFailure, errorNorm, minStep, spendAttempt, trialStep,
} from './control.ts';
import { DOPRI5, DOPRI5_CONTROL, DOPRI5_E, DOPRI5_PAIR } from './dopri5.ts';
import { RkWork, rkStep } from './explicit-rk.ts';
import type { DenseSegment } from './types.ts';
import type { StepOutcome } from './control.ts';

/** The starting step's error is measured against tolerances this many times the run's. */
export const START_TOLERANCE = 0.1;

/**
 * Points of the history the start gives, from the tolerance: the Adams order that the
 * work-precision problems settle at after a start from order 1, plus one (order 4 to 5 at
 * rtol 1e-3 … 1e-6, 6 to 8 below; measured, bench/README.md).
 */
export function startPoints(rtol: number): number {
  return Math.min(8, Math.max(4, Math.round(-Math.log10(rtol)) - 1));
}

/** What a start leaves: the accepted step and the history, newest first. */
export interface AdamsStart {
  readonly segment: DenseSegment;
  readonly tNew: number;
  /** Times of the history, newest (tNew) first. */
  readonly T: number[];
  /** The rates at those times (new arrays). */
  readonly F: Float64Array[];
  /** The step H that was accepted. */
  readonly h: number;
}

/** Work arrays of the start, made once per stepper. */
export class AdamsStartWork {
  readonly rk: RkWork;
  readonly yNew: Float64Array;
  readonly err: Float64Array;
  readonly arg: Float64Array;
  readonly mark: NonFiniteMark;
  constructor(n: number) {
    this.rk = new RkWork(n, DOPRI5.c.length);
    this.yNew = new Float64Array(n);
    this.err = new Float64Array(n);
    this.arg = new Float64Array(n);
    this.mark = new NonFiniteMark(n);
  }
}

function scaled(o: ResolvedOptions): ResolvedOptions {
  return { ...o, rtol: o.rtol * START_TOLERANCE, atol: o.atol.map((v) => v * START_TOLERANCE) };
}

/**
 * One dopri5 step from (t, y) with f0 = f(t, y), first tried with h, and the P-point history
 * it gives (fewer when f is not finite at an interior point: then only the step's ends).
 * Writes the new state into `work.yNew`. A failure (step collapse, budget) is returned as the
 * stepper's outcome.
 */
export function rkStart(ctx: OdeContext, t: number, y: Float64Array, f0: Float64Array, h: number, tEnd: number,
  points: number, work: AdamsStartWork): AdamsStart | StepOutcome {
  const { rk, yNew, err, arg, mark } = work;
  const k = rk.k;
  const C = DOPRI5_CONTROL;
  const tight = scaled(ctx.options);
  k[0].set(f0);
  mark.clear();
  for (;;) {
    const budget = spendAttempt(ctx, t, y);
    if (budget) return budget;
    const trial = trialStep(t, h, tEnd, ctx.options.maxStep);
    const tNew = trial.last ? tEnd : t + trial.h;
    const step = tNew - t;
    const bad = rkStep(DOPRI5, ctx.rhs, t, y, step, rk, yNew, tNew);
    if (bad >= 0) {
      mark.set(ctx, t + DOPRI5.c[bad] * step, y, rk.arg, k[bad]);
      ctx.counters.rejected++;
      h = step * C.nonFiniteShrink;
      if (h < minStep(t)) return collapseFailure(ctx, t, y, f0, mark);
      continue;
    }
    for (let i = 0; i < ctx.n; i++) {
      let acc = 0;
      for (let j = 0; j < 7; j++) acc += DOPRI5_E[j] * k[j][i];
      err[i] = step * acc;
    }
    const norm = errorNorm(err, y, yNew, tight);
    if (!(norm <= 1)) {
      ctx.counters.rejected++;
      mark.clear();
      h = step * (Number.isFinite(norm) ? Math.max(C.minFactor, C.safety * Math.pow(norm, -C.rejectExponent)) : C.minFactor);
      if (h < minStep(t)) return collapseFailure(ctx, t, y, f0, mark);
      continue;
    }
    const segment = DOPRI5_PAIR.segment(t, tNew, step, y, yNew, k);
    const T = [tNew];
    const F: Float64Array[] = [Float64Array.from(k[6])];
    // the interior points only when the run goes on after this step
    const inner = trial.last ? 0 : points - 2;
    const innerT: number[] = [];
    const innerF: Float64Array[] = [];
    for (let j = inner; j >= 1; j--) {
      const tj = t + (j / (points - 1)) * step;
      segment.eval(tj, arg);
      const fj = new Float64Array(ctx.n);
      if (!ctx.rhs.call(tj, arg, fj)) {
        innerT.length = 0;
        innerF.length = 0;
        break;
      }
      innerT.push(tj);
      innerF.push(fj);
    }
    T.push(...innerT, t);
    F.push(...innerF, Float64Array.from(f0));
    return { segment, tNew, T, F, h: step };
  }
}
