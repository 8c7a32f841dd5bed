// Set-up kept from one integration to the next (`OdeReuse`, the dense output's shared chunks)
// changes no number: every result is compared bit for bit with a fresh computation, the
// reference here being the integrator as it runs with nothing kept. The runs alternate
// methods, sizes and tolerances, so that a kept stepper always starts from another run's state.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { integrate, newOdeReuse, type IntegrateResult, type Method } from '../../src/numerics/ode/integrate.ts';
import type { Rhs } from '../../src/numerics/ode/types.ts';
import { expandSchedule } from '../../src/simulate/schedule.ts';
import { runSchedule, type SystemSpec } from '../../src/simulate/run-schedule.ts';
import { evalPiece } from '../../src/simulate/trajectory.ts';
import { openStudy } from '../../src/index.ts';
import { SIX_DOSES } from '../../bench/simulate.ts';

const HOUR = 3600;

/** Equal as stored numbers (NaN equal to NaN, 0 unequal to -0). */
function sameBits(a: ArrayLike<number>, b: ArrayLike<number>, what: string): void {
  assert.equal(a.length, b.length, `${what}: lengths`);
  for (let i = 0; i < a.length; i++) assert.ok(Object.is(a[i], b[i]), `${what}[${i}]: ${a[i]} against ${b[i]}`);
}

/** Two results the same: end, counters, every step's ends and the dense output inside each step. */
function sameResult(a: IntegrateResult, b: IntegrateResult, what: string): void {
  assert.equal(a.status, b.status, what);
  assert.equal(a.message, b.message, what);
  assert.ok(Object.is(a.t, b.t) && Object.is(a.nextStep, b.nextStep), what);
  sameBits(a.y, b.y, `${what} y`);
  assert.deepEqual(a.counters, b.counters, what);
  assert.equal(a.method, b.method, what);
  assert.equal(a.stiffnessDetected, b.stiffnessDetected, what);
  assert.equal(a.segments.length, b.segments.length, `${what}: steps`);
  const n = a.y.length;
  const oa = new Float64Array(n), ob = new Float64Array(n);
  a.segments.forEach((s, i) => {
    const o = b.segments[i];
    assert.ok(Object.is(s.t0, o.t0) && Object.is(s.t1, o.t1), `${what}: step ${i}`);
    for (const th of [0, 0.1, 1 / 3, 0.5, 0.77, 1]) {
      const t = s.t0 + th * (s.t1 - s.t0);
      s.eval(t, oa);
      o.eval(t, ob);
      sameBits(oa, ob, `${what}: step ${i} at θ = ${th}`);
    }
  });
}

// problems of one and three states, one of them stiff enough for auto to switch
const decay = (k: number): Rhs => (_t, y, dy) => { dy[0] = -k * y[0]; };
const chain = (k: number): Rhs => (t, y, dy) => { dy[0] = -k * y[0] + Math.sin(t); dy[1] = k * y[0] - 0.5 * y[1]; dy[2] = y[1] * y[1] - y[2]; };
const stiffish: Rhs = (t, y, dy) => { dy[0] = -1e4 * (y[0] - Math.cos(t)); };

const RUNS: Array<{ f: Rhs; y0: number[]; t1: number; method: Method; rtol: number }> = [
  { f: decay(0.7), y0: [1], t1: 10, method: 'dopri5', rtol: 1e-6 },
  { f: chain(1.3), y0: [1, 0, 0.5], t1: 8, method: 'dopri5', rtol: 1e-4 },
  { f: decay(2.1), y0: [3], t1: 5, method: 'dp853', rtol: 1e-9 },
  { f: chain(0.4), y0: [0.2, 1, 0], t1: 12, method: 'auto', rtol: 1e-8 },
  { f: stiffish, y0: [0], t1: 2, method: 'auto', rtol: 1e-4 },
  { f: decay(0.05), y0: [1], t1: 40, method: 'auto', rtol: 1e-6 },
  { f: chain(2.2), y0: [1, 1, 1], t1: 3, method: 'dp853', rtol: 1e-7 },
];

describe('set-up kept between integrations', () => {
  it('gives every run the numbers of a fresh integrator, whatever ran before with the same set-up', () => {
    const reuse = newOdeReuse();
    for (let pass = 0; pass < 2; pass++) {
      for (const [i, r] of RUNS.entries()) {
        const fresh = integrate(r.f, 0, r.y0, r.t1, { method: r.method, rtol: r.rtol });
        const kept = integrate(r.f, 0, r.y0, r.t1, { method: r.method, rtol: r.rtol, firstStep: fresh.nextStep / 3 }, reuse);
        const freshToo = integrate(r.f, 0, r.y0, r.t1, { method: r.method, rtol: r.rtol, firstStep: fresh.nextStep / 3 });
        sameResult(kept, freshToo, `run ${i}, pass ${pass}`);
        sameResult(integrate(r.f, 0, r.y0, r.t1, { method: r.method, rtol: r.rtol }, reuse), fresh, `run ${i}, pass ${pass}, own first step`);
      }
    }
  });

  it('a run that stops early leaves nothing behind for the next', () => {
    const reuse = newOdeReuse();
    const blowup: Rhs = (_t, y, dy) => { dy[0] = y[0] * y[0]; };
    const stopped = integrate(blowup, 0, [1], 2, { method: 'dopri5' }, reuse);
    assert.notEqual(stopped.status, 'success');
    const budget = integrate(decay(1), 0, [1], 100, { method: 'dopri5', maxSteps: 3 }, reuse);
    assert.equal(budget.status, 'budget');
    const r = RUNS[0];
    sameResult(integrate(r.f, 0, r.y0, r.t1, { method: r.method, rtol: r.rtol }, reuse), integrate(r.f, 0, r.y0, r.t1, { method: r.method, rtol: r.rtol }), 'after failures');
  });

  it('an integration inside f, with the same set-up, sets up its own', () => {
    const reuse = newOdeReuse();
    const inner = (t: number) => integrate(decay(1), 0, [1], 1 + t, { method: 'dopri5' }, reuse).y[0];
    const outer: Rhs = (t, y, dy) => { dy[0] = -y[0] * inner(t); };
    const plain: Rhs = (t, y, dy) => { dy[0] = -y[0] * integrate(decay(1), 0, [1], 1 + t, { method: 'dopri5' }).y[0]; };
    sameResult(integrate(outer, 0, [1], 1, { method: 'dopri5' }, reuse), integrate(plain, 0, [1], 1, { method: 'dopri5' }), 'nested');
  });

  it('a schedule run with the set-up of earlier runs gives the fresh run\'s trajectory', () => {
    const dose = 0.5e-3 / 0.03;
    const actions = expandSchedule([{ index: 0, at: 0, every: 8 * HOUR, count: 6, kind: 'add', targets: [{ name: 'C', value: dose }] }], 0, 48 * HOUR);
    if (!Array.isArray(actions)) throw new Error(actions.error);
    const sys = (k: number): SystemSpec => ({
      n: 1, quadratures: [0], stateIndex: new Map([['C', 0]]), paramIndex: new Map([['k', 0]]), y0: Float64Array.of(0), p0: Float64Array.of(k),
      autonomous: true, rates: (_t, y, p, dy) => { dy[0] = -p[0] * y[0]; },
    });
    const settings = { method: 'auto' as const, rtol: 1e-6, atol: Float64Array.of(dose * 1e-9), maxSteps: 200_000 };
    const reuse = newOdeReuse();
    const out = new Float64Array(2), ref = new Float64Array(2);
    for (const k of [0.05, 0.3, 0.1, 0.1, 0.22]) {
      const kept = runSchedule(sys(k / HOUR), actions, 0, 48 * HOUR, settings, reuse);
      const fresh = runSchedule(sys(k / HOUR), actions, 0, 48 * HOUR, settings);
      assert.equal(kept.steps, fresh.steps);
      assert.equal(kept.evaluations, fresh.evaluations);
      assert.equal(kept.trajectory.pieces.length, fresh.trajectory.pieces.length);
      kept.trajectory.pieces.forEach((p, i) => {
        const q = fresh.trajectory.pieces[i];
        sameBits(p.y1, q.y1, `k ${k}, piece ${i}`);
        for (let t = p.t0; t <= p.t1; t += (p.t1 - p.t0) / 97) {
          evalPiece(p, t, out);
          evalPiece(q, t, ref);
          sameBits(out, ref, `k ${k}, piece ${i}, t ${t}`);
        }
      });
    }
  });

  it('what-if runs in a loop answer as a study opened afresh with the same value', () => {
    const opened = openStudy(SIX_DOSES);
    assert.ok(opened.ok);
    const w = opened.session.whatIf(['Cmax', 'trough', 'auc', 'above'], [{ name: 'k', dimension: '1 / h' }, { name: 'V', dimension: 'L' }]);
    assert.ok(w.ok);
    // values written exactly in the study's text: k per hour and V in litres as decimals
    for (const [k, V] of [[0.1, 30], [0.07, 25], [0.18, 41.5], [0.1, 30], [0.125, 33]]) {
      const got = w.evaluate([k / HOUR, V / 1000]);
      const doc = structuredClone(SIX_DOSES) as { cells: Array<{ items?: Array<{ name: string; value: string }> }> };
      for (const it of doc.cells[0].items!) {
        if (it.name === 'k') it.value = `${k} / h`;
        if (it.name === 'V') it.value = `${V} L`;
      }
      const fresh = openStudy(doc);
      assert.ok(fresh.ok);
      const results = fresh.session.report().cells[2].results as Record<string, { si: number }>;
      sameBits(got.values, ['Cmax', 'trough', 'auc', 'above'].map((n) => results[n].si), `k ${k} / h, V ${V} L`);
    }
  });
});
