/**
 * Why a fixed-step run blew up, when the law itself stays bounded: an explicit method is
 * stable only while the step times the law's fastest rate (the spectral radius of its
 * Jacobian, ρ) stays inside its stability region, about 2 for Euler and Heun and 2.785 for
 * the classic Runge–Kutta method on the negative real axis (Hairer & Wanner, Solving Ordinary
 * Differential Equations II, sec. IV.2). Past it the numbers grow like a blow-up though the
 * solution decays; the cure is a smaller step or an adaptive (or stiff) method.
 */
import { spectralRadius } from '../numerics/ode/jacobian.ts';

/** The stability interval on the negative real axis of each fixed-step method. */
export const STABILITY_LIMIT: Readonly<Record<'euler' | 'heun' | 'rk4', number>> = { euler: 2, heun: 2, rk4: 2.785 };

export interface UnstableStep {
  /** The law's fastest rate at the start, 1/s. */
  readonly rho: number;
  /** h·ρ of the run's step. */
  readonly product: number;
  /** The method's limit of h·ρ. */
  readonly limit: number;
  /** The largest stable step, s. */
  readonly largestStep: number;
}

/**
 * The instability of a fixed step of `h` seconds for `method` on the rates f at (t0, y0):
 * undefined when h·ρ is within the method's limit (the blow-up is then the law's own) or ρ
 * cannot be had. ρ from a forward-difference Jacobian (n + 1 evaluations of f).
 */
export function unstableStep(
  f: (t: number, y: Float64Array, dy: Float64Array) => void, t0: number, y0: Float64Array, h: number, method: keyof typeof STABILITY_LIMIT,
): UnstableStep | undefined {
  const n = y0.length;
  const f0 = new Float64Array(n);
  const fi = new Float64Array(n);
  const probe = Float64Array.from(y0);
  const jac = new Float64Array(n * n);
  f(t0, y0, f0);
  for (let j = 0; j < n; j++) {
    const d = Math.sqrt(Number.EPSILON) * Math.max(Math.abs(y0[j]), 1e-6 * (Math.abs(f0[j]) * Math.abs(h) || 1));
    probe[j] = y0[j] + d;
    f(t0, probe, fi);
    probe[j] = y0[j];
    for (let i = 0; i < n; i++) jac[i * n + j] = (fi[i] - f0[i]) / d;
  }
  const rho = spectralRadius(jac, n);
  const limit = STABILITY_LIMIT[method];
  if (!(rho > 0) || !Number.isFinite(rho) || !(h * rho > limit)) return undefined;
  return { rho, product: h * rho, limit, largestStep: limit / rho };
}
