// The first step of the explicit pairs from the solution's time scale (src/numerics/ode/start-step.ts).
// Yardsticks from outside the project: a change of the unit of time must not change the step
// sequence (dimensional analysis), the closed forms of bench/work-precision.ts, and the evaluation
// counts of SciPy 1.17.1's solve_ivp measured once into bench/scipy-reference.json (every
// evaluation counted, the same error measure on a 2001-point grid).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { integrate } from '../../src/numerics/ode/integrate.ts';
import type { Rhs } from '../../src/numerics/ode/types.ts';
import { bestReference, ours, problems } from '../../bench/work-precision.ts';

const HOUR = 3600;
const k = 0.35 / HOUR;
/** Newton cooling, T' = -k (T - Ta), t in seconds; the same law with t in hours. */
const coolingSeconds: Rhs = (_t, y, dy) => { dy[0] = -k * (y[0] - 293.15); };
const coolingHours: Rhs = (_t, y, dy) => { dy[0] = -k * HOUR * (y[0] - 293.15); };

describe('the first step of dopri5', () => {
  it('does not depend on the unit of time: the same run in hours and in seconds takes the same steps', () => {
    for (const rtol of [1e-3, 1e-6, 1e-9]) {
      const s = integrate(coolingSeconds, 0, [353.15], 8 * HOUR, { method: 'dopri5', rtol, atol: 1e-3 * rtol });
      const h = integrate(coolingHours, 0, [353.15], 8, { method: 'dopri5', rtol, atol: 1e-3 * rtol });
      assert.equal(s.counters.evaluations, h.counters.evaluations, `rtol ${rtol}`);
      const first = s.segments[0].t1 - s.segments[0].t0;
      const firstHours = h.segments[0].t1 - h.segments[0].t0;
      assert.ok(Math.abs(first / HOUR - firstHours) <= 1e-12 * firstHours, `rtol ${rtol}: ${first} s against ${firstHours} h`);
    }
  });

  it('is accepted and within a factor 20 of the run\'s longest step (the book\'s rule gave 1/14 000), so no steps are spent growing it (Newton cooling over 8 h)', () => {
    for (const rtol of [1e-3, 1e-4, 1e-5, 1e-6]) {
      const res = integrate(coolingSeconds, 0, [353.15], 8 * HOUR, { method: 'dopri5', rtol, atol: 1e-3 * rtol });
      const steps = res.segments.map((s) => s.t1 - s.t0);
      assert.equal(res.counters.rejected, 0, `rtol ${rtol}`);
      assert.ok(steps[0] >= Math.max(...steps) / 20, `rtol ${rtol}: first step ${steps[0]} s, longest ${Math.max(...steps)} s`);
    }
  });

  it('keeps the book\'s rule for a start at rest (y0 = 0, f(y0) = 0 until a forcing begins)', () => {
    const res = integrate((t, _y, dy) => { dy[0] = t > 100 ? 1 : 0; }, 0, [0], 1000, { method: 'dopri5', rtol: 1e-6, atol: 1e-9 });
    assert.equal(res.status, 'success', res.message);
    assert.ok(Math.abs(res.y[0] - 900) <= 1e-6 * 900 + 1e-9 + 1e-3, `${res.y[0]} (closed form 900)`);
  });
});

/**
 * auto against the best SciPy method at equal accuracy, where dopri5 runs (rtol 1e-3 … 1e-6).
 * Evaluations measured when this was written (Newton cooling 32, 38, 50, 62; Michaelis–Menten
 * 14, 20, 32, 50; logistic growth 98, 128, 182 at 1e-3 … 1e-5): each must stay within 1.25
 * times the best reference's count at the error it reached, and within 1 tolerance unit.
 * Before the time-scale start they were 1.23–1.81 times (44–86 and 50–116 evaluations).
 */
const CASES: ReadonlyArray<{ readonly problem: string; readonly rtols: readonly number[] }> = [
  { problem: 'Newton cooling', rtols: [1e-3, 1e-4, 1e-5, 1e-6] },
  { problem: 'Michaelis–Menten', rtols: [1e-3, 1e-4, 1e-5, 1e-6] },
  { problem: 'logistic growth', rtols: [1e-3, 1e-4, 1e-5] },
];

describe('auto at equal accuracy with SciPy 1.17.1 (bench/scipy-reference.json)', () => {
  const all = problems();
  for (const { problem, rtols } of CASES) {
    it(`${problem}: at most 1.25 times the best reference's evaluations and within 1 unit, rtol ${rtols.join(', ')}`, () => {
      const p = all.find((q) => q.name === problem)!;
      for (const rtol of rtols) {
        const run = ours(p, 'auto', rtol);
        const best = bestReference(problem, run.error);
        assert.ok(run.units <= 1, `rtol ${rtol}: ${run.units} units`);
        assert.ok(run.evaluations <= 1.25 * best.evaluations,
          `rtol ${rtol}: ${run.evaluations} evaluations against ${best.method}'s ${best.evaluations.toFixed(0)} at error ${run.error}`);
      }
    });
  }
});
