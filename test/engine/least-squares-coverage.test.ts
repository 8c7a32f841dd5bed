// Coverage of the fitter's 95% intervals (src/numerics/fit/least-squares.ts): on simulated data with
// known parameters, the intervals p ± t(0.975, m − n)·SE should contain the truth about 95% of the
// time (the definition of a 95% confidence interval; for a nonlinear model with small noise the
// linearised interval is close to exact — Bates & Watts, Nonlinear Regression Analysis and Its
// Applications, 1988, ch. 2). 200 fits with a fixed seed; the band 90–99% leaves room for the
// binomial spread (sd ≈ 1.5 points) and the linearisation.
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { fitLeastSquares } from '../../src/numerics/fit/least-squares.ts';

/** Uniform [0, 1) from a fixed seed (mulberry32) and standard normal deviates (Box–Muller). */
function generator(seed: number): { uniform: () => number; normal: () => number } {
  let a = seed >>> 0;
  const uniform = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const normal = () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
  return { uniform, normal };
}

it('95% intervals of y = a·(1 − e^(−b·t)) contain the true a and b in 90–99% of 200 noisy fits', () => {
  const { uniform, normal } = generator(20261202);
  const REPS = 200;
  let coveredA = 0, coveredB = 0, converged = 0;
  for (let rep = 0; rep < REPS; rep++) {
    const a = 1 + 9 * uniform();
    const b = 0.1 + 0.9 * uniform();
    const m = 6 + Math.floor(uniform() * 10);
    const times = Array.from({ length: m }, () => (0.2 + 4 * uniform()) / b).sort((x, y) => x - y);
    const sd = 0.02 * a;
    const ys = times.map((t) => a * (1 - Math.exp(-b * t)) + sd * normal());
    const r = fitLeastSquares({
      m, p0: [a * (0.5 + uniform()), b * (0.5 + uniform())],
      residuals: (p, out) => {
        for (let i = 0; i < m; i++) out[i] = p[0] * (1 - Math.exp(-p[1] * times[i])) - ys[i];
        return true;
      },
    });
    if (!r.converged || !r.ci95) continue;
    converged++;
    if (r.ci95[0][0] <= a && a <= r.ci95[0][1]) coveredA++;
    if (r.ci95[1][0] <= b && b <= r.ci95[1][1]) coveredB++;
  }
  assert.equal(converged, REPS, 'every fit converges');
  for (const [name, covered] of [['a', coveredA], ['b', coveredB]] as const) {
    const share = covered / REPS;
    assert.ok(share >= 0.9 && share <= 0.99, `${name}: ${covered} of ${REPS} intervals contain the truth`);
  }
});
