/**
 * A model run for fitting: the coupled laws integrated from their start, with some parameters
 * and starting values replaced, sampled at given times. No schedule. Pure numbers (SI).
 */
import type { Law } from '../engine/node.ts';
import { integrate, denseAt } from '../numerics/ode/integrate.ts';
import { Status } from '../numerics/ode/types.ts';
import { compileLaw } from './compile-law.ts';

export interface ModelSpec {
  readonly laws: readonly Law[];
  /** Parameters the laws read, in input order after t and the states. */
  readonly params: readonly string[];
}

export interface RunAt {
  /** values[k][i]: state i at times[k]; undefined when the run failed. */
  readonly values?: Float64Array[];
  readonly message?: string;
}

/** Tolerances tight enough that finite differences of a run are not spoiled by its error. */
export const FIT_RTOL = 1e-10;

/**
 * Runs the model from t0 with starting values y0 and parameters p, and samples it at `times`
 * (ascending, none before t0). Cost: one adaptive run (auto method).
 */
export function runModelAt(spec: ModelSpec, t0: number, y0: Float64Array, p: Float64Array, times: readonly number[], scale: Float64Array): RunAt {
  const states = spec.laws.map((l) => l.state);
  const inputs = ['t', ...states, ...spec.params];
  const compiled = spec.laws.map((l) => compileLaw(l, inputs));
  const n = states.length;
  const x = new Float64Array(inputs.length);
  x.set(p, 1 + n);
  const f = (t: number, y: Float64Array, dy: Float64Array) => {
    x[0] = t;
    for (let i = 0; i < n; i++) x[1 + i] = y[i];
    for (let i = 0; i < n; i++) dy[i] = compiled[i](x);
  };
  const t1 = times.length ? times[times.length - 1] : t0;
  const atol = Float64Array.from(scale, (s) => Math.max(s, 1e-300) * FIT_RTOL * 1e-2);
  const run = t1 > t0 ? integrate(f, t0, y0, t1, { method: 'auto', rtol: FIT_RTOL, atol, maxSteps: 200_000 }) : undefined;
  if (run && run.status !== Status.Success) return { message: run.message };
  const out: Float64Array[] = [];
  for (const t of times) {
    const v = new Float64Array(n);
    if (!run || t <= t0) v.set(y0);
    else if (!denseAt(run.segments, t, v)) return { message: `no value at t = ${t}` };
    out.push(v);
  }
  return { values: out };
}
