// The NDF's global error on a nonlinear stiff problem whose Jacobian it keeps for many steps:
// Robertson's kinetics over [0, 4e5], at rtol 1e-4 … 1e-8, in tolerance units
// |y - y_ref| / (atol + rtol·|y_ref|) on a grid spaced evenly in log t from 1e-5 (the fast
// transient of y2) to 4e5 and at the end. The reference is the same NDF at rtol 1e-12; that it
// is a reference is checked here against RODAS (a one-step Rosenbrock method, another formula)
// at rtol 1e-11: they agree within a hundredth of a unit of rtol 1e-8 on the grid. The error
// margin that follows the global error (`ndf-accumulation.ts`) runs only while the Newton
// iteration's rate says J is nearly current (`NDF_CONTROL.trustRate`); here that holds on
// about a tenth of the steps (86 of 920 at rtol 1e-6). Measured: 0.21, 0.26, 0.45, 0.49, 0.93
// units on the grid and 0.18, 0.15, 0.07, 0.41, 0.87 at the end, in 1 137, 1 110, 2 015, 3 145,
// 4 260 evaluations; with the margin fixed at 30 throughout, rtol 1e-8 left 1.22 units.
//
// Van der Pol with mu = 1000 over [0, 3000] (y1' = y2, y2' = mu (1 - y1²) y2 - y1, y(0) = (2, 0),
// atol = rtol) is not within 1 unit and is not held here: 1.5–8.2 units at the end and 11–60 on
// a grid at rtol 1e-4 … 1e-8 against the same kind of reference. Its error along the limit cycle
// (a shift of phase) never decays, so a margin that covered it would take each step's error
// thousands of times over: with J formed afresh for the margin at every step the end came within
// 0.3–1.3 units, for 1.1–5.1 million evaluations instead of 2 400–10 600.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { denseAt, integrate, type IntegrateResult } from '../../src/numerics/ode/integrate.ts';
import type { Rhs } from '../../src/numerics/ode/types.ts';

/** Robertson (1966): y1' = -0.04 y1 + 1e4 y2 y3, y2' = 0.04 y1 - 1e4 y2 y3 - 3e7 y2², y3' = 3e7 y2². */
const robertson: Rhs = (_t, y, dy) => {
  dy[0] = -0.04 * y[0] + 1e4 * y[1] * y[2];
  dy[2] = 3e7 * y[1] * y[1];
  dy[1] = -dy[0] - dy[2];
};
const T1 = 4e5;
const atolFor = (rtol: number) => [1e-2 * rtol, 1e-8 * rtol, 1e-2 * rtol];
const GRID = Array.from({ length: 201 }, (_, i) => Math.min(T1, 10 ** (-5 + (i * Math.log10(T1 / 1e-5)) / 200)));

function run(rtol: number, formula: 'ndf' | 'rodas'): IntegrateResult {
  return integrate(robertson, 0, [1, 0, 0], T1, { method: 'stiff', stiffFormula: formula, rtol, atol: atolFor(rtol), maxSteps: 1e6 });
}

/** The largest error in tolerance units of `res` against `ref` on the grid, and at the end. */
function units(res: IntegrateResult, ref: IntegrateResult, rtol: number): { grid: number; end: number } {
  const atol = atolFor(rtol);
  const a = new Float64Array(3), b = new Float64Array(3);
  const u = (x: ArrayLike<number>, r: ArrayLike<number>) => Math.max(...[0, 1, 2].map((j) => Math.abs(x[j] - r[j]) / (atol[j] + rtol * Math.abs(r[j]))));
  let grid = 0;
  for (const t of GRID) {
    assert.ok(denseAt(res.segments, t, a) && denseAt(ref.segments, t, b));
    grid = Math.max(grid, u(a, b));
  }
  return { grid, end: u(res.y, ref.y) };
}

describe('the NDF on Robertson\'s problem over [0, 4e5] against a reference at rtol 1e-12', () => {
  const ref = run(1e-12, 'ndf');

  it('the reference: the NDF at rtol 1e-12 and RODAS at 1e-11 agree within 0.01 units of rtol 1e-8', () => {
    assert.equal(ref.status, 'success');
    const other = run(1e-11, 'rodas');
    assert.equal(other.status, 'success');
    const { grid, end } = units(other, ref, 1e-8);
    assert.ok(grid <= 0.01 && end <= 0.01, `${grid} units on the grid, ${end} at the end`);
  });

  for (const rtol of [1e-4, 1e-5, 1e-6, 1e-7, 1e-8]) {
    it(`rtol ${rtol}: within 1 unit on the grid and at the end`, () => {
      const res = run(rtol, 'ndf');
      assert.equal(res.status, 'success');
      const { grid, end } = units(res, ref, rtol);
      assert.ok(grid <= 1 && end <= 1, `${grid.toFixed(2)} units on the grid, ${end.toFixed(2)} at the end`);
    });
  }
});
