// Mixing, flushing, draining, decay and drag templates: key results against closed forms and
// published values (the model library, flow and growth/decay part).
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { runStudy, type CellReport } from '../../src/index.ts';

type Q = { value: number; unit: string; si: number };
type Eq = Q & { stability: string; slope: Q };
const cells = (file: string): CellReport[] => {
  const r = runStudy(readFileSync(new URL(`../../examples/${file}`, import.meta.url), 'utf8'));
  assert.ok(r.ok);
  return (r as { report: { cells: CellReport[] } }).report.cells;
};
const byId = (cs: CellReport[], id: string) => cs.find((c) => c.id === id)!;
const results = (cs: CellReport[], id: string) => byId(cs, id).results as Record<string, Q>;
const values = (cs: CellReport[], id: string) => byId(cs, id).values as Record<string, Q>;
/** |got - want| within rel * |want|, with both in the message. */
const near = (got: Q, want: number, rel: number, unit: string) => {
  assert.equal(got.unit, unit);
  assert.ok(Math.abs(got.value - want) <= rel * Math.abs(want), `${got.value} ${got.unit} vs ${want} ${unit}`);
};
const G = 9.80665; // standard gravity, m/s^2 (CGPM 1901 conventional value)

it('filling tank: time to spill over and concentration then, from the closed form', () => {
  // Closed form of the linear ODE, derived here: d(VC)/dt = Qin Cin - Qout C and dV/dt = Qin - Qout
  // give V dC/dt = Qin (Cin - C). With V = V0 + r t, r = Qin - Qout, u = C - Cin:
  // du/u = -(Qin / r) dV/V, so C = Cin + (C0 - Cin) (V0 / V)^(Qin / r). Once full (V = Vmax,
  // outflow = inflow) it is a constant-volume mixer: C - Cin decays as e^(-Qin t / Vmax).
  // Tolerance: the runs use relative 1e-9, but the solver steps across the kink where the
  // volume law switches off at Vmax; 1e-6 relative leaves room for that.
  const cs = cells('tank-changing-volume.ratebook.json');
  const V0 = 3000, Vmax = 8000, C0 = 12, Qin = 200, Cin = 2, Qout = 120, Ctarget = 2.5; // L, g/L, L/min (the template's demo numbers)
  const r = Qin - Qout;
  const Cat = (t: number) => Cin + (C0 - Cin) * Math.pow(V0 / (V0 + r * t), Qin / r);
  const tFull = (Vmax - V0) / r;
  const Cfull = Cat(tFull);
  const tUsable = tFull + (Vmax / Qin) * Math.log((Cfull - Cin) / (Ctarget - Cin)); // after the spill-over starts
  const run = results(cs, 'run');
  near(run.t_full, tFull, 1e-6, 'min'); // closed form V(t) = V0 + (Qin - Qout) t
  near(run.C_30, Cat(30), 1e-6, 'g / L'); // closed form of the linear ODE, derived above
  near(results(cs, 'at-full').C_full, Cfull, 1e-6, 'g / L'); // same closed form at the spill-over
  near(run.t_usable, tUsable, 1e-6, 'min'); // constant-volume mixing after the spill-over (common practice)
  const p = values(cs, 'tank');
  near(p.t_full_cf, tFull, 1e-12, 'min');
  near(p.C_full_cf, Cfull, 1e-12, 'g / L');
  near(p.t_usable_cf, tUsable, 1e-12, 'min');
});

it('rinse tank flush: concentration at the switch and time to the limit, from the closed form', () => {
  // Constant-volume well-mixed tank: C(t) = C_feed + (C0 - C_feed) e^(-Q t / V), then from the
  // switch C = C_clean + (C_s - C_clean) e^(-Q (t - t_s) / V) (mixing-tank closed form, common
  // practice). Default solver tolerance relative 1e-6; checked to 1e-5.
  const cs = cells('mixing-tank-flush.ratebook.json');
  const V = 2000, Q = 100, Cfeed = 50, C0 = 0, Cclean = 0, tSwitch = 60, limit = 1; // L, L/min, mg/L, min
  const k = Q / V;
  const Cs = Cfeed + (C0 - Cfeed) * Math.exp(-k * tSwitch);
  const tClean = tSwitch + Math.log((Cs - Cclean) / (limit - Cclean)) / k; // minutes
  const run = results(cs, 'run');
  near(run.C_at_switch, Cs, 1e-5, 'mg / L'); // closed form, filling toward C_feed
  near(run.t_clean, tClean / 60, 1e-5, 'h'); // closed form, flushing toward C_clean
});

it('draining tank: Torricelli times to half height and to 1 cm, and the empty tank as the one equilibrium', () => {
  // Torricelli with a discharge coefficient, A dh/dt = -Cd a sqrt(2 g h), integrates to
  // sqrt(h) = sqrt(h0) - (Cd a / A) sqrt(g / 2) t (closed form, fluid mechanics textbooks,
  // from memory); empty at t_empty = (A / (Cd a)) sqrt(2 h0 / g). Default solver tolerance
  // relative 1e-6; checked to 1e-5 (the singular end at h = 0 is not asked for).
  const cs = cells('tank-draining-orifice.ratebook.json');
  const D = 1.2, d = 0.03, Cd = 0.61, h0 = 1.8, hLow = 0.01; // m (the template's demo numbers)
  const A = (Math.PI / 4) * D * D, a = (Math.PI / 4) * d * d;
  const K = ((Cd * a) / A) * Math.sqrt(G / 2); // m^0.5 / s
  const timeTo = (h: number) => (Math.sqrt(h0) - Math.sqrt(h)) / K; // s
  const tEmpty = (A / (Cd * a)) * Math.sqrt((2 * h0) / G);
  assert.ok(Math.abs(timeTo(0) - tEmpty) < 1e-9 * tEmpty); // the two closed forms agree
  const run = results(cs, 'run');
  near(run.t_half, timeTo(h0 / 2) / 60, 1e-5, 'min'); // Torricelli closed form, half height
  near(run.t_low, timeTo(hLow) / 60, 1e-5, 'min'); // Torricelli closed form, 1 cm left
  near(run.level_10, Math.pow(Math.sqrt(h0) - K * 600, 2), 1e-5, 'm'); // Torricelli closed form at 10 min
  const p = values(cs, 'tank');
  // shown in the run's minutes (the study's time unit); the SI seconds are the closed form's
  near(p.t_empty_cf, tEmpty / 60, 1e-12, 'min');
  near(p.t_half_cf, timeTo(h0 / 2) / 60, 1e-12, 'min');
  assert.ok(Math.abs(p.t_empty_cf.si - tEmpty) <= 1e-12 * tEmpty);
  // The phase line on [0, 2 m]: h = 0 is the only zero of -c sqrt(h), and the level falls
  // toward it from above (an attractor at the range's edge).
  const eq = byId(cs, 'settle').equilibria as Eq[];
  assert.equal(eq.length, 1);
  assert.equal(eq[0].si, 0);
  assert.equal(eq[0].stability, 'attractor');
  const iv = byId(cs, 'settle').intervals as Array<{ from: Q | null; to: Q | null; sign: string }>;
  assert.deepEqual(iv.map((i) => i.sign), ['-']);
});

it('radiocarbon age: t_half log2(1/f) with the NUBASE2020 half-life, and the conventional age', () => {
  // Carbon-14 half-life 5700 +/- 30 years: Kondev et al. 2021, NUBASE2020, Chinese Physics C 45,
  // 030001. (The Cambridge half-life, 5730 +/- 40 years, is Godwin 1962, Nature 195, 984.)
  // First-order decay of the remaining fraction: N = 2^(-t / t_half), so the age is t_half log2(1 / f).
  // Default solver tolerance relative 1e-6; checked to 1e-5.
  const cs = cells('radiometric-age.ratebook.json');
  const tHalf = 5700, tHalfCambridge = 5730, A0 = 13.56, A = 4.1; // years; decays per minute per gram (demo sample)
  const f = A / A0;
  const age = tHalf * Math.log2(1 / f);
  const run = results(cs, 'run');
  near(run.age, age, 1e-5, 'year'); // closed form of first-order decay
  near(run.N_at_half_life, 0.5, 1e-5, ''); // half left after one half-life (definition)
  near(run.N_at_10000, Math.pow(2, -10000 / tHalf), 1e-5, ''); // closed form
  const cf = byId(cs, 'run').closedForm!.N14;
  near(cf.halfLife!, tHalf, 1e-9, 'year'); // t_half = ln 2 / lambda, back to the NUBASE2020 value
  const p = values(cs, 'decay');
  near(p.age_cf, age, 1e-12, 'year');
  near(p.age_cambridge, tHalfCambridge * Math.log2(1 / f), 1e-12, 'year'); // Godwin 1962 half-life
  // Conventional radiocarbon age = -8033 ln(F) years, 8033 years being the Libby mean life
  // 5568 / ln 2 (Stuiver and Polach 1977, Radiocarbon 19, 355; from memory). 8033 is rounded:
  // 5568 / ln 2 = 8032.98, so 1e-5 relative.
  near(p.age_conventional, -8033 * Math.log(f), 1e-5, 'year');
});

it('falling body with quadratic drag: terminal speed, time to 95 % of it, distance fallen', () => {
  // m dv/dt = m g - (1/2) rho Cd A v |v| from rest: v = v_t tanh(g t / v_t),
  // x = (v_t^2 / g) ln cosh(g t / v_t), v_t = sqrt(2 m g / (rho Cd A)) (closed form, common
  // practice; mechanics textbooks, from memory). Default solver tolerance relative 1e-6; the
  // crossing near v_t is about ten times more sensitive (dv/dt = 0.0975 g there), so 1e-5.
  const cs = cells('falling-body-drag.ratebook.json');
  const m = 80, Cd = 1.0, A = 0.7, rho = 1.2, p = 0.95; // kg, -, m^2, kg/m^3 (the template's demo numbers)
  const vt = Math.sqrt((2 * m * G) / (rho * Cd * A));
  const x = (t: number) => ((vt * vt) / G) * Math.log(Math.cosh((G * t) / vt));
  const tp = (Math.atanh(p) * vt) / G;
  const run = results(cs, 'run');
  near(run.t_p, tp, 1e-5, 's'); // atanh(p) v_t / g, closed form
  near(run.v_5, vt * Math.tanh((G * 5) / vt), 1e-5, 'm / s'); // v_t tanh(g t / v_t), closed form
  near(run.x_10, x(10), 1e-5, 'm'); // (v_t^2 / g) ln cosh(g t / v_t), closed form
  near(results(cs, 'at-p').x_p, x(tp), 1e-5, 'm'); // the same at t_p
  near(values(cs, 'body').v_t, vt, 1e-12, 'm / s');
  // Phase line of g - k v |v| on [-60, 80] m/s: one equilibrium, v_t, an attractor with slope
  // -2 k v_t = -2 g / v_t; no equilibrium at -v_t (drag opposes motion).
  const eq = byId(cs, 'settle').equilibria as Eq[];
  assert.equal(eq.length, 1);
  near(eq[0], vt, 1e-9, 'm / s');
  assert.equal(eq[0].stability, 'attractor');
  near(eq[0].slope, (-2 * G) / vt, 1e-6, '1 / s');
});
