/**
 * RODAS handing a run over to the NDF when the run turns stiff on the way. A run whose
 * Jacobian at the start is mild (Robertson's kinetics at t = 0: ρ(J) = 0.04, since y2 = y3 = 0)
 * starts with RODAS (`stiff-choice.ts`); as soon as ρ(J)·(the span left) reaches `STIFF_SPAN`,
 * the same rule that picks the NDF at the start, the NDF takes over from the accepted state.
 * RODAS forms J at every step, so the test costs no evaluation: max |J_ii| at every step (no
 * allocation), the power iteration of `spectralRadius` every `POWER_EVERY` steps. The dense
 * output stays continuous: the NDF's first segment starts at RODAS's last step end.
 *
 * Measured on Robertson's problem to t = 40 (atol = rtol·(1e-2, 1e-8, 1e-2)): RODAS alone
 * needed 287–86 445 evaluations at rtol 1e-3 … 1e-10 (a Jacobian at every step); see
 * test/engine/ode-stiff-handover.test.ts for the counts with the handover.
 */
import type { OdeContext, StepOutcome, Stepper } from './control.ts';
import { spectralRadius } from './jacobian.ts';
import { NdfStepper } from './ndf.ts';
import type { RosenbrockStepper } from './rosenbrock.ts';
import type { Jacobian } from './types.ts';

/** Steps between two power iterations (the diagonal test runs at every step). */
const POWER_EVERY = 8;

export class StiffHandover implements Stepper {
  private current: Stepper;
  private steps = 0;
  /** Time at which the NDF took over, or null while RODAS runs. */
  handedOverAt: number | null = null;

  constructor(private readonly ctx: OdeContext, private readonly rodas: RosenbrockStepper, private readonly stiffSpan: number,
    private readonly jacobian?: Jacobian) {
    this.current = rodas;
  }

  get t(): number { return this.current.t; }
  get y(): Float64Array { return this.current.y; }
  get h(): number { return this.current.h; }

  step(tEnd: number): StepOutcome {
    const outcome = this.current.step(tEnd);
    if (outcome.ok && this.handedOverAt === null && this.current.t < tEnd && this.turnedStiff(tEnd)) {
      const { t, y, h } = this.rodas;
      this.current = new NdfStepper(this.ctx, t, y, Number.isFinite(h) ? h : undefined, this.jacobian);
      this.handedOverAt = t;
    }
    return outcome;
  }

  private turnedStiff(tEnd: number): boolean {
    const n = this.ctx.n;
    const jac = this.rodas.lastJacobian;
    const need = this.stiffSpan / (tEnd - this.rodas.t);
    let diag = 0;
    for (let i = 0; i < n; i++) diag = Math.max(diag, Math.abs(jac[i * n + i]));
    if (diag >= need) return true;
    this.steps++;
    return n > 1 && this.steps % POWER_EVERY === 0 && spectralRadius(jac, n) >= need;
  }
}
