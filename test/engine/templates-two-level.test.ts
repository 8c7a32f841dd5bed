// The template "Two levels during an intermittent infusion" (examples/two-level-infusion-dosing
// .ratebook.json) against outside references, computed here from its invented inputs:
// - the least-squares fit through the regimen against the two-level method for intermittent
//   infusions (Sawchuk RJ, Zaske DE. J Pharmacokinet Biopharm 1976;4:183-195), with the level
//   before the dose taken from one-compartment superposition (derived below);
// - the Bayesian (MAP) fit against the study format's MAP objective written out here from the
//   closed-form concentrations;
// - the solve cells against one-compartment superposition over the 7-day run and at steady state
//   (standard pharmacokinetics textbooks, from memory).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { runStudy, type CellReport, type ReportOf } from '../../src/index.ts';
import { near } from './helpers.ts';

type Q = { value: number; unit: string; si: number };
const r = runStudy(JSON.parse(readFileSync(new URL('../../examples/two-level-infusion-dosing.ratebook.json', import.meta.url), 'utf8')));
assert.ok(r.ok);
const report = r.report;
const byId = (id: string) => report.cells.find((c) => c.id === id) as CellReport & Record<string, unknown>;
const est = (id: string) => byId(id).estimates as Record<string, { value: Q }>;
const solve = (id: string) => byId(id) as unknown as ReportOf<'solve'>;

// the template's invented inputs (mg, L, h)
const DOSE = 1000, T_INF = 1, TAU = 12, N_GIVEN = 4, K0 = DOSE / T_INF;
const [[T1, C1], [T2, C2]] = [[38, 31.8], [47.5, 15.2]];
const CL_POP = 4.5, V_POP = 50, OMEGA_CL = 0.3, OMEGA_V = 0.2, ADD = 1, PROP = 0.1;
const TARGET_TROUGH = 12, TARGET_AUC24 = 500;

/** One-compartment superposition of n_given infusions of K0 over T_INF every TAU: the level at t (h). */
function level(cl: number, v: number, t: number): number {
  const k = cl / v;
  let c = 0;
  for (let j = 0; j < N_GIVEN; j++) {
    const s = j * TAU;
    if (t <= s) continue;
    c += t < s + T_INF ? K0 / cl * (1 - Math.exp(-k * (t - s))) : K0 / cl * (1 - Math.exp(-k * T_INF)) * Math.exp(-k * (t - s - T_INF));
  }
  return c;
}

it('every cell computes, and the study carries the dose caution', () => {
  assert.deepEqual(report.cells.filter((c) => !c.ok).map((c) => `${c.id}: ${c.error?.message}`), []);
  assert.deepEqual(report.cautions.map((c) => c.kind), ['dosing']);
});

it('least squares through the regimen equals the two-level method (Sawchuk and Zaske 1976)', () => {
  // Both levels fall after the end of the fourth infusion (it runs 36-37 h), before the fifth (48 h).
  // Sawchuk RJ, Zaske DE. J Pharmacokinet Biopharm 1976;4:183-195:
  //   k = ln(C1/C2) / (t2 - t1);
  //   Cmax = C1 e^(k (t1 - t_end)), the peak extrapolated back to the end of the infusion;
  //   Cmin = C2 e^(-k (t_next - t2)), the trough extrapolated to the next dose;
  //   V = k0 (1 - e^(-k t_inf)) / (k (Cmax - Cpre e^(-k t_inf))), Cpre the level as the infusion
  //   started (at steady state Cpre = Cmin; after a first dose Cpre = 0).
  // Not at steady state, superposition gives Cpre: one infusion leaves A = k0/(kV) (1 - e^(-k t_inf))
  // e^(-k (tau - t_inf)) one interval after it started, so with r = e^(-k tau) the level as
  // infusion m starts is A (1 + r + ... + r^(m-2)) = A (1 - r^(m-1)) / (1 - r). The trough
  // extrapolated to the end of interval n is the level as infusion n+1 starts, A (1 - r^n) / (1 - r),
  // so Cpre = Cmin (1 - r^(n-1)) / (1 - r^n), with n = 4 here.
  const k = Math.log(C1 / C2) / (T2 - T1);
  const tStart = (N_GIVEN - 1) * TAU, tEnd = tStart + T_INF, tNext = N_GIVEN * TAU;
  const cmax = C1 * Math.exp(k * (T1 - tEnd));
  const cmin = C2 * Math.exp(-k * (tNext - T2));
  const rr = Math.exp(-k * TAU);
  const cpre = cmin * (1 - rr ** (N_GIVEN - 1)) / (1 - rr ** N_GIVEN);
  const V = K0 * (1 - Math.exp(-k * T_INF)) / (k * (cmax - cpre * Math.exp(-k * T_INF)));
  const CL = k * V;
  // two levels, two unknowns: least squares interpolates, so it must agree to round-off of the fit
  near(est('ls').V_ls.value.value, V, 1e-6, 'V (L)');
  near(est('ls').CL_ls.value.value, CL, 1e-6, 'CL (L/h)');
  near(est('ls').CL_ls.value.value / est('ls').V_ls.value.value, k, 1e-6, 'k = CL / V (1/h)');
  // and the closed form above passes through both levels (a check of the derivation)
  near(level(CL, V, T1), C1, 1e-12, 'level at t1');
  near(level(CL, V, T2), C2, 1e-12, 'level at t2');
});

describe('the Bayesian (MAP) fit', () => {
  // the study format's MAP objective: sum(((y - f)/sigma)^2) + sum((log P - log median)^2 / omega^2),
  // sigma^2 = additive^2 + (proportional f)^2, f from the closed-form superposition above
  const objective = (cl: number, v: number) =>
    [[T1, C1], [T2, C2]].reduce((s, [t, y]) => { const f = level(cl, v, t); return s + (y - f) ** 2 / (ADD ** 2 + (PROP * f) ** 2); }, 0)
    + (Math.log(cl / CL_POP) / OMEGA_CL) ** 2 + (Math.log(v / V_POP) / OMEGA_V) ** 2;
  const cl = est('bayes').CL_i.value.value, v = est('bayes').V_i.value.value;

  it('its objective at the estimate equals the objective written out here, and no nearby point is lower', () => {
    near(byId('bayes').objective as number, objective(cl, v), 1e-6, 'objective');
    for (const [dc, dv] of [[1, 0], [-1, 0], [0, 1], [0, -1]]) {
      assert.ok(objective(cl * (1 + 1e-3 * dc), v * (1 + 1e-3 * dv)) >= objective(cl, v), `a step ${dc}, ${dv} lowers the objective`);
    }
  });

  it('moves each estimate from least squares toward its prior median', () => {
    const ls = est('ls');
    assert.ok(Math.abs(Math.log(cl / CL_POP)) < Math.abs(Math.log(ls.CL_ls.value.value / CL_POP)), 'CL toward CL_pop');
    assert.ok(Math.abs(Math.log(v / V_POP)) < Math.abs(Math.log(ls.V_ls.value.value / V_POP)), 'V toward V_pop');
  });
});

describe('the new regimen, with the Bayesian CL and V, against superposition and its steady state', () => {
  const cl = est('bayes').CL_i.value.value, v = est('bayes').V_i.value.value, k = cl / v;
  const SPAN = 7 * 24; // the template's new regimen: doses every tau for 7 days
  // steady state of an intermittent infusion (one-compartment superposition):
  // Cmin,ss = (k0 / (k V)) (1 - e^(-k t_inf)) e^(-k (tau - t_inf)) / (1 - e^(-k tau))
  const troughSS = (dose: number, tau: number) => dose / T_INF / (k * v) * (1 - Math.exp(-k * T_INF)) * Math.exp(-k * (tau - T_INF)) / (1 - Math.exp(-k * tau));
  // after n doses: one dose leaves A one interval after it started, and the trough after n doses is
  // A (1 + r + ... + r^(n-1)) = Cmin,ss (1 - r^n), r = e^(-k tau)
  const troughN = (dose: number, tau: number) => troughSS(dose, tau) * (1 - Math.exp(-k * SPAN));
  // area over 24 h at steady state: AUC24 = 24 h dose / (tau CL)
  const auc24SS = (dose: number, tau: number) => 24 * dose / (tau * cl);
  // after n doses: the area under all doses in interval m is the area of one dose over its first
  // m tau, dose/CL - C1(m tau)/k (C1 one dose's level, past its infusion); summed over the last 24 h
  const c1 = (dose: number, t: number) => dose / T_INF / (k * v) * (1 - Math.exp(-k * T_INF)) * Math.exp(-k * (t - T_INF));
  const auc24N = (dose: number, tau: number) => {
    const n = SPAN / tau;
    let a = 0;
    for (let m = n - 24 / tau + 1; m <= n; m++) a += dose / cl - c1(dose, m * tau) / k;
    return a;
  };

  it('seven days are steady state to within 1e-5 of the trough and 1e-4 of the area (closed forms)', () => {
    for (const tau of [6, 8, 12, 24]) {
      near(troughN(1, tau), troughSS(1, tau), 1e-5, `trough at ${tau} h`);
      near(auc24N(1, tau), auc24SS(1, tau), 1e-4, `area at ${tau} h`);
    }
  });

  it('the dose for the target trough: linear in the dose, rounded to a 250 mg vial', () => {
    const s = solve('dose-trough');
    near(s.solution!.value, TARGET_TROUGH / troughN(1, TAU), 1e-5, 'dose (mg)');
    near(s.solution!.value, TARGET_TROUGH / troughSS(1, TAU), 1e-5, 'dose (mg), steady state');
    assert.equal(s.rounded!.value, 750); // hand-worked: 801 mg is nearest 750 mg among multiples of 250 mg
    near(s.achievedRounded!.value, troughN(750, TAU), 1e-5, 'trough at 750 mg');
  });

  it('the interval for the target trough: the trough at each choice, and the choice nearest the target', () => {
    const s = solve('interval-trough');
    for (const c of s.choices!) near(c.achieved!.value, troughN(DOSE, c.value.value), 1e-5, `trough at ${c.value.value} h`);
    const nearest = [6, 8, 12, 24].reduce((a, b) => (Math.abs(troughSS(DOSE, b) - TARGET_TROUGH) < Math.abs(troughSS(DOSE, a) - TARGET_TROUGH) ? b : a));
    assert.equal(s.solution!.value, nearest);
  });

  it('the dose for the target area over 24 hours: AUC24 = 24 h dose / (tau CL) at steady state', () => {
    const s = solve('dose-auc');
    near(s.solution!.value, TARGET_AUC24 / auc24N(1, TAU), 1e-5, 'dose (mg)');
    near(s.solution!.value, TARGET_AUC24 * TAU * cl / 24, 1e-4, 'dose (mg), steady state');
    near(s.achievedRounded!.value, auc24N(s.rounded!.value, TAU), 1e-5, 'area at the rounded dose');
    near((byId('steady').results as Record<string, Q>).auc24_ss.value, auc24N(DOSE, TAU), 1e-5, 'the run\'s area at the present dose');
  });
});
