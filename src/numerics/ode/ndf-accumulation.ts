/**
 * The NDF's error margin from the error it has carried so far (`ndf.ts`). A local error test
 * bounds each step's error, not their sum. Where a step's error decays no faster than the
 * solution (the slow mode e^{-t} of a 2×2 linear system with eigenvalues -1 and -1000: the
 * relative error of every step is kept), errors add up over the steps: measured there at rtol
 * 1e-8, each step's increase of the relative error equalled its estimate to within 5 % while
 * rtol·|y| set the tolerance (so neither the error constants, nor the estimate after a change
 * of step, nor the order was at fault), and with a fixed margin of 30 the run ended 0.26–6
 * tolerance units off at rtol 1e-3 … 1e-10, growing with the number of steps. Where it decays
 * fast (y' = -1e4 (y - cos t): a step's error is damped by 1/(1 + h·1e4/α) at the next)
 * nothing adds up.
 *
 * So the stepper carries an estimate E of its global error: each accepted step's estimated
 * local error added to E after E is carried across the step by the linearised flow,
 * E ← (I - hJ)⁻¹E + e (implicit Euler on the error equation e' = J·e, which damps stiff modes
 * and follows slow ones to first order; Hairer, Nørsett & Wanner I, sec. II.3, for the
 * error equation). `kept`, the share of E (in tolerance units, which follow the solution) a
 * step keeps, says for how many steps a step's error will last, 1/(1 - kept), at most the
 * steps left at this size; that many steps' errors, each about `TARGET` of the test's limit,
 * must fit in what remains of `GLOBAL_BUDGET`: the margin is
 * max(30, min(steps left, 1/(1 - kept))·TARGET/(GLOBAL_BUDGET - |E|)), at most `MAX_MARGIN`.
 *
 * This needs J as it is now: the NDF keeps a Jacobian over many steps, and with Robertson's
 * J from t = 0 (no coupling through y2 and y3) an error in y2 looked as if it never decayed.
 * So the caller says whether J can be trusted (the Newton iteration's measured rate, see
 * `NDF_CONTROL.trustRate`); while it cannot, E is left as it is and the margin is 30.
 */
import { errorNorm, type ResolvedOptions } from './control.ts';
import { luFactor, luSolve } from './lu.ts';

/** The global error, in tolerance units, the margin aims to stay within. */
export const GLOBAL_BUDGET = 0.8;
/** The largest margin (a step's error taken this many times over). */
export const MAX_MARGIN = 1e4;
/** The estimate an accepted step has, as a share of the test's limit (the controller's aim, about safety^(k+1)). */
const TARGET = 0.5;

export class ErrorAccumulation {
  /** The global error estimate (signed, per state). */
  private readonly E: Float64Array;
  private readonly carried: Float64Array;
  private readonly matrix: Float64Array;
  private readonly pivot: Int32Array;
  /** The h and Jacobian version the matrix I - hJ was factored for. */
  private factoredH = NaN;
  private factoredJac = -1;
  /** The margin for the next step. */
  margin: number;

  constructor(private readonly n: number, private readonly floor: number) {
    this.E = new Float64Array(n);
    this.carried = new Float64Array(n);
    this.matrix = new Float64Array(n * n);
    this.pivot = new Int32Array(n);
    this.margin = floor;
  }

  /**
   * After an accepted step of size h from t to tNew (towards tEnd) with local error estimate
   * `local` (signed), J `jac` (its version `jacVersion` changes when it is formed again), and
   * the new solution yNew: E carried and added to, and the margin for the next step; when
   * J is not `trusted`, E unchanged and the fixed margin. Returns the number of
   * factorizations made (0 or 1).
   */
  accept(local: Float64Array, jac: Float64Array, jacVersion: number, h: number, tNew: number, tEnd: number,
    yOld: Float64Array, yNew: Float64Array, o: ResolvedOptions, trusted: boolean): number {
    const { n, E, carried, matrix, pivot } = this;
    let factored = 0;
    if (!trusted) {
      this.margin = this.floor;
      return 0;
    }
    if (h !== this.factoredH || jacVersion !== this.factoredJac) {
      for (let i = 0; i < n * n; i++) matrix[i] = -h * jac[i];
      for (let i = 0; i < n; i++) matrix[i * n + i] += 1;
      factored = 1;
      const ok = luFactor(matrix, n, pivot);
      this.factoredH = ok ? h : NaN;
      this.factoredJac = ok ? jacVersion : -1;
    }
    const before = errorNorm(E, yOld, yOld, o);
    carried.set(E);
    if (!Number.isNaN(this.factoredH)) luSolve(matrix, n, pivot, carried);
    for (let i = 0; i < n; i++) E[i] = carried[i] + local[i];
    const after = errorNorm(E, yNew, yNew, o);
    // The share of the carried error that this step kept (relative to the tolerance, which
    // follows the solution): near 1 where errors persist, near 0 where they are damped.
    const kept = before > 0 ? Math.min(1, errorNorm(carried, yNew, yNew, o) / before) : 0;
    const persisting = Math.min(Math.max(0, (tEnd - tNew) / h), 1 / Math.max(1 - kept, 1e-12));
    const room = GLOBAL_BUDGET - after;
    const wanted = room > 0 ? (persisting * TARGET) / room : MAX_MARGIN;
    this.margin = Math.min(MAX_MARGIN, Math.max(this.floor, wanted));
    return factored;
  }
}
