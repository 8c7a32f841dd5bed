/**
 * Model runs of a fit whose model is a rate law, the count that matters when each run is a
 * simulation: NIST StRD Misra1a and BoxBOD (y' = b2·(b1 − y), y(0) = 0, integrated at rtol
 * 1e-10 by the ODE driver) from both published starts, fitted as a fit cell does (central
 * differences near the end, the polish, `digits`) and with forward differences alone (no
 * polish, no digits), the same model and starts. Counts are deterministic, so they can be
 * read on a loaded machine. Goal: the digits cost at most 1.5 times the forward differences'
 * model runs, over the four fits.
 */
import { fitLeastSquares } from '../src/numerics/fit/least-squares.ts';
import { integrate, denseAt } from '../src/numerics/ode/integrate.ts';
import { MISRA1A, BOXBOD } from '../test/engine/nist-strd.ts';

export interface FitEvaluationRow {
  readonly name: string;
  /** Model runs with digits, and with forward differences alone. */
  readonly withDigits: number;
  readonly forward: number;
  /** Digits claimed, per fit. */
  readonly digits: ReadonlyArray<number | null>;
}

/** The most model runs the digits may cost, relative to forward differences. */
export const DIGITS_COST_GOAL = 1.5;

function fitLaw(d: typeof MISRA1A, p0: readonly number[], digits: boolean) {
  const v = new Float64Array(1);
  return fitLeastSquares({
    m: d.x.length, p0, scale: p0,
    residuals: (p, out) => {
      const run = integrate((_t, y, dy) => { dy[0] = p[1] * (p[0] - y[0]); }, 0, Float64Array.of(0), d.x[d.x.length - 1],
        { method: 'auto', rtol: 1e-10, atol: Float64Array.of(1e-12 * Math.abs(p[0])) });
      for (let i = 0; i < d.x.length; i++) {
        if (!denseAt(run.segments, d.x[i], v)) return false;
        out[i] = v[0] - d.y[i];
      }
      return true;
    },
  }, digits
    ? { modelAccuracy: 1e-10, residualError: (r, e) => { for (let i = 0; i < r.length; i++) e[i] = 10 * 1e-10 * (Math.abs(r[i] + d.y[i]) + 1e-2 * Math.max(...d.y)); } }
    : { diffStep: 1e-5 });
}

export function fitEvaluationBenchmarks(): FitEvaluationRow[] {
  const rows: FitEvaluationRow[] = [];
  for (const [name, d] of [['Misra1a', MISRA1A], ['BoxBOD', BOXBOD]] as const) {
    const fits = d.starts.map((s) => [fitLaw(d, s, true), fitLaw(d, s, false)] as const);
    rows.push({
      name: `${name}, both NIST starts: model runs (${fits.map(([c, f]) => `${c.evaluations} against ${f.evaluations}`).join('; ')})`,
      withDigits: fits.reduce((a, [c]) => a + c.evaluations, 0),
      forward: fits.reduce((a, [, f]) => a + f.evaluations, 0),
      digits: fits.map(([c]) => c.digits),
    });
  }
  return rows;
}
