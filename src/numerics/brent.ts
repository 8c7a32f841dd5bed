/**
 * Brent's methods on an interval, without derivatives (R. P. Brent, "Algorithms for
 * Minimization without Derivatives", Prentice-Hall 1973):
 *
 * - `brentRoot`: a zero of f in a bracket [a, b] where f changes sign (ch. 4, procedure
 *   `zero`): inverse quadratic or secant steps, safeguarded by bisection, so it never needs
 *   more than about (log2((b - a) / tol))^2 evaluations and usually far fewer.
 * - `brentMinimize`: a local minimum of f on [a, b] (ch. 5, procedure `localmin`): golden
 *   section safeguarding successive parabolic interpolation.
 *
 * Numerical failure is a result, not an exception: each returns `converged` and a `status`
 * from a fixed table, with its counters. Invalid input (a non-finite end, a bad option) is a
 * RangeError that names the option.
 */

/** Machine epsilon for doubles. */
const EPS = Number.EPSILON;
/** Smallest useful relative tolerance: below this the step cannot move the iterate. */
const MIN_RTOL = 4 * EPS;
/** Smallest normal double: a floor for step tolerances, so that a zero at x = 0 still moves. */
const MIN_NORMAL = 2.2250738585072014e-308;
/** Brent's golden-section constant (3 - sqrt 5) / 2. */
const GOLDEN = (3 - Math.sqrt(5)) / 2;
/** Default iteration caps; each iteration costs one evaluation of f. */
const ROOT_MAX_ITERATIONS = 100;
const MIN_MAX_ITERATIONS = 200;

export type BrentStatus = 'converged' | 'exact-zero' | 'not-bracketed' | 'non-finite' | 'iteration-limit' | 'stopped';

/** What each status means, for messages shown to a person. */
export const BRENT_MESSAGES: Readonly<Record<BrentStatus, string>> = {
  'converged': 'the bracket is within tolerance',
  'exact-zero': 'f is exactly zero at the root',
  'not-bracketed': 'f has the same sign at both ends of the interval',
  'non-finite': 'f is not a finite number at a point of the interval',
  'iteration-limit': 'the iteration limit was reached before the tolerance',
  'stopped': 'the caller\'s stop condition was met',
};

export interface BrentOptions {
  /** Absolute tolerance on the location, in the units of x (default 0). */
  readonly xtol?: number;
  /** Relative tolerance on the location (default 4 machine epsilons; smaller values are raised to that). */
  readonly rtol?: number;
  /** Iteration cap; one evaluation of f per iteration (default 100). */
  readonly maxIterations?: number;
}

export interface BrentRootResult {
  /** Best estimate of the zero: the bracket end where |f| is smaller. */
  readonly root: number;
  /** f at `root`. */
  readonly fRoot: number;
  /** The final bracket, ordered: f changes sign across it (unless status is non-finite). */
  readonly bracket: readonly [number, number];
  /** f at the bracket's ends. */
  readonly fBracket: readonly [number, number];
  readonly iterations: number;
  /** Evaluations of f, including the two at the ends when they were not supplied. */
  readonly evaluations: number;
  readonly converged: boolean;
  readonly status: BrentStatus;
}

function checkOptions(o: BrentOptions, defaultMax: number): { xtol: number; rtol: number; maxIterations: number } {
  const xtol = o.xtol ?? 0;
  const rtol = o.rtol ?? MIN_RTOL;
  const maxIterations = o.maxIterations ?? defaultMax;
  if (!(xtol >= 0) || !Number.isFinite(xtol)) throw new RangeError(`xtol must be a finite number >= 0; it is ${xtol}`);
  if (!(rtol >= 0) || !Number.isFinite(rtol)) throw new RangeError(`rtol must be a finite number >= 0; it is ${rtol}`);
  if (!Number.isInteger(maxIterations) || maxIterations < 0) throw new RangeError(`maxIterations must be an integer >= 0; it is ${maxIterations}`);
  return { xtol, rtol: Math.max(rtol, MIN_RTOL), maxIterations };
}

function checkEnds(a: number, b: number): void {
  if (!Number.isFinite(a)) throw new RangeError(`a must be a finite number; it is ${a}`);
  if (!Number.isFinite(b)) throw new RangeError(`b must be a finite number; it is ${b}`);
}

/**
 * A zero of `f` in [a, b], where f(a) and f(b) have opposite signs (or one is zero).
 * Stops when the bracket is no wider than xtol + rtol·|root| (so the zero is within that of
 * `root`), when f is exactly zero, or after `maxIterations` evaluations.
 *
 * `fa` and `fb`, when already known, save the first two evaluations. ±Infinity is accepted
 * as a signed value (a pole in the bracket then shows as |f| growing at the ends); NaN stops
 * the search with status `non-finite`.
 *
 * Cost: one evaluation per iteration; typically 6–12 for smooth f at full precision.
 */
export function brentRoot(
  f: (x: number) => number, a: number, b: number, options: BrentOptions = {}, fa?: number, fb?: number,
): BrentRootResult {
  checkEnds(a, b);
  const { xtol, rtol, maxIterations } = checkOptions(options, ROOT_MAX_ITERATIONS);
  let evaluations = 0;
  const ev = (x: number): number => { evaluations++; return f(x); };
  if (fa === undefined) fa = ev(a);
  if (fb === undefined) fb = ev(b);
  const done = (status: BrentStatus, iterations: number, x: number, fx: number, o: number, fo: number): BrentRootResult => {
    const lo = Math.min(x, o), hi = Math.max(x, o);
    const flo = x <= o ? fx : fo, fhi = x <= o ? fo : fx;
    return {
      root: x, fRoot: fx, bracket: [lo, hi], fBracket: [flo, fhi], iterations, evaluations,
      converged: status === 'converged' || status === 'exact-zero', status,
    };
  };
  if (Number.isNaN(fa)) return done('non-finite', 0, a, fa, b, fb);
  if (Number.isNaN(fb)) return done('non-finite', 0, b, fb, a, fa);
  if (fa === 0) return done('exact-zero', 0, a, fa, a, fa);
  if (fb === 0) return done('exact-zero', 0, b, fb, b, fb);
  if (Math.sign(fa) === Math.sign(fb)) {
    return Math.abs(fa) <= Math.abs(fb) ? done('not-bracketed', 0, a, fa, b, fb) : done('not-bracketed', 0, b, fb, a, fa);
  }

  // Brent's variables: b is the best estimate, c the other end of the bracket, a the previous b.
  let c = a, fc = fa, d = b - a, e = d;
  for (let iteration = 0; ; iteration++) {
    if (Math.sign(fb) === Math.sign(fc)) { c = a; fc = fa; d = b - a; e = d; }
    if (Math.abs(fc) < Math.abs(fb)) { a = b; b = c; c = a; fa = fb; fb = fc; fc = fa; }
    const tol = Math.max(0.5 * (xtol + rtol * Math.abs(b)), MIN_NORMAL);
    const m = 0.5 * (c - b);
    if (fb === 0) return done('exact-zero', iteration, b, fb, c, fc);
    if (Math.abs(m) <= tol) return done('converged', iteration, b, fb, c, fc);
    if (iteration >= maxIterations) return done('iteration-limit', iteration, b, fb, c, fc);
    const finite = Number.isFinite(fa) && Number.isFinite(fb) && Number.isFinite(fc);
    if (!finite || Math.abs(e) < tol || Math.abs(fa) <= Math.abs(fb)) {
      d = m; e = m; // bisection
    } else {
      let p: number, q: number;
      const s = fb / fa;
      if (a === c) { // secant
        p = 2 * m * s; q = 1 - s;
      } else { // inverse quadratic interpolation
        const qa = fa / fc, r = fb / fc;
        p = s * (2 * m * qa * (qa - r) - (b - a) * (r - 1));
        q = (qa - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q; else p = -p;
      const eOld = e;
      e = d;
      if (2 * p < 3 * m * q - Math.abs(tol * q) && p < Math.abs(0.5 * eOld * q)) d = p / q;
      else { d = m; e = m; }
    }
    a = b; fa = fb;
    b += Math.abs(d) > tol ? d : (m > 0 ? tol : -tol);
    fb = ev(b);
    if (Number.isNaN(fb)) return done('non-finite', iteration + 1, b, fb, c, fc);
  }
}

export interface MinimizeOptions extends BrentOptions {
  /** Called after each evaluation; returning true ends the search at that point (status `stopped`). */
  readonly stop?: (x: number, fx: number) => boolean;
}

export interface BrentMinResult {
  /** The best point found. */
  readonly x: number;
  readonly fx: number;
  readonly iterations: number;
  readonly evaluations: number;
  readonly converged: boolean;
  readonly status: BrentStatus;
}

/**
 * A local minimum of `f` on [a, b] (Brent 1973, ch. 5). The location is found to about
 * xtol + rtol·|x|; rtol defaults to sqrt(machine epsilon), the useful limit for a smooth
 * minimum (f is flat to first order there). NaN or ±Infinity values are treated as +Infinity
 * (never the minimum), so the search stays on the finite part. `stop` ends the search early
 * at the first point the caller accepts (for example "f went negative").
 *
 * Cost: one evaluation per iteration; typically 10–30.
 */
export function brentMinimize(f: (x: number) => number, a: number, b: number, options: MinimizeOptions = {}): BrentMinResult {
  checkEnds(a, b);
  const { xtol, maxIterations } = checkOptions(options, MIN_MAX_ITERATIONS);
  const rtol = Math.max(options.rtol ?? Math.sqrt(EPS), MIN_RTOL);
  if (a > b) [a, b] = [b, a];
  let evaluations = 0;
  const stop = options.stop;
  let stopped = false;
  const ev = (x: number): number => {
    evaluations++;
    const v = f(x);
    if (stop && stop(x, v)) stopped = true;
    return Number.isNaN(v) || v === -Infinity ? Infinity : v;
  };
  let x = a + GOLDEN * (b - a), w = x, v = x;
  let fx = ev(x), fw = fx, fv = fx;
  let d = 0, e = 0;
  const result = (status: BrentStatus, iterations: number, bx: number, bf: number): BrentMinResult =>
    ({ x: bx, fx: bf, iterations, evaluations, converged: status === 'converged', status });
  if (stopped) return result('stopped', 0, x, fx);
  for (let iteration = 0; ; iteration++) {
    const m = 0.5 * (a + b);
    const tol = Math.max(rtol * Math.abs(x) + xtol / 3, MIN_NORMAL);
    const t2 = 2 * tol;
    if (Math.abs(x - m) <= t2 - 0.5 * (b - a)) return result('converged', iteration, x, fx);
    if (iteration >= maxIterations) return result('iteration-limit', iteration, x, fx);
    let p = 0, q = 0, r = 0;
    if (Math.abs(e) > tol && Number.isFinite(fx) && Number.isFinite(fw) && Number.isFinite(fv)) {
      r = (x - w) * (fx - fv);
      q = (x - v) * (fx - fw);
      p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p; else q = -q;
      r = e;
      e = d;
    }
    if (Math.abs(p) < Math.abs(0.5 * q * r) && p > q * (a - x) && p < q * (b - x)) {
      d = p / q; // parabolic step
      const u = x + d;
      if (u - a < t2 || b - u < t2) d = x < m ? tol : -tol;
    } else {
      e = (x < m ? b : a) - x; // golden section step
      d = GOLDEN * e;
    }
    const u = x + (Math.abs(d) >= tol ? d : (d > 0 ? tol : -tol));
    const fu = ev(u);
    if (stopped) return result('stopped', iteration + 1, u, fu);
    if (fu <= fx) {
      if (u < x) b = x; else a = x;
      v = w; fv = fw; w = x; fw = fx; x = u; fx = fu;
    } else {
      if (u < x) a = u; else b = u;
      if (fu <= fw || w === x) { v = w; fv = fw; w = u; fw = fu; }
      else if (fu <= fv || v === x || v === w) { v = u; fv = fu; }
    }
  }
}
