/**
 * Which formula the stiff method runs: RODAS (`rosenbrock.ts`) or the variable-order NDF
 * (`ndf.ts`). Both are L-stable enough for any stiffness; they differ in cost. RODAS is a
 * one-step method of order 4: cheap to start (every piece between events restarts) and good
 * on problems that are not stiff over their span. On a stiff problem it suffers order
 * reduction (see `ndf.ts`) and forms a Jacobian at every step, so its cost grows fast as the
 * tolerance tightens; the NDF keeps one Jacobian over many steps. The NDF is chosen at every
 * tolerance when the run is stiff over its span (ρ(J)·span at least `STIFF_SPAN`) or `auto`
 * has found it stiff. Measured on y' = -1e4 (y - cos t) over 10 s at rtol 1e-3 … 1e-6: RODAS
 * 473–3 260 evaluations, the NDF 190–376 (LSODA 204–639), both within 1 tolerance unit at
 * the steps. Until the NDF's Newton test was Shampine & Reichelt's (`ndf.ts`) it could not
 * run Robertson's problem at these tolerances, and RODAS ran there.
 *
 * A run RODAS starts is handed over to the NDF when it turns stiff on the way
 * (`stiff-handover.ts`), by the same rule.
 *
 * RODAS stays where `denseErrorControl` is false: that option asks for RODAS's step-end-only
 * control, which the NDF (whose dense output is its own polynomial) has no use for.
 */
import { type OdeContext, type Stepper, failure, nonFiniteStatus } from './control.ts';
import { type StiffStart, formJacobian, spectralRadius } from './jacobian.ts';
import { NdfStepper } from './ndf.ts';
import { RosenbrockStepper } from './rosenbrock.ts';
import { StiffHandover } from './stiff-handover.ts';
import type { Jacobian } from './types.ts';

/**
 * ρ(J)·(t1 - t0) from which a run counts as stiff: the fastest mode decays e-fold this many
 * times over the run, so an explicit or a low-order one-step method would spend its steps on
 * stability or on order reduction rather than on the solution.
 */
export const STIFF_SPAN = 1e3;

export type StiffFormula = 'rodas' | 'ndf';

export interface StiffOptions {
  readonly jacobian?: Jacobian;
  readonly autonomous?: boolean;
  readonly denseErrorControl?: boolean;
  /** The formula to run whatever the problem (tests and benchmarks); default: chosen as above. */
  readonly stiffFormula?: StiffFormula;
}

/** The formula a stiff stepper ran last: 'ndf' once RODAS has handed a run over to it. */
export function formulaNow(stepper: Stepper, formula: StiffFormula): StiffFormula {
  return stepper instanceof StiffHandover && stepper.handedOverAt !== null ? 'ndf' : formula;
}

/**
 * A stepper for the stiff method from (t0, y0) towards tEnd, and the formula it runs.
 * `knownStiff`: `auto` found the problem stiff, so the NDF needs no check of ρ(J). When
 * the check runs, f and J at the start are formed once and handed to the chosen stepper.
 */
export function stiffStepper(ctx: OdeContext, t0: number, y0: ArrayLike<number>, tEnd: number, firstStep: number | undefined,
  options: StiffOptions, knownStiff: boolean): { stepper: Stepper; formula: StiffFormula } {
  const rodas = (start?: StiffStart) => ({
    stepper: new RosenbrockStepper(ctx, t0, y0, firstStep, options.jacobian, options.autonomous ?? false,
      options.denseErrorControl ?? true, start),
    formula: 'rodas' as const,
  });
  /** RODAS, handing over to the NDF if the run turns stiff (`stiff-handover.ts`). */
  const rodasFirst = (start: StiffStart) => ({
    stepper: new StiffHandover(ctx, rodas(start).stepper, STIFF_SPAN, options.jacobian),
    formula: 'rodas' as const,
  });
  const ndf = (start?: StiffStart) => ({ stepper: new NdfStepper(ctx, t0, y0, firstStep, options.jacobian, start), formula: 'ndf' as const });
  if (options.stiffFormula === 'rodas' || options.denseErrorControl === false) return rodas();
  if (options.stiffFormula === 'ndf' || knownStiff) return ndf();
  const n = ctx.n;
  const y = Float64Array.from(y0);
  const start = { f0: new Float64Array(n), jac: new Float64Array(n * n) };
  // Where f is not finite at the start, the run fails there at once, without a second look.
  if (!ctx.rhs.call(t0, y, start.f0)) {
    const failed = failure(nonFiniteStatus(ctx, y, y, start.f0), t0, y);
    return { stepper: { t: t0, y, h: firstStep ?? NaN, step: () => failed }, formula: 'rodas' };
  }
  // Where J is not finite, RODAS's first step reports it as it always has.
  if (formJacobian(ctx, t0, y, start.f0, start.jac, new Float64Array(n), new Float64Array(n), options.jacobian)) return rodas();
  return spectralRadius(start.jac, n) * (tEnd - t0) >= STIFF_SPAN ? ndf(start) : rodasFirst(start);
}
