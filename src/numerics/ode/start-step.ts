/**
 * The starting step of the explicit pairs, measured in the solution's own time scale.
 *
 * Hairer, Nørsett & Wanner, Solving ODEs I, sec. II.4 ("Starting step size"), estimate
 * d1 = ‖y'(t0)‖ and d2 ≈ ‖y''(t0)‖ (scaled by the tolerance, one explicit Euler probe) and
 * take h = (0.01 / max(d1, d2))^(1/(p+1)). That mixes a rate (1/time) with a second
 * derivative (1/time²) and reads the result as a time, which holds only when the unit of
 * time is about the solution's time scale. Here t is in seconds while laws run over hours or
 * days: on Newton cooling over 8 h (time scale 2.9 h) it gives 0.2–0.9 s where steps of
 * 10³–10⁴ s are right, and the pair then spends four or five steps (a fifth to a half of a
 * whole run's evaluations) growing tenfold a step.
 *
 * The same model with its units kept: the solution changes on the time scale τ = d1/d2, and
 * its higher derivatives are taken to grow like ‖y^(p+1)‖ ≈ d1/τ^p. The local error of a
 * method of order p is then about (h/τ)^(p+1)·d1·τ in tolerance units, and h is chosen to
 * make that 0.01, the book's target: h = τ·(0.01/(d1·τ))^(1/(p+1)). It does not change when
 * t is rescaled (seconds, hours), and it equals the book's value when τ = 1 and d1 = d2.
 * As in the book, h is at most 100 times the first guess h0 (the time for a 1 % change of
 * y at its initial rate) and the result never falls below the smallest resolvable step.
 * Where the initial rate is negligible (d0 or d1 below 1e-5, a start at rest) the book's
 * rule is kept unchanged (`initialStep`). Costs one evaluation of f.
 */
import { type OdeContext, initialStep, minStep, scaledRms } from './control.ts';

/** d1 at or below this (in tolerance units per unit time) counts as a start at rest. */
const AT_REST = 1e-5;

/** The error, in tolerance units, the first step aims at (the book's 0.01). */
const FIRST_STEP_ERROR = 0.01;

/**
 * The first trial step from (t0, y0), f0 = f(t0, y0), towards tEnd for a method whose error
 * estimate has order p. Evaluates f once, at the Euler probe.
 */
export function startStep(ctx: OdeContext, t0: number, y0: Float64Array, f0: Float64Array, tEnd: number, p: number): number {
  const o = ctx.options;
  const span = tEnd - t0;
  const d0 = scaledRms(y0, y0, o);
  const d1 = scaledRms(f0, y0, o);
  if (d0 < AT_REST || d1 < AT_REST) return initialStep(ctx, t0, y0, f0, tEnd, p);
  const h0 = Math.min((0.01 * d0) / d1, o.maxStep, span);
  const n = ctx.n;
  const y1 = new Float64Array(n);
  for (let i = 0; i < n; i++) y1[i] = y0[i] + h0 * f0[i];
  const f1 = new Float64Array(n);
  if (!ctx.rhs.call(t0 + h0, y1, f1)) return Math.max(h0 * 1e-3, minStep(t0));
  for (let i = 0; i < n; i++) f1[i] = (f1[i] - f0[i]) / h0;
  const d2 = scaledRms(f1, y0, o);
  // τ = d1/d2 is infinite when y'' is nil: then only the caps below limit the step.
  const h1 = d2 > 0 ? (d1 / d2) * Math.pow(FIRST_STEP_ERROR * d2 / (d1 * d1), 1 / (p + 1)) : Infinity;
  return Math.max(Math.min(100 * h0, h1, o.maxStep, span), minStep(t0));
}
