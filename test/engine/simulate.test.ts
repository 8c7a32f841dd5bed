// The simulate cell against closed-form solutions. Errors are measured in tolerance units,
// |numeric - exact| / (atol + rtol |exact|), or against the known size of a crossing error.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { runStudy, type Report, type CellReport } from '../../src/index.ts';

type Q = { value: number; unit: string; si: number };

function simulate(cells: unknown[]): CellReport {
  const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells });
  assert.ok(r.ok, r.ok ? '' : r.error.message);
  const report = (r as { report: Report }).report;
  const run = report.cells.find((c) => c.kind === 'simulate')!;
  assert.ok(run.ok, JSON.stringify(run.error ?? report.cells.find((c) => !c.ok)?.error));
  return run;
}
const results = (c: CellReport) => c.results as Record<string, Q>;

/** |a - b| within `units` tolerance units of rtol and atol. */
function withinTolerance(actual: number, exact: number, rtol: number, atol: number, units = 10, what = '') {
  const err = Math.abs(actual - exact) / (atol + rtol * Math.abs(exact));
  assert.ok(err <= units, `${what}: ${actual} vs exact ${exact}: ${err.toFixed(2)} tolerance units`);
}

describe('Newton cooling', () => {
  // T(t) = Ta + (T0 - Ta) e^{-kt} (Newton's law of cooling, textbook common practice);
  // crossing time t = ln((T0 - Ta) / (T - Ta)) / k
  const cells = (extra: Record<string, unknown> = {}) => [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.8 / h' }, { name: 'Ta', value: '4 degC' }] },
    { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '74 degC' },
    { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '10 h', ...extra, find: [
      { name: 't21', crossing: 'T', level: '21 degC', direction: 'down' },
      { name: 'T3', valueOf: 'T', at: '3 h' },
      { name: 'tmin', timeOfMinimum: 'T' },
      { name: 'never', crossing: 'T', level: '2 degC' },
    ] },
  ];

  it('finds the crossing time and values to the tolerance', () => {
    const run = simulate(cells());
    const r = results(run);
    const k = 0.8 / 3600;
    const exactT = Math.log(70 / 17) / k;
    // a state error of e at the crossing moves it by e / |T'|; T' = -k (21 - 4) K
    withinTolerance(r.t21.si, exactT, 1e-6, 1e-6 * 347 * 1e-3 / (k * 17), 10, 't21');
    assert.equal(r.t21.unit, 'h');
    withinTolerance(r.T3.si, 277.15 + 70 * Math.exp(-k * 3 * 3600), 1e-6, 1e-6 * 347.15 * 1e-3, 10, 'T(3 h)');
    assert.equal(r.T3.unit, 'degC');
    assert.equal(r.tmin.si, 36000);
  });

  it('says "not reached" with the run\'s end, and the name is not defined downstream', () => {
    const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [...cells(), { id: 'use', kind: 'parameters', items: [{ name: 'x', value: 'never * 2' }] }] });
    assert.ok(r.ok);
    if (!r.ok) return;
    const never = (r.report.cells[2].results as Record<string, any>).never;
    assert.equal(never.notReached, true);
    assert.match(never.message, /not reached: no T crossing 2 degC by the end of the run \(10 h\)/);
    assert.match(r.report.cells[3].error!.message, /waits on cell "run": "never" was not reached: no T crossing 2 degC/);
    const cs = cells();
    (cs[2] as Record<string, unknown>).find = [{ name: 'low', crossing: 'T', level: '-40 degC', direction: 'down' }];
    const down = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: cs });
    assert.ok(down.ok);
    if (!down.ok) return;
    assert.match((down.report.cells[2].results as Record<string, any>).low.message, /not reached: no T falling through -40 degC by the end/);
  });

  it('reports the closed form beside the numeric run, with the numeric error', () => {
    const run = simulate(cells());
    const cf = (run.closedForm as Record<string, any>).T;
    // time constant 1/k = 1.25 h; half-life ln 2 / k = 0.866434 h (first-order kinetics, common practice)
    assert.ok(Math.abs(cf.timeConstant.value - 1.25) < 1e-9);
    assert.ok(Math.abs(cf.halfLife.value - Math.LN2 / 0.8) < 1e-9);
    assert.ok(Math.abs(cf.equilibrium.si - 277.15) < 1e-9);
    assert.equal(cf.stable, true);
    assert.ok(cf.maxErrorInTolerances < 10, `${cf.maxErrorInTolerances}`);
  });

  it('gives the same answers from Fahrenheit inputs', () => {
    const f = cells();
    (f[0] as any).items[1].value = '39.2 degF';
    (f[1] as any).initial = '165.2 degF';
    const a = results(simulate(cells())).t21.si;
    const b = results(simulate(f)).t21.si;
    assert.ok(Math.abs(a - b) < 1e-6 * a, `${a} vs ${b}`);
  });

  it('lets a user compare with a hand calculation: Euler with a fixed step', () => {
    // explicit Euler on T' = -k (T - Ta): T_n - Ta = (T0 - Ta)(1 - k h)^n (hand-worked recurrence)
    const run = simulate(cells({ method: 'euler', step: '0.5 h' }));
    const euler = 277.15 + 70 * Math.pow(1 - 0.8 * 0.5, 6);
    assert.ok(Math.abs(results(run).T3.si - euler) < 1e-9, `${results(run).T3.si} vs ${euler}`);
    assert.equal(run.method, 'euler');
    assert.equal(run.steps, 20);
  });
});

describe('repeated IV bolus', () => {
  // one compartment, dose D every tau: trough after n doses
  //   C_n = (D/V) e^{-k tau} (1 - e^{-n k tau}) / (1 - e^{-k tau})   (geometric series; common practice)
  const D = 500, V = 30, k = 0.1, tau = 8;
  const trough = (n: number) => (D / V) * Math.exp(-k * tau) * (1 - Math.exp(-n * k * tau)) / (1 - Math.exp(-k * tau));
  const peak = (n: number) => (D / V) * (1 - Math.exp(-n * k * tau)) / (1 - Math.exp(-k * tau));
  const run = simulate([
    { id: 'p', kind: 'parameters', items: [{ name: 'dose', value: '500 mg' }, { name: 'V', value: '30 L' }, { name: 'k', value: '0.1 / h' }, { name: 'MIC', value: '10 mg / L' }] },
    { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
    { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '48 h', tolerance: { relative: 1e-8 },
      events: [{ at: '0 h', every: '8 h', count: 6, add: { C: 'dose / V' } }],
      find: [
        { name: 'before6', valueOf: 'C', at: '39.999999 h' },
        { name: 'at6', valueOf: 'C', at: '40 h' },
        { name: 'end', valueOf: 'C', at: '48 h' },
        { name: 'Cmax', maximum: 'C' },
        { name: 'Cmin_last', minimum: 'C', from: '40 h', to: '48 h' },
        { name: 'auc', integralOf: 'C', from: '0 h', to: '48 h' },
        { name: 'above', timeAbove: 'C', level: 'MIC' },
        { name: 'below', timeBelow: 'C', level: 'MIC' },
        { name: 'up1', crossing: 'C', level: 'MIC', direction: 'up' },
        { name: 'up2', crossing: 'C', level: 'MIC', direction: 'up', occurrence: 2 },
        { name: 'down1', crossing: 'C', level: 'MIC', direction: 'down' },
      ] },
  ]);
  const r = results(run);
  const mgL = 1e-3; // 1 mg/L = 1e-3 kg/m^3

  it('gives the trough before a dose and the jump at the dose time exactly', () => {
    withinTolerance(r.before6.si, trough(5) * Math.exp(k * 1e-6) * mgL, 1e-8, 1e-12, 10, 'trough 5');
    withinTolerance(r.at6.si, peak(6) * mgL, 1e-8, 1e-12, 10, 'peak 6 at the dose time');
    withinTolerance(r.end.si, trough(6) * mgL, 1e-8, 1e-12, 10, 'trough 6');
    withinTolerance(r.Cmax.si, peak(6) * mgL, 1e-8, 1e-12, 10, 'Cmax');
    withinTolerance(r.Cmin_last.si, trough(6) * mgL, 1e-8, 1e-12, 10, 'Cmin');
  });

  it('integrates the area under the curve', () => {
    // AUC(0, 48 h) = sum over doses of (D/V)/k (1 - e^{-k (48 - t_i)})  (integral of each exponential)
    let auc = 0;
    for (let i = 0; i < 6; i++) auc += (D / V) / k * (1 - Math.exp(-k * (48 - 8 * i)));
    withinTolerance(r.auc.si, auc * mgL * 3600, 1e-8, 1e-9, 10, 'AUC');
    assert.equal(r.auc.unit, 'mg * h / L');
  });

  it('adds up the time above and below a level from the crossings', () => {
    // C > 10 mg/L from each dose until (D/V peak_i) e^{-k s} = 10: s_i = ln(peak_i / 10) / k
    let above = 0;
    for (let n = 1; n <= 6; n++) if (peak(n) > 10) above += Math.min(8, Math.log(peak(n) / 10) / k);
    withinTolerance(r.above.si / 3600, above, 1e-6, 1e-6, 10, 'time above');
    assert.ok(Math.abs(r.above.si + r.below.si - 48 * 3600) < 1e-6);
    // troughs: 7.49 mg/L before the second dose, then 10.85 and up (geometric series above), so
    // C rises through 10 mg/L at the first dose (a jump at t = 0) and at the second (t = 8 h)
    assert.equal(r.up1.si, 0);
    assert.equal(r.up2.si, 8 * 3600);
    withinTolerance(r.down1.si / 3600, Math.log(peak(1) / 10) / k, 1e-6, 1e-6, 10, 'first fall below');
  });
});

describe('other laws with closed forms', () => {
  it('a constant-rate infusion approaches R / (k V)', () => {
    // C(t) = R/(kV) (1 - e^{-kt}) during a zero-order infusion (common practice)
    const run = simulate([
      { id: 'p', kind: 'parameters', items: [{ name: 'R', value: '50 mg / h' }, { name: 'V', value: '20 L' }, { name: 'k', value: '0.25 / h' }] },
      { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '40 h', events: [{ at: '0 h', for: '30 h', infuse: { C: 'R / V' } }],
        find: [{ name: 'C10', valueOf: 'C', at: '10 h' }, { name: 'C30', valueOf: 'C', at: '30 h' }, { name: 'C40', valueOf: 'C', at: '40 h' }] },
    ]);
    const r = results(run);
    const css = 50 / (0.25 * 20);
    withinTolerance(r.C10.si, css * (1 - Math.exp(-2.5)) * 1e-3, 1e-6, 1e-12, 10, 'C(10 h)');
    const c30 = css * (1 - Math.exp(-7.5));
    withinTolerance(r.C30.si, c30 * 1e-3, 1e-6, 1e-12, 10, 'C(30 h)');
    withinTolerance(r.C40.si, c30 * Math.exp(-2.5) * 1e-3, 1e-6, 1e-12, 10, 'C(40 h), after the infusion stops');
  });

  it('the logistic law reaches half its capacity at ln(K/y0 - 1)/r', () => {
    // y(t) = K / (1 + (K/y0 - 1) e^{-rt}) (Verhulst; common practice)
    const run = simulate([
      { id: 'law', kind: 'rate', state: 'N', unit: 'g / L', rate: '0.9 / d * N * (1 - N / (12 g / L))', initial: '0.1 g / L' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 d', to: '20 d', find: [{ name: 'half', crossing: 'N', level: '6 g / L' }] },
    ]);
    const exact = Math.log(12 / 0.1 - 1) / 0.9;
    assert.ok(Math.abs(results(run).half.si / 86400 - exact) < 1e-5 * exact, `${results(run).half.value} vs ${exact}`);
    assert.equal(run.closedForm, undefined);
  });

  it('a state that starts at zero: a linear law gets its true rate constant, a nonlinear one no exact solution', () => {
    // Regression: the linearity probe used the start value as its scale, so from zero every law looked
    // linear with rate constant 0. Filling a mixed tank: C' = Q/V (Cin - C), rate constant -Q/V (closed form).
    const filling = simulate([
      { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '0.2 / h * (5 mg / L - C)', initial: '0 mg / L' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '10 h' },
    ]);
    const cf = filling.closedForm!.C;
    assert.ok(Math.abs(cf.rateConstant.value + 0.2) < 1e-12, `${cf.rateConstant.value}`);
    assert.ok((filling.closedForm as Record<string, { maxErrorInTolerances: number }>).C.maxErrorInTolerances < 10);
    // falling from rest with quadratic drag: v' = g - c v|v| is not linear in v (common practice)
    const falling = simulate([
      { id: 'law', kind: 'rate', state: 'v', unit: 'm / s', rate: 'gravity - 0.004 / m * v * abs(v)', initial: '0 m / s' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 s', to: '60 s' },
    ]);
    assert.equal(falling.closedForm, undefined);
  });

  it('a state without a unit (a fraction remaining, unit "1") decays and crosses its level', () => {
    // first-order decay of a fraction: f = 2^(-t / t_half), so f = 0.3 at t_half log2(1/0.3) (closed form)
    const run = simulate([
      { id: 'law', kind: 'rate', state: 'f', unit: '1', rate: '-log(2) / (5700 year) * f', initial: '1' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 year', to: '20000 year', find: [{ name: 'age', crossing: 'f', level: '0.3' }] },
    ]);
    const age = results(run).age;
    assert.equal(age.unit, 'year');
    assert.ok(Math.abs(age.value - 5700 * Math.log2(1 / 0.3)) < 1e-6 * age.value, `${age.value}`);
  });

  it('a tank draining through an orifice empties in finite time (Torricelli)', () => {
    // h' = -c sqrt(h): sqrt(h) = sqrt(h0) - c t / 2, empty at t = 2 sqrt(h0) / c (separation of variables)
    const run = simulate([
      { id: 'law', kind: 'rate', state: 'h', unit: 'm', rate: '-0.02 m^0.5 / s * sqrt(max(h, 0 m))', initial: '2 m' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 s', to: '200 s', find: [{ name: 'half', crossing: 'h', level: '0.5 m' }, { name: 'almost', crossing: 'h', level: '1 mm' }] },
    ]);
    const r = results(run);
    const c = 0.02, h0 = 2;
    withinTolerance(r.half.si, 2 * (Math.sqrt(h0) - Math.sqrt(0.5)) / c, 1e-6, 1e-6, 10, 'half height');
    withinTolerance(r.almost.si, 2 * (Math.sqrt(h0) - Math.sqrt(1e-3)) / c, 1e-5, 1e-5, 10, 'nearly empty');
  });

  it('two coupled states: oral absorption peaks at ln(ka/k)/(ka - k)', () => {
    // Bateman function; tmax = ln(ka/k)/(ka - k) (common practice)
    const run = simulate([
      { id: 'p', kind: 'parameters', items: [{ name: 'ka', value: '1.2 / h' }, { name: 'k', value: '0.15 / h' }, { name: 'V', value: '40 L' }] },
      { id: 'gut', kind: 'rate', state: 'A', unit: 'mg', rate: '-ka * A', initial: '400 mg' },
      { id: 'plasma', kind: 'rate', state: 'C', unit: 'mg / L', rate: 'ka * A / V - k * C', initial: '0 mg / L' },
      { id: 'run', kind: 'simulate', rates: ['plasma'], from: '0 h', to: '24 h', find: [{ name: 'tmax', timeOfMaximum: 'C' }, { name: 'Cmax', maximum: 'C' }] },
    ]);
    const r = results(run);
    const ka = 1.2, k = 0.15;
    const tmax = Math.log(ka / k) / (ka - k);
    assert.ok(Math.abs(r.tmax.si / 3600 - tmax) < 1e-4, `${r.tmax.value} vs ${tmax}`);
    const cmax = (400 / 40) * ka / (ka - k) * (Math.exp(-k * tmax) - Math.exp(-ka * tmax));
    withinTolerance(r.Cmax.si, cmax * 1e-3, 1e-6, 1e-12, 10, 'Cmax');
  });
});

describe('schedules', () => {
  it('a parameter set by an event changes the law from that time on', () => {
    const run = simulate([
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '1 / h' }, { name: 'Ta', value: '20 degC' }] },
      { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '80 degC' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '3 h', events: [{ at: '1 h', set: { Ta: '0 degC' } }], find: [{ name: 'T3', valueOf: 'T', at: '3 h' }] },
    ]);
    // hand-worked: T(1 h) = 20 + 60/e; then T(3 h) = (20 + 60/e) e^{-2}
    withinTolerance(results(run).T3.si - 273.15, (20 + 60 / Math.E) * Math.exp(-2), 1e-6, 1e-3, 10, 'T(3 h)');
  });

  it('refuses a set on a name the law only reads through a derived value', () => {
    const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'Ta', value: '20 degC' }, { name: 'Tb', value: 'Ta + 1 K' }] },
      { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-(T - Tb) / (1 h)', initial: '80 degC' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '3 h', events: [{ at: '1 h', set: { Ta: '0 degC' } }] },
    ] });
    assert.ok(r.ok);
    if (r.ok) assert.match(r.report.cells[2].error!.message, /reads "Tb", which is computed from "Ta"/);
  });

  it('property: events land on their scheduled times, and stable linear laws follow the closed form', () => {
    fc.assert(fc.property(
      fc.double({ min: 0.05, max: 5, noNaN: true }), fc.double({ min: -50, max: 50, noNaN: true }),
      fc.double({ min: 0, max: 100, noNaN: true }), fc.double({ min: 0.1, max: 3, noNaN: true }),
      (k, target, y0, at) => {
        // y' = -k (y - target): after 5 time constants y - target = (y0 - target) e^{-5}
        // (common practice); a jump of +10 at `at` hours shows in full right at that time
        const run = simulate([
          { id: 'law', kind: 'rate', state: 'y', unit: 'mg / L', rate: `-${k} / h * (y - (${target} mg / L))`, initial: `${y0} mg / L` },
          { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: `${5 / k + at} h`, events: [{ at: `${at} h`, add: { y: '10 mg / L' } }],
            find: [{ name: 'before', valueOf: 'y', at: `${at} h` }, { name: 'end', valueOf: 'y', at: `${5 / k + at} h` }] },
        ]);
        const r = results(run);
        const atJump = target + (y0 - target) * Math.exp(-k * at) + 10;
        const end = target + (atJump - target) * Math.exp(-5);
        const scale = Math.max(Math.abs(y0), Math.abs(target), 10);
        withinTolerance(r.before.value, atJump, 1e-6, 1e-3 * 1e-6 * scale, 20, 'value at the event');
        withinTolerance(r.end.value, end, 1e-6, 1e-3 * 1e-6 * scale, 20, 'after five time constants');
      },
    ), { numRuns: 60, seed: 20261202 });
  });
});

describe('models that misbehave say so', () => {
  const fails = (law: Record<string, unknown>, extra: Record<string, unknown> = {}) => {
    const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [
      { id: 'law', kind: 'rate', state: 'y', unit: 'm', initial: '1 m', ...law },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 s', to: '3 s', ...extra },
    ] });
    assert.ok(r.ok);
    return (r as { report: Report }).report.cells[1];
  };

  it('a finite-time blow-up stops where it happens', () => {
    // y' = y^2, y(0) = 1: y = 1 / (1 - t), singular at t = 1 (separation of variables)
    const c = fails({ rate: 'y^2 / (1 m * s)' });
    assert.equal(c.ok, false);
    assert.match(c.error!.message, /the run stopped at t = 1 s: the solution grows without bound/);
  });

  it('a rate that becomes undefined stops with the time and the state', () => {
    // y' = -sqrt(y) / s from y = 1 m reaches 0 at t = 2 s, then sqrt of a negative
    const c = fails({ rate: '-sqrt(y * 1 m) / (1 s)' });
    assert.equal(c.ok, false);
    assert.match(c.error!.message, /the run stopped at t = 2 s: the rate is not a number there/);
  });

  it('a run over its step budget says so', () => {
    const c = fails({ rate: 'sin(y / (1 m) * 1e6) * 1 m / s' }, { method: 'rk4', step: '1e-9 s', to: '1 s' });
    assert.equal(c.ok, false);
    assert.match(c.error!.message, /too small for the run/);
  });
});

describe('stiff laws', () => {
  it('auto switches to the stiff method, says so, and stays accurate', () => {
    // y' = -λ (y - cos t): after the transient y = (λ² cos t + λ sin t) / (λ² + 1) (linear ODE, common practice)
    const run = simulate([
      { id: 'law', kind: 'rate', state: 'y', unit: 'm', rate: '-10000 / s * (y - 1 m * cos(t / (1 s)))', initial: '0 m' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 s', to: '10 s', find: [{ name: 'y5', valueOf: 'y', at: '5 s' }] },
    ]);
    assert.equal(run.method, 'stiff');
    assert.ok((run.switchedToStiff as Q).si < 0.1);
    // at the default rtol 1e-6 auto starts with the Adams formulas (ADAMS_FROM_RTOL)
    assert.match(String(run.note), /switched from the Adams formulas to the stiff method/);
    const l = 1e4;
    const exact = (l * l * Math.cos(5) + l * Math.sin(5)) / (l * l + 1);
    withinTolerance(results(run).y5.si, exact, 1e-6, 1e-9, 10, 'y(5 s)');
    // budget (stated): the explicit method alone needs about 180 000 evaluations here
    assert.ok((run.evaluations as number) < 10_000, `${run.evaluations} evaluations`);
  });
});

describe('a constant-volume mixing tank', () => {
  it('approaches the inflow concentration with time constant V/Q, then flushes', () => {
    // C' = Q/V (Cin - C): C = Cin (1 - e^{-t Q/V}) while fed, then C(t1) e^{-(t - t1) Q/V}
    // (well-mixed tank mass balance; common practice)
    const run = simulate([
      { id: 'p', kind: 'parameters', items: [{ name: 'V', value: '2 m^3' }, { name: 'Q', value: '100 L / min' }, { name: 'Cin', value: '50 mg / L' }] },
      { id: 'tank', kind: 'rate', state: 'C', unit: 'mg / L', rate: 'Q / V * (Cin - C)', initial: '0 mg / L' },
      { id: 'run', kind: 'simulate', rates: ['tank'], from: '0 min', to: '180 min', events: [{ at: '60 min', set: { Cin: '0 mg / L' } }],
        find: [{ name: 'C60', valueOf: 'C', at: '60 min' }, { name: 'clean', crossing: 'C', level: '1 mg / L', direction: 'down' }] },
    ]);
    const r = results(run);
    const rate = 0.1 / 2; // per minute
    const c60 = 50 * (1 - Math.exp(-rate * 60));
    withinTolerance(r.C60.si, c60 * 1e-3, 1e-6, 1e-12, 10, 'C(60 min)');
    const clean = 60 + Math.log(c60 / 1) / rate;
    assert.ok(Math.abs(r.clean.si / 60 - clean) < 1e-4, `${r.clean.value} vs ${clean}`);
    assert.equal(r.clean.unit, 'min');
    const cf = (run.closedForm as Record<string, any>).C;
    assert.ok(Math.abs(cf.timeConstant.value - 20) < 1e-9); // V/Q = 2000 L / (100 L/min) = 20 min
  });
});

describe('what a plot and a reader get', () => {
  const run = simulate([
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.8 / h' }, { name: 'Ta', value: '4 degC' }] },
    { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '74 degC' },
    { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '6 h', events: [{ at: '3 h', set: { Ta: '0 degC' } }],
      find: [{ name: 't21', crossing: 'T', level: '21 degC', direction: 'down' }] },
  ]);

  it('samples the run in the study\'s units, with events, levels and found points', () => {
    const plot = run.plot as { timeUnit: string; t: number[]; states: Array<{ name: string; unit: string; values: number[] }>; events: Array<{ time: number }>; levels: Array<{ value: number }>; marks: Array<{ time: number; value: number }> };
    assert.equal(plot.timeUnit, 'h');
    assert.equal(plot.t[0], 0);
    assert.equal(plot.t[plot.t.length - 1], 6);
    assert.equal(plot.states[0].unit, 'degC');
    assert.ok(Math.abs(plot.states[0].values[0] - 74) < 1e-9);
    assert.deepEqual(plot.events.map((e) => e.time), [3]);
    assert.deepEqual(plot.levels.map((l) => l.value), [21]);
    // crossing time ln(70/17)/0.8 h (Newton cooling closed form, common practice) and its level
    assert.ok(Math.abs(plot.marks[0].time - Math.log(70 / 17) / 0.8) < 1e-5);
    assert.ok(Math.abs(plot.marks[0].value - 21) < 1e-6);
  });

  it('marks a trough just before a dose at the trough, not at the peak the dose makes', () => {
    // repeated IV bolus, one compartment: 100 mg / 10 L every 8 h, k = 0.1 /h (invented numbers).
    // Closed form (superposition, common practice): just before dose n+1 at n·tau,
    // C = C0 e^(-k tau) (1 - e^(-n k tau)) / (1 - e^(-k tau)); just after it, that plus C0.
    const dosed = simulate([
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.1 / h' }] },
      { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '24 h', events: [{ at: '0 h', every: '8 h', count: '3', add: { C: '10 mg / L' } }],
        find: [{ name: 'trough_2', minimum: 'C', from: '8 h', to: '16 h' }, { name: 'peak_3', maximum: 'C', from: '16 h', to: '24 h' }, { name: 'C_16', valueOf: 'C', at: '16 h' }] },
    ]);
    const marks = (dosed.plot as { marks: Array<{ name: string; time: number; value: number }> }).marks;
    const at = (name: string) => marks.find((m) => m.name === name)!;
    const r = Math.exp(-0.8);
    const before3 = 10 * r * (1 - r ** 2) / (1 - r);
    assert.equal(at('trough_2').time, 16);
    assert.ok(Math.abs(at('trough_2').value - before3) < 1e-4, `trough marked at ${at('trough_2').value}, closed form ${before3}`);
    assert.equal(at('peak_3').time, 16);
    assert.ok(Math.abs(at('peak_3').value - (before3 + 10)) < 1e-4, `peak marked at ${at('peak_3').value}`);
    // a value asked for at a dose's time is the value after it, as the answer says
    assert.ok(Math.abs(at('C_16').value - (before3 + 10)) < 1e-4);
  });

  it('says in words what happened', () => {
    assert.match(String(run.summary), /^T falls from 74 degC to [\d.]+ degC; t21 \(T falls through 21 degC\): 1\.769 h\.$/);
  });
});

describe('the words of a run that ends at zero', () => {
  it('say 0 where a value is within the absolute tolerance of zero, not its round-off', () => {
    // a gut amount given at t = 0 and absorbed with ka = 3 /h (invented numbers): after 12 h
    // 320 mg e^{-36}, 7e-14 mg, below the run's absolute tolerance (320 mg * 1e-6 * 1e-3)
    const run = simulate([
      { id: 'law', kind: 'rate', state: 'Ag', unit: 'mg', rate: '-3 / h * Ag', initial: '320 mg' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '12 h' },
    ]);
    assert.equal(String(run.summary), 'Ag falls from 320 mg to 0 mg.');
  });
});
