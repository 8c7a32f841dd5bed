// The stiff method on a run that turns stiff on the way: Robertson's kinetics start with a
// mild Jacobian (ρ(J) = 0.04 at t = 0, since y2 = y3 = 0), so RODAS starts, and hands the run
// over to the NDF once ρ(J)·(span left) reaches the stiff-span rule (src/numerics/ode/
// stiff-handover.ts). In tolerance units against published reference values, within
// evaluation budgets (the counts measured when this was written plus about 15 %).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { integrate } from '../../src/numerics/ode/integrate.ts';
import { Status, type Rhs } from '../../src/numerics/ode/types.ts';

/**
 * Robertson (1966): y1' = -0.04 y1 + 1e4 y2 y3, y2' = 0.04 y1 - 1e4 y2 y3 - 3e7 y2²,
 * y3' = 3e7 y2², y(0) = (1, 0, 0).
 */
const robertson: Rhs = (_t, y, dy) => {
  dy[0] = -0.04 * y[0] + 1e4 * y[1] * y[2];
  dy[2] = 3e7 * y[1] * y[1];
  dy[1] = -dy[0] - dy[2];
};
/** y(40), Hairer & Wanner, Solving ODEs II, sec. IV.10 (from memory; they add up to 1 to 13 digits). */
const ROBERTSON_AT_40 = [0.7158270687193, 9.185534764557e-6, 0.2841637457458];

/**
 * Measured with the handover: 245, 302, 396, 488, 649, 877, 1398, 1952 evaluations at rtol
 * 1e-3 … 1e-10; RODAS throughout needs 261, 371, 601, 1061, 1971, 4801, 19 766, 78 591 (a
 * Jacobian at every step).
 */
const CASES = [
  { rtol: 1e-3, budget: 285 }, { rtol: 1e-4, budget: 350 }, { rtol: 1e-5, budget: 460 }, { rtol: 1e-6, budget: 565 },
  { rtol: 1e-7, budget: 750 }, { rtol: 1e-8, budget: 1010 }, { rtol: 1e-9, budget: 1610 }, { rtol: 1e-10, budget: 2250 },
];

describe('stiff on Robertson\'s problem to t = 40: RODAS hands over to the NDF, atol = rtol·(1e-2, 1e-8, 1e-2)', () => {
  for (const { rtol, budget } of CASES) {
    it(`rtol ${rtol}: within 1 unit of the reference in at most ${budget} evaluations, the dense output continuous at the handover`, () => {
      const atol = [1e-2 * rtol, 1e-8 * rtol, 1e-2 * rtol];
      const res = integrate(robertson, 0, [1, 0, 0], 40, { method: 'stiff', rtol, atol, autonomous: true });
      assert.equal(res.status, Status.Success, res.message);
      assert.equal(res.stiffFormula, 'ndf', 'the NDF ended the run');
      const units = Math.max(...ROBERTSON_AT_40.map((r, j) => Math.abs(res.y[j] - r) / (atol[j] + rtol * Math.abs(r))));
      assert.ok(units <= 1, `${units} units`);
      assert.ok(res.counters.evaluations <= budget, `${res.counters.evaluations} evaluations`);
      const kinds = res.segments.map((s) => s.constructor.name);
      const at = kinds.findIndex((k, i) => i > 0 && k !== kinds[i - 1]);
      assert.ok(at > 0 && kinds.slice(at).every((k) => k === kinds[at]), `one handover: ${[...new Set(kinds)].join(', ')}`);
      assert.ok(res.segments[at].t0 < 1e-3, `handed over at t = ${res.segments[at].t0}`);
      const before = new Float64Array(3);
      const after = new Float64Array(3);
      res.segments[at - 1].eval(res.segments[at].t0, before);
      res.segments[at].eval(res.segments[at].t0, after);
      assert.deepEqual([...after], [...before]);
    });
  }

  it('with stiffFormula: \'rodas\' RODAS runs throughout (a Jacobian at every step)', () => {
    const res = integrate(robertson, 0, [1, 0, 0], 40, { method: 'stiff', rtol: 1e-6, atol: [1e-8, 1e-14, 1e-8], autonomous: true, stiffFormula: 'rodas' });
    assert.equal(res.status, Status.Success);
    assert.equal(res.stiffFormula, 'rodas');
    assert.ok(res.counters.jacobians >= res.counters.steps, `${res.counters.jacobians} Jacobians, ${res.counters.steps} steps`);
  });
});
