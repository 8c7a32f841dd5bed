/**
 * Speed of the least-squares fitter (src/numerics/fit/least-squares.ts) on a closed-form model:
 * a decay to a baseline y = c + A·e^(−k·t), three parameters, 20 points with fixed pseudo-random
 * noise, from a start a factor of two or three off. The figure is the median time of one whole
 * fit (Jacobians, SVDs, statistics and intervals included) after untimed runs for the optimising
 * compiler. Goal: under 50 ms in Node, so that a fit cell with a cheap model answers at once.
 *
 * Not wired into `bench/run.ts` here; `fitBenchmarks()` returns rows for whoever adds it.
 */
import { fitLeastSquares } from '../src/numerics/fit/least-squares.ts';

export interface FitBenchmark {
  readonly name: string;
  /** Median milliseconds of one fit. */
  readonly ms: number;
  readonly goalMs: number;
  /** The goal is met and the fit converged to the known optimum's neighbourhood. */
  readonly ok: boolean;
}

/** Untimed running before measuring. */
const WARMUP_MS = 300;
/** Timed fits; the median is reported. */
const SAMPLES = 51;
const GOAL_MS = 50;

export function fitBenchmarks(): FitBenchmark[] {
  const times = Array.from({ length: 20 }, (_, i) => 0.5 * i);
  // deterministic noise of sd about 0.05 (a fixed sine sequence, not random)
  const ys = times.map((t, i) => 1.5 + 8 * Math.exp(-0.45 * t) + 0.05 * Math.sin(12.9898 * i));
  const fit = () => fitLeastSquares({
    m: times.length, p0: [3, 1, 0],
    residuals: (p, out) => {
      for (let i = 0; i < times.length; i++) out[i] = p[2] + p[0] * Math.exp(-p[1] * times[i]) - ys[i];
      return true;
    },
  });
  const start = performance.now();
  let last = fit();
  while (performance.now() - start < WARMUP_MS) last = fit();
  const samples: number[] = [];
  for (let s = 0; s < SAMPLES; s++) {
    const t0 = performance.now();
    last = fit();
    samples.push(performance.now() - t0);
  }
  samples.sort((a, b) => a - b);
  const ms = samples[Math.floor(SAMPLES / 2)];
  const near = Math.abs(last.p[0] - 8) < 0.5 && Math.abs(last.p[1] - 0.45) < 0.05 && Math.abs(last.p[2] - 1.5) < 0.2;
  return [{
    name: `3-parameter fit, 20 points, closed-form model (${last.evaluations} evaluations, ${last.iterations} iterations)`,
    ms, goalMs: GOAL_MS, ok: last.converged && near && ms < GOAL_MS,
  }];
}
