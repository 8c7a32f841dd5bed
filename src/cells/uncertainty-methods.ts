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
import { seeded, type Random } from '../numerics/sampling/random.ts';
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

/**
 * Monte Carlo as work that can be done in slices (the app's worker draws a slice of samples
 * between messages): the generator and the values gathered so far are kept between slices, so
 * the figures are the same bit for bit however the samples are sliced. Cost: one what-if run
 * per sample.
 */
export class MonteCarloRun {
  private readonly rng: Random;
  private readonly names: NameSamples[];
  private readonly x: Float64Array;
  private failed = 0;
  private reason?: string;
  /** Samples drawn so far. */
  done = 0;

  constructor(private readonly whatIf: WhatIf, private readonly drawer: Drawer, inputs: number, readonly total: number, seed: number) {
    this.rng = seeded(seed);
    this.names = whatIf.wanted.map(() => ({ values: [], verdict: false, failed: 0 }));
    this.x = new Float64Array(inputs);
  }

  /**
   * Draws samples until all `total` are drawn or `until` (a performance.now() time) has
   * passed, at least one; true when all are drawn.
   */
  step(until = Infinity): boolean {
    const { whatIf, drawer, rng, names, x } = this;
    while (this.done < this.total) {
      drawer(rng, x);
      charge(1);
      const r = whatIf.evaluate(x);
      if (!r.ok) this.failed++;
      r.answers.forEach((a, i) => {
        const n = names[i];
        if (!a.ok) {
          n.failed++;
          n.reason ??= a.reason;
          this.reason ??= a.reason;
          return;
        }
        n.template ??= a.q;
        const truth = a.binding.kind === 'value' ? a.binding.truth : undefined;
        if (truth !== undefined) n.verdict = true;
        n.values.push(truth !== undefined ? Number(truth) : a.si);
      });
      this.done++;
      if (until !== Infinity && performance.now() > until) break;
    }
    return this.done >= this.total;
  }

  /** What the samples drawn gave (all of them once `step` has returned true). */
  result(): MonteCarlo {
    return { names: this.names, failed: this.failed, ...(this.reason !== undefined ? { reason: this.reason } : {}), evaluations: this.done };
  }
}

/** Runs `samples` draws through the what-if at once. Cost: `samples` what-if runs. */
export function monteCarlo(whatIf: WhatIf, drawer: Drawer, inputs: number, samples: number, seed: number): MonteCarlo {
  const run = new MonteCarloRun(whatIf, drawer, inputs, samples, seed);
  run.step();
  return run.result();
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
