// A fit through a run's schedule (`run` on a fit cell): levels taken late in a dosing regimen
// are fitted through every dose before them. Checked against the closed forms of superposition
// for a one-compartment model with first-order elimination (Gibaldi & Perrier,
// Pharmacokinetics, 2nd ed., 1982, ch. 3: repeated IV boluses and intermittent infusions).
// All numbers are invented for the tests.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { openStudy, runStudy, type CellReport, type StudySession } from '../../src/index.ts';

type Q = { value: number; unit: string; si: number };
type Est = Record<string, { value: Q; standardError?: Q; ci95?: Q[] }>;

const study = (cells: unknown[]) => ({ format: 'ratebook-study', version: 1, title: 'fit through a run', cells });
function report(cells: unknown[]): CellReport[] {
  const r = runStudy(study(cells));
  assert.ok(r.ok, JSON.stringify(r));
  return (r as { report: { cells: CellReport[] } }).report.cells;
}
const byId = (cells: CellReport[], id: string) => cells.find((c) => c.id === id)!;
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

const K = 0.1; // 1/h: CL 5 L/h over V 50 L
const DOSE = 1000; // mg

/** Repeated IV boluses: C(t) = sum over doses given by t of D/V e^{-k (t - t_i)} (superposition, closed form). */
function bolus(t: number, k = K, V = 50, every = 12, count = 8): number {
  let c = 0;
  for (let i = 0; i < count; i++) if (i * every <= t) c += (DOSE / V) * Math.exp(-k * (t - i * every));
  return c;
}

/**
 * Intermittent infusions of D over T hours every tau: each infusion adds R/CL (1 - e^{-k s})
 * while it runs (s hours in), then R/CL (1 - e^{-kT}) e^{-k (t - end)} (superposition, closed form).
 */
function infusions(t: number, CL = 5, V = 50, T = 1, every = 12, count = 6): number {
  const k = CL / V, R = DOSE / T;
  let c = 0;
  for (let i = 0; i < count; i++) {
    const s = t - i * every;
    if (s <= 0) continue;
    c += s <= T ? (R / CL) * (1 - Math.exp(-k * s)) : (R / CL) * (1 - Math.exp(-k * T)) * Math.exp(-k * (s - T));
  }
  return c;
}

const params = (extra: Array<{ name: string; value: string }> = []) => ({ id: 'p', kind: 'parameters', items: [
  { name: 'CL', value: '5 L/h' }, { name: 'V', value: '50 L' }, { name: 'dose', value: '1000 mg' }, ...extra] });
const law = { id: 'elim', kind: 'rate', state: 'C', unit: 'mg/L', rate: '-CL / V * C', initial: '0 mg/L' };
const regimen = (events: unknown[], to = '96 h') => ({ id: 'regimen', kind: 'simulate', rates: ['elim'], from: '0 h', to, events, find: [{ name: 'peak', maximum: 'C' }] });
const q12h = [{ at: '0 h', every: '12 h', count: 8, add: { C: 'dose / V' } }];
const levels = (rows: number[][]) => ({ id: 'levels', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg/L' }], rows });
const fit = (extra: Record<string, unknown> = {}) => ({ id: 'fit', kind: 'fit', run: 'regimen', data: 'levels', time: 't', observe: { C: 'C' },
  estimate: [{ parameter: 'CL', as: 'CL_i', guess: '3 L/h' }, { parameter: 'V', as: 'V_i', guess: '30 L' }], ...extra });

describe('a fit through a run\'s schedule', () => {
  it('recovers CL and V from three late levels of a q12h bolus regimen to 1e-6 relative', () => {
    const rows = [84.5, 90, 95.5].map((t) => [t, bolus(t)]);
    const cells = report([params(), law, regimen(q12h), levels(rows), fit()]);
    const f = byId(cells, 'fit');
    assert.equal(f.ok, true, JSON.stringify(f.error));
    const est = f.estimates as Est;
    // closed form: the levels were made with CL = 5 L/h and V = 50 L
    assert.ok(rel(est.CL_i.value.value, 5) < 1e-6, `${est.CL_i.value.value}`);
    assert.equal(est.CL_i.value.unit, 'L / h');
    assert.ok(rel(est.V_i.value.value, 50) < 1e-6, `${est.V_i.value.value}`);
    assert.equal(f.n, 3);
    assert.equal(f.dof, 1);
  });

  it('recovers CL and V from two levels of intermittent infusions to 1e-6 relative', () => {
    const rows = [62, 71.5].map((t) => [t, infusions(t)]);
    const events = [{ at: '0 h', every: '12 h', count: 6, for: '1 h', infuse: { C: 'dose / (1 h) / V' } }];
    const cells = report([params(), law, regimen(events, '72 h'), levels(rows), fit(),
      { id: 'below', kind: 'parameters', items: [{ name: 'V_spread', value: 'V_i_se' }] }]);
    const f = byId(cells, 'fit');
    assert.equal(f.ok, true, JSON.stringify(f.error));
    const est = f.estimates as Est;
    // closed form superposition of the infusions with CL = 5 L/h, V = 50 L
    assert.ok(rel(est.CL_i.value.value, 5) < 1e-6, `${est.CL_i.value.value}`);
    assert.ok(rel(est.V_i.value.value, 50) < 1e-6, `${est.V_i.value.value}`);
    // two levels, two estimates: no degrees of freedom, so no standard error to name
    assert.equal(f.dof, 0);
    const below = byId(cells, 'below');
    assert.equal(below.ok, false);
    assert.match(below.error!.message, /"V_i_se" is not defined: the fit has no degrees of freedom/);
    assert.equal(below.error!.undefinedName?.name, 'V_i_se');
  });

  it('honours a parameter change in the schedule: the clearance set at 48 h is estimated from levels after it', () => {
    // doses q12h; at 48 h CL falls to CL_late (set before the dose at that time, as the schedule orders it)
    const kLate = 2 / 50;
    const at48 = bolus(48 - 1e-12, K, 50, 12, 4); // the four doses before 48 h, decayed with k = 0.1/h
    const late = (t: number) => at48 * Math.exp(-kLate * (t - 48)) + [48, 60, 72, 84].filter((ti) => ti <= t).reduce((s, ti) => s + (DOSE / 50) * Math.exp(-kLate * (t - ti)), 0);
    const rows = [59.5, 66, 83.5, 90].map((t) => [t, late(t)]);
    const events = [...q12h, { at: '48 h', set: { CL: 'CL_late' } }];
    const cells = report([params([{ name: 'CL_late', value: '4 L/h' }]), law, regimen(events), levels(rows),
      fit({ estimate: [{ parameter: 'CL_late', as: 'CL_late_i', guess: '3 L/h' }, { parameter: 'V', as: 'V_i', guess: '40 L' }] })]);
    const f = byId(cells, 'fit');
    assert.equal(f.ok, true, JSON.stringify(f.error));
    const est = f.estimates as Est;
    // closed form: CL_late = 2 L/h, V = 50 L made the levels
    assert.ok(rel(est.CL_late_i.value.value, 2) < 1e-6, `${est.CL_late_i.value.value}`);
    assert.ok(rel(est.V_i.value.value, 50) < 1e-6, `${est.V_i.value.value}`);
  });

  it('estimates a starting value through the run', () => {
    // a patient who starts at 8 mg/L before the first dose: C0 e^{-kt} adds to the boluses (superposition)
    const rows = [6, 30, 50].map((t) => [t, bolus(t, K, 50, 12, 8) + 8 * Math.exp(-K * t)]);
    const cells = report([params(), { ...law, initial: '2 mg/L' }, regimen(q12h), levels(rows),
      fit({ estimate: [{ parameter: 'C', as: 'C0_i', guess: '1 mg/L' }, { parameter: 'V', as: 'V_i', guess: '40 L' }] })]);
    const est = byId(cells, 'fit').estimates as Est;
    assert.ok(rel(est.C0_i.value.si, 8e-3 * 1000) < 1e-6 || rel(est.C0_i.value.value, 8) < 1e-6, JSON.stringify(est.C0_i.value));
    assert.ok(rel(est.V_i.value.value, 50) < 1e-6);
  });

  it('feeds a second run below, and the run shows the fit\'s measurements', () => {
    const rows = [84.5, 90, 95.5].map((t) => [t, bolus(t)]);
    const again = { id: 'again', kind: 'simulate', rates: ['elim'], from: '0 h', to: '24 h', events: [{ at: '0 h', add: { C: 'dose / V_i' } }], find: [{ name: 'C_at_6', valueOf: 'C', at: '6 h' }] };
    const cells = report([params(), law, regimen(q12h), levels(rows), fit(), again]);
    const a = byId(cells, 'again');
    assert.equal(a.ok, true, JSON.stringify(a.error));
    // closed form: D/V_i e^{-k 6 h} with V_i = 50 L (the law still reads CL and V)
    const c6 = (a.results as Record<string, Q>).C_at_6;
    assert.ok(rel(c6.value, 20 * Math.exp(-0.6)) < 1e-5, JSON.stringify(c6));
    const run = byId(cells, 'regimen');
    assert.deepEqual((run.plot as { points?: Array<{ state: string; t: number[] }> }).points?.map((p) => [p.state, p.t.length]), [['C', 3]]);
  });

  it('says it is a cycle when the run reads the estimates of a fit through itself', () => {
    const events = [{ at: '0 h', every: '12 h', count: 8, add: { C: 'dose / V_i' } }];
    const cells = report([params(), law, regimen(events), levels([[84.5, 30], [90, 25], [95, 20]]), fit()]);
    const f = byId(cells, 'fit');
    assert.equal(f.error?.kind, 'cycle');
    assert.match(f.error!.message, /circular definition: V_i -> cell "regimen" -> V_i; a fit through the run "regimen" cannot feed that run's own laws or events: use the fit's estimates in another run/);
    assert.ok(byId(cells, 'regimen').errors?.some((e) => e.kind === 'cycle'));
  });

  it('puts each bad input on its field', () => {
    const ok = () => structuredClone([params(), law, regimen(q12h), levels([[84.5, 30], [90, 25], [95, 20]]), fit()]) as any[];
    const errorOf = (cells: any[]) => byId(report(cells), 'fit').error!;
    let c = ok(); c[4].run = 'elim';
    assert.deepEqual([errorOf(c).path, errorOf(c).message], ['cells[4].run', 'cell "elim" is not a simulate cell: a fit goes through a run (a simulate cell)']);
    c = ok(); c[4].run = 'regimn';
    assert.deepEqual([errorOf(c).path, errorOf(c).message], ['cells[4].run', 'there is no cell "regimn" (did you mean "regimen"?)']);
    c = ok(); c[4].rates = ['elim'];
    assert.deepEqual([errorOf(c).path, errorOf(c).message], ['cells[4].run', 'name either the laws ("rates") or a run ("run"), not both']);
    c = ok(); delete c[4].run;
    assert.equal(errorOf(c).path, 'cells[4].rates');
    c = ok(); c[3].rows.push([100, 3]);
    assert.deepEqual([errorOf(c).path, errorOf(c).message], ['cells[4].time', 'row 4 is at 100 h, outside the run "regimen" (0 h to 96 h): the data\'s times are times on the run\'s clock']);
    c = ok(); c[4].estimate[0].parameter = 'Q';
    c[0].items.push({ name: 'Q', value: '1 L/h' });
    assert.deepEqual([errorOf(c).path, errorOf(c).message], ['cells[4].estimate[0].parameter', 'the run "regimen" does not read "Q" (its laws and events read: CL, V, dose)']);
    c = ok(); c[0].items.push({ name: 'k', value: 'CL / V' }); c[1].rate = '-k * C';
    assert.equal(errorOf(c).path, 'cells[4].estimate[0].parameter');
    assert.match(errorOf(c).message, /the run "regimen" reads "k", which is computed from "CL"/);
  });

  it('fits a level at the very time of a dose to the level after it, and says so', () => {
    // the trajectory is right-continuous (a run's valueOf reads it so): at 84 h the eighth dose is in
    const rows = [[84, bolus(84)], [90, bolus(90)], [95.5, bolus(95.5)]];
    const cells = report([params(), law, regimen(q12h), levels(rows), fit()]);
    const f = byId(cells, 'fit');
    const est = f.estimates as Est;
    assert.ok(rel(est.V_i.value.value, 50) < 1e-6, `${est.V_i.value.value}`);
    assert.deepEqual(f.warnings, ['row 1 is at the very time of a dose in the run "regimen", so it is fitted to the level just after that dose; a level drawn just before a dose (a trough) must be written a moment earlier']);
    const away = byId(report([params(), law, regimen(q12h), levels([[83.9, bolus(83.9)], [90, bolus(90)], [95.5, bolus(95.5)]]), fit()]), 'fit');
    assert.equal(away.warnings, undefined);
  });

  it('answers the what-if evaluator: with the dose doubled, the same levels mean twice the V and CL (linear scaling)', () => {
    const o = openStudy(study([params(), law, regimen(q12h), levels([84.5, 90, 95.5].map((t) => [t, bolus(t)])), fit()]));
    assert.ok(o.ok);
    const s = (o as { session: StudySession }).session;
    const w = s.whatIf(['CL_i', 'V_i', 'V_i_se'], [{ name: 'dose' }]);
    assert.ok(w.ok, JSON.stringify(w));
    const r = (w as Extract<typeof w, { ok: true }>).evaluate([2e-3]); // 2000 mg in SI (kg)
    // C = dose/V sum e^{-k(t - t_i)} with k = CL/V: doubling the dose doubles V and CL for the same levels (closed form)
    assert.ok(rel(r.values[0], 2 * 5 / 3.6e6) < 1e-6, JSON.stringify(r).slice(0, 600));
    assert.ok(rel(r.values[1], 2 * 0.05) < 1e-6, `${r.values[1]}`);
    assert.ok(Number.isFinite(r.values[2]));
  });

  it('does not fit again when only a question of the run changes', () => {
    const o = openStudy(study([params(), law, regimen(q12h), levels([84.5, 90, 95.5].map((t) => [t, bolus(t)])), fit()]));
    assert.ok(o.ok);
    const s = (o as { session: StudySession }).session;
    const run = structuredClone(s.document().cells[2]) as any;
    run.find = [{ name: 'low', minimum: 'C', from: '84 h' }];
    const r = s.apply({ type: 'replace', cell: run });
    assert.ok(r.ok);
    assert.deepEqual((r as { rerun: readonly string[] }).rerun, ['regimen']);
  });
});
