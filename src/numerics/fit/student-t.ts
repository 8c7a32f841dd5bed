/**
 * Student's t distribution: its tail, its distribution function and its quantile, for the
 * confidence intervals of a fit. With the special functions they rest on: log-gamma, the
 * regularized incomplete beta and gamma functions, and the normal quantile.
 *
 * - `logGamma`: Lanczos's approximation (C. Lanczos, "A precise approximation of the gamma
 *   function", SIAM J. Numer. Anal. B 1, 1964) with g = 7 and 9 terms, relative error about
 *   1e-15, and the reflection formula below 1/2.
 * - `regularizedBeta`: I_x(a, b) by its continued fraction (Abramowitz & Stegun 26.5.8),
 *   evaluated with the modified Lentz method (W. J. Lentz, Appl. Optics 15, 1976; Thompson &
 *   Barnett, J. Comput. Phys. 64, 1986), used on the side of (a+1)/(a+b+2) where it converges
 *   fast and by symmetry I_x(a, b) = 1 − I_{1−x}(b, a) on the other (as in Press et al.,
 *   Numerical Recipes, 3rd ed., sec. 6.4).
 * - `regularizedGammaQ`: Q(a, x) by its series (A&S 6.5.29) below x = a + 1 and its continued
 *   fraction (A&S 6.5.31) above (Numerical Recipes sec. 6.2); erfc(x) = Q(1/2, x²).
 * - `studentTUpperTail`: P(T > t) = I_{ν/(ν+t²)}(ν/2, 1/2) / 2 (A&S 26.7.1 with 26.5.27), with
 *   1 − x passed exactly as t²/(ν+t²) so that no digits are lost in the far tail or near 0.
 * - `studentTQuantile`: the t with P(T ≤ t) = p, found by Brent's zero finder on the tail
 *   (to about 1e-14 relative); above ν = 1e4 degrees of freedom by the Cornish–Fisher
 *   expansion about the normal quantile (A&S 26.7.5, four terms; the next one is below
 *   1e-20 there), where the continued fraction would need too many terms.
 *
 * Invalid arguments (p outside (0, 1), ν not positive) are a RangeError naming them.
 */
import { brentRoot } from '../brent.ts';

const EPS = Number.EPSILON;
/** Smallest magnitude the Lentz recurrences may reach before being nudged off zero. */
const TINY = 1e-300;
/** Most terms of a series or continued fraction; far above what ν ≤ 1e4 needs (about 400). */
const MAX_TERMS = 20000;
/** Above this many degrees of freedom the quantile uses the Cornish–Fisher expansion. */
export const CORNISH_FISHER_DOF = 1e4;

/** Lanczos coefficients for g = 7, n = 9 (P. Godfrey's set, as widely tabulated). */
const LANCZOS_G = 7;
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313,
  -176.61502916214059, 12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6,
  1.5056327351493116e-7,
];
const HALF_LOG_2PI = 0.5 * Math.log(2 * Math.PI);

/** ln Γ(x) for x > 0 (and ln |Γ(x)| for negative non-integer x). Relative error about 1e-15. */
export function logGamma(x: number): number {
  if (x < 0.5) {
    // Reflection: Γ(x)·Γ(1 − x) = π / sin(πx)
    return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - logGamma(1 - x);
  }
  const z = x - 1;
  let sum = LANCZOS[0];
  for (let i = 1; i < LANCZOS.length; i++) sum += LANCZOS[i] / (z + i);
  const t = z + LANCZOS_G + 0.5;
  return HALF_LOG_2PI + (z + 0.5) * Math.log(t) - t + Math.log(sum);
}

/** ln B(a, b) = ln Γ(a) + ln Γ(b) − ln Γ(a + b). */
function logBeta(a: number, b: number): number {
  return logGamma(a) + logGamma(b) - logGamma(a + b);
}

/** The continued fraction of I_x(a, b) (A&S 26.5.8) by modified Lentz. */
function betaFraction(x: number, a: number, b: number): number {
  const apb = a + b, ap1 = a + 1, am1 = a - 1;
  let c = 1;
  let d = 1 - (apb * x) / ap1;
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  for (let k = 1; k <= MAX_TERMS; k++) {
    const k2 = 2 * k;
    // even term d_{2k}
    let coef = (k * (b - k) * x) / ((am1 + k2) * (a + k2));
    d = 1 + coef * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + coef / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    // odd term d_{2k+1}
    coef = (-(a + k) * (apb + k) * x) / ((a + k2) * (ap1 + k2));
    d = 1 + coef * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + coef / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) <= EPS) return h;
  }
  return h; // not reached for the arguments this module uses; the last approximant
}

/**
 * The regularized incomplete beta function I_x(a, b) for a, b > 0 and 0 ≤ x ≤ 1.
 * `y`, when given, is 1 − x computed without rounding by the caller (it keeps the tail near
 * x = 1 accurate); otherwise 1 − x is used.
 */
export function regularizedBeta(x: number, a: number, b: number, y: number = 1 - x): number {
  if (!(a > 0) || !(b > 0)) throw new RangeError(`regularizedBeta needs a > 0 and b > 0; got a = ${a}, b = ${b}`);
  if (!(x >= 0 && x <= 1)) throw new RangeError(`x must be in [0, 1]; it is ${x}`);
  if (x === 0) return 0;
  if (y === 0) return 1;
  const front = Math.exp(a * Math.log(x) + b * Math.log(y) - logBeta(a, b));
  if (x < (a + 1) / (a + b + 2)) return (front * betaFraction(x, a, b)) / a;
  return 1 - (front * betaFraction(y, b, a)) / b;
}

/** The regularized upper incomplete gamma function Q(a, x) = Γ(a, x)/Γ(a), a > 0, x ≥ 0. */
export function regularizedGammaQ(a: number, x: number): number {
  if (!(a > 0)) throw new RangeError(`regularizedGammaQ needs a > 0; it is ${a}`);
  if (!(x >= 0)) throw new RangeError(`x must be >= 0; it is ${x}`);
  if (x === 0) return 1;
  if (x === Infinity) return 0;
  const front = Math.exp(a * Math.log(x) - x - logGamma(a));
  if (x < a + 1) {
    // series for P(a, x) = front · Σ x^k / (a (a+1) ... (a+k))   (A&S 6.5.29)
    let term = 1 / a, sum = term;
    for (let k = 1; k <= MAX_TERMS; k++) {
      term *= x / (a + k);
      sum += term;
      if (Math.abs(term) <= Math.abs(sum) * EPS) break;
    }
    return 1 - front * sum;
  }
  // continued fraction for Q(a, x) (A&S 6.5.31), modified Lentz in its even form
  let bb = x + 1 - a;
  let c = 1 / TINY;
  let d = 1 / bb;
  let h = d;
  for (let k = 1; k <= MAX_TERMS; k++) {
    const an = -k * (k - a);
    bb += 2;
    d = an * d + bb;
    if (Math.abs(d) < TINY) d = TINY;
    c = bb + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) <= EPS) break;
  }
  return front * h;
}

/** Upper tail of the standard normal, P(Z > z) = erfc(z/√2)/2. */
export function normalUpperTail(z: number): number {
  if (z < 0) return 1 - normalUpperTail(-z);
  return 0.5 * regularizedGammaQ(0.5, 0.5 * z * z);
}

function checkProbability(p: number): void {
  if (!(p > 0 && p < 1)) throw new RangeError(`p must be strictly between 0 and 1; it is ${p}`);
}

function checkDof(dof: number): void {
  if (!(dof > 0)) throw new RangeError(`dof must be a positive number (Infinity allowed); it is ${dof}`);
}

/**
 * The t ≥ 0 where the decreasing function `f` reaches `target` (f(0) > target > f(∞)):
 * brackets it by doubling, then Brent's method to about 1e-14 relative.
 */
function solveDecreasing(f: (t: number) => number, target: number): number {
  let hi = 1;
  while (f(hi) > target) hi *= 2; // f → its limit below target, so this ends
  const r = brentRoot((t) => f(t) - target, 0, hi, { rtol: 4 * EPS, xtol: 0, maxIterations: 200 });
  return r.root;
}

/** Below this p the quantile solves for the central probability 2p − 1, above it for the tail 1 − p. */
const CENTRAL_BELOW = 0.75;

/** The normal quantile z with P(Z ≤ z) = p. */
export function normalQuantile(p: number): number {
  checkProbability(p);
  if (p === 0.5) return 0;
  if (p < 0.5) return -normalQuantile(1 - p);
  if (p < CENTRAL_BELOW) {
    // P(|Z| ≤ z) = P(1/2, z²/2) = 1 − Q(1/2, z²/2), which keeps digits for small z
    return solveDecreasing((z) => -(1 - regularizedGammaQ(0.5, 0.5 * z * z)), -(2 * p - 1));
  }
  return solveDecreasing(normalUpperTail, 1 - p);
}

/** P(T > t) for Student's t with `dof` degrees of freedom (Infinity: the normal). */
export function studentTUpperTail(t: number, dof: number): number {
  checkDof(dof);
  if (Number.isNaN(t)) return NaN;
  if (dof === Infinity) return normalUpperTail(t);
  if (t < 0) return 1 - studentTUpperTail(-t, dof);
  if (t === Infinity) return 0;
  const t2 = t * t;
  const x = dof / (dof + t2);
  const y = t2 / (dof + t2);
  return 0.5 * regularizedBeta(x, dof / 2, 0.5, y);
}

/** P(|T| ≤ t) for t ≥ 0, accurate for small t as well. */
function studentTCentral(t: number, dof: number): number {
  const t2 = t * t;
  return regularizedBeta(t2 / (dof + t2), 0.5, dof / 2, dof / (dof + t2));
}

/** P(T ≤ t) for Student's t with `dof` degrees of freedom. */
export function studentTCdf(t: number, dof: number): number {
  return 1 - studentTUpperTail(t, dof);
}

/**
 * The quantile of Student's t: the t with P(T ≤ t) = p, for 0 < p < 1 and dof > 0 (not
 * necessarily an integer; Infinity gives the normal quantile). For a two-sided 95% interval
 * use p = 0.975. Accuracy about 1e-13 relative.
 */
export function studentTQuantile(p: number, dof: number): number {
  checkProbability(p);
  checkDof(dof);
  if (p === 0.5) return 0;
  if (p < 0.5) return -studentTQuantile(1 - p, dof);
  if (dof === Infinity) return normalQuantile(p);
  if (dof > CORNISH_FISHER_DOF) return cornishFisher(normalQuantile(p), dof);
  if (p < CENTRAL_BELOW) {
    // near the centre solve P(|T| ≤ t) = I_y(1/2, ν/2) = 2p − 1 with y = t²/(ν + t²) (A&S 26.7.1),
    // whose target is exact where 1 − p would have lost the digits of p − 1/2
    return solveDecreasing((t) => -studentTCentral(t, dof), -(2 * p - 1));
  }
  return solveDecreasing((t) => studentTUpperTail(t, dof), 1 - p);
}

/** t from the normal quantile z by the Cornish–Fisher expansion in 1/ν (A&S 26.7.5). */
export function cornishFisher(z: number, dof: number): number {
  const z2 = z * z;
  const g1 = (z * (z2 + 1)) / 4;
  const g2 = (z * ((5 * z2 + 16) * z2 + 3)) / 96;
  const g3 = (z * (((3 * z2 + 19) * z2 + 17) * z2 - 15)) / 384;
  const g4 = (z * ((((79 * z2 + 776) * z2 + 1482) * z2 - 1920) * z2 - 945)) / 92160;
  const w = 1 / dof;
  return z + w * (g1 + w * (g2 + w * (g3 + w * g4)));
}
