/**
 * The entry checks of a fit: the problem and its options checked (a message naming the field
 * when something is invalid), and put in working form (Float64Arrays, start clipped into the
 * bounds, defaults filled in, the typical size of each parameter).
 */
import { FIT_DEFAULTS, type LeastSquaresOptions, type LeastSquaresProblem } from './fit-types.ts';

/** A problem that passed `checkInput`, in working form. */
export interface CheckedInput {
  readonly n: number;
  readonly m: number;
  readonly p0: Float64Array;
  readonly lower: Float64Array;
  readonly upper: Float64Array;
  readonly scale: Float64Array | null;
  readonly typical: Float64Array;
  readonly maxIterations: number;
  readonly maxEvaluations: number;
  readonly ftol: number;
  readonly xtol: number;
  readonly gtol: number;
  readonly diffStep: number;
  /** The model's relative accuracy (central differences, digits), or null (forward differences). */
  readonly modelAccuracy: number | null;
  /** Per parameter: counted on the log scale for `digits` (`LeastSquaresOptions.logParameters`). */
  readonly logParameters: readonly boolean[];
}

/** Checks the input; returns the problem in working form or the reason it is invalid. */
export function checkInput(problem: LeastSquaresProblem, options: LeastSquaresOptions): CheckedInput | { invalid: string } {
  const bad = (why: string) => ({ invalid: why });
  if (problem === null || typeof problem !== 'object') return bad('the problem must be an object');
  if (typeof problem.residuals !== 'function') return bad('residuals must be a function');
  const m = problem.m;
  if (!Number.isInteger(m) || m < 1) return bad(`m must be a positive integer; it is ${m}`);
  const p0In = problem.p0;
  if (!p0In || typeof p0In.length !== 'number' || p0In.length < 1) return bad('p0 must hold at least one number');
  const n = p0In.length;
  const vector = (name: string, v: ArrayLike<number> | undefined, fill: number): Float64Array | string => {
    if (v === undefined) return new Float64Array(n).fill(fill);
    if (!v || v.length !== n) return `${name} must have one entry per parameter (${n}); it has ${v?.length}`;
    return Float64Array.from(v);
  };
  const p0 = Float64Array.from(p0In);
  for (let j = 0; j < n; j++) if (!Number.isFinite(p0[j])) return bad(`p0[${j}] must be a finite number; it is ${p0[j]}`);
  const lower = vector('lower', problem.lower, -Infinity);
  if (typeof lower === 'string') return bad(lower);
  const upper = vector('upper', problem.upper, Infinity);
  if (typeof upper === 'string') return bad(upper);
  for (let j = 0; j < n; j++) {
    if (Number.isNaN(lower[j]) || lower[j] === Infinity) return bad(`lower[${j}] must be a number or -Infinity; it is ${lower[j]}`);
    if (Number.isNaN(upper[j]) || upper[j] === -Infinity) return bad(`upper[${j}] must be a number or Infinity; it is ${upper[j]}`);
    if (!(lower[j] < upper[j])) return bad(`lower[${j}] (${lower[j]}) must be below upper[${j}] (${upper[j]})`);
    p0[j] = Math.min(Math.max(p0[j], lower[j]), upper[j]);
  }
  let scale: Float64Array | null = null;
  if (problem.scale !== undefined) {
    const s = vector('scale', problem.scale, 1);
    if (typeof s === 'string') return bad(s);
    for (let j = 0; j < n; j++) if (!(s[j] > 0 && Number.isFinite(s[j]))) return bad(`scale[${j}] must be a positive finite number; it is ${s[j]}`);
    scale = s;
  }
  const typical = new Float64Array(n);
  for (let j = 0; j < n; j++) typical[j] = scale ? scale[j] : p0[j] !== 0 ? Math.abs(p0[j]) : 1;

  const o = options ?? {};
  const positiveInteger = (name: string, v: number | undefined, dflt: number): number | string => {
    if (v === undefined) return dflt;
    return Number.isInteger(v) && v >= 1 ? v : `${name} must be a positive integer; it is ${v}`;
  };
  const tolerance = (name: string, v: number | undefined, dflt: number): number | string => {
    if (v === undefined) return dflt;
    return v >= 0 && Number.isFinite(v) ? v : `${name} must be a finite number >= 0; it is ${v}`;
  };
  const maxIterations = positiveInteger('maxIterations', o.maxIterations, FIT_DEFAULTS.maxIterations);
  if (typeof maxIterations === 'string') return bad(maxIterations);
  const maxEvaluations = positiveInteger('maxEvaluations', o.maxEvaluations, FIT_DEFAULTS.evaluationsPerParameter * (n + 1));
  if (typeof maxEvaluations === 'string') return bad(maxEvaluations);
  const ftol = tolerance('ftol', o.ftol, FIT_DEFAULTS.ftol);
  if (typeof ftol === 'string') return bad(ftol);
  const xtol = tolerance('xtol', o.xtol, FIT_DEFAULTS.xtol);
  if (typeof xtol === 'string') return bad(xtol);
  const gtol = tolerance('gtol', o.gtol, FIT_DEFAULTS.gtol);
  if (typeof gtol === 'string') return bad(gtol);
  const diffStep = o.diffStep ?? FIT_DEFAULTS.diffStep;
  if (!(diffStep > 0 && diffStep < 1)) return bad(`diffStep must be a number between 0 and 1; it is ${diffStep}`);
  const modelAccuracy = o.modelAccuracy ?? null;
  if (modelAccuracy !== null && !(modelAccuracy >= Number.EPSILON && modelAccuracy < 1e-2)) {
    return bad(`modelAccuracy must be a number from machine epsilon up to 0.01; it is ${modelAccuracy}`);
  }
  const logParameters = o.logParameters ?? Array.from({ length: n }, () => false);
  if (!Array.isArray(logParameters) || logParameters.length !== n) return bad(`logParameters must have one entry per parameter (${n})`);
  return { n, m, p0, lower, upper, scale, typical, maxIterations, maxEvaluations, ftol, xtol, gtol, diffStep, modelAccuracy, logParameters };
}
