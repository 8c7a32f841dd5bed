// The template "Cooling design" (examples/cooling-design.ratebook.json) against the closed form
// of Newton cooling with constant air, T(t) = Ta + (T0 - Ta) e^(-k t) (Newton's law of cooling;
// any heat-transfer textbook, from memory), solved here for k and for Ta from its invented inputs.
// The limits are the template's defaults: the two-stage rule of the US FDA Food Code 2022,
// section 3-501.14, 135 degF to 70 degF within 2 h and to 41 degF within 6 h in total (57, 21
// and 5 degC).
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { runStudy, type CellReport, type ReportOf } from '../../src/index.ts';
import { near } from './helpers.ts';

const r = runStudy(JSON.parse(readFileSync(new URL('../../examples/cooling-design.ratebook.json', import.meta.url), 'utf8')));
assert.ok(r.ok);
const report = r.report;
const solve = (id: string) => report.cells.find((c) => c.id === id) as unknown as ReportOf<'solve'>;

// the template's inputs (degC, h): the rule, a 30 min margin, k 0.8 /h, walk-in air 3 degC, a 12 h run
const T0 = 57, T1 = 21, T2 = 5, LIMIT1 = 2, TOTAL = 6, MARGIN = 0.5, K = 0.8, TA = 3, RUN_END = 12;
/** Closed form: the time Newton cooling takes from T0 to T in air at ta, with constant k. */
const timeTo = (T: number, k: number, ta: number) => Math.log((T0 - ta) / (T - ta)) / k;
/** The air temperature at which T2 is reached at time t, by bisection on the closed form (it rises with ta below T2). */
function airFor(t: number, k: number): number {
  let lo = -50, hi = T2 - 1e-9;
  for (let i = 0; i < 200; i++) { const mid = (lo + hi) / 2; if (timeTo(T2, k, mid) < t) lo = mid; else hi = mid; }
  return (lo + hi) / 2;
}

it('every cell computes, and the study carries the food-code caution', () => {
  assert.deepEqual(report.cells.filter((c: CellReport) => !c.ok).map((c) => `${c.id}: ${c.error?.message}`), []);
  assert.deepEqual(report.cautions.map((c) => c.kind), ['temperature-limits']);
});

it('the smallest cooling constant that reaches 21 degC a margin before 2 h: k = ln((T0 - Ta)/(T1 - Ta)) / (2 h - margin)', () => {
  const s = solve('k-needed');
  const kMin = Math.log((T0 - TA) / (T1 - TA)) / (LIMIT1 - MARGIN);
  near(s.solution!.value, kMin, 1e-5, 'k (1/h)');
  assert.deepEqual(s.solutions!.length, 1); // the time falls as k rises: one solution
  // larger k cools faster, so every k above the answer passes the first stage with the margin
  assert.ok(timeTo(T1, kMin * 1.01, TA) < LIMIT1 - MARGIN && timeTo(T1, kMin * 0.99, TA) > LIMIT1 - MARGIN);
});

it('the warmest walk-in air that reaches 5 degC a margin before 6 h, by bisection on the closed form', () => {
  const s = solve('air-needed');
  const taMax = airFor(TOTAL - MARGIN, K);
  // the closed form solved for Ta, (T2 e^(k t) - T0) / (e^(k t) - 1), agrees with the bisection
  const e = Math.exp(K * (TOTAL - MARGIN));
  near(taMax, (T2 * e - T0) / (e - 1), 1e-9, 'Ta closed form');
  // the run's crossing time is good to its tolerance (1e-6): |dTa| well under a thousandth of a kelvin
  assert.ok(Math.abs(s.solution!.value - taMax) < 1e-3, `Ta ${s.solution!.value} vs ${taMax} degC`);
  // air from the temperature at which 5 degC is reached at the run's end upward never gets there in the run
  const eEnd = Math.exp(K * RUN_END);
  assert.equal(s.undefinedIn!.length, 1);
  assert.ok(Math.abs(s.undefinedIn![0].from.value - (T2 * eEnd - T0) / (eEnd - 1)) < 1e-3, `edge ${s.undefinedIn![0].from.value} degC`);
  assert.equal(s.undefinedIn![0].to.value, 10);
});

it('the present pan: the run\'s crossing times are the closed form\'s', () => {
  const run = report.cells.find((c) => c.id === 'run')!.results as Record<string, { value: number }>;
  near(run.t_to_stage1.value, timeTo(T1, K, TA), 1e-5, 'time to 21 degC (h)');
  near(run.t_to_stage2.value, timeTo(T2, K, TA), 1e-5, 'time to 5 degC (h)');
});
