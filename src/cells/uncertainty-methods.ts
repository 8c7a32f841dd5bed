/**
 * The two ways an uncertainty cell carries its inputs' spread to its names, on a prepared
 * what-if (engine/what-if.ts) that replaces the inputs:
 * - Monte Carlo (JCGM 101:2008, GUM Supplement 1): `samples` draws of all inputs from the
 *   seeded generator, each run through the what-if; per name, its values (a verdict's yes/no),
 *   and the samples in which it had no value with the first reason.
 * - Linear (JCGM 100:2008, the law of propagation of uncertainty, 5.2): u(y)² = J Σ Jᵀ with J
 *   the derivatives of each name with respect to the inputs' working coordinates
 *   (uncertainty-inputs.ts), by the shared central differences of numerics/slopes.ts.
 * Each what-if run charges the work meter one unit besides its own work.
 */
import type { WhatIf } from '../engine/what-if.ts';
import type { Quantity } from '../units/quantity.ts';
import { charge } from '../numerics/work-meter.ts';
import { seeded } from '../numerics/sampling/random.ts';
import type { Drawer, Working } from './uncertainty-inputs.ts';
import { slopes } from '../numerics/slopes.ts';
import { RUN_ACCURACY } from './sensitivity.ts';

/** What the samples gave for one name. */
export interface NameSamples {
  /** Values in SI (a verdict: 1 or 0), in sample order, where the name had a value. */
  readonly values: number[];
  /** True when the name is a yes/no verdict. */
  verdict: boolean;
  /** A quantity of the name, for its unit. */
  template?: Quantity;
  failed: number;
  reason?: string;
}

export interface MonteCarlo {
  readonly names: NameSamples[];
  /** Samples in which some name had no value, and the first reason. */
  readonly failed: number;
  readonly reason?: string;
  readonly evaluations: number;
}

/** Runs `samples` draws through the what-if. Cost: `samples` what-if runs. */
export function monteCarlo(whatIf: WhatIf, drawer: Drawer, inputs: number, samples: number, seed: number): MonteCarlo {
  const rng = seeded(seed);
  const names: NameSamples[] = whatIf.wanted.map(() => ({ values: [], verdict: false, failed: 0 }));
  const x = new Float64Array(inputs);
  let failed = 0;
  let reason: string | undefined;
  for (let s = 0; s < samples; s++) {
    drawer(rng, x);
    charge(1);
    const r = whatIf.evaluate(x);
    if (!r.ok) failed++;
    r.answers.forEach((a, i) => {
      const n = names[i];
      if (!a.ok) {
        n.failed++;
        n.reason ??= a.reason;
        reason ??= a.reason;
        return;
      }
      n.template ??= a.q;
      const truth = a.binding.kind === 'value' ? a.binding.truth : undefined;
      if (truth !== undefined) n.verdict = true;
      n.values.push(truth !== undefined ? Number(truth) : a.si);
    });
  }
  return { names, failed, ...(reason !== undefined ? { reason } : {}), evaluations: samples };
}

/** One name under the linear method. */
export type LinearName =
  | { readonly ok: true; readonly mean: number; readonly sd: number; readonly template: Quantity; readonly truth?: boolean }
  | { readonly ok: false; readonly reason: string };

/**
 * The linear method. The derivatives are central differences (numerics/slopes.ts: a step per
 * input from its standard uncertainty and the runs' accuracy, `RUN_ACCURACY`, one-sided where
 * a side has no value). Cost: 1 + 2·inputs what-if runs (more where a side has no value).
 */
export function linear(whatIf: WhatIf, working: Working): { names: LinearName[]; evaluations: number } {
  const n = working.w0.length;
  const x = new Float64Array(n);
  const run = (w: ArrayLike<number>) => {
    working.toValues(w, x);
    charge(1);
    return whatIf.evaluate(x);
  };
  const center = run(working.w0);
  const scale = Float64Array.from({ length: n }, (_, j) => Math.sqrt(working.covariance[j * n + j]));
  const s = slopes((w) => run(w).values, Float64Array.from(working.w0), scale, { accuracy: RUN_ACCURACY, f0: center.values });
  const bad = new Map<number, string>();
  for (const f of s.failed) if (f.output >= 0 && !bad.has(f.output)) bad.set(f.output, f.reason);
  const names: LinearName[] = center.answers.map((a, i) => {
    if (!a.ok) return { ok: false, reason: a.reason };
    const truth = a.binding.kind === 'value' ? a.binding.truth : undefined;
    if (truth !== undefined) return { ok: true, mean: a.si, sd: 0, template: a.q, truth };
    if (bad.has(i)) return { ok: false, reason: `no slope near the present values: ${bad.get(i)}` };
    let v = 0;
    for (let j = 0; j < n; j++) for (let k = 0; k < n; k++) v += s.d[i * n + j] * working.covariance[j * n + k] * s.d[i * n + k];
    return { ok: true, mean: a.si, sd: Math.sqrt(Math.max(0, v)), template: a.q };
  });
  return { names, evaluations: 1 + s.evaluations };
}
