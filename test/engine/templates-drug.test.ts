// The drug-kinetics templates (one compartment, first order, and one saturable law) check
// their key results against closed forms computed here from the templates' invented inputs.
//
// Tolerances: the runs use the default solver tolerance (relative 1e-6), and each template's
// linear laws report a closed-form error below one tolerance unit; values read off a run
// (levels, peaks, troughs, areas, crossing times) are checked to 1e-5 relative, ten times
// that. Derived parameters are plain arithmetic and are checked to 1e-12 relative.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { runStudy, type CellReport } from '../../src/index.ts';

type Q = { value: number; unit: string; si: number };
const read = (file: string) => JSON.parse(readFileSync(new URL(`../../examples/${file}`, import.meta.url), 'utf8'));
const evaluate = (doc: unknown): CellReport[] => {
  const r = runStudy(doc);
  assert.ok(r.ok);
  return (r as { report: { cells: CellReport[] } }).report.cells;
};
const cells = (file: string) => evaluate(read(file));
const byId = (cs: CellReport[], id: string) => cs.find((c) => c.id === id)!;
const values = (cs: CellReport[], id: string) => byId(cs, id).values as Record<string, Q>;
const results = (cs: CellReport[], id: string) => byId(cs, id).results as Record<string, Q>;
const RUN = 1e-5;
const ARITH = 1e-12;
function near(actual: Q, expected: number, rel: number, unit: string, what: string) {
  assert.equal(actual.unit, unit, `${what}: unit`);
  assert.ok(Math.abs(actual.value - expected) <= rel * Math.abs(expected), `${what}: ${actual.value} against ${expected}`);
}
function allOk(cs: CellReport[]) {
  assert.deepEqual(cs.filter((c) => !c.ok).map((c) => `${c.id}: ${c.error?.message}`), []);
}

describe('repeated IV bolus', () => {
  // invented inputs of the template
  const D = 500, tau = 8, V = 30, CL = 3, k = CL / V, MIC = 4;
  const C0 = D / V, r = Math.exp(-k * tau);
  // one-compartment superposition closed form, Gibaldi & Perrier, Pharmacokinetics, 2nd ed., ch. 3 (from memory):
  // peak after n boluses (D/V)(1 - r^n)/(1 - r), trough one interval later that times r
  const peakN = (n: number) => (C0 * (1 - r ** n)) / (1 - r);
  const troughN = (n: number) => peakN(n) * r;
  const cs = cells('iv-bolus-repeated.ratebook.json');

  it('evaluates with every cell ok', () => allOk(cs));

  it('gives the steady-state peak, trough, average, accumulation factor and time to 90% in closed form', () => {
    const s = values(cs, 'steady');
    // accumulation factor 1/(1 - e^{-k tau}) (same source)
    near(s.acc, 1 / (1 - r), ARITH, '', 'accumulation factor');
    // Cmax,ss = (D/V)/(1 - e^{-k tau}); Cmin,ss = Cmax,ss e^{-k tau} (same source)
    near(s.Cmax_ss, C0 / (1 - r), ARITH, 'mg / L', 'Cmax_ss');
    near(s.Cmin_ss, (C0 * r) / (1 - r), ARITH, 'mg / L', 'Cmin_ss');
    // Cavg,ss = D/(CL tau) (same source)
    near(s.Cavg_ss, D / (CL * tau), ARITH, 'mg / L', 'Cavg_ss');
    // 90% of steady state after ln 10 / k = log2(10) half-lives, about 3.3 (common practice)
    near(s.t90_ss, Math.log(10) / k, ARITH, 'h', 't90_ss');
    near(s.t90_in_half_lives, Math.log2(10), ARITH, '', 't90 in half-lives');
    const n = values(cs, 'after-n');
    near(n.Cmax_n, peakN(6), ARITH, 'mg / L', 'Cmax_n');
    near(n.Cmin_n, troughN(6), ARITH, 'mg / L', 'Cmin_n');
    near(n.share_of_ss, 1 - r ** 6, ARITH, '', 'share of steady state');
  });

  it('simulates the peak and trough of the last interval as the six-dose closed form gives them', () => {
    const run = results(cs, 'run');
    // superposition closed form for n doses (Gibaldi & Perrier, ch. 3, from memory)
    near(run.peak_last, peakN(6), RUN, 'mg / L', 'peak after dose 6');
    near(run.Cmax, peakN(6), RUN, 'mg / L', 'largest level of the run');
    near(run.trough_last, troughN(6), RUN, 'mg / L', 'trough after dose 6');
    near(run.trough_before_last, troughN(5), RUN, 'mg / L', 'trough before dose 6');
    // area under a mono-exponential over one interval: peak (1 - e^{-k tau}) / k (common practice)
    near(run.auc_last, (peakN(6) * (1 - r)) / k, RUN, 'mg * h / L', 'area over the last interval');
    // mass balance of a linear one-compartment model: AUC(0, T) = (n D/V - C(T)) / k (common practice)
    near(run.auc_0_48, (6 * C0 - troughN(6)) / k, RUN, 'mg * h / L', 'area over the run');
    // the lowest trough, after the first dose, C0 e^{-k tau}, stays above the level of interest
    assert.ok(C0 * r > MIC);
    near(run.t_above_mic, 48, RUN, 'h', 'time above the level of interest');
  });
});

describe('intermittent IV infusion', () => {
  const D = 1000, tinf = 1, tau = 12, V = 50, CL = 5, k = CL / V, R0 = D / tinf, n = 8;
  // superposition of short infusions, Gibaldi & Perrier, Pharmacokinetics, 2nd ed., ch. 3 (from memory):
  // peak at the end of infusion n: R0/(kV)(1 - e^{-k tinf})(1 - e^{-n k tau})/(1 - e^{-k tau});
  // trough before the next infusion: that peak times e^{-k (tau - tinf)}
  const peakN = (m: number) => ((R0 / (k * V)) * (1 - Math.exp(-k * tinf)) * (1 - Math.exp(-m * k * tau))) / (1 - Math.exp(-k * tau));
  const troughN = (m: number) => peakN(m) * Math.exp(-k * (tau - tinf));
  const peakSs = ((R0 / (k * V)) * (1 - Math.exp(-k * tinf))) / (1 - Math.exp(-k * tau));
  const doc = read('intermittent-iv-infusion.ratebook.json');
  const cs = evaluate(doc);

  it('evaluates with every cell ok, and its schedule gives the number of infusions it says', () => {
    allOk(cs);
    const run = doc.cells.find((c: { id: string }) => c.id === 'run');
    assert.equal(run.events[0].count, values(cs, 'steady').n_doses.value);
  });

  it('gives the steady-state peak and trough in closed form', () => {
    const s = values(cs, 'steady');
    // same source as above (steady state: n large)
    near(s.Cmax_ss, peakSs, ARITH, 'mg / L', 'Cmax_ss');
    near(s.Cmin_ss, peakSs * Math.exp(-k * (tau - tinf)), ARITH, 'mg / L', 'Cmin_ss');
    // Cavg,ss = D/(CL tau) (same source)
    near(s.Cavg_ss, D / (CL * tau), ARITH, 'mg / L', 'Cavg_ss');
    near(s.Cmax_n, peakN(n), ARITH, 'mg / L', 'Cmax_n');
    near(s.Cmin_n, troughN(n), ARITH, 'mg / L', 'Cmin_n');
  });

  it('simulates the first and last peaks and the last trough as the n-dose closed form gives them', () => {
    const run = results(cs, 'run');
    // n-dose superposition closed form (Gibaldi & Perrier, ch. 3, from memory)
    near(run.peak_first, peakN(1), RUN, 'mg / L', 'peak of the first infusion');
    near(run.peak_last, peakN(n), RUN, 'mg / L', 'peak of the last infusion');
    near(run.trough_last, troughN(n), RUN, 'mg / L', 'trough after the last infusion');
    // the peak comes at the end of the infusion (common practice)
    near(run.t_peak_last, (n - 1) * tau + tinf, RUN, 'h', 'time of the last peak');
    // mass balance over the last interval: AUC = (D/V - (C(end) - C(start))) / k (common practice)
    near(run.auc_last, (D / V - (troughN(n) - troughN(n - 1))) / k, RUN, 'mg * h / L', 'area over the last interval');
    const cmp = values(cs, 'compare');
    near(cmp.peak_ratio, 1, RUN, '', 'peak ratio');
    near(cmp.trough_ratio, 1, RUN, '', 'trough ratio');
  });
});

describe('oral dose with first-order absorption', () => {
  const D = 400, F = 0.8, ka = 1.2, V = 40, CL = 4, k = CL / V;
  // Bateman function, Gibaldi & Perrier, Pharmacokinetics, 2nd ed., ch. 1 (from memory):
  // C(t) = F D ka/(V (ka - k)) (e^{-kt} - e^{-ka t}); tmax = ln(ka/k)/(ka - k)
  const bateman = (t: number, a = ka) => ((F * D * a) / (V * (a - k))) * (Math.exp(-k * t) - Math.exp(-a * t));
  const tmaxOf = (a: number) => Math.log(a / k) / (a - k);
  // its integral from 0 to T (integral of two exponentials, common practice)
  const area = (T: number) => ((F * D * ka) / (V * (ka - k))) * ((1 - Math.exp(-k * T)) / k - (1 - Math.exp(-ka * T)) / ka);
  // Ag is a first-order law alone: its exact solution is exact, the C peak is flat, so its
  // time is known to about (rtol · |C'| scale)/|C''| ≈ 1e-5 h here; checked to 1e-4 h
  const TMAX_ABS = 1e-4;
  const cs = cells('oral-first-order-absorption.ratebook.json');

  it('evaluates with every cell ok', () => allOk(cs));

  it('gives tmax, Cmax and the whole area in closed form', () => {
    const c = values(cs, 'closed');
    near(c.tmax_cf, tmaxOf(ka), ARITH, 'h', 'tmax');
    near(c.Cmax_cf, bateman(tmaxOf(ka)), ARITH, 'mg / L', 'Cmax');
    // at tmax, ka e^{-ka t} = k e^{-k t}, so Cmax = (F D/V) e^{-k tmax} (follows from the Bateman function)
    near(c.Cmax_check, ((F * D) / V) * Math.exp(-k * tmaxOf(ka)), ARITH, 'mg / L', 'Cmax by the identity');
    // AUC(0, inf) = F D / CL (common practice)
    near(c.auc_inf_cf, (F * D) / CL, ARITH, 'mg * h / L', 'AUC to infinity');
  });

  it('simulates the peak, a level, the area and the gut amount as the Bateman function gives them', () => {
    const run = results(cs, 'run');
    assert.equal(run.tmax.unit, 'h');
    assert.ok(Math.abs(run.tmax.value - tmaxOf(ka)) < TMAX_ABS, `tmax ${run.tmax.value}`);
    near(run.Cmax, bateman(tmaxOf(ka)), RUN, 'mg / L', 'Cmax');
    near(run.C_12h, bateman(12), RUN, 'mg / L', 'C at 12 h');
    near(run.auc_0_72, area(72), RUN, 'mg * h / L', 'area to 72 h');
    // first-order absorption: Ag(t) = F D e^{-ka t} (common practice)
    near(run.Ag_2h, F * D * Math.exp(-ka * 2), RUN, 'mg', 'gut amount at 2 h');
  });

  it('keeps to the Bateman function when absorption is slower than elimination (flip-flop)', () => {
    const doc = read('oral-first-order-absorption.ratebook.json');
    doc.cells.find((c: { id: string }) => c.id === 'regimen').items.find((i: { name: string }) => i.name === 'ka').value = '0.05 / h';
    const cs2 = evaluate(doc);
    allOk(cs2);
    const run = results(cs2, 'run');
    // the Bateman function is symmetric in ka and k (Gibaldi & Perrier, ch. 1, from memory)
    assert.ok(Math.abs(run.tmax.value - tmaxOf(0.05)) < TMAX_ABS, `tmax ${run.tmax.value} against ${tmaxOf(0.05)}`);
    near(run.Cmax, bateman(tmaxOf(0.05), 0.05), RUN, 'mg / L', 'Cmax');
  });
});

describe('loading dose and maintenance', () => {
  const Ct = 10, V = 50, CL = 4, k = CL / V, tau = 12;
  const cs = cells('loading-dose-maintenance.ratebook.json');

  it('evaluates with every cell ok', () => allOk(cs));

  it('gives the loading dose C V, the maintenance rate C CL and the repeated-dose plan in closed form', () => {
    // loading dose = C_target V, maintenance rate = C_target CL (Gibaldi & Perrier, ch. 3, from memory)
    const p = values(cs, 'infusion-plan');
    near(p.loading, Ct * V, ARITH, 'mg', 'loading dose');
    near(p.R_maint, Ct * CL, ARITH, 'mg / h', 'maintenance rate');
    near(p.t90_without, Math.log(10) / k, ARITH, 'h', 'time to 90% without loading');
    // maintenance dose C CL tau; loading dose = maintenance dose / (1 - e^{-k tau}) (same source)
    const d = values(cs, 'dose-plan');
    near(d.D_maint, Ct * CL * tau, ARITH, 'mg', 'maintenance dose');
    near(d.D_load, (Ct * CL * tau) / (1 - Math.exp(-k * tau)), ARITH, 'mg', 'loading dose for repeated doses');
    near(d.Cavg_ss, Ct, ARITH, 'mg / L', 'average level at steady state');
  });

  it('reaches the target at once with a loading bolus and holds it with a constant infusion', () => {
    // C(t) = C_target for all t when C(0) = C_target and the input rate is C_target CL (same source)
    const run = results(cs, 'run');
    for (const name of ['C_1h', 'C_6h', 'C_24h', 'C_47h', 'C_highest', 'C_lowest']) near(run[name], Ct, RUN, 'mg / L', name);
  });

  it('without a loading dose takes ln 10 / k to reach 90% of the target, and falls after the infusion stops', () => {
    // constant infusion from zero: C(t) = C_target (1 - e^{-kt}); after it stops, e^{-k t} decline (common practice)
    const run = results(cs, 'run-no-load');
    near(run.t90_run, Math.log(10) / k, RUN, 'h', 't90');
    near(run.C_6h_no_load, Ct * (1 - Math.exp(-k * 6)), RUN, 'mg / L', 'C at 6 h');
    const c48 = Ct * (1 - Math.exp(-k * 48));
    near(run.C_48h_no_load, c48, RUN, 'mg / L', 'C at 48 h');
    near(run.C_72h_no_load, c48 * Math.exp(-k * 24), RUN, 'mg / L', 'C at 72 h');
  });

  it('with a loading dose and repeated doses averages the target over the first and last intervals', () => {
    // at steady state the average level over an interval is dose/(CL tau) (Gibaldi & Perrier, ch. 3, from memory),
    // and the loading dose D/(1 - e^{-k tau}) puts the level on its steady cycle from the start
    const run = results(cs, 'run-doses');
    const peak = (Ct * CL * tau) / (1 - Math.exp(-k * tau)) / V;
    near(run.auc_first, Ct * tau, RUN, 'mg * h / L', 'area over the first interval');
    near(run.auc_last, Ct * tau, RUN, 'mg * h / L', 'area over the last interval');
    near(run.peak_first, peak, RUN, 'mg / L', 'first peak');
    near(run.peak_last, peak, RUN, 'mg / L', 'last peak');
    near(run.trough_last, peak * Math.exp(-k * tau), RUN, 'mg / L', 'last trough');
    const cmp = values(cs, 'compare');
    near(cmp.Cavg_first, Ct, RUN, 'mg / L', 'average over the first interval');
    near(cmp.Cavg_last, Ct, RUN, 'mg / L', 'average over the last interval');
  });
});

describe('saturable elimination under a constant infusion', () => {
  const Vmax = 500, Km = 4, V = 50, R = 300; // mg/d, mg/L, L, mg/d
  // Michaelis–Menten elimination, steady state C* = Km R / (Vmax - R) for R < Vmax
  // (Rowland & Tozer, Clinical Pharmacokinetics, ch. on nonlinearities, from memory)
  const star = (r: number) => (Km * r) / (Vmax - r);
  // time to go from C0 to C at the rate r: V dC/dt = (r Km - (Vmax - r) C)/(Km + C) separated and
  // integrated by partial fractions (derived here): t = V/a [(Km + C*) ln((C* - C0)/(C* - C)) - (C - C0)]
  const timeTo = (r: number, c0: number, c: number) => {
    const a = Vmax - r, s = star(r);
    return (V / a) * ((Km + s) * Math.log((s - c0) / (s - c)) - (c - c0));
  };
  // the level after dt from c0 at the rate r: the inverse of timeTo, by bisection
  const levelAfter = (r: number, c0: number, dt: number) => {
    let lo = c0, hi = star(r);
    for (let i = 0; i < 200; i++) {
      const mid = 0.5 * (lo + hi);
      if (timeTo(r, c0, mid) < dt) lo = mid; else hi = mid;
    }
    return 0.5 * (lo + hi);
  };
  const doc = read('saturable-elimination-infusion.ratebook.json');
  const cs = evaluate(doc);
  const withR = (value: string) => {
    const d = structuredClone(doc);
    d.cells.find((c: { id: string }) => c.id === 'drug').items.find((i: { name: string }) => i.name === 'R').value = value;
    return evaluate(d);
  };
  // the phase line's equilibria are located to 1e-12 of the range's width (the finder's default
  // tolerance); checked to ten times that
  const width = 1000;
  const EQ_ABS = 1e-11 * width;

  it('evaluates with every cell ok', () => allOk(cs));

  it('gives the steady level, the time to 90% and the apparent clearance in closed form', () => {
    const c = values(cs, 'closed');
    near(c.C_star, star(R), ARITH, 'mg / L', 'C*');
    near(c.t90, timeTo(R, 0, 0.9 * star(R)), ARITH, 'd', 't90');
    // apparent clearance at steady state R / C* = Vmax / (Km + C*) (same source)
    near(c.CL_at_ss, R / star(R), ARITH, 'L / d', 'clearance at steady state');
    // first order at low levels with k = Vmax / (V Km) (same source)
    near(c.k_low, Vmax / (V * Km), ARITH, '1 / d', 'low-level rate constant');
    near(c.C_star_up10, star(1.1 * R), ARITH, 'mg / L', 'C* at the raised rate');
    assert.ok(star(1.1 * R) / star(R) > 1.25); // far more than 10% higher
    near(c.has_steady_level, 1, 0, '', 'steady level exists');
  });

  it('finds one attractor at Km R / (Vmax - R), with the slope of the law there', () => {
    const eq = byId(cs, 'settle').equilibria as Array<Q & { stability: string; slope: Q }>;
    assert.equal(eq.length, 1);
    assert.equal(eq[0].unit, 'mg / L');
    assert.ok(Math.abs(eq[0].value - star(R)) <= EQ_ABS, `${eq[0].value}`);
    assert.equal(eq[0].stability, 'attractor');
    // d/dC of R/V - Vmax C/(V (Km + C)) is -Vmax Km / (V (Km + C)^2) (calculus)
    near(eq[0].slope, (-Vmax * Km) / (V * (Km + star(R)) ** 2), 1e-6, '1 / d', 'slope at C*');
  });

  it('sweeps one branch of attractors on Km R / (Vmax - R) that leaves the range before Vmax, with no fold', () => {
    const sweep = byId(cs, 'settle').sweep as { branches: Array<Array<{ parameter: Q; value: Q; stability: string }>>; folds: unknown[] };
    assert.deepEqual(sweep.folds, []);
    assert.equal(sweep.branches.length, 1);
    const points = sweep.branches[0];
    // the grid: 61 steps from 0 to 750 mg/d; an equilibrium exists in [0, 1000] mg/L exactly
    // where R < Vmax and Km R / (Vmax - R) <= 1000 mg/L
    const grid = Array.from({ length: 61 }, (_, i) => (750 * i) / 60);
    const expected = grid.filter((p) => p < Vmax && star(p) <= width);
    assert.deepEqual(points.map((p) => p.parameter.value), expected);
    for (const p of points) {
      assert.equal(p.parameter.unit, 'mg / d');
      assert.equal(p.stability, 'attractor');
      assert.ok(Math.abs(p.value.value - star(p.parameter.value)) <= EQ_ABS + 1e-10 * star(p.parameter.value), `at R = ${p.parameter.value}: ${p.value.value}`);
    }
    // the level grows without bound toward Vmax: the last point lies far above the template's C*
    assert.ok(points.at(-1)!.value.value > 20 * star(R));
  });

  for (const r of [Vmax, 600]) {
    it(`has no equilibrium in the range, and a rising level everywhere, at R = ${r} mg/d (not below Vmax)`, () => {
      const cs2 = withR(`${r} mg / d`);
      const settle = byId(cs2, 'settle');
      assert.ok(settle.ok);
      assert.deepEqual(settle.equilibria, []);
      assert.deepEqual((settle.intervals as Array<{ sign: string }>).map((i) => i.sign), ['+']);
      assert.equal(values(cs2, 'closed').has_steady_level.value, 0);
      // no finite steady level: C* is reported as infinite rather than as a number
      assert.equal(byId(cs2, 'closed').ok, false);
      assert.match(byId(cs2, 'closed').error!.message, /infinite/);
    });
  }

  it('simulates the rise to 90% of C* and the step after a 10% rise in the rate as the separated solution gives them', () => {
    const run = results(cs, 'run');
    // separated and integrated closed form above (derived here)
    near(run.t90_run, timeTo(R, 0, 0.9 * star(R)), RUN, 'd', 't90 from the run');
    const c20 = levelAfter(R, 0, 20);
    near(run.C_before_raise, c20, RUN, 'mg / L', 'level when the rate is raised');
    const R2 = 1.1 * R, level = star(R) + 0.9 * (star(R2) - star(R));
    near(run.t_90_of_step, 20 + timeTo(R2, c20, level), RUN, 'd', 'time to 90% of the step');
    near(run.C_40d, levelAfter(R2, c20, 20), RUN, 'mg / L', 'level at 40 d');
  });
});
