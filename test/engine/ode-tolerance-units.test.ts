// dp853 (and below, adams) reaches the accuracy it promises: on the six problems of the work-precision bench
// (bench/work-precision-problems.json; closed forms in bench/work-precision.ts: Newton cooling,
// logistic, Bateman, superposition of doses, the stiff forced problem by substitution,
// Michaelis–Menten by Lambert's W after Schnell & Mendoza 1997), at rtol 1e-3 … 1e-10 with
// atol = 1e-3·rtol·size, the largest error on a 2001-point grid (the dense output between the
// steps included) in tolerance units |err| / (atol + rtol·|y_exact|). Before dp853 took its
// error norm against tolerances 20 times tighter (DP853_TOLERANCE_SAFETY) it ended at up to
// 1.0, 13.7, 6.9, 1.8, 33.7 and 8.8 units; the evaluation budgets are the totals over the eight
// tolerances measured with it plus about 15 % (before: 1 111, 3 248, 3 466, 2 351, 2 237 859,
// 1 259).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { ours, problems } from '../../bench/work-precision.ts';

const LIMITS: Record<string, { units: number; budget: number }> = {
  'Newton cooling': { units: 1, budget: 1450 },
  'logistic growth': { units: 1, budget: 4780 },
  'oral absorption (Bateman)': { units: 1, budget: 5180 },
  '6 IV doses': { units: 1, budget: 3340 },
  // explicit steps held by stability on a stiff problem: their error is not the step's estimate's
  "stiff forced y' = -1e4 (y - cos t)": { units: 2, budget: 3_530_000 },
  'Michaelis–Menten': { units: 1, budget: 1780 },
};

describe('dp853 within its tolerance on the work-precision problems (closed forms), rtol 1e-3 … 1e-10', () => {
  for (const p of problems()) {
    const limit = LIMITS[p.name];
    it(`${p.name}: within ${limit.units} tolerance unit${limit.units > 1 ? 's' : ''} on the grid at every tolerance, in at most ${limit.budget} evaluations in all`, () => {
      let total = 0;
      for (let q = 3; q <= 10; q++) {
        const run = ours(p, 'dp853', 10 ** -q);
        assert.equal(run.method, 'dp853');
        assert.ok(run.units <= limit.units, `rtol 1e-${q}: ${run.units} units`);
        total += run.evaluations;
      }
      assert.ok(total <= limit.budget, `${total} evaluations`);
    });
  }
});

// adams reaches the accuracy it promises on the five smooth problems (the stiff one is not
// its: alone it runs out of steps there, and auto switches). The budgets of the first three are
// the totals measured with its Runge–Kutta start after a dose (adams-start.ts), in the
// one-evaluation mode, plus about 10 %: Newton cooling 503, logistic 1 692, 6 IV doses 1 661
// (2 382 with the climb from order 1 after each dose). That mode left Bateman at rtol 1e-7
// (1.63 units) and Michaelis–Menten at 1e-5 and 1e-6 (1.13, 1.04); with the final evaluation
// from rtol 1e-9 (PECE, adams.ts) they are within 1 unit too, and the totals are 535, 1 714,
// 1 760, Bateman 1 990 and Michaelis–Menten 479: the last two budgets are those plus 10 %.
const ADAMS_BUDGETS: Record<string, number> = {
  'Newton cooling': 560,
  'logistic growth': 1860,
  '6 IV doses': 1830,
  'oral absorption (Bateman)': 2190,
  'Michaelis–Menten': 530,
};

describe('adams within its tolerance on the smooth work-precision problems (closed forms), rtol 1e-3 … 1e-10', () => {
  for (const p of problems()) {
    const budget = ADAMS_BUDGETS[p.name];
    if (budget === undefined) continue;
    it(`${p.name}: within 1 tolerance unit on the grid at every tolerance, in at most ${budget} evaluations in all`, () => {
      let total = 0;
      for (let q = 3; q <= 10; q++) {
        const run = ours(p, 'adams', 10 ** -q);
        assert.equal(run.method, 'adams');
        assert.ok(run.units <= 1, `rtol 1e-${q}: ${run.units} units`);
        total += run.evaluations;
      }
      assert.ok(total <= budget, `${total} evaluations`);
    });
  }
});

// dopri5 measures a step's error in the unit of the value where the step ends
// (`errorNormAtEnd` in dopri5.ts). With the book's max(|y0|, |y1|) it ended at 1.42, 1.30 and
// 1.17 units on Bateman's problem at rtol 1e-3 … 1e-5, where auto runs it (the absorption
// state's relative error added up along its decay). Budgets: the totals measured (Newton
// cooling 874, Bateman 5 866, 6 IV doses 3 728 over rtol 1e-3 … 1e-10; logistic 408 and
// Michaelis–Menten 90 over rtol 1e-3 … 1e-5) plus about 10 %. Left: logistic growth from rtol
// 1e-6 (1.6 to 16 units, inside steps: the order-4 dense output) and Michaelis–Menten at 1e-9
// and 1e-10 (1.1 and 1.3 units), where auto runs adams.
const DOPRI5_LIMITS: Record<string, { tightest: number; budget: number }> = {
  'Newton cooling': { tightest: 10, budget: 960 },
  'oral absorption (Bateman)': { tightest: 10, budget: 6450 },
  '6 IV doses': { tightest: 10, budget: 4100 },
  'logistic growth': { tightest: 5, budget: 455 },
  'Michaelis–Menten': { tightest: 5, budget: 100 },
};

describe('dopri5 within its tolerance on the work-precision problems (closed forms)', () => {
  for (const p of problems()) {
    const limit = DOPRI5_LIMITS[p.name];
    if (limit === undefined) continue;
    it(`${p.name}: within 1 tolerance unit on the grid at rtol 1e-3 … 1e-${limit.tightest}, in at most ${limit.budget} evaluations in all`, () => {
      let total = 0;
      for (let q = 3; q <= limit.tightest; q++) {
        const run = ours(p, 'dopri5', 10 ** -q);
        assert.equal(run.method, 'dopri5');
        assert.ok(run.units <= 1, `rtol 1e-${q}: ${run.units} units`);
        total += run.evaluations;
      }
      assert.ok(total <= limit.budget, `${total} evaluations`);
    });
  }
});
