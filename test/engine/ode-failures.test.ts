// How runs fail: a finite-time blow-up, a rate that is not a number, a collapsed step, a
// budget, and invalid input. Failure is a result with a status, a message that says where,
// and the state there; invalid input is a RangeError that names the input.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { denseAt, integrate, type Method } from '../../src/numerics/ode/integrate.ts';
import { MESSAGES, Status, formatForMessage, type Rhs } from '../../src/numerics/ode/types.ts';

const ADAPTIVE: readonly Method[] = ['dopri5', 'stiff', 'auto'];

describe('blow-up', () => {
  // y' = y², y(0) = 1 has y = 1/(1 - t): it leaves every bound as t → 1 (closed form).
  const square: Rhs = (_t, y, dy) => { dy[0] = y[0] * y[0]; };

  for (const method of ADAPTIVE) {
    it(`${method}: y' = y² from y(0) = 1 stops with blowup near t = 1, within a bounded effort`, () => {
      const res = integrate(square, 0, [1], 2, { method });
      assert.equal(res.status, Status.Blowup);
      assert.match(res.message, /^the solution grows without bound near t = 1 \(state \[[0-9.]+e\+1[0-9]\]\)$/);
      // An adaptive step may straddle the singularity a little before the growth is caught.
      assert.ok(res.failure && Math.abs(res.failure.t - 1) < 1e-5, `stopped at ${res.failure?.t}`);
      assert.equal(res.failure.t, res.t, 'a blow-up is reported at the last accepted state');
      assert.ok(res.y[0] > 1e8, 'the state had grown large');
      // The covered span is still usable: the dense output follows 1/(1 - t) well before the end.
      const out = new Float64Array(1);
      assert.equal(res.segments[res.segments.length - 1].t1, res.t);
      assert.ok(denseAt(res.segments, 0.9, out) && Math.abs(out[0] - 10) < 1e-4, `y(0.9) = ${out[0]}`);
      assert.ok(res.counters.evaluations < 10_000, `${res.counters.evaluations} evaluations`);
    });
  }

  it('rk4 with a fixed step cannot see the singularity coming but stops soon after t = 1', () => {
    const res = integrate(square, 0, [1], 2, { method: 'rk4', step: 0.01 });
    assert.equal(res.status, Status.Blowup);
    assert.ok(res.failure && res.failure.t >= 1 && res.failure.t <= 1.1, `stopped at ${res.failure?.t}`);
  });

  it('a state that grows exponentially but stays finite over the run is not a blow-up', () => {
    // y = e^{t}: grows by e^{30} ≈ 1e13 over the run.
    const res = integrate((_t, y, dy) => { dy[0] = y[0]; }, 0, [1], 30, { method: 'dopri5', rtol: 1e-8 });
    assert.equal(res.status, Status.Success);
    assert.ok(Math.abs(res.y[0] / Math.exp(30) - 1) < 1e-6);
  });
});

describe('undefined rate', () => {
  // y' = -1 has y = 1 - t, which reaches 0 at t = 1; the rate also takes sqrt(y), which is
  // NaN once y < 0.
  const drain: Rhs = (_t, y, dy) => { dy[0] = -1 + 0 * Math.sqrt(y[0]); };

  for (const method of ADAPTIVE) {
    it(`${method}: a rate that becomes NaN when the state crosses zero stops at t = 1 and says where`, () => {
      const res = integrate(drain, 0, [1], 2, { method });
      assert.equal(res.status, Status.UndefinedRate);
      assert.match(res.message, /^the rate is not a finite number at t = 1, state \[-[0-9.e-]+\]$/);
      assert.ok(res.failure && Math.abs(res.failure.t - 1) < 1e-9);
      assert.ok(res.failure.y[0] < 0 && res.failure.y[0] > -1e-9, `state ${res.failure.y[0]}`);
      assert.ok(Math.abs(res.y[0] - (1 - res.t)) < 1e-12, 'the last accepted state is still on y = 1 - t');
    });
  }

  it('a fixed-step method reports the stage where the rate failed', () => {
    const res = integrate(drain, 0, [1], 2, { method: 'rk4', step: 0.3 });
    assert.equal(res.status, Status.UndefinedRate);
    // The step from 0.9 to 1.2 crosses y = 0: its stages sit at 0.9, 1.05, 1.05 and 1.2.
    assert.equal(res.t, 0.8999999999999999);
    assert.ok(res.failure && res.failure.t > 1 && res.failure.t <= 1.2 + 1e-12, `failed at ${res.failure?.t}`);
  });

  it('a rate that is not finite at the start fails at once, before any step', () => {
    for (const method of ['dopri5', 'stiff', 'rk4'] as const) {
      const res = integrate((_t, y, dy) => { dy[0] = Math.log(y[0]); }, 0, [0], 1, { method, step: 0.1 });
      assert.equal(res.status, Status.UndefinedRate, method);
      assert.equal(res.counters.steps, 0);
      assert.equal(res.counters.evaluations, 1);
      assert.equal(res.message, 'the rate is not a finite number at t = 0, state [0]');
    }
  });
});

describe('collapsed step and budgets', () => {
  it('dopri5 on a problem far too stiff for it collapses its step at once and suggests the stiff method', () => {
    // y' = -1e20 (y - 1) from t = 1: explicit stability needs h ≈ 3e-20, below the
    // resolution of t near 1 (≈ 3.6e-15).
    const res = integrate((_t, y, dy) => { dy[0] = -1e20 * (y[0] - 1); }, 1, [2], 2, { method: 'dopri5' });
    assert.equal(res.status, Status.StepCollapse);
    assert.equal(res.message,
      'the step size fell to the resolution of t near t = 1 (state [2]); the rate may jump there or change faster than t can resolve (try the stiff method)');
  });

  it('the stiff method takes a very fast decay (y\' = -1e9 (y - 1), closed form 1 + e^{-1e9 t}) in its stride', () => {
    const res = integrate((_t, y, dy) => { dy[0] = -1e9 * (y[0] - 1); }, 1, [2], 2, { method: 'stiff', autonomous: true });
    assert.equal(res.status, Status.Success, res.message);
    assert.ok(Math.abs(res.y[0] - 1) < 1e-9);
    assert.ok(res.counters.steps < 200, `${res.counters.steps} steps`);
  });

  it('the step budget stops a run with budget, counting rejected attempts too', () => {
    const res = integrate((_t, y, dy) => { dy[0] = Math.cos(y[0]) * 50; }, 0, [0], 100, { method: 'dopri5', maxSteps: 10 });
    assert.equal(res.status, Status.Budget);
    assert.equal(res.counters.steps + res.counters.rejected, 10);
    assert.match(res.message, /after 10 step attempts \(the step budget\)$/);
  });

  it('the evaluation budget stops a run between steps', () => {
    const res = integrate((t, _y, dy) => { dy[0] = Math.sin(t); }, 0, [0], 1000, { method: 'dopri5', maxEvaluations: 100 });
    assert.equal(res.status, Status.Budget);
    assert.ok(res.counters.evaluations >= 100 && res.counters.evaluations < 100 + 7);
    assert.match(res.message, /after 100 evaluations of the rate \(the evaluation budget\)$/);
  });

  it('a fixed-step run that needs more steps than the budget stops with budget at the last step reached', () => {
    const res = integrate((_t, y, dy) => { dy[0] = -y[0]; }, 0, [1], 10, { method: 'euler', step: 0.001, maxSteps: 500 });
    assert.equal(res.status, Status.Budget);
    assert.equal(res.counters.steps, 500);
    assert.ok(Math.abs(res.t - 0.5) < 1e-12);
  });

  it('a rate that chatters across a jump ends within its budget instead of hanging', () => {
    // y' = sign(0.5 - y): reaches 0.5 at t = 0.5, then every step straddles the jump.
    const res = integrate((_t, y, dy) => { dy[0] = y[0] < 0.5 ? 1 : -1; }, 0, [0], 1, { method: 'auto', maxSteps: 2000 });
    assert.equal(res.status, Status.Budget);
    assert.equal(res.counters.steps + res.counters.rejected, 2000);
    assert.ok(Math.abs(res.y[0] - 0.5) < 1e-3);
  });
});

describe('invalid input throws a RangeError that names it', () => {
  const f: Rhs = (_t, y, dy) => { dy[0] = -y[0]; };
  const cases: [string, () => unknown, RegExp][] = [
    ['rtol', () => integrate(f, 0, [1], 1, { rtol: -1 }), /^rtol must be a positive finite number; it is -1$/],
    ['atol length', () => integrate(f, 0, [1], 1, { atol: [1, 2] }), /^atol must have one entry per state \(1\); it has 2$/],
    ['atol entry', () => integrate(f, 0, [1], 1, { atol: [0] }), /^atol\[0\] must be a positive/],
    ['maxSteps', () => integrate(f, 0, [1], 1, { maxSteps: 0 }), /^maxSteps must be a positive whole number/],
    ['firstStep', () => integrate(f, 0, [1], 1, { firstStep: NaN }), /^firstStep must be/],
    ['step missing', () => integrate(f, 0, [1], 1, { method: 'rk4' }), /^step is required for method rk4$/],
    ['step', () => integrate(f, 0, [1], 1, { method: 'rk4', step: -2 }), /^step must be a positive finite number/],
    ['method', () => integrate(f, 0, [1], 1, { method: 'magic' as Method }), /^method must be one of auto, dopri5, stiff, rk4, heun, euler/],
    ['t1 before t0', () => integrate(f, 1, [1], 0), /^t1 must not be before t0/],
    ['y0', () => integrate(f, 0, [NaN], 1), /^y0\[0\] must be a finite number/],
    ['no states', () => integrate(f, 0, [], 1), /^y0 must hold at least one state$/],
  ];
  for (const [name, run, message] of cases) {
    it(name, () => assert.throws(run, (e: unknown) => e instanceof RangeError && message.test(e.message)));
  }
});

describe('messages', () => {
  it('every status has a message that names the time, and failures the state', () => {
    const at = { t: 3600, y: new Float64Array([1.5, 2e-7]) };
    for (const status of Object.values(Status)) {
      const text = MESSAGES[status](at, { budget: 'steps', limit: 5 });
      assert.match(text, /t = 3600/);
      if (status !== Status.Success) assert.match(text, /\[1\.5, 2e-7\]/, status);
    }
  });

  it('numbers are short: six significant digits, exponents for the very large and small', () => {
    assert.equal(formatForMessage(0.99999999999996), '1');
    assert.equal(formatForMessage(39721012345678), '3.9721e+13');
    assert.equal(formatForMessage(-2.83875e-16), '-2.83875e-16');
    assert.equal(formatForMessage(123.4567891), '123.457');
    assert.equal(formatForMessage(0), '0');
    assert.equal(formatForMessage(NaN), 'NaN');
  });
});
