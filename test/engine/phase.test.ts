// Where a one-state law y' = f(y) settles (src/numerics/phase/equilibria.ts): equilibria, their
// stability and slope, poles, jumps, gaps, zero intervals and the sign intervals, against
// closed forms. Stability follows the usual phase-line rule (common practice, e.g. Strogatz,
// Nonlinear Dynamics and Chaos, §2.2): f > 0 on the left and f < 0 on the right of y* is an
// attractor, the reverse a repeller, the same sign on both sides semi-stable. Values are SI
// magnitudes, as the engine passes them. Evaluation counts are budgets.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { findEquilibria, type PhaseAnalysis } from '../../src/numerics/phase/equilibria.ts';

const EPS = Number.EPSILON;
/** Default location tolerance of the finder: 1e-12 of the range's width plus 4 eps relative. */
const locTol = (width: number, y: number) => 1e-12 * width + 4 * EPS * Math.abs(y);

function near(actual: number, expected: number, tol: number, what = 'value'): void {
  assert.ok(Math.abs(actual - expected) <= tol, `${what}: ${actual}, expected ${expected} ± ${tol}`);
}

/** The summary most tests compare: [value, stability] per equilibrium. */
const summary = (r: PhaseAnalysis) => r.equilibria.map((e) => e.stability);
const signs = (r: PhaseAnalysis) => r.intervals.map((i) => i.sign).join(' ');

/** Intervals cover [from, to] in order: each starts where the previous ended. */
function assertCovers(r: PhaseAnalysis): void {
  const iv = r.intervals;
  assert.ok(iv.length > 0);
  assert.ok(iv[0].from === null || typeof iv[0].from === 'number');
  for (let k = 1; k < iv.length; k++) {
    assert.notEqual(iv[k].from, null, `interval ${k} starts at the range's edge`);
    assert.equal(iv[k].from, iv[k - 1].to, `interval ${k} does not start where ${k - 1} ends`);
    assert.ok((iv[k].from as number) < (iv[k].to ?? Infinity), `interval ${k} is empty or reversed`);
  }
}

describe('findEquilibria: the standard cases', () => {
  it('logistic y(3 - 4y): a repeller at 0 and an attractor at 3/4, with slopes ±3', () => {
    // closed form: zeros 0 and 3/4; f'(y) = 3 - 8y gives f'(0) = 3, f'(3/4) = -3
    const r = findEquilibria((y) => y * (3 - 4 * y), -1, 2);
    assert.deepEqual(summary(r), ['repeller', 'attractor']);
    near(r.equilibria[0].value, 0, locTol(3, 0));
    near(r.equilibria[1].value, 0.75, locTol(3, 0.75));
    near(r.equilibria[0].slope, 3, 1e-8);
    near(r.equilibria[1].slope, -3, 1e-8);
    assert.ok(r.equilibria.every((e) => e.consistent && e.converged && e.slopeSource === 'difference'));
    assert.equal(signs(r), '- + -');
    assert.equal(r.intervals[0].from, null);
    assert.equal(r.intervals[2].to, null);
    assert.equal(r.intervals[1].from, r.equilibria[0].value);
    assert.equal(r.intervals[1].to, r.equilibria[1].value);
    assert.deepEqual([r.poles, r.jumps, r.gaps, r.zeroIntervals], [[], [], [], []]);
    assert.equal(r.budgetExhausted, false);
    assert.ok(r.evaluations <= 150, `${r.evaluations} evaluations`);
  });

  it('(y - 1)²: one semi-stable point at 1, f > 0 on both sides', () => {
    // closed form: double zero at 1, f' = 0 there; located as a zero of f' to about 1e-9
    const r = findEquilibria((y) => (y - 1) ** 2, 0, 3);
    assert.deepEqual(summary(r), ['semi-stable']);
    near(r.equilibria[0].value, 1, 1e-9);
    near(r.equilibria[0].slope, 0, 1e-6);
    assert.equal(r.equilibria[0].left, '+');
    assert.equal(r.equilibria[0].right, '+');
    assert.equal(signs(r), '+ +');
    assert.ok(r.evaluations <= 150, `${r.evaluations} evaluations`);
  });

  it('y² - 2cy + c², a double zero written so that rounding makes f dip below zero, is one semi-stable point', () => {
    // closed form: (y - c)²; computed from terms near c², f near c scatters by about eps·c²
    // on both sides of zero, which must not split it into an attractor–repeller pair
    // the first three values of c are ones where a threshold at rounding level did split it
    const cs = [1.9830356609000108, 4.344448541900031, 8.97682440649999];
    for (let i = 0; i < 100; i++) cs.push(0.5 + ((i * 0.6180339887498949) % 1) * 9); // spread over [0.5, 9.5]
    for (const c of cs) {
      const r = findEquilibria((y) => y * y - 2 * c * y + c * c, 0, 10);
      assert.deepEqual(summary(r), ['semi-stable'], `c = ${c}`);
      near(r.equilibria[0].value, c, 1e-6 * c, `c = ${c}`);
    }
  });

  it('1/(y - 1): no equilibrium, a pole at 1 across which f goes from - to +', () => {
    const r = findEquilibria((y) => 1 / (y - 1), 0, 3);
    assert.deepEqual(r.equilibria, []);
    assert.equal(r.poles.length, 1);
    near(r.poles[0].at, 1, 1e-10);
    assert.equal(r.poles[0].left, '-');
    assert.equal(r.poles[0].right, '+');
    assert.equal(signs(r), '- +');
    assert.equal(r.intervals[0].to, r.poles[0].at);
  });

  it('1/(y - 1) on [0, 2], where the grid lands on the pole and f there is Infinity', () => {
    const r = findEquilibria((y) => 1 / (y - 1), 0, 2);
    assert.deepEqual(r.equilibria, []);
    assert.equal(r.poles.length, 1);
    near(r.poles[0].at, 1, 1e-10);
    assert.deepEqual(r.gaps, []);
  });

  it('1/(y - 1)²: a pole without a change of sign is found too', () => {
    const r = findEquilibria((y) => 1 / (y - 1) ** 2, 0, 3);
    assert.deepEqual(r.equilibria, []);
    assert.equal(r.poles.length, 1);
    near(r.poles[0].at, 1, 1e-6);
    assert.equal(signs(r), '+ +');
  });

  it('sqrt(y) - 1 on [-1, 4]: a gap for y < 0, and a repeller at 1', () => {
    // closed form: f < 0 on [0, 1), f > 0 on (1, 4], f undefined (NaN) for y < 0; f(0) = -1
    const r = findEquilibria((y) => Math.sqrt(y) - 1, -1, 4);
    assert.deepEqual(summary(r), ['repeller']);
    near(r.equilibria[0].value, 1, locTol(5, 1));
    near(r.equilibria[0].slope, 0.5, 1e-8); // f'(1) = 1/(2 sqrt 1)
    assert.equal(r.gaps.length, 1);
    assert.equal(r.gaps[0].from, -1);
    near(r.gaps[0].to, 0, 1e-10);
    assert.equal(signs(r), 'none - +');
    assert.deepEqual([r.intervals[0].from, r.intervals[0].to], [null, r.gaps[0].to]);
  });

  it('sqrt(y) on [-1, 4]: an equilibrium where f falls to zero at the edge of its domain', () => {
    // f(0) = 0 and f > 0 for y > 0: trajectories leave 0 (one-sided repeller); left of it f is undefined
    const r = findEquilibria((y) => Math.sqrt(y), -1, 4);
    assert.deepEqual(summary(r), ['repeller']);
    near(r.equilibria[0].value, 0, 1e-10);
    assert.equal(r.equilibria[0].left, null);
    assert.equal(r.equilibria[0].right, '+');
  });

  it('f = 0 on [1, 2]: a zero interval, not a swarm of equilibria', () => {
    const f = (y: number) => (y < 1 ? 1 - y : y > 2 ? 2 - y : 0);
    const r = findEquilibria(f, 0, 3);
    assert.deepEqual(r.equilibria, []);
    assert.equal(r.zeroIntervals.length, 1);
    // the ends are where |f| falls below the zero tolerance (1e-10 of the local size of f)
    near(r.zeroIntervals[0].from, 1, 1e-9);
    near(r.zeroIntervals[0].to, 2, 1e-9);
    assert.equal(signs(r), '+ 0 -');
    assertCovers(r);
  });

  it('f = 0 everywhere: one zero interval, the whole range', () => {
    const r = findEquilibria(() => 0, 0, 1);
    assert.deepEqual(r.zeroIntervals, [{ from: 0, to: 1 }]);
    assert.deepEqual(r.intervals, [{ from: null, to: null, sign: '0' }]);
  });

  it('f constant and nonzero: no equilibria, one interval, nothing but the grid evaluated', () => {
    const r = findEquilibria(() => -2.5, 10, 20);
    assert.deepEqual(r.equilibria, []);
    assert.deepEqual(r.intervals, [{ from: null, to: null, sign: '-' }]);
    assert.equal(r.evaluations, 65);
  });

  it('Newton cooling -k(T - Ta) in kelvin, k = 1e-4 /s: one attractor at Ta to 1e-9 relative, slope -k', () => {
    // closed form: T* = Ta, f'(T*) = -k
    const k = 1e-4, Ta = 277.15;
    const r = findEquilibria((T) => -k * (T - Ta), 253.15, 373.15);
    assert.deepEqual(summary(r), ['attractor']);
    near(r.equilibria[0].value, Ta, 1e-9 * Ta);
    near(r.equilibria[0].slope, -k, 1e-8 * k);
    assert.equal(signs(r), '+ -');
    assert.ok(r.evaluations <= 100, `${r.evaluations} evaluations`);
  });

  it('a constant infusion with first-order loss at concentrations near 1e-6 kg/m³', () => {
    // C' = R - kC, closed form C* = R/k = 1e-6 kg/m³ with R = 1e-9 kg/(m³·s), k = 1e-3 /s
    const R = 1e-9, k = 1e-3;
    const r = findEquilibria((C) => R - k * C, 0, 1e-5);
    assert.deepEqual(summary(r), ['attractor']);
    near(r.equilibria[0].value, R / k, 1e-9 * (R / k));
    near(r.equilibria[0].slope, -k, 1e-8 * k);
  });

  it('a cubic (y - 1)(y - 2)(y - 3): repeller, attractor, repeller with slopes 2, -1, 2', () => {
    // closed form: f'(y) = 3y² - 12y + 11
    const r = findEquilibria((y) => (y - 1) * (y - 2) * (y - 3), 0, 4);
    assert.deepEqual(summary(r), ['repeller', 'attractor', 'repeller']);
    r.equilibria.forEach((e, i) => {
      near(e.value, i + 1, locTol(4, i + 1));
      near(e.slope, 3 * (i + 1) ** 2 - 12 * (i + 1) + 11, 1e-8);
    });
    assert.equal(signs(r), '- + - +');
  });

  it('exp(y) - 5 on [0, 50]: zero is judged by the size of f near the root, not by e^25', () => {
    // closed form: y* = log 5
    const r = findEquilibria((y) => Math.exp(y) - 5, 0, 50);
    assert.deepEqual(summary(r), ['repeller']);
    near(r.equilibria[0].value, Math.log(5), locTol(50, 2));
    assert.deepEqual(r.zeroIntervals, []);
  });

  it('a triple zero (y - 1)³ is one repeller with a slope of (almost) zero', () => {
    const r = findEquilibria((y) => (y - 1) ** 3, 0, 3);
    assert.deepEqual(summary(r), ['repeller']);
    near(r.equilibria[0].value, 1, 1e-6); // a triple zero is only determined to about cbrt(tolerance)
    assert.equal(r.equilibria[0].consistent, true);
  });
});

describe('findEquilibria: edges, close pairs, jumps and gaps', () => {
  it('equilibria exactly at both ends: y(1 - y) on [0, 1]', () => {
    // closed form: repeller at 0 (f' = 1), attractor at 1 (f' = -1); the side outside the
    // range is probed too, where f is defined
    const r = findEquilibria((y) => y * (1 - y), 0, 1);
    assert.deepEqual(summary(r), ['repeller', 'attractor']);
    assert.equal(r.equilibria[0].value, 0);
    assert.equal(r.equilibria[1].value, 1);
    assert.deepEqual(r.intervals, [{ from: 0, to: 1, sign: '+' }]);
  });

  it('equilibria just inside the ends: 1e-9 above from and 1e-10 below to', () => {
    const a = findEquilibria((y) => y - 1e-9, 0, 1);
    near(a.equilibria[0].value, 1e-9, locTol(1, 0));
    assert.deepEqual(summary(a), ['repeller']);
    const b = findEquilibria((y) => (1 - 1e-10) - y, 0, 1);
    near(b.equilibria[0].value, 1 - 1e-10, locTol(1, 1));
    assert.deepEqual(summary(b), ['attractor']);
    assert.equal(signs(b), '+ -');
  });

  it('a semi-stable point exactly at either end', () => {
    const a = findEquilibria((y) => (y - 1) ** 2, 0, 1);
    assert.deepEqual(a.equilibria.map((e) => [e.value, e.stability]), [[1, 'semi-stable']]);
    const b = findEquilibria((y) => -((y - 1) ** 2), 1, 3);
    assert.deepEqual(b.equilibria.map((e) => [e.value, e.stability]), [[1, 'semi-stable']]);
  });

  for (const gap of [1e-3, 1e-4, 1e-5]) {
    it(`two equilibria ${gap} apart inside one grid cell are both found, with their stability`, () => {
      // closed form: (y - 1)(y - 1 - gap)(y - 5): repeller 1, attractor 1 + gap, repeller 5
      const r = findEquilibria((y) => (y - 1) * (y - 1 - gap) * (y - 5), 0, 10);
      assert.deepEqual(summary(r), ['repeller', 'attractor', 'repeller']);
      near(r.equilibria[0].value, 1, locTol(10, 1));
      near(r.equilibria[1].value, 1 + gap, locTol(10, 1));
      near(r.equilibria[2].value, 5, locTol(10, 5));
      assert.equal(signs(r), '- + - +');
    });
  }

  it('two equilibria closer than the zero tolerance resolves are one semi-stable point', () => {
    // (y - 1)(y - 1 - 1e-7)(y - 5): f dips to -1e-14 between the two, below 1e-10 of the size
    // of f nearby, so the pair is reported as the double zero it is numerically
    const r = findEquilibria((y) => (y - 1) * (y - 1 - 1e-7) * (y - 5), 0, 10);
    assert.deepEqual(summary(r), ['semi-stable', 'repeller']);
    near(r.equilibria[0].value, 1 + 5e-8, 1e-7);
  });

  it('a jump in sign without a zero (a thermostat) is a jump, not an equilibrium', () => {
    const r = findEquilibria((T) => (T < 278.15 ? 1e-3 : -1e-3), 268.15, 298.15);
    assert.deepEqual(r.equilibria, []);
    assert.equal(r.jumps.length, 1);
    near(r.jumps[0].at, 278.15, 1e-9 * 278.15);
    assert.deepEqual([r.jumps[0].left, r.jumps[0].right], ['+', '-']);
  });

  it('where f throws or returns NaN there is a gap', () => {
    const f = (y: number) => { if (y > 1 && y < 2) throw new Error('undefined here'); return y - 2.5; };
    const r = findEquilibria(f, 0, 3);
    assert.equal(r.gaps.length, 1);
    near(r.gaps[0].from, 1, 1e-10);
    near(r.gaps[0].to, 2, 1e-10);
    assert.deepEqual(summary(r), ['repeller']);
    assert.equal(signs(r), '- none - +');
  });

  it('a gap narrower than a grid cell, met by Brent inside a sign change, is located and is no equilibrium', () => {
    // f = y - 1.015 except on (1.01, 1.02), where it is undefined: f changes sign across the
    // gap without a zero; no grid sample (cells of 3/64) falls inside it
    const r = findEquilibria((y) => (y > 1.01 && y < 1.02 ? NaN : y - 1.015), 0, 3);
    assert.deepEqual(r.equilibria, []);
    assert.equal(r.gaps.length, 1);
    near(r.gaps[0].from, 1.01, 1e-10);
    near(r.gaps[0].to, 1.02, 1e-10);
    assert.equal(signs(r), '- none +');
  });

  it('a grid point exactly on a zero, with a second zero in the next cell: y(y - 0.02) on [-5, 5]', () => {
    // closed form: f' = 2y - 0.02, so 0 attracts (f' = -0.02) and 0.02 repels (f' = 0.02)
    const r = findEquilibria((y) => y * (y - 0.02), -5, 5);
    assert.deepEqual(summary(r), ['attractor', 'repeller']);
    assert.equal(r.equilibria[0].value, 0);
    near(r.equilibria[1].value, 0.02, locTol(10, 0.02));
  });

  it('works at magnitudes where products of values underflow: f = 1e-222·y - 1e-306', () => {
    // closed form: zero at 1e-84 (0 to the location tolerance), a repeller
    const r = findEquilibria((y) => 1e-222 * y - 1e-306, -5, 5);
    assert.deepEqual(summary(r), ['repeller']);
    near(r.equilibria[0].value, 1e-84, locTol(10, 0));
    assert.equal(signs(r), '- +');
  });

  it('uses the caller\'s derivative for the slope and keeps the difference as a cross-check', () => {
    // closed form: f = y(3 - 4y), f' = 3 - 8y
    const r = findEquilibria((y) => y * (3 - 4 * y), -1, 2, { derivative: (y) => 3 - 8 * y });
    assert.deepEqual(r.equilibria.map((e) => e.slopeSource), ['derivative', 'derivative']);
    near(r.equilibria[1].slope, -3, 1e-10);
    near(r.equilibria[1].slopeDifference, -3, 1e-6);
  });

  it('flags a derivative that contradicts the side signs, and keeps the signs\' verdict', () => {
    const r = findEquilibria((y) => y - 1, 0, 3, { derivative: () => -1 });
    assert.deepEqual(summary(r), ['repeller']);
    assert.equal(r.equilibria[0].consistent, false);
    assert.ok(r.warnings.some((w) => /disagrees/.test(w)));
  });
});

describe('findEquilibria: bounded work and invalid input', () => {
  it('stays within maxEvaluations on a wildly oscillating f, and says the budget was hit', () => {
    let calls = 0;
    const r = findEquilibria((y) => { calls++; return Math.sin(1000 * y); }, 0, 1, { maxEvaluations: 500 });
    assert.ok(calls <= 500, `${calls} calls`);
    assert.equal(r.evaluations, calls);
    assert.equal(r.budgetExhausted, true);
    assert.ok(r.warnings.some((w) => /budget/.test(w)));
    assertCovers(r);
  });

  it('refuses invalid input with an error that names it', () => {
    const f = (y: number) => y;
    assert.throws(() => findEquilibria(f, 1, 1), /from must be less than to/);
    assert.throws(() => findEquilibria(f, NaN, 1), /from must be a finite number/);
    assert.throws(() => findEquilibria(f, 0, Infinity), /to must be a finite number/);
    assert.throws(() => findEquilibria(f, 0, 1, { panels: 0 }), /panels/);
    assert.throws(() => findEquilibria(f, 0, 1, { maxEvaluations: 10 }), /maxEvaluations/);
    assert.throws(() => findEquilibria(f, 0, 1, { zeroTolerance: -1 }), /zeroTolerance/);
    assert.throws(() => findEquilibria('y' as unknown as (y: number) => number, 0, 1), /f must be a function/);
  });
});

describe('findEquilibria: properties', () => {
  it('finds the three zeros of any cubic a(y - r1)(y - r2)(y - r3) with separated zeros, with alternating stability', () => {
    // closed form: for a > 0 the outer zeros repel and the middle one attracts; a < 0 the reverse
    fc.assert(fc.property(
      fc.double({ min: 0.05, max: 0.95, noNaN: true }), fc.double({ min: 0.05, max: 0.95, noNaN: true }),
      fc.double({ min: 0.05, max: 0.95, noNaN: true }), fc.constantFrom(-3e-4, 1, 250),
      fc.double({ min: -300, max: 300, noNaN: true }), fc.constantFrom(1e-6, 1, 400),
      (u1, u2, u3, a, shift, scale) => {
        const [q1, q2, q3] = [u1, u2, u3].sort((x, y) => x - y);
        fc.pre(q2 - q1 > 0.01 && q3 - q2 > 0.01);
        const roots = [q1, q2, q3].map((q) => shift * scale + q * scale);
        const f = (y: number) => a * (y - roots[0]) * (y - roots[1]) * (y - roots[2]);
        const from = shift * scale, to = shift * scale + scale;
        const r = findEquilibria(f, from, to);
        const expected = a > 0 ? ['repeller', 'attractor', 'repeller'] : ['attractor', 'repeller', 'attractor'];
        assert.deepEqual(summary(r), expected);
        r.equilibria.forEach((e, i) => near(e.value, roots[i], 1e-9 * scale + 8 * EPS * Math.abs(roots[i]), `zero ${i}`));
        assertCovers(r);
        assert.ok(r.evaluations <= 250, `${r.evaluations} evaluations`);
      }), { numRuns: 200, seed: 20261202 });
  });
});
