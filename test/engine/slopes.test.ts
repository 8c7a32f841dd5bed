// Slopes by finite differences (src/numerics/slopes.ts) against closed-form derivatives. The
// accuracy each check allows is stated beside it, from the step rule h = cbrt(eps_f)·max(|x|,
// scale): the central difference's error is about h²/6·|f'''| + eps_f·|f|/h (Nocedal & Wright,
// "Numerical Optimization", 2nd ed., §8.1).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { slopes } from '../../src/numerics/slopes.ts';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
const v = (...xs: number[]) => Float64Array.from(xs);

/** A deterministic "noise" in [-1, 1] of x, standing for an integrator's error of relative size eps. */
function noise(x: number): number {
  const s = Math.sin(x * 12.9898e3) * 43758.5453;
  return 2 * (s - Math.floor(s)) - 1;
}

describe('slopes', () => {
  it('gives the derivatives of a polynomial map to 1e-9 relative, counting its evaluations', () => {
    // closed form: f = [x³ + 2xy, y²]: df0/dx = 3x² + 2y, df0/dy = 2x, df1/dx = 0, df1/dy = 2y.
    // Error bound: h²/6·|f'''| with h = cbrt(2.2e-16)·2 ≈ 1.2e-5, f''' = 6: about 1.5e-10.
    let calls = 0;
    const f = (x: Float64Array) => { calls++; return v(x[0] ** 3 + 2 * x[0] * x[1], x[1] ** 2); };
    const r = slopes(f, v(1.5, -2), v(1, 1));
    const exact = [3 * 2.25 - 4, 3, 0, -4];
    for (let k = 0; k < 4; k++) {
      if (exact[k] === 0) assert.ok(Math.abs(r.d[k]) < 1e-9, `d[${k}] = ${r.d[k]}`);
      else assert.ok(rel(r.d[k], exact[k]) < 1e-9, `d[${k}] = ${r.d[k]}, exact ${exact[k]}`);
    }
    assert.deepEqual(r.how, ['central', 'central', 'central', 'central']);
    assert.equal(r.failed.length, 0);
    assert.equal(r.evaluations, calls);
    assert.equal(r.evaluations, 5, 'f(x0) and two sides per input');
    assert.deepEqual([...r.f0], [1.5 ** 3 - 6, 4]);
  });

  it('takes f(x0) from the caller when given, and spends one evaluation less', () => {
    // closed form: d/dx sin x at π/3 is cos(π/3) = 1/2
    const r = slopes((x) => v(Math.sin(x[0])), v(Math.PI / 3), v(1), { f0: v(Math.sin(Math.PI / 3)) });
    assert.equal(r.evaluations, 2);
    assert.ok(rel(r.d[0], 0.5) < 1e-9, `${r.d[0]}`);
  });

  it('uses the step rule: h = cbrt(accuracy)·max(|x|, scale), exactly representable from x', () => {
    const r = slopes((x) => v(x[0] * x[1]), v(300, 1e-3), v(1, 2), { accuracy: 1e-6 });
    // hand-worked: cbrt(1e-6) = 0.01; input 0: 0.01·300 = 3; input 1: 0.01·max(1e-3, 2) = 0.02
    assert.ok(rel(r.steps[0], 3) < 1e-12);
    assert.ok(rel(r.steps[1], 0.02) < 1e-12);
    assert.equal((300 + r.steps[0]) - 300, r.steps[0]);
    assert.equal((1e-3 + r.steps[1]) - 1e-3, r.steps[1]);
  });

  it('keeps d exp(x)/dx within eps_f^(2/3) when f carries a relative error eps_f = 1e-8', () => {
    // closed form: d/dx exp(x) = exp(x) at x = 1. f is exp(x)·(1 + 1e-8·noise), as a run at
    // rtol 1e-8 would be. Bound: h = cbrt(1e-8) ≈ 2.15e-3; h²/6 ≈ 7.7e-7 plus 1e-8/h ≈ 4.6e-6:
    // 5.4e-6 relative, so 1e-5 is allowed.
    const f = (x: Float64Array) => v(Math.exp(x[0]) * (1 + 1e-8 * noise(x[0])));
    const r = slopes(f, v(1), v(1), { accuracy: 1e-8 });
    assert.ok(rel(r.d[0], Math.E) < 1e-5, `relative error ${rel(r.d[0], Math.E)}`);
  });

  it('falls back to a second-order one-sided slope where one side has no value, and says so', () => {
    // closed form: f = exp(x) for x <= 0.5 (NaN beyond), f = 1/y for y >= 2 (throws below):
    // df/dx = exp(0.5) at 0.5 from below, d(1/y)/dy = -1/4 at y = 2 from above. The one-sided
    // formula's error is h²/3·|f'''|: with h ≈ 6e-6·2, about 1e-10 relative; 1e-8 allowed.
    const f = (x: Float64Array) => {
      if (x[1] < 2) throw new Error('no value below 2');
      return v(x[0] <= 0.5 ? Math.exp(x[0]) : NaN, 1 / x[1]);
    };
    const r = slopes(f, v(0.5, 2), v(1, 1));
    assert.equal(r.how[0], 'backward');
    assert.ok(rel(r.d[0], Math.exp(0.5)) < 1e-8, `${r.d[0]}`);
    // output 0 against input 1: central (exp does not depend on y)
    assert.equal(r.how[1], 'forward', 'input 1 below 2 throws, so every output of it is forward');
    assert.ok(Math.abs(r.d[1]) < 1e-12);
    assert.equal(r.how[3], 'forward');
    assert.ok(rel(r.d[3], -0.25) < 1e-8, `${r.d[3]}`);
    assert.equal(r.how[2], 'central');
    assert.equal(r.failed.length, 0);
    // 1 + 2·2 + one more point on each one-sided input
    assert.equal(r.evaluations, 7);
  });

  it('reports NaN and the reason per input and output where no slope can be formed', () => {
    // f has no value at x0 for output 1, nor on its sides; input 1 has value 0 and scale 0.
    const f = (x: Float64Array) => v(x[0] + x[1], x[0] > 0.9 ? NaN : x[0]);
    const r = slopes(f, v(1, 0), v(1, 0));
    assert.ok(Number.isNaN(r.d[2]) && r.how[2] === 'failed');
    assert.ok(rel(r.d[0], 1) < 1e-9);
    const reasons = r.failed.map((x) => `${x.input},${x.output}: ${x.reason}`);
    assert.deepEqual(reasons, [
      '0,1: the output has no value at the point itself',
      '1,0: no step: the value and its scale are both 0',
      '1,1: no step: the value and its scale are both 0',
    ]);
    assert.equal(r.steps[1], 0);
  });

  it('says when f has no value at all, and the outputs are unknown', () => {
    const r = slopes(() => { throw new Error('never'); }, v(1, 2), v(1, 1));
    assert.equal(r.d.length, 0);
    assert.deepEqual(r.failed.map((x) => [x.input, x.output]), [[0, -1], [1, -1]]);
    assert.equal(r.evaluations, 5);
  });

  it('refuses a scale of the wrong length or an accuracy outside (0, 1), naming it', () => {
    assert.throws(() => slopes((x) => x, v(1, 2), v(1)), /scale has 1 entries for 2 inputs/);
    assert.throws(() => slopes((x) => x, v(1), v(1), { accuracy: 0 }), /accuracy must lie in \(0, 1\)/);
  });
});
