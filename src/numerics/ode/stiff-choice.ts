/**
 * Which formula the stiff method runs: RODAS (`rosenbrock.ts`) or the variable-order NDF
 * (`ndf.ts`). Both are L-stable enough for any stiffness; they differ in cost. RODAS is a
 * one-step method of order 4: cheap to start (every piece between events restarts), good
 * at loose and moderate tolerances and on problems that are not stiff. On a stiff problem
 * at tight tolerances it suffers order reduction (see `ndf.ts`) and its cost explodes,
 * while the NDF's does not. So the NDF is chosen when the tolerance is tighter than
 * `NDF_BELOW_RTOL` and the run is stiff over its span: ρ(J)·span at least `STIFF_SPAN`, or
 * `auto` has found it stiff.
 */
import type { OdeContext, Stepper } from './control.ts';
import { type StiffStart, formJacobian, spectralRadius } from './jacobian.ts';
import { NdfStepper } from './ndf.ts';
import { RosenbrockStepper } from './rosenbrock.ts';
import type { Jacobian } from './types.ts';

/** The NDF is used only for rtol below this (measured on y' = -1e4 (y - cos t); see bench/ode.ts). */
export const NDF_BELOW_RTOL = 1e-6;

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
  const ndf = (start?: StiffStart) => ({ stepper: new NdfStepper(ctx, t0, y0, firstStep, options.jacobian, start), formula: 'ndf' as const });
  if (!(ctx.options.rtol < NDF_BELOW_RTOL)) return rodas();
  if (knownStiff) return ndf();
  const n = ctx.n;
  const y = Float64Array.from(y0);
  const start = { f0: new Float64Array(n), jac: new Float64Array(n * n) };
  // Where f or J is not finite at the start, RODAS's first step reports it as it always has.
  if (!ctx.rhs.call(t0, y, start.f0)) return rodas();
  if (formJacobian(ctx, t0, y, start.f0, start.jac, new Float64Array(n), new Float64Array(n), options.jacobian)) return rodas();
  return spectralRadius(start.jac, n) * (tEnd - t0) >= STIFF_SPAN ? ndf(start) : rodas(start);
}
