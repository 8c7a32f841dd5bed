/**
 * Whether a run has a fast mode: J's dominant eigenvalue decays e-fold at least `STIFF_SPAN`
 * times over what is left of the run, the rule the stiff method's own choice uses
 * (`stiff-choice.ts`). The explicit pairs' stiffness test (`embedded-rk.ts`) and the Adams
 * formulas' (`adams.ts`) each measure a ratio ‖Δf‖/‖Δy‖ along one direction; that ratio is a
 * norm, which a coupling between states of different units inflates (a dose in kg feeding a
 * concentration in kg/m³: 25 times the eigenvalue), so it only prompts this check, which finds
 * |λ| by power iteration on differenced evaluations from that direction (`dominantRate` in
 * `jacobian.ts`: one evaluation for one state, at most 8).
 */
import type { OdeContext } from './control.ts';
import { dominantRate } from './jacobian.ts';
import { STIFF_SPAN } from './stiff-choice.ts';

/** Whether a test's own rate (its norm ratio) at t suggests a fast mode over the rest of the run: rate·(tEnd − t) ≥ `STIFF_SPAN`. */
export function suggestsFastMode(rate: number, t: number, tEnd: number): boolean {
  return rate * (tEnd - t) >= STIFF_SPAN;
}

/** The check of a run, with its work arrays (made on first use) and its last answer. */
export class FastModeCheck {
  /** The last answer: whether J's dominant |λ| spanned `STIFF_SPAN` e-folds over the rest of the run; undefined until asked. */
  fast: boolean | undefined = undefined;
  /** J's dominant |λ| found by the last check (NaN where f was not finite or the direction nil). */
  rate = NaN;
  private work: [Float64Array, Float64Array, Float64Array] | null = null;

  /** Forgets the answer (a new run or piece); the work arrays are kept. */
  clear(): void {
    this.fast = undefined;
    this.rate = NaN;
  }

  /** The n-long start of the power iteration, for the caller to write the direction its test measured along. */
  direction(n: number): Float64Array {
    return (this.work ??= [new Float64Array(n), new Float64Array(n), new Float64Array(n)])[0];
  }

  /**
   * J's dominant |λ| at (t, y), f0 = f(t, y), from `direction` (overwritten): whether it decays
   * e-fold `STIFF_SPAN` times by tEnd, kept as `fast` (and the rate as `rate`). Costs 1–8
   * evaluations of f.
   */
  confirm(ctx: OdeContext, t: number, y: Float64Array, f0: Float64Array, tEnd: number): boolean {
    const [v, probe, fv] = this.work ??= [new Float64Array(ctx.n), new Float64Array(ctx.n), new Float64Array(ctx.n)];
    this.rate = dominantRate(ctx, t, y, f0, v, probe, fv);
    this.fast = this.rate * (tEnd - t) >= STIFF_SPAN;
    return this.fast;
  }

  /** Whether the rate the last check found still spans `STIFF_SPAN` e-folds from t to tEnd. */
  spans(t: number, tEnd: number): boolean {
    return this.rate * (tEnd - t) >= STIFF_SPAN;
  }
}
