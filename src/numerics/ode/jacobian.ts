/**
 * The Jacobian J = ∂f/∂y the stiff methods share: analytic when the caller gives one, else
 * by forward differences (n evaluations of f), and a cheap estimate of its spectral radius.
 */
import { type OdeContext, type StepOutcome, failure, nonFiniteStatus } from './control.ts';
import { type Jacobian, Status } from './types.ts';

const SQRT_EPS = Math.sqrt(Number.EPSILON);

/**
 * Writes J at (t, y) into `jac` (row-major n×n) and counts it; `f0` must hold f(t, y).
 * `probe` and `fi` are n-long work arrays. Returns null, or the failure when J or f is not
 * finite there. The difference increment scales with |y_j|, and below it with atol_j/rtol:
 * the size under which the tolerances stop asking for relative accuracy in that state; a
 * forward probe where f is not finite is retried backwards.
 */
export function formJacobian(ctx: OdeContext, t: number, y: Float64Array, f0: Float64Array, jac: Float64Array,
  probe: Float64Array, fi: Float64Array, analytic?: Jacobian): StepOutcome | null {
  const n = ctx.n;
  ctx.counters.jacobians++;
  if (analytic) {
    analytic(t, y, jac);
    for (let i = 0; i < n * n; i++) if (!Number.isFinite(jac[i])) return failure(Status.UndefinedRate, t, y);
    return null;
  }
  probe.set(y);
  for (let j = 0; j < n; j++) {
    const yj = y[j];
    let delta = SQRT_EPS * Math.max(Math.abs(yj), ctx.options.atol[j] / ctx.options.rtol);
    probe[j] = yj + delta;
    delta = probe[j] - yj;
    if (!ctx.rhs.call(t, probe, fi)) {
      probe[j] = yj - delta;
      delta = probe[j] - yj;
      if (!ctx.rhs.call(t, probe, fi)) return failure(nonFiniteStatus(ctx, y, probe, fi), t, probe);
    }
    for (let i = 0; i < n; i++) jac[i * n + j] = (fi[i] - f0[i]) / delta;
    probe[j] = yj;
  }
  return null;
}

/** f and J at a run's starting (t, y), formed once to choose a stiff method and handed to it. */
export interface StiffStart {
  readonly f0: Float64Array;
  readonly jac: Float64Array;
}

/** Power iterations in `spectralRadius`: a rough figure is all the callers need. */
const POWER_STEPS = 12;

/**
 * An estimate of the spectral radius of J (n×n, row-major): the larger of the largest
 * |J_ii| and a few power iterations from the all-ones vector (Golub & Van Loan, Matrix
 * Computations, sec. 7.3 — common practice). Exact for one state; within a small factor
 * otherwise, which is all a "how stiff is this run" decision needs. Cost O(n²), no f.
 */
export function spectralRadius(jac: Float64Array, n: number): number {
  let diag = 0;
  for (let i = 0; i < n; i++) diag = Math.max(diag, Math.abs(jac[i * n + i]));
  let v = new Float64Array(n).fill(1 / Math.sqrt(n));
  let w = new Float64Array(n);
  let rho = 0;
  for (let k = 0; k < POWER_STEPS; k++) {
    let norm = 0;
    for (let i = 0; i < n; i++) {
      let acc = 0;
      for (let j = 0; j < n; j++) acc += jac[i * n + j] * v[j];
      w[i] = acc;
      norm += acc * acc;
    }
    norm = Math.sqrt(norm);
    if (!(norm > 0) || !Number.isFinite(norm)) break;
    rho = norm;
    for (let i = 0; i < n; i++) w[i] /= norm;
    [v, w] = [w, v];
  }
  return Math.max(diag, rho);
}

/** Most power iterations in `dominantRate`, each one evaluation of f. */
const RATE_ITERATIONS = 8;
/** `dominantRate` stops when two successive ratios agree to this share. */
const RATE_AGREEMENT = 0.1;

/**
 * |λ| of J's dominant eigenvalue at (t, y), f0 = f(t, y), by power iteration on differenced
 * evaluations: v ← J·v ≈ (f(y + εv) - f0)/ε, the rate being ‖J·v‖/‖v‖ once two successive
 * ratios agree within `RATE_AGREEMENT` (Golub & Van Loan, Matrix Computations, sec. 7.3;
 * the difference quotient as in Jacobian-free Newton–Krylov methods, Knoll & Keyes, J. Comput.
 * Phys. 193 (2004), eq. 10 — common practice). Unlike the norm ‖J·v‖/‖v‖ of one product,
 * the limit does not depend on the units of the states: with a dose in kg and a
 * concentration in kg/m³, J's coupling ka/V is 25 times its largest eigenvalue. One
 * evaluation for one state (the quotient is J itself), at most `RATE_ITERATIONS` otherwise.
 * ε makes each component's change at most √eps of max(|y_i|, atol_i/rtol). `v` (the start,
 * overwritten), `probe` and `fv` are n-long; NaN where f is not finite or v is nil.
 */
export function dominantRate(ctx: OdeContext, t: number, y: Float64Array, f0: Float64Array,
  v: Float64Array, probe: Float64Array, fv: Float64Array): number {
  const n = ctx.n;
  const { atol, rtol } = ctx.options;
  let size = 0;
  for (let i = 0; i < n; i++) size += v[i] * v[i];
  size = Math.sqrt(size);
  let rate = NaN;
  for (let iter = 0; iter < RATE_ITERATIONS; iter++) {
    let relative = 0;
    for (let i = 0; i < n; i++) relative = Math.max(relative, Math.abs(v[i]) / Math.max(Math.abs(y[i]), atol[i] / rtol));
    if (!(size > 0) || !(relative > 0) || !Number.isFinite(relative)) return NaN;
    const eps = SQRT_EPS / relative;
    for (let i = 0; i < n; i++) probe[i] = y[i] + eps * v[i];
    if (!ctx.rhs.call(t, probe, fv)) return NaN;
    let next = 0;
    for (let i = 0; i < n; i++) {
      v[i] = (fv[i] - f0[i]) / eps;
      next += v[i] * v[i];
    }
    next = Math.sqrt(next);
    const ratio = next / size;
    if (n === 1 || Math.abs(ratio - rate) <= RATE_AGREEMENT * ratio) return ratio;
    rate = ratio;
    size = next;
  }
  return rate;
}
