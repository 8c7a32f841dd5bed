// The templates with solve cells check their answers against closed forms computed here from
// the templates' invented inputs: the superposition trough of a bolus regimen, and the time a
// well-mixed tank takes to flush to 1%. Values read off a run are checked to 1e-5 relative (the
// runs' tolerance is 1e-6), plain arithmetic to 1e-12.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { runStudy, type CellReport, type ReportOf } from '../../src/index.ts';
import { near } from './helpers.ts';

const cellsOf = (file: string): CellReport[] => {
  const r = runStudy(JSON.parse(readFileSync(new URL(`../../examples/${file}`, import.meta.url), 'utf8')));
  assert.ok(r.ok);
  const cells = r.report.cells;
  assert.deepEqual(cells.filter((c) => !c.ok).map((c) => `${c.id}: ${c.error?.message}`), []);
  return cells;
};
const solve = (cells: CellReport[], id: string) => cells.find((c) => c.id === id) as ReportOf<'solve'>;

describe('dose and interval for a target trough', () => {
  const cells = cellsOf('dose-for-target-trough.ratebook.json');
  // invented inputs of the template: 10 doses every tau, V 40 L, CL 4 L/h, target 5 mg/L
  const V = 40, k = 4 / 40, n = 10, target = 5;
  // one-compartment superposition (standard pharmacokinetics textbooks, from memory): the trough
  // after n doses of D every tau is (D/V) r (1 - r^n)/(1 - r), r = e^{-k tau}
  const troughPerMg = (tau: number) => { const r = Math.exp(-k * tau); return r * (1 - r ** n) / (1 - r) / V; };

  it('the dose: target / trough per mg, and the trough at the dose rounded to 250 mg', () => {
    const s = solve(cells, 'new-dose');
    near(s.solution!.value, target / troughPerMg(12), 1e-5, 'dose (mg)');
    assert.equal(s.rounded!.value, 500); // hand-worked: 464 mg is nearest 500 mg among multiples of 250 mg
    near(s.achievedRounded!.value, 500 * troughPerMg(12), 1e-5, 'trough at 500 mg');
  });

  it('the interval: the trough at each choice, and the choice nearest the target', () => {
    const s = solve(cells, 'new-interval');
    for (const c of s.choices!) near(c.achieved!.value, 1000 * troughPerMg(c.value.value), 1e-5, `trough at ${c.value.value} h`);
    const nearest = [6, 8, 12, 24].reduce((a, b) => (Math.abs(1000 * troughPerMg(b) - target) < Math.abs(1000 * troughPerMg(a) - target) ? b : a));
    assert.equal(s.solution!.value, nearest);
  });
});

describe('flow that flushes a tank in time', () => {
  const cells = cellsOf('flush-design.ratebook.json');
  // invented inputs: V 2 m^3 = 2000 L, 1% within 30 min, a 2 h run
  it('Q = V ln 100 / t (closed form of c0 e^{-Qt/V}), and the stretch of flows that do not reach 1% in the run', () => {
    const s = solve(cells, 'flow');
    near(s.solution!.value, 2000 * Math.log(100) / 30, 1e-5, 'Q (L/min)');
    assert.equal(s.rounded!.value, 310); // hand-worked: 307.0 L/min to the nearest 10 L/min
    near(s.achievedRounded!.value, 2000 / 310 * Math.log(100), 1e-5, 'time at 310 L/min (min)');
    assert.equal(s.undefinedIn!.length, 1);
    near(s.undefinedIn![0].to.value, 2000 * Math.log(100) / 120, 1e-5, 'the least flow that reaches 1% in 2 h');
  });
});
