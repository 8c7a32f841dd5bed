// RODAS's dense output near zeros of the solution: the large figures in tolerance units that
// the work-precision bench showed for the stiff method at loose tolerances while RODAS ran there (up to 144 units at
// rtol 1e-3) come from the measure, not from the interpolant. The bench divides each grid
// point's error by atol + rtol·|y(t)|, which near a zero crossing is atol alone (1e-3·rtol
// here); a step's error is controlled against atol + rtol·max(|y_n|, |y_n+1|), the sizes at
// its ends. Measured against that scale, the interpolant stays within about one unit inside
// every step, and the step ends within a tenth.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { integrate } from '../../src/numerics/ode/integrate.ts';

// y' = -1e4 (y - cos t), y(0) = 0: closed form by substitution (as in ode-stiff-tight.test.ts)
const LAMBDA = 1e4;
const slow = (t: number) => (LAMBDA ** 2 * Math.cos(t) + LAMBDA * Math.sin(t)) / (LAMBDA ** 2 + 1);
const exact = (t: number) => slow(t) - slow(0) * Math.exp(-LAMBDA * t);

describe("RODAS's dense output near zeros (y' = -1e4 (y - cos t), closed form)", () => {
  for (const rtol of [1e-3, 1e-4, 1e-5]) {
    it(`rtol ${rtol}: within about one unit of each step's own scale; the pointwise figure is large only where y crosses zero`, () => {
      const atol = Float64Array.of(1e-3 * rtol);
      const run = integrate((t, y, dy) => { dy[0] = -LAMBDA * (y[0] - Math.cos(t)); }, 0, Float64Array.of(0), 10, { method: 'stiff', stiffFormula: 'rodas', rtol, atol });
      assert.equal(run.status, 'success');
      assert.equal(run.stiffFormula, 'rodas');
      const out = new Float64Array(1);
      let stepScaled = 0, atEnds = 0, pointwise = 0, where = 0;
      for (const s of run.segments) {
        const scale = atol[0] + rtol * Math.max(Math.abs(exact(s.t0)), Math.abs(exact(s.t1)));
        s.eval(s.t1, out);
        atEnds = Math.max(atEnds, Math.abs(out[0] - exact(s.t1)) / (atol[0] + rtol * Math.abs(exact(s.t1))));
        for (let k = 1; k < 40; k++) {
          const t = s.t0 + ((s.t1 - s.t0) * k) / 40;
          s.eval(t, out);
          const e = Math.abs(out[0] - exact(t));
          stepScaled = Math.max(stepScaled, e / scale);
          const u = e / (atol[0] + rtol * Math.abs(exact(t)));
          if (u > pointwise) { pointwise = u; where = t; }
        }
      }
      assert.ok(atEnds <= 0.5, `step ends: ${atEnds} units`);
      assert.ok(stepScaled <= 1.5, `inside the steps, against each step's scale: ${stepScaled} units`);
      // the pointwise measure's worst point sits where the solution is near zero (|y| ≤ 1% of its size 1)
      assert.ok(pointwise > 5 * stepScaled, `pointwise ${pointwise}, step-scaled ${stepScaled}`);
      assert.ok(Math.abs(exact(where)) <= 1e-2, `worst pointwise at t = ${where}, y = ${exact(where)}`);
    });
  }
});
