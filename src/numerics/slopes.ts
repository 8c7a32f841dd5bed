/**
 * Slopes of a vector function by finite differences: d f_i / d x_j at x0, for every output i
 * and input j, over plain numbers (SI), no units.
 *
 * The step for input j is
 *
 *     h_j = cbrt(eps_f) · max(|x0_j|, scale_j)
 *
 * with eps_f the relative accuracy of f (`accuracy`; machine epsilon by default; for a run
 * integrated at a relative tolerance rtol it is about rtol, not machine epsilon). This step
 * balances the central difference's truncation error, h²/6 · |f'''|, against the error of f
 * itself, eps_f · |f| / h (Nocedal & Wright, "Numerical Optimization", 2nd ed., §8.1), so a
 * slope is good to about eps_f^(2/3) relative to f's scale over x's scale. The step is rounded
 * so that x0 + h and x0 - h are exactly h away from x0.
 *
 * Each slope is the central difference (f(x0 + h) - f(x0 - h)) / 2h. Where an output has no
 * value on one side (f threw, or gave NaN or ±Infinity there), that output's slope is the
 * second-order one-sided difference on the other side, (-3 f(x0) + 4 f(x0 ± h) - f(x0 ± 2h))
 * / (±2h), of the same order of accuracy; `how` says which was used. Where neither can be
 * formed (no value at x0, or on both sides) the slope is NaN and `failed` says why, per input
 * and output.
 *
 * Cost: 2 evaluations of f per input, 1 more per input with a one-sided output, and 1 for
 * f(x0) unless the caller gives it (`f0`). f's stop by the work meter passes through.
 */
import { rethrowWork } from './work-meter.ts';

/** How one slope was formed. */
export type SlopeHow = 'central' | 'forward' | 'backward' | 'failed';

/** A slope that could not be formed: input j, output i, and why, in words. */
export interface SlopeFailure {
  readonly input: number;
  readonly output: number;
  readonly reason: string;
}

export interface SlopesOptions {
  /** The relative accuracy of f, eps_f in the step rule (default: machine epsilon). */
  readonly accuracy?: number;
  /** f(x0), when the caller has it already: saves one evaluation. */
  readonly f0?: Float64Array;
}

export interface SlopesResult {
  /** nOut×nIn, row-major: d[i * nIn + j] = d f_i / d x_j; NaN where it failed. */
  readonly d: Float64Array;
  /** Calls of f made. */
  readonly evaluations: number;
  /** Every slope that could not be formed, by input then output (output -1: f had no value at all, so the outputs are not known). */
  readonly failed: readonly SlopeFailure[];
  /** nOut×nIn, row-major, as `d`: how each slope was formed. */
  readonly how: readonly SlopeHow[];
  /** The step used per input (0 where the input had none: x0 and scale both 0). */
  readonly steps: Float64Array;
  /** f(x0) (the caller's, when given; NaN where it had no value). */
  readonly f0: Float64Array;
}

/** f at x, or undefined where it threw (the work meter's stop passes through). */
function tryF(f: (x: Float64Array) => Float64Array, x: Float64Array): Float64Array | undefined {
  try {
    return f(x);
  } catch (err) {
    rethrowWork(err);
    return undefined;
  }
}

const finiteAt = (v: Float64Array | undefined, i: number): boolean => v !== undefined && i < v.length && Number.isFinite(v[i]);

/**
 * The slopes of f at x0 (see the module comment for the step rule and the accuracy).
 * `scale[j]` is the size of change of input j that matters (its unit's size, a typical value),
 * used where |x0_j| is smaller. f must return outputs of one length at every x; it is never
 * handed x0 itself to keep (a fresh array per call).
 */
export function slopes(
  f: (x: Float64Array) => Float64Array,
  x0: Float64Array,
  scale: Float64Array,
  options: SlopesOptions = {},
): SlopesResult {
  const nIn = x0.length;
  if (scale.length !== nIn) throw new RangeError(`slopes: scale has ${scale.length} entries for ${nIn} inputs`);
  const accuracy = options.accuracy ?? Number.EPSILON;
  if (!(accuracy > 0 && accuracy < 1)) throw new RangeError(`slopes: accuracy must lie in (0, 1); it is ${accuracy}`);
  let evaluations = 0;
  const call = (x: Float64Array): Float64Array | undefined => {
    evaluations++;
    return tryF(f, x);
  };
  const given = options.f0 ?? call(Float64Array.from(x0));
  const root = Math.cbrt(accuracy);
  const at = (j: number, h: number): Float64Array => {
    const x = Float64Array.from(x0);
    x[j] = x0[j] + h;
    return x;
  };
  // The steps and both sides of every input first: f(x0) may have no value while the sides do.
  const steps = new Float64Array(nIn);
  const sides: { up?: Float64Array; down?: Float64Array; reason?: string }[] = [];
  for (let j = 0; j < nIn; j++) {
    const size = Math.max(Math.abs(x0[j]), Math.abs(scale[j]));
    // h as the representable distance from x0 to x0 + h
    const h = (x0[j] + root * size) - x0[j];
    if (!(Number.isFinite(h) && h > 0)) {
      sides.push({ reason: Number.isFinite(x0[j]) ? 'no step: the value and its scale are both 0' : 'the value is not a finite number' });
      continue;
    }
    steps[j] = h;
    sides.push({ up: call(at(j, h)), down: call(at(j, -h)) });
  }
  const firstLength = sides.map((s) => s.up?.length ?? s.down?.length).find((n) => n !== undefined);
  const nOut = given?.length ?? firstLength ?? 0;
  const f0 = given ?? new Float64Array(nOut).fill(NaN);
  const d = new Float64Array(nOut * nIn).fill(NaN);
  const how: SlopeHow[] = new Array<SlopeHow>(nOut * nIn).fill('failed');
  const failed: SlopeFailure[] = [];
  if (given === undefined && firstLength === undefined) {
    for (let j = 0; j < nIn; j++) failed.push({ input: j, output: -1, reason: sides[j].reason ?? 'the function had no value at the point or beside it' });
    return { d, evaluations, failed, how, steps, f0 };
  }

  for (let j = 0; j < nIn; j++) {
    const { up, down, reason } = sides[j];
    if (reason !== undefined) {
      for (let i = 0; i < nOut; i++) failed.push({ input: j, output: i, reason });
      continue;
    }
    const h = steps[j];
    let up2: Float64Array | undefined;
    let down2: Float64Array | undefined;
    let up2Tried = false;
    let down2Tried = false;
    for (let i = 0; i < nOut; i++) {
      const k = i * nIn + j;
      const hasUp = finiteAt(up, i);
      const hasDown = finiteAt(down, i);
      if (hasUp && hasDown) {
        d[k] = (up![i] - down![i]) / (2 * h);
        how[k] = 'central';
        continue;
      }
      if (!Number.isFinite(f0[i])) {
        failed.push({ input: j, output: i, reason: 'the output has no value at the point itself' });
        continue;
      }
      if (hasUp) {
        if (!up2Tried) { up2 = call(at(j, 2 * h)); up2Tried = true; }
        if (finiteAt(up2, i)) {
          d[k] = (-3 * f0[i] + 4 * up![i] - up2![i]) / (2 * h);
          how[k] = 'forward';
          continue;
        }
      } else if (hasDown) {
        if (!down2Tried) { down2 = call(at(j, -2 * h)); down2Tried = true; }
        if (finiteAt(down2, i)) {
          d[k] = (3 * f0[i] - 4 * down![i] + down2![i]) / (2 * h);
          how[k] = 'backward';
          continue;
        }
      }
      failed.push({
        input: j,
        output: i,
        reason: hasUp || hasDown
          ? 'the output has a value on one side only, too close to the point for a one-sided slope'
          : 'the output has no value on either side of the point',
      });
    }
  }
  return { d, evaluations, failed, how, steps, f0 };
}
