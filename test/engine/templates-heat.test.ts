// Heat-transfer templates check their key results against closed forms, an independent
// quadrature and published rules (the model library, heat-transfer part).
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { runStudy, type CellReport } from '../../src/index.ts';

type Q = { value: number; unit: string; si: number };
type Doc = { cells: Array<Record<string, unknown> & { id: string }> };

const load = (file: string): Doc => JSON.parse(readFileSync(new URL(`../../examples/${file}`, import.meta.url), 'utf8'));
const evaluate = (doc: Doc): CellReport[] => {
  const r = runStudy(JSON.stringify(doc));
  assert.ok(r.ok);
  return (r as { report: { cells: CellReport[] } }).report.cells;
};
const cells = (file: string): CellReport[] => evaluate(load(file));
const byId = (cs: CellReport[], id: string) => cs.find((c) => c.id === id)!;
const values = (cs: CellReport[], id: string) => byId(cs, id).values as Record<string, Q>;
const results = (cs: CellReport[], id: string) => byId(cs, id).results as Record<string, Q & { notReached?: boolean }>;
/** Sets a parameter's value text in a parsed study (the perturbations below). */
const setParam = (doc: Doc, name: string, value: string): Doc => {
  for (const c of doc.cells) {
    const item = ((c.items ?? []) as Array<{ name: string; value: string }>).find((i) => i.name === name);
    if (item) { item.value = value; return doc; }
  }
  throw new Error(`no parameter ${name}`);
};
const near = (actual: number, expected: number, tol: number, what: string) =>
  assert.ok(Math.abs(actual - expected) <= tol, `${what}: ${actual} vs ${expected} (tolerance ${tol})`);

const C = 273.15; // kelvin at 0 degC (SI definition of the Celsius scale)
const H = 3600;

/**
 * Newton cooling T' = -k (T - Ta) whose k and Ta change once, at tm (exact piecewise solution,
 * common practice). Times in s, temperatures in K.
 */
const piecewise = (T0: number, k1: number, Ta1: number, tm: number, k2: number, Ta2: number) => {
  const Tm = Ta1 + (T0 - Ta1) * Math.exp(-k1 * tm);
  return {
    at: (t: number) => (t <= tm ? Ta1 + (T0 - Ta1) * Math.exp(-k1 * t) : Ta2 + (Tm - Ta2) * Math.exp(-k2 * (t - tm))),
    // time of falling through level L (L below Tm: in the second piece, else in the first)
    timeTo: (L: number) => (L < Tm ? tm + Math.log((Tm - Ta2) / (L - Ta2)) / k2 : Math.log((T0 - Ta1) / (L - Ta1)) / k1),
  };
};

// Tolerances. The runs use the engine's default tolerances (relative 1e-6): the engine's own
// comparison with the exact solution (closedForm.maxError) stays near 1e-4 K on these runs. We
// allow 1e-3 K on temperatures, and on crossing times 1e-3 K divided by the slope at the
// crossing (the time error a 1e-3 K temperature error makes), given in each check.
const TOL_T = 1e-3;

it('two-stage cooling: piecewise Newton cooling gives the times to 21 and 5 degC and the verdict', () => {
  // closed form of piecewise Newton cooling (above); the rule's limits are the US FDA Food Code
  // 2022, section 3-501.14: 57 degC to 21 degC within 2 h, to 5 degC within a total of 6 h
  const cs = cells('two-stage-cooling-check.ratebook.json');
  const cool = piecewise(57 + C, 0.5 / H, 24 + C, 0.5 * H, 0.8 / H, 3 + C);
  const r = results(cs, 'run');
  const slope = (L: number) => 0.8 / H * (L - 3); // |T'| at a level L degC in the walk-in, K/s
  near(r.t_to_stage1.si, cool.timeTo(21 + C), TOL_T / slope(21), 't to 21 degC');
  near(r.t_to_stage2.si, cool.timeTo(5 + C), TOL_T / slope(5), 't to 5 degC');
  near(r.T_at_stage1.si, cool.at(2 * H), TOL_T, 'T at 2 h');
  near(r.T_at_total.si, cool.at(6 * H), TOL_T, 'T at 6 h');
  // the verdict, from the Food Code limits applied to the closed form
  const v = values(cs, 'verdict');
  const stage1 = cool.at(2 * H) <= 21 + C, stage2 = cool.at(6 * H) <= 5 + C;
  assert.equal(v.stage1_ok.value, stage1 ? 1 : 0);
  assert.equal(v.stage2_ok.value, stage2 ? 1 : 0);
  assert.equal(v.passes.value, stage1 && stage2 ? 1 : 0);
  assert.equal(v.passes.value, 1, 'the demo pan passes');
  assert.equal((v.passes as Q & { truth?: boolean }).truth, true, 'the verdict is a yes/no value');
  near(v.margin_stage1.si, 21 + C - cool.at(2 * H), TOL_T, 'margin at 2 h');
});

it('two-stage cooling: a slower walk-in (deep pot) fails, and the verdict holds when a level is never reached', () => {
  // piecewise Newton cooling closed form; limits of the US FDA Food Code 2022, section 3-501.14
  for (const kCold of [0.4, 0.1]) {
    const cs = evaluate(setParam(load('two-stage-cooling-check.ratebook.json'), 'k_cold', `${kCold} / h`));
    const cool = piecewise(57 + C, 0.5 / H, 24 + C, 0.5 * H, kCold / H, 3 + C);
    assert.ok(cool.at(2 * H) > 21 + C, 'the closed form fails the first stage');
    const v = values(cs, 'verdict');
    assert.ok(byId(cs, 'verdict').ok);
    assert.equal(v.stage1_ok.value, 0, `k_cold ${kCold}`);
    assert.equal(v.stage2_ok.value, cool.at(6 * H) <= 5 + C ? 1 : 0, `k_cold ${kCold}`);
    assert.equal(v.passes.value, 0, `k_cold ${kCold}`);
    near(results(cs, 'run').T_at_stage1.si, cool.at(2 * H), TOL_T, 'T at 2 h');
    if (cool.at(8 * H) > 5 + C) assert.equal(results(cs, 'run').t_to_stage2.notReached, true); // 8 h: the run's end
  }
});

it('stock pot: bench then walk-in, t_21, t_5 and T_6h against piecewise Newton cooling', () => {
  // closed form of piecewise Newton cooling, k = 0.55/h, 74 degC, 22 degC bench, walk-in 3 degC after 30 min
  const cool = piecewise(74 + C, 0.55 / H, 22 + C, 0.5 * H, 0.55 / H, 3 + C);
  const r = results(cells('cooling-stock-pot.ratebook.json'), 'run');
  const slope = (L: number) => 0.55 / H * (L - 3);
  near(r.t_21.si, cool.timeTo(21 + C), TOL_T / slope(21), 't_21');
  near(r.t_5.si, cool.timeTo(5 + C), TOL_T / slope(5), 't_5');
  near(r.T_6h.si, cool.at(6 * H), TOL_T, 'T_6h');
});

it('water tank heater: attractor at T* = Ta + P/UA, T(t) = T* + (T0 - T*) exp(-UA t / (m c))', () => {
  // heat balance m c T' = P - UA (T - Ta), closed form (first-order linear ODE, common practice)
  const m = 150, c = 4180, P = 3000, UA = 40, Ta = 18 + C, T0 = 12 + C;
  const Ts = Ta + P / UA, tau = (m * c) / UA;
  const exact = (t: number) => Ts + (T0 - Ts) * Math.exp(-t / tau);
  const cs = cells('heating-constant-power.ratebook.json');
  const eq = byId(cs, 'settle').equilibria as Array<Q & { stability: string; slope: Q }>;
  assert.equal(eq.length, 1);
  near(eq[0].si, Ts, 1e-9 * Ts, 'T*');
  assert.equal(eq[0].stability, 'attractor');
  near(eq[0].slope.si, -UA / (m * c), 1e-9 * UA / (m * c), 'slope at T*');
  const r = results(cs, 'run');
  const tTarget = tau * Math.log((T0 - Ts) / (60 + C - Ts));
  near(r.t_target.si, tTarget, TOL_T / ((Ts - 60 - C) / tau), 'time to 60 degC');
  near(r.T_4h.si, exact(4 * H), TOL_T, 'T at 4 h');
  near(r.T_end.si, exact(12 * H), TOL_T, 'T at 12 h');
  // the whole curve
  const s = byId(cs, 'run').series as { t: number[]; T: number[] };
  assert.ok(s.t.length > 5);
  s.t.forEach((t, i) => near(s.T[i], exact(t), TOL_T, `T at ${t} s`));
  // the closed-form values the template shows
  const v = values(cs, 'tank');
  near(v.T_star.si, Ts, 1e-9 * Ts, 'T_star');
  near(v.t_target_closed.si, tTarget, 1e-9 * tTarget, 't_target_closed');
});

// Convection plus radiation: m c T' = -h A (T - Ta) - eps sigma A (T^4 - Tsur^4), in kelvin.
const SIGMA = 5.670374419e-8; // Stefan-Boltzmann constant, W m^-2 K^-4 (CODATA 2018, exact in the 2019 SI to these digits)
const part = { m: 2, c: 460, A: 0.05, h: 15, eps: 0.8, Ta: 25 + C, Tsur: 25 + C, T0: 600 + C };
const heatLoss = (T: number, eps = part.eps) => part.h * part.A * (T - part.Ta) + eps * SIGMA * part.A * (T ** 4 - part.Tsur ** 4);
/** t = integral from T down to T0 of m c dT / loss(T), composite Simpson with n intervals (independent of the engine). */
const timeToReach = (T: number, eps = part.eps, n = 20000) => {
  const f = (x: number) => (part.m * part.c) / heatLoss(x, eps);
  const dx = (part.T0 - T) / n;
  let s = f(T) + f(part.T0);
  for (let i = 1; i < n; i++) s += (i % 2 ? 4 : 2) * f(T + i * dx);
  return (s * dx) / 3;
};
/** Classical RK4 with fixed steps, 0.05 s for 30 min (independent of the engine). */
const rk4 = (tEnd: number, steps = 36000) => {
  const f = (T: number) => -heatLoss(T) / (part.m * part.c);
  const dt = tEnd / steps;
  let T = part.T0;
  for (let i = 0; i < steps; i++) {
    const k1 = f(T), k2 = f(T + (dt / 2) * k1), k3 = f(T + (dt / 2) * k2), k4 = f(T + dt * k3);
    T += (dt / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
  }
  return T;
};

it('convection plus radiation: crossing times against an independent quadrature, T(30 min) against RK4', () => {
  // separable ODE: t(T) = integral of m c dT / (h A (T - Ta) + eps sigma A (T^4 - Tsur^4)) (common practice);
  // Simpson with 20000 intervals and RK4 with 0.05 s steps are accurate far below the tolerances
  const cs = cells('convection-radiation-cooling.ratebook.json');
  const r = results(cs, 'run');
  const slope = (T: number) => heatLoss(T) / (part.m * part.c);
  near(r.t_300.si, timeToReach(300 + C), TOL_T / slope(300 + C), 't to 300 degC');
  near(r.t_handle.si, timeToReach(50 + C), TOL_T / slope(50 + C), 't to 50 degC');
  near(r.T_30min.si, rk4(1800), TOL_T, 'T at 30 min');
  // radiation as an equivalent coefficient: h_r = eps sigma (T^4 - Tsur^4) / (T - Tsur) (Incropera & DeWitt, eq. 1.9)
  const hr = (part.eps * SIGMA * (part.T0 ** 4 - part.Tsur ** 4)) / (part.T0 - part.Tsur);
  near(values(cs, 'part').h_rad0.si, hr, 1e-9 * hr, 'h_rad0');
});

it('convection plus radiation: the part settles at Ta when Tsur = Ta, with the linearised slope', () => {
  // T = Ta zeroes both terms; d(rate)/dT there is -(h A + 4 eps sigma A Ta^3) / (m c)
  // (linearised radiation coefficient 4 eps sigma T^3, Incropera & DeWitt, eq. 1.9 with T = Tsur)
  const eq = byId(cells('convection-radiation-cooling.ratebook.json'), 'settle').equilibria as Array<Q & { stability: string; slope: Q }>;
  assert.equal(eq.length, 1);
  near(eq[0].si, part.Ta, 1e-6, 'equilibrium');
  assert.equal(eq[0].stability, 'attractor');
  const b = -(part.h * part.A + 4 * part.eps * SIGMA * part.A * part.Ta ** 3) / (part.m * part.c);
  near(eq[0].slope.si, b, 1e-6 * Math.abs(b), 'slope');
});

it('convection plus radiation: T^4 uses the kelvin scale whatever the state unit, and eps = 0 is Newton cooling', () => {
  // with eps = 0: t = m c / (h A) ln((T0 - Ta) / (T - Ta)) (Newton cooling closed form)
  const doc0 = setParam(load('convection-radiation-cooling.ratebook.json'), 'eps', '0');
  const r0 = results(evaluate(doc0), 'run');
  const tau = (part.m * part.c) / (part.h * part.A);
  const tNewton = tau * Math.log((part.T0 - part.Ta) / (25));
  near(r0.t_handle.si, tNewton, TOL_T / (25 / tau), 't to 50 degC with eps = 0');
  near(timeToReach(50 + C, 0), tNewton, 1e-6 * tNewton, 'the quadrature itself, eps = 0');
  // the same study with the state shown in degF or K gives the same physical times
  // (study format: results do not depend on the temperature scale of the inputs)
  const expected = timeToReach(50 + C);
  for (const unit of ['degF', 'K']) {
    const doc = load('convection-radiation-cooling.ratebook.json');
    doc.cells.find((c) => c.id === 'cooling')!.unit = unit;
    near(results(evaluate(doc), 'run').t_handle.si, expected, TOL_T / (heatLoss(50 + C) / (part.m * part.c)), `t to 50 degC, state in ${unit}`);
  }
});

it('lumped capacitance: Bi = h (V/A) / k_solid, lumped_ok, and the crossing against T = Ta + (T0 - Ta) e^{-t/tau}', () => {
  // Biot number with Lc = V/A and the lumped criterion Bi < 0.1, time constant rho c V / (h A):
  // Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, sections 5.1-5.2
  const D = 0.02, rho = 7800, c = 460, k = 40, h = 100, T0 = 200 + C, Ta = 25 + C;
  const Lc = D / 6; // sphere: (pi D^3 / 6) / (pi D^2), by hand
  const Bi = (h * Lc) / k;
  const tau = (rho * c * Lc) / h;
  const cs = cells('lumped-capacitance-check.ratebook.json');
  const v = values(cs, 'check');
  near(v.Bi.si, Bi, 1e-12, 'Bi');
  near(v.Bi.si, 0.02 / 6 * 100 / 40, 1e-12, 'Bi by hand: 100 x (0.02/6) / 40 = 0.008333');
  assert.equal(v.lumped_ok.value, Bi < 0.1 ? 1 : 0);
  assert.equal(v.lumped_ok.value, 1);
  near(v.tau.si, tau, 1e-9 * tau, 'tau');
  const r = results(cs, 'run');
  const t50 = tau * Math.log((T0 - Ta) / (50 + C - Ta));
  near(r.t_target.si, t50, TOL_T / (25 / tau), 'time to 50 degC');
  near(r.T_2min.si, Ta + (T0 - Ta) * Math.exp(-120 / tau), TOL_T, 'T at 2 min');
});

it('lumped capacitance: a larger ball or a poor conductor fails the Bi < 0.1 rule', () => {
  // Incropera & DeWitt, section 5.2: the lumped model is acceptable for Bi < 0.1
  const cases: Array<[string, string, number]> = [
    ['D', '300 mm', (100 * (0.3 / 6)) / 40], // Bi = 0.125
    ['k_solid', '0.2 W / (m K)', (100 * (0.02 / 6)) / 0.2], // a polymer ball: Bi = 1.67
  ];
  for (const [name, value, Bi] of cases) {
    const v = values(evaluate(setParam(load('lumped-capacitance-check.ratebook.json'), name, value)), 'check');
    near(v.Bi.si, Bi, 1e-12 * Math.max(1, Bi), `Bi with ${name} = ${value}`);
    assert.ok(Bi > 0.1);
    assert.equal(v.lumped_ok.value, 0, `${name} = ${value}`);
  }
});
