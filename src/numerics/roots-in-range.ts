/**
 * Every zero of a function of one variable in [min, max], without derivatives: sample f on an
 * even grid, run Brent's method (brent.ts) on each interval where f changes sign, and look
 * into each dip of |f| between samples of one sign (a minimum of |f| that may touch or cross
 * zero: a double root, or two roots closer than the grid) with Brent's minimiser.
 *
 * Where f is undefined (NaN: a level never reached, a run that failed), the samples are not
 * dropped: the stretches of x without a value are returned, each edge located by bisection
 * between the last sample with a value and the first without, and zeros are sought on each
 * stretch with values, to its located edges.
 *
 * Roots closer together than the grid step with f of one sign at every sample between them are
 * found only when |f| dips between samples; a zero where f touches 0 without a dip in the
 * samples (narrower than a grid step) can be missed: the grid's size bounds what is seen.
 *
 * Cost: `intervals + 1` evaluations for the grid, about 6–12 per zero found, up to about 30
 * per dip looked into, and `edgeSteps` per edge of an undefined stretch.
 */
import { brentMinimize, brentRoot } from './brent.ts';

export interface RootsOptions {
  /** Grid intervals over [min, max] (default 24). */
  readonly intervals?: number;
  /** Relative tolerance on each zero, as a share of max - min (default 1e-10). */
  readonly xtol?: number;
  /** Bisections that locate each edge of a stretch where f has no value (default 24). */
  readonly edgeSteps?: number;
}

export interface RootsInRange {
  /** The zeros found, in increasing order. */
  readonly roots: readonly number[];
  /** The least and greatest f seen (samples and every point evaluated); NaN when f had no value anywhere. */
  readonly low: number;
  readonly high: number;
  /** Where they were seen. */
  readonly lowAt: number;
  readonly highAt: number;
  /** Stretches of x where f had no value, as [from, to] (edges located to `edgeSteps` bisections). */
  readonly undefinedIn: ReadonlyArray<readonly [number, number]>;
  /** Evaluations of f in all. */
  readonly evaluations: number;
}

/**
 * The zeros of f in [min, max] (min < max, both finite). f may return NaN where it has no value;
 * ±Infinity counts as a signed value.
 */
export function rootsInRange(f: (x: number) => number, min: number, max: number, options: RootsOptions = {}): RootsInRange {
  if (!(Number.isFinite(min) && Number.isFinite(max) && min < max)) throw new RangeError(`need finite min < max; got [${min}, ${max}]`);
  const n = options.intervals ?? 24;
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`intervals must be a whole number >= 1; it is ${n}`);
  const xtol = (options.xtol ?? 1e-10) * (max - min);
  const edgeSteps = options.edgeSteps ?? 24;
  let evaluations = 0;
  let low = NaN, high = NaN, lowAt = NaN, highAt = NaN;
  const ev = (x: number): number => {
    evaluations++;
    const y = f(x);
    if (!Number.isNaN(y)) {
      if (!(y >= low)) { low = y; lowAt = x; }
      if (!(y <= high)) { high = y; highAt = x; }
    }
    return y;
  };

  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i <= n; i++) {
    const x = i === n ? max : min + ((max - min) * i) / n;
    xs.push(x);
    ys.push(ev(x));
  }

  // stretches with values, each with its located edges (an edge between two samples is bisected)
  const stretches: Array<{ xs: number[]; ys: number[] }> = [];
  const undefinedIn: Array<[number, number]> = [];
  /** Bisection keeping [a with a value, b without]: the last point with a value, its f, and the first without. */
  const edge = (defined: number, undef: number): [number, number, number] => {
    let a = defined, b = undef, fa = NaN;
    for (let k = 0; k < edgeSteps; k++) {
      const m = 0.5 * (a + b);
      const y = ev(m);
      if (Number.isNaN(y)) b = m;
      else { a = m; fa = y; }
    }
    return [a, fa, b];
  };
  let current: { xs: number[]; ys: number[] } | undefined;
  let gapStart: number | undefined;
  for (let i = 0; i <= n; i++) {
    const defined = !Number.isNaN(ys[i]);
    if (defined) {
      if (!current) {
        current = { xs: [], ys: [] };
        stretches.push(current);
        if (i > 0) {
          const [x, y, last] = edge(xs[i], xs[i - 1]);
          undefinedIn.push([gapStart!, last]);
          gapStart = undefined;
          if (!Number.isNaN(y)) { current.xs.push(x); current.ys.push(y); }
        }
      }
      current.xs.push(xs[i]);
      current.ys.push(ys[i]);
    } else if (current) {
      const [x, y, first] = edge(xs[i - 1], xs[i]);
      if (!Number.isNaN(y)) { current.xs.push(x); current.ys.push(y); }
      gapStart = first;
      current = undefined;
    } else if (gapStart === undefined) gapStart = xs[i];
  }
  if (gapStart !== undefined) undefinedIn.push([gapStart, max]);

  const roots: number[] = [];
  const add = (x: number) => { if (!roots.some((r) => Math.abs(r - x) <= 2 * xtol)) roots.push(x); };
  const bracket = (a: number, b: number, fa: number, fb: number) => {
    if (fa === 0) { add(a); return; }
    if (fb === 0) { add(b); return; }
    const r = brentRoot(ev, a, b, { xtol }, fa, fb);
    if (r.converged) add(r.root);
  };
  for (const s of stretches) {
    const m = s.xs.length;
    for (let i = 0; i + 1 < m; i++) {
      const a = s.xs[i], b = s.xs[i + 1], fa = s.ys[i], fb = s.ys[i + 1];
      if (fa === 0 || Math.sign(fa) !== Math.sign(fb)) bracket(a, b, fa, fb);
    }
    if (s.ys[m - 1] === 0) add(s.xs[m - 1]);
    // dips of |f| at a sample between two of the same sign: look for a touch or a crossing
    for (let i = 1; i + 1 < m; i++) {
      const [fl, fc, fr] = [s.ys[i - 1], s.ys[i], s.ys[i + 1]];
      const sign = Math.sign(fc);
      if (sign === 0 || Math.sign(fl) !== sign || Math.sign(fr) !== sign) continue;
      if (!(Math.abs(fc) < Math.abs(fl) && Math.abs(fc) <= Math.abs(fr))) continue;
      const g = (x: number) => sign * ev(x);
      const found = brentMinimize(g, s.xs[i - 1], s.xs[i + 1], { xtol, stop: (_x, gx) => gx <= 0 });
      if (found.fx <= 0) {
        if (found.fx === 0) { add(found.x); continue; }
        bracket(s.xs[i - 1], found.x, fl, sign * found.fx);
        bracket(found.x, s.xs[i + 1], sign * found.fx, fr);
      } else if (found.fx <= 1e-9 * Math.max(Math.abs(fl), Math.abs(fr))) {
        // |f| falls to round-off at the dip's bottom: a double zero that f touches
        add(found.x);
      }
    }
  }
  roots.sort((a, b) => a - b);
  return { roots, low, high, lowAt, highAt, undefinedIn, evaluations };
}

