// A solve cell's answer is shown, said and written to the digits its accuracy supports
// (src/cells/solve-digits.ts): the runs' tolerance, 10 tolerance units, over the target's slope,
// plus the search's own. Checked against the closed form of one-compartment IV boluses
// (superposition, common practice): after n doses of D every tau, the trough just before the
// next dose is (D / V) r (1 - r^n) / (1 - r) with r = e^(-k tau); it is linear in D, so the dose
// for a target trough is target V (1 - r) / (r (1 - r^n)).
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { runStudy, solutionEdit, shownSolution, formatNumber, type Cell, type SolveCell, type Study } from '../../src/index.ts';
import { supportedDigits } from '../../src/cells/solve-digits.ts';

const template = JSON.parse(readFileSync(new URL('../../examples/dose-for-target-trough.ratebook.json', import.meta.url), 'utf8')) as Study;
// the template's figures: V 40 L, CL 4 L/h (k 0.1 /h), every 12 h, 10 doses, a trough of 5 mg/L
const V = 40, k = 0.1, tau = 12, n = 10, target = 5;
const r = Math.exp(-k * tau);
const exactDose = (target * V * (1 - r)) / (r * (1 - r ** n)); // mg, 464.0262...

type SolveReport = { ok: boolean; solution: { value: number; unit: string; si: number }; digits?: number; message: string };

/** The template with the dose cell's rounding taken off and the run's tolerance and method as given. */
function solve(change: { relative?: number; method?: string } = {}) {
  const doc = structuredClone(template);
  const s = doc.cells.find((c) => c.id === 'new-dose') as SolveCell;
  delete (s.vary as { roundTo?: string }).roundTo;
  const run = doc.cells.find((c) => c.id === 'run') as Cell & { tolerance?: { relative: number }; method?: string; step?: string };
  if (change.relative !== undefined) run.tolerance = { relative: change.relative };
  if (change.method) { run.method = change.method; run.step = '0.1 h'; }
  const out = runStudy(doc);
  if (!out.ok) throw new Error(out.error.message);
  const report = out.report.cells.find((c) => c.id === 'new-dose') as unknown as SolveReport;
  assert.ok(report.ok, report.message);
  return { doc, s, report };
}

/** The unit of the last place of `x` shown to `digits` significant digits. */
const lastPlace = (x: number, digits: number) => 10 ** (Math.floor(Math.log10(Math.abs(x))) - digits + 1);

test('the dose for a target trough: shown to 5 digits, every one of them right against the closed form', () => {
  const { report } = solve();
  assert.equal(report.solution.unit, 'mg');
  assert.equal(report.digits, 5, `digits ${report.digits}`);
  // 464.026 mg was shown to 6 digits; the run's error, 10 tolerance units at 1e-6, is 0.0046 mg
  assert.equal(shownSolution(report.solution, report), '464.03 mg');
  const shown = Number(formatNumber(report.solution.value, report.digits!));
  assert.ok(Math.abs(shown - exactDose) <= lastPlace(shown, report.digits!) / 2, `${shown} mg against the closed form's ${exactDose} mg`);
  // the full value stays in the report, and in the name defined downstream
  assert.ok(Math.abs(report.solution.value - exactDose) / exactDose < 1e-5);
  assert.match(report.message, /^dose = 464\.03 mg gives trough = 5 mg \/ L/);
});

test('"use this value" writes what the cell shows, not a figure the user did not see', () => {
  const { doc, s, report } = solve();
  const edit = solutionEdit(doc.cells, s, report as never)!;
  assert.equal(edit.text, '464.03 mg');
  assert.equal(edit.text, shownSolution(report.solution, report));
  // with the template's rounding to a 250 mg vial, the rounded dose, as shown beside it
  const rounded = runStudy(structuredClone(template));
  if (!rounded.ok) throw new Error(rounded.error.message);
  const withVial = rounded.report.cells.find((c) => c.id === 'new-dose') as never;
  assert.equal(solutionEdit(template.cells, template.cells.find((c) => c.id === 'new-dose') as SolveCell, withVial)!.text, '500 mg');
});

test('the digits follow the run\'s tolerance, and stay right against the closed form', () => {
  for (const [relative, want] of [[1e-3, 2], [1e-4, 3], [1e-8, 6]] as const) {
    const { report } = solve({ relative });
    assert.equal(report.digits, want, `tolerance ${relative}: ${report.digits} digits of ${report.solution.value} mg`);
    const shown = Number(formatNumber(report.solution.value, report.digits!));
    assert.ok(Math.abs(shown - exactDose) <= lastPlace(shown, report.digits!) / 2, `tolerance ${relative}: ${shown} mg against ${exactDose} mg`);
  }
});

test('a fixed step bounds no error: no digits claimed, the answer shown as every figure (4 digits)', () => {
  const { report } = solve({ method: 'rk4' });
  assert.equal(report.digits, undefined);
  assert.equal(shownSolution(report.solution, report), `${formatNumber(report.solution.value, 4)} mg`);
});

test('the rule: the last place shown is the least power of ten at least twice the error', () => {
  assert.equal(supportedDigits(464.026, 0.00464), 5); // 2 × 0.00464 ≤ 0.01
  assert.equal(supportedDigits(464.026, 0.005), 5); // exactly half the last place
  assert.equal(supportedDigits(464.026, 0.0051), 4);
  assert.equal(supportedDigits(892.609, 0.0089), 4); // the two-level template's dose: 892.6 (closed form 892.603)
  assert.equal(supportedDigits(0.7324, 0), 6);
  assert.equal(supportedDigits(464, 900), 1);
  assert.equal(supportedDigits(464, NaN), undefined);
});
