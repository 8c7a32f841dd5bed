// The template "Two levels and a prior" (examples/bayesian-two-levels.ratebook.json) against
// outside references: the closed-form one-compartment bolus C = C0·e^(−k·t), the study format's
// MAP objective written out by hand and minimised by ml-levenberg-marquardt (npm), and least
// squares through two points in closed form.
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { runStudy, type CellReport } from '../../src/index.ts';

type Q = { value: number; unit: string; si: number };
const r = runStudy(readFileSync(new URL('../../examples/bayesian-two-levels.ratebook.json', import.meta.url), 'utf8'));
assert.ok(r.ok);
const cs = (r as { report: { cells: CellReport[]; cautions: Array<{ kind: string }> } }).report;
const byId = (id: string) => cs.cells.find((c) => c.id === id)!;
const est = (id: string) => byId(id).estimates as Record<string, { value: Q; ci95?: Q[]; prior?: { ratio: number } }>;
const near = (x: number, want: number, rel: number, what: string) => assert.ok(Math.abs(x - want) <= rel * Math.abs(want), `${what}: ${x} vs ${want}`);

// the template's invented inputs
const DOSE = 1000, V_POP = 50, CL_POP = 5, LEVELS = [[2, 19.0], [10, 11.4]];

it('every cell computes, and the study carries the dose caution', () => {
  assert.deepEqual(cs.cells.filter((c) => !c.ok).map((c) => `${c.id}: ${c.error?.message}`), []);
  assert.deepEqual(cs.cautions.map((c) => c.kind), ['dosing']);
});

it('the Bayesian estimate is the minimum of the hand-written objective (ml-levenberg-marquardt)', () => {
  const terms = ([u, v]: number[]) => [
    ...LEVELS.map(([t, y]) => { const f = Math.exp(u - Math.exp(v) * t); return (y - f) / Math.sqrt(0.5 ** 2 + (0.1 * f) ** 2); }),
    (u - Math.log(DOSE / V_POP)) / 0.2, (v - Math.log(CL_POP / V_POP)) / 0.3,
  ];
  const ref = levenbergMarquardt({ x: [0, 1, 2, 3], y: [0, 0, 0, 0] }, (th: number[]) => (x: number) => terms(th)[x], {
    initialValues: [Math.log(20), Math.log(0.1)], damping: 1e-2, maxIterations: 2000, errorTolerance: 0, gradientDifference: 1e-7, centralDifference: true, improvementThreshold: 1e-6,
  });
  const [u, v] = ref.parameterValues;
  near(est('bayes').C0_i.value.value, Math.exp(u), 1e-5, 'C0');
  near(est('bayes').k_i.value.value, Math.exp(v), 1e-5, 'k');
  // the patient's values below follow by arithmetic (V = dose / C0, CL = k V)
  const ind = byId('individual').values as Record<string, Q>;
  near(ind.V_i.si, DOSE * 1e-6 / (Math.exp(u) * 1e-3), 1e-5, 'V_i');
  near(ind.CL_i.value, Math.exp(v) * DOSE / Math.exp(u), 1e-5, 'CL_i in L/h');
  assert.ok(est('bayes').k_i.ci95, 'an interval');
});

it('least squares alone passes through both levels (closed form) and gives no interval', () => {
  const k = Math.log(19.0 / 11.4) / 8;
  near(est('plain').k_ls.value.value, k, 1e-6, 'k through both points');
  near(est('plain').C0_ls.value.value, 19.0 * Math.exp(2 * k), 1e-6, 'C0 through both points');
  assert.equal(est('plain').k_ls.ci95, undefined);
  // the prior pulls k from there toward its median
  assert.ok(est('bayes').k_i.value.value > k && est('bayes').k_i.value.value < CL_POP / V_POP);
});
