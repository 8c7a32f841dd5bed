/**
 * Speed of the equilibrium finder and the parameter sweep behind the `phase` cell.
 *
 * `phaseBenchmarks()` returns one row per case: the median wall time of `runs` timed calls
 * after untimed warm-up calls (so the JIT has compiled the code), the goal, and the calls of
 * f per timed call (a machine-independent measure of the work). Plain numbers in SI, no units
 * layer: this measures the numerics alone.
 */
import { findEquilibria } from '../src/numerics/phase/equilibria.ts';
import { sweepEquilibria } from '../src/numerics/phase/sweep.ts';

export interface BenchRow {
  /** What was timed. */
  readonly name: string;
  /** Median wall time of one call, in milliseconds. */
  readonly ms: number;
  /** The time it should stay under, in milliseconds. */
  readonly goalMs: number;
  /** ms <= goalMs. */
  readonly ok: boolean;
  /** Timed calls behind the median. */
  readonly runs: number;
  /** Calls of f in one call (the same on every machine). */
  readonly evaluations: number;
}

/** Warm-up lasts at least this long, so that the optimising compiler has finished. */
const WARMUP_MS = 400;
const DAY = 86400;
const HOUR = 3600;

function time(name: string, goalMs: number, run: () => number, runs: number): BenchRow {
  let evaluations = 0;
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    evaluations = run();
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  const ms = times[times.length >> 1];
  return { name, ms, goalMs, ok: ms <= goalMs, runs, evaluations };
}

/**
 * The rows: every case is first run untimed, `warmup` times and for at least 400 ms (all
 * cases, before any timing, so the first row does not pay for compiling shared code), then
 * `runs` times timed. About a second in all.
 */
export function phaseBenchmarks(runs = 15, warmup = 5): BenchRow[] {
  const r = 0.5 / DAY, K = 2000;
  const Vmax = 10e-3 / HOUR, Km = 2e-3;
  const cases: Array<[string, number, () => number]> = [
    ['phase sweep: 200 steps of a harvested logistic law (two equilibria, one fold)', 20,
      () => sweepEquilibria((y, H) => r * y * (1 - y / K) - H, 0, 1.2 * K, 0, 0.4 * r * K, 200).evaluations],
    ['phase sweep: 200 steps of saturable elimination with an infusion (one equilibrium)', 20,
      () => sweepEquilibria((C, R) => R - (Vmax * C) / (Km + C), 0, 0.05, 0, 1.5 * Vmax, 200).evaluations],
    ['phase: one analysis of a cubic law with three equilibria', 1,
      () => findEquilibria((y) => (y - 1) * (y - 2) * (y - 3), 0, 4).evaluations],
  ];
  const start = performance.now();
  for (let i = 0; i < warmup || performance.now() - start < WARMUP_MS; i++) for (const [, , run] of cases) run();
  return cases.map(([name, goalMs, run]) => time(name, goalMs, run, runs));
}
