// Equilibrium branches and folds as a parameter runs (src/numerics/phase/sweep.ts), against closed
// forms, in SI magnitudes. Evaluation counts are budgets, so an efficiency regression fails
// like a wrong answer.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { sweepEquilibria, type SweepResult } from '../../src/numerics/phase/sweep.ts';

const DAY = 86400;
const HOUR = 3600;

function near(actual: number, expected: number, tol: number, what = 'value'): void {
  assert.ok(Math.abs(actual - expected) <= tol, `${what}: ${actual}, expected ${expected} ± ${tol}`);
}

const allPoints = (s: SweepResult) => s.branches.flatMap((b) => b.points);

describe('sweepEquilibria: logistic growth with constant harvest, y\' = r y (1 - y/K) - H', () => {
  // closed form: equilibria y± = K/2·(1 ± sqrt(1 - 4H/(rK))), y- a repeller and y+ an
  // attractor while H < rK/4; they meet at the fold H = rK/4, y = K/2 and vanish beyond it
  const r = 0.5 / DAY, K = 2000; // 1/s and kg
  const f = (y: number, H: number) => r * y * (1 - y / K) - H;
  const Hfold = r * K / 4;
  const s = sweepEquilibria(f, 0, 1.2 * K, 0, 0.4 * r * K, 200);

  it('locates the fold at H = rK/4, y = K/2 to 1e-8 relative', () => {
    assert.equal(s.folds.length, 1);
    const fold = s.folds[0];
    near(fold.parameter, Hfold, 1e-8 * Hfold, 'H at the fold');
    near(fold.value, K / 2, 1e-8 * K, 'y at the fold');
    assert.equal(fold.pair, 'vanishes');
    assert.equal(fold.method, 'newton');
    assert.equal(fold.converged, true);
  });

  it('follows two branches, the repeller y- and the attractor y+, matching the closed form at every point', () => {
    assert.equal(s.branches.length, 2);
    const [low, high] = s.branches[0].points[0].value < s.branches[1].points[0].value ? s.branches : [s.branches[1], s.branches[0]];
    // each ends at the fold, the one semi-stable point (f = f_y = 0 there)
    assert.ok(low.points.slice(0, -1).every((p) => p.stability === 'repeller'));
    assert.ok(high.points.slice(0, -1).every((p) => p.stability === 'attractor'));
    assert.equal(low.points.at(-1)!.stability, 'semi-stable');
    assert.equal(high.points.at(-1)!.stability, 'semi-stable');
    for (const [branch, sign] of [[low, -1], [high, 1]] as const) {
      for (const p of branch.points) {
        const exact = (K / 2) * (1 + sign * Math.sqrt(1 - (4 * p.parameter) / (r * K)));
        near(p.value, exact, 1e-9 * K, `y at H = ${p.parameter}`);
        near(p.slope, r * (1 - (2 * exact) / K), 1e-6 * r, `slope at H = ${p.parameter}`); // f_y = r(1 - 2y/K)
      }
      assert.equal(branch.points[0].parameter, 0);
    }
    near(low.points[0].value, 0, 1e-12 * K);
    near(high.points[0].value, K, 1e-9 * K);
  });

  it('carries both branches to the fold: each ends at H = rK/4, y = K/2, with no gap before it', () => {
    // the grid's last step before the fold is H = 0.4rK·124/199 (y± = K/2·(1 ± 0.0790)): the
    // branches must not stop there. Every point added on the way is on the closed form above
    // (checked in the test before); here, that they reach the fold and close the gap evenly.
    const step = (0.4 * r * K) / 199;
    for (const b of s.branches) {
      const end = b.points.at(-1)!;
      near(end.parameter, Hfold, 1e-8 * Hfold, 'H where the branch ends');
      near(end.value, K / 2, 1e-8 * K, 'y where the branch ends');
      const beyondGrid = b.points.filter((p) => p.parameter > 124 * step * (1 + 1e-12));
      assert.ok(beyondGrid.length >= 8, `${beyondGrid.length} points between the last step and the fold`);
      // no jump in y between neighbours near the fold larger than a tenth of the last grid gap
      const lastGap = Math.abs(b.points[b.points.length - beyondGrid.length - 1].value - K / 2);
      for (let i = b.points.length - beyondGrid.length; i < b.points.length; i++) {
        assert.ok(Math.abs(b.points[i].value - b.points[i - 1].value) <= 0.12 * lastGap, `jump at H = ${b.points[i].parameter}`);
      }
    }
  });

  it('carries the branches to a fold that falls on a step (the template\'s 81 steps over 0 to 200 t/year, K = 1000 t)', () => {
    // r = 0.5 /year, K = 1000 t: the fold H = rK/4 = 125 t/year is step 50, where the grid
    // finds the semi-stable point N = K/2 = 500 t; the repeller's last step is 122.5 (N = 429.3)
    const rr = 0.5, KK = 1000;
    const t = sweepEquilibria((y, H) => rr * y * (1 - y / KK) - H, 0, 1100, 0, 200, 81);
    assert.equal(t.branches.length, 2);
    for (const b of t.branches) {
      near(b.points.at(-1)!.parameter, 125, 1e-9 * 125, 'H where the branch ends');
      near(b.points.at(-1)!.value, 500, 1e-6 * 500, 'N where the branch ends');
      for (const p of b.points.slice(0, -1)) {
        const sign = p.stability === 'attractor' ? 1 : -1;
        near(p.value, (KK / 2) * (1 + sign * Math.sqrt(1 - (4 * p.parameter) / (rr * KK))), 1e-9 * KK, `N at H = ${p.parameter}`);
      }
    }
  });

  it('has an equilibrium at every step before the fold and none after it', () => {
    s.parameters.forEach((H, k) => {
      assert.equal(s.steps[k].equilibria.length, H < Hfold ? 2 : 0, `H = ${H}`);
    });
  });

  it('keeps to an evaluation budget: 200 steps in at most 100 calls of f per step', () => {
    assert.equal(s.parameters.length, 200);
    assert.ok(s.evaluations <= 200 * 100, `${s.evaluations} evaluations`);
    assert.equal(s.budgetExhausted, false);
    assert.deepEqual(s.warnings, []);
  });

  it('finds the same fold, as a pair that appears, when the sweep runs downward and lands on it', () => {
    // H = 0.4rK - 0.4rK·15/40 = rK/4 is a step: f has the semi-stable point K/2 there
    const down = sweepEquilibria(f, 0, 1.2 * K, 0.4 * r * K, 0, 41);
    assert.equal(down.folds.length, 1);
    near(down.folds[0].parameter, Hfold, 1e-8 * Hfold);
    near(down.folds[0].value, K / 2, 1e-6 * K);
    assert.equal(down.folds[0].pair, 'appears');
    // both branches start at the fold, in the order the sweep runs
    for (const b of down.branches) {
      near(b.points[0].parameter, Hfold, 1e-8 * Hfold, 'H where the branch starts');
      near(b.points[0].value, K / 2, 1e-6 * K, 'y where the branch starts');
    }
  });
});

describe('sweepEquilibria: saturable elimination with a constant infusion, C\' = R - Vmax·C/(Km + C)', () => {
  // closed form (Michaelis–Menten elimination at steady state, common practice in
  // pharmacokinetics): C* = Km·R/(Vmax - R), an attractor with slope -Vmax·Km/(Km + C*)²,
  // only while R < Vmax; for R >= Vmax the infusion outruns elimination and C grows without end
  const Vmax = 10e-3 / HOUR; // 10 mg/(L·h) in kg/(m³·s)
  const Km = 2e-3; // 2 mg/L in kg/m³
  const Cmax = 0.05; // 50 mg/L
  const f = (C: number, R: number) => R - (Vmax * C) / (Km + C);
  const s = sweepEquilibria(f, 0, Cmax, 0, 1.5 * Vmax, 61);

  it('matches C* = Km·R/(Vmax - R) at every step where it lies in the range', () => {
    let checked = 0;
    s.parameters.forEach((R, k) => {
      const eq = s.steps[k].equilibria;
      const exact = R < Vmax ? (Km * R) / (Vmax - R) : Infinity;
      if (exact <= Cmax) {
        assert.equal(eq.length, 1, `R = ${R}`);
        near(eq[0].value, exact, 1e-9 * exact + 1e-12 * Cmax, `C* at R = ${R}`);
        assert.equal(eq[0].stability, 'attractor');
        near(eq[0].slope, (-Vmax * Km) / (Km + exact) ** 2, 1e-6 * Vmax / Km, `slope at R = ${R}`);
        checked++;
      } else {
        assert.deepEqual(eq, [], `R = ${R}: no steady state in range`);
      }
    });
    assert.ok(checked >= 30, `${checked} steps checked`);
  });

  it('has no equilibrium anywhere in range for R >= Vmax, and the rate is positive there', () => {
    s.parameters.forEach((R, k) => {
      if (R < Vmax) return;
      assert.deepEqual(s.steps[k].equilibria, []);
      assert.deepEqual(s.steps[k].intervals, [{ from: null, to: null, sign: '+' }]);
    });
  });

  it('is one attractor branch, leaving through the top of the range, with no fold', () => {
    assert.equal(s.branches.length, 1);
    assert.ok(s.branches[0].points.every((p) => p.stability === 'attractor'));
    assert.deepEqual(s.folds, []);
    assert.ok(s.evaluations <= 61 * 100, `${s.evaluations} evaluations`);
  });
});

describe('sweepEquilibria: other bifurcations and the fallbacks', () => {
  it('hysteresis y\' = p + y - y³: two folds at p = ∓2/(3√3), y = ±1/√3', () => {
    // closed form: f_y = 1 - 3y² = 0 at y = ±1/√3, and f = 0 there gives p = y³ - y
    const s = sweepEquilibria((y, p) => p + y - y ** 3, -2, 2, -1, 1, 101);
    const pf = 2 / (3 * Math.sqrt(3)), yf = 1 / Math.sqrt(3);
    assert.equal(s.folds.length, 2);
    const [a, b] = s.folds;
    near(a.parameter, -pf, 1e-10); near(a.value, yf, 1e-8); assert.equal(a.pair, 'appears');
    near(b.parameter, pf, 1e-10); near(b.value, -yf, 1e-8); assert.equal(b.pair, 'vanishes');
    // at each fold two branch ends meet: the middle (repeller) branch's and an attractor's
    for (const fold of s.folds) {
      const ends = s.branches.flatMap((br) => [br.points[0], br.points.at(-1)!])
        .filter((e) => Math.abs(e.parameter - fold.parameter) <= 1e-10 && Math.abs(e.value - fold.value) <= 1e-7);
      assert.equal(ends.length, 2, `branch ends at the fold p = ${fold.parameter}`);
    }
  });

  it('a fold pair born in the same step as an equilibrium entering the range is still told apart', () => {
    // f = p + a y + b y² + d y³ on y in [-4, 4]: between p = -1.821 and -1.714 the pair near
    // y = 1.56 appears while a third equilibrium enters at y = -3.99. Closed form: the folds are
    // at the zeros y* of f_y = a + 2b y + 3d y², with p* = -(a y* + b y*² + d y*³)
    const a = 1.8508353988173654, b = -0.16121766418920638, d = -0.18381503061684298;
    const s = sweepEquilibria((y, p) => p + a * y + b * y * y + d * y ** 3, -4, 4, -3, 3, 57);
    const yStar = [-1, 1].map((sg) => (-2 * b + sg * Math.sqrt(4 * b * b - 12 * a * d)) / (6 * d)).sort((u, v) => v - u);
    const pStar = yStar.map((y) => -(a * y + b * y * y + d * y ** 3));
    assert.equal(s.folds.length, 2);
    s.folds.forEach((fold, i) => {
      near(fold.parameter, pStar[i], 1e-10, `p at fold ${i}`);
      near(fold.value, yStar[i], 1e-8, `y at fold ${i}`);
    });
    assert.deepEqual(s.folds.map((x) => x.pair), ['appears', 'vanishes']);
  });

  it('transcritical y\' = p·y - y²: no fold; the attractor moves from 0 to y = p', () => {
    // closed form: equilibria 0 and p; for p < 0, 0 attracts; for p > 0, p attracts
    const s = sweepEquilibria((y, p) => p * y - y * y, -2, 2, -1, 1, 21);
    assert.deepEqual(s.folds, []);
    for (const p of allPoints(s)) {
      if (p.stability === 'attractor') near(p.value, Math.max(0, p.parameter), 1e-9, `attractor at p = ${p.parameter}`);
      if (p.stability === 'repeller') near(p.value, Math.min(0, p.parameter), 1e-9, `repeller at p = ${p.parameter}`);
    }
  });

  it('falls back on bisection in p where Newton cannot converge (f_p infinite at the fold)', () => {
    // f = cbrt(p - 0.3) - (y - 1)²: the pair 1 ± (p - 0.3)^(1/6) exists for p > 0.3 and meets
    // at (0.3, 1); Newton on cbrt diverges, so the fold must come from the bisection
    const s = sweepEquilibria((y, p) => Math.cbrt(p - 0.3) - (y - 1) ** 2, 0, 3, 0, 1, 20);
    assert.equal(s.folds.length, 1);
    assert.equal(s.folds[0].method, 'bisection');
    assert.equal(s.folds[0].converged, true);
    near(s.folds[0].parameter, 0.3, 1e-9);
    near(s.folds[0].value, 1, 1e-6);
    assert.equal(s.folds[0].pair, 'appears');
  });

  it('reports a fold it had no budget to refine at the grid step, unconverged', () => {
    const r = 1, K = 1;
    const s = sweepEquilibria((y, H) => r * y * (1 - y / K) - H, 0, 1.2, 0, 0.4, 21, { maxFoldEvaluations: 5 });
    assert.equal(s.folds.length, 1);
    assert.equal(s.folds[0].method, 'grid');
    assert.equal(s.folds[0].converged, false);
    assert.ok(s.folds[0].parameter >= 0.24 && s.folds[0].parameter <= 0.26);
    assert.equal(s.budgetExhausted, true);
  });

  it('refuses invalid input with an error that names it', () => {
    const f = (y: number, p: number) => p - y;
    assert.throws(() => sweepEquilibria(f, 1, 0, 0, 1, 10), /yFrom must be less than yTo/);
    assert.throws(() => sweepEquilibria(f, 0, 1, 1, 1, 10), /pFrom and pTo must differ/);
    assert.throws(() => sweepEquilibria(f, 0, 1, 0, NaN, 10), /pTo must be a finite number/);
    assert.throws(() => sweepEquilibria(f, 0, 1, 0, 1, 1), /steps must be an integer/);
    assert.throws(() => sweepEquilibria(f, 0, 1, 0, 1, 10.5), /steps must be an integer/);
    assert.throws(() => sweepEquilibria(f, 0, 1, 0, 1, 10, { maxJump: 0 }), /maxJump/);
  });
});
