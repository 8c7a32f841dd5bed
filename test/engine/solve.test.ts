// The solve cell against closed forms: a dose (linear scaling), a dosing interval
// (superposition), a flow (flushing a tank), a level reached twice (the Bateman function), and
// its refusals, each on its field.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { openStudy, type CellReport, type ReportOf, type StudySession } from '../../src/index.ts';
import { near } from './helpers.ts';

const HOUR = 3600;

/** A one-compartment IV bolus regimen: n doses every tau, C' = -k C, the level at the end of the run. Invented numbers. */
function regimen(o: { dose?: string; V?: string; k?: string; tau?: string; n?: number; to?: string } = {}) {
  return {
    format: 'ratebook-study', version: 1, title: 'regimen',
    cells: [
      { id: 'p', kind: 'parameters', items: [
        { name: 'dose', value: o.dose ?? '1000 mg' }, { name: 'V', value: o.V ?? '50 L' },
        { name: 'k', value: o.k ?? '0.1 / h' }, { name: 'tau', value: o.tau ?? '12 h' }] },
      { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: o.to ?? `${(o.n ?? 8) * 12} h`,
        events: [{ at: '0 h', every: 'tau', count: o.n ?? 8, add: { C: 'dose / V' } }],
        find: [{ name: 'trough', valueOf: 'C', at: o.to ?? `${(o.n ?? 8) * 12} h` }] },
    ] as object[],
  };
}

function open(doc: unknown): StudySession {
  const o = openStudy(structuredClone(doc));
  assert.ok(o.ok, o.ok ? '' : o.error.message);
  return o.session;
}

function solveOf(doc: { cells: object[] }, solve: object): ReportOf<'solve'> {
  const s = open({ ...doc, cells: [...doc.cells, { id: 's', kind: 'solve', ...solve }] });
  return s.report().cells.find((c) => c.id === 's') as ReportOf<'solve'>;
}

function ok(r: CellReport): void {
  assert.ok(r.ok, JSON.stringify(r.error));
}

describe('solve: closed forms', () => {
  it('a dose: the trough of a bolus regimen is linear in the dose, so the dose is target / trough per unit dose', () => {
    const r = solveOf(regimen(), { vary: { parameter: 'dose', as: 'dose_new', min: '100 mg', max: '5000 mg' }, target: { value: 'trough', equals: '12.5 mg/L' } });
    ok(r);
    // closed form (superposition of first-order decays): trough per mg = (1/V) Σ_j exp(-k (96 h - 12 h j)), j = 0..7
    let perMg = 0;
    for (let j = 0; j < 8; j++) perMg += Math.exp(-0.1 * (96 - 12 * j)) / 50; // mg/L per mg
    near(r.solution!.value, 12.5 / perMg, 1e-5, 'dose (mg)');
    assert.equal(r.solution!.unit, 'mg');
    near(r.achieved!.value, 12.5, 1e-9, 'achieved');
    assert.deepEqual(r.solutions!.map((q) => q.si), [r.solution!.si]);
  });

  it('roundTo: the dose rounded to a multiple of 250 mg, and the trough at that dose (linear: target × rounded / exact)', () => {
    const r = solveOf(regimen(), { vary: { parameter: 'dose', as: 'dose_new', min: '100 mg', max: '5000 mg', roundTo: '250 mg' }, target: { value: 'trough', equals: '12.5 mg/L' } });
    ok(r);
    const exact = r.solution!.value;
    assert.equal(r.rounded!.value, Math.round(exact / 250) * 250); // hand-worked: 1450.2 mg rounds to 1500 mg
    assert.equal(r.rounded!.value, 1500);
    near(r.achievedRounded!.value, 12.5 * 1500 / exact, 1e-5, 'trough at the rounded dose');
  });

  it('an interval: the trough after 20 doses, C = (D/V) e^{-kτ}(1 - e^{-20kτ})/(1 - e^{-kτ}), solved for τ', () => {
    const doc = regimen({ n: 20, to: '20 * tau', dose: '500 mg', V: '40 L' });
    (doc.cells[2] as { find: object[] }).find = [{ name: 'trough', valueOf: 'C', at: '20 * tau' }];
    const r = solveOf(doc, { vary: { parameter: 'tau', as: 'tau_new', min: '4 h', max: '36 h' }, target: { value: 'trough', equals: '2 mg/L' } });
    ok(r);
    const tau = r.solution!.value;
    assert.equal(r.solution!.unit, 'h');
    // closed form (superposition of 20 doses, read just before the 21st)
    const x = Math.exp(-0.1 * tau);
    const trough = (500 / 40) * x * (1 - x ** 20) / (1 - x);
    near(trough, 2, 1e-5, 'closed-form trough at the solved interval');
    // the steady-state form (n → ∞) gives the same τ to within e^{-20kτ} (hand-worked: τ ≈ 14.5 h, e^{-29} ≈ 2.5e-13)
    const steady = (500 / 40) * x / (1 - x);
    near(steady, 2, 1e-5, 'steady-state trough');
  });

  it('a flow: the flow that flushes a tank to 1% in 1 h is Q = V ln 100 / 1 h; where 1% is not reached within the run the target has no value, and that stretch is reported', () => {
    const doc = {
      format: 'ratebook-study', version: 1, title: 'flushing (invented numbers)',
      cells: [
        { id: 'p', kind: 'parameters', items: [{ name: 'V', value: '2 m^3' }, { name: 'Q', value: '10 m^3 / h' }] },
        { id: 'tank', kind: 'rate', state: 'c', unit: 'g / L', rate: '-Q / V * c', initial: '1 g / L' },
        { id: 'run', kind: 'simulate', rates: ['tank'], from: '0 h', to: '2 h', find: [{ name: 't_1pct', crossing: 'c', level: '0.01 g / L', direction: 'down' }] },
      ],
    };
    const r = solveOf(doc, { vary: { parameter: 'Q', as: 'Q_new', min: '1 m^3 / h', max: '20 m^3 / h' }, target: { value: 't_1pct', equals: '1 h' } });
    ok(r);
    // closed form: c = c0 e^{-Q t / V}, so t = V/Q ln 100
    near(r.solution!.value, 2 * Math.log(100) / 1, 1e-6, 'Q (m^3/h)');
    // below Q = V ln 100 / 2 h the level is not reached within the 2 h run (closed form: 4.605 m^3/h)
    assert.equal(r.undefinedIn?.length, 1);
    const gap = r.undefinedIn![0];
    assert.equal(gap.from.value, 1);
    near(gap.to.value, 2 * Math.log(100) / 2, 1e-5, 'edge of the stretch without a value');
    assert.match(gap.reason, /not reached/);
    assert.match(r.message!, /no value for Q from 1 m\^3 \/ h to 4\.60/);
  });

  it('a level reached twice (oral absorption, the Bateman function): both times are found, the smallest defined, or the one nearest the guess', () => {
    // C(t) = D ka / (V (ka - k)) (e^{-k t} - e^{-ka t}); invented numbers
    const doc = {
      format: 'ratebook-study', version: 1, title: 'oral dose',
      cells: [
        { id: 'p', kind: 'parameters', items: [{ name: 'ka', value: '1 / h' }, { name: 'k', value: '0.2 / h' }, { name: 'tq', value: '2 h' }] },
        { id: 'gut', kind: 'rate', state: 'A', unit: 'mg', rate: '-ka * A', initial: '500 mg' },
        { id: 'blood', kind: 'rate', state: 'C', unit: 'mg / L', rate: 'ka * A / (50 L) - k * C', initial: '0 mg / L' },
        { id: 'run', kind: 'simulate', rates: ['gut', 'blood'], from: '0 h', to: '24 h', find: [{ name: 'Cq', valueOf: 'C', at: 'tq' }] },
      ],
    };
    const bateman = (t: number) => (500 * 1) / (50 * (1 - 0.2)) * (Math.exp(-0.2 * t) - Math.exp(-1 * t));
    const tmax = Math.log(1 / 0.2) / (1 - 0.2); // closed form: tmax = ln(ka/k) / (ka - k) = 2.012 h
    const level = 4;
    const rootOf = (lo: number, hi: number) => { // bisection on the closed form
      for (let i = 0; i < 200; i++) { const m = (lo + hi) / 2; if ((bateman(m) - level) * (bateman(lo) - level) <= 0) hi = m; else lo = m; }
      return (lo + hi) / 2;
    };
    const early = rootOf(0, tmax), late = rootOf(tmax, 24);
    const r = solveOf(doc, { vary: { parameter: 'tq', as: 't_level', min: '0.1 h', max: '24 h' }, target: { value: 'Cq', equals: `${level} mg/L` } });
    ok(r);
    assert.equal(r.solutions!.length, 2);
    near(r.solutions![0].value, early, 1e-5, 'rising');
    near(r.solutions![1].value, late, 1e-5, 'falling');
    near(r.solution!.value, early, 1e-5, 'the smallest is defined');
    const g = solveOf(doc, { vary: { parameter: 'tq', as: 't_level', min: '0.1 h', max: '24 h', guess: '10 h' }, target: { value: 'Cq', equals: `${level} mg/L` } });
    near(g.solution!.value, late, 1e-5, 'the one nearest the guess');

    // two solutions closer together than the grid (24 intervals of 1 h): found through the dip of |C - level|
    const high = bateman(tmax) - 0.01;
    const r2 = solveOf(doc, { vary: { parameter: 'tq', as: 't_level', min: '0 h', max: '24 h' }, target: { value: 'Cq', equals: `${high} mg/L` } });
    ok(r2);
    assert.equal(r2.solutions!.length, 2, JSON.stringify(r2.solutions));
    assert.ok(r2.solutions![1].value - r2.solutions![0].value < 1, 'both within one grid interval');
    for (const q of r2.solutions!) near(bateman(q.value), high, 1e-5, 'closed form at each');
  });

  it('choices: the trough at each interval of a list, and the interval whose trough is nearest the target', () => {
    const doc = regimen({ n: 20, to: '20 * tau', dose: '500 mg', V: '40 L' });
    (doc.cells[2] as { find: object[] }).find = [{ name: 'trough', valueOf: 'C', at: '20 * tau' }];
    const r = solveOf(doc, { vary: { parameter: 'tau', as: 'tau_new', choices: ['6 h', '8 h', '12 h', '24 h'] }, target: { value: 'trough', equals: '4 mg/L' } });
    ok(r);
    const closed = (tau: number) => { const x = Math.exp(-0.1 * tau); return 12.5 * x * (1 - x ** 20) / (1 - x); };
    assert.equal(r.choices!.length, 4);
    for (const c of r.choices!) near(c.achieved!.value, closed(c.value.value), 1e-5, `trough at ${c.value.value} h (superposition)`);
    // hand-worked from the closed form: 6 h → 15.2, 8 h → 10.2, 12 h → 5.39, 24 h → 1.25 mg/L; 4 mg/L is nearest 5.39 (12 h)
    const chosen = r.choices!.filter((c) => c.chosen);
    assert.equal(chosen.length, 1);
    assert.equal(chosen[0].value.value, 12);
    assert.equal(r.solution!.value, 12);
    assert.equal(r.evaluations, 4);
  });

  it('the solved name is defined downstream, and a solve can read another (a what-if inside a what-if)', () => {
    // linear: dose_new = 12.5 mg/L · V / S with S = Σ e^{-k(96 - 12j)}; so dose_new = 1500 mg at V = 1500 S / 12.5
    let S = 0;
    for (let j = 0; j < 8; j++) S += Math.exp(-0.1 * (96 - 12 * j));
    const doc = regimen();
    doc.cells.push(
      { id: 'a', kind: 'solve', vary: { parameter: 'dose', as: 'dose_new', min: '100 mg', max: '5000 mg' }, target: { value: 'trough', equals: '12.5 mg/L' } },
      { id: 'b', kind: 'solve', vary: { parameter: 'V', as: 'V_for', min: '10 L', max: '200 L' }, target: { value: 'dose_new', equals: '1500 mg' } },
      { id: 'q', kind: 'parameters', items: [{ name: 'per_kg', value: 'dose_new / (70 kg)' }] },
    );
    const s = open(doc);
    const b = s.report().cells.find((c) => c.id === 'b') as ReportOf<'solve'>;
    ok(b);
    near(b.solution!.value, 1500 * S / 12.5, 1e-5, 'V (L)');
    const q = s.report().cells.find((c) => c.id === 'q') as ReportOf<'parameters'>;
    ok(q);
    near(q.values!.per_kg.si, (12.5 / (S / 50)) * 1e-6 / 70, 1e-5, 'dose_new / 70 kg');
  });
});

describe('solve: refusals, each on its field', () => {
  const base = regimen();
  const tryIt = (vary: object, target: object = { value: 'trough', equals: '12.5 mg/L' }) => solveOf(base, { vary: { parameter: 'dose', as: 'dose_new', ...vary }, target });

  it('no solution in range: the message gives the target\'s range (linear: trough per mg × min and × max)', () => {
    const r = tryIt({ min: '100 mg', max: '500 mg' });
    assert.equal(r.ok, false);
    assert.equal(r.error!.path, 'cells[3].target.equals');
    let perMg = 0;
    for (let j = 0; j < 8; j++) perMg += Math.exp(-0.1 * (96 - 12 * j)) / 50;
    near(r.targetRange!.low.value, 100 * perMg, 1e-5, 'low');
    near(r.targetRange!.high.value, 500 * perMg, 1e-5, 'high');
    assert.match(r.error!.message, /^no dose from 100 mg to 500 mg gives trough = 12\.5 mg \/ L: over that range trough runs from 0\.862 mg \/ L \(at 100 mg\) to 4\.31 mg \/ L \(at 500 mg\)/);
  });

  it('min >= max', () => {
    const r = tryIt({ min: '5000 mg', max: '100 mg' });
    assert.equal(r.error!.path, 'cells[3].vary.min');
    assert.match(r.error!.message, /min \(5000 mg\) must be below max \(100 mg\)/);
  });

  it('a bound, a rounding step or a wanted value of the wrong dimension: a unit error on that field', () => {
    let r = tryIt({ min: '100 mL', max: '5000 mg' });
    assert.deepEqual([r.error!.path, r.error!.kind], ['cells[3].vary.min', 'unit']);
    r = tryIt({ min: '100 mg', max: '5000 mg', roundTo: '1 h' });
    assert.deepEqual([r.error!.path, r.error!.kind], ['cells[3].vary.roundTo', 'unit']);
    r = tryIt({ min: '100 mg', max: '5000 mg' }, { value: 'trough', equals: '12 mg' });
    assert.deepEqual([r.error!.path, r.error!.kind], ['cells[3].target.equals', 'unit']);
    assert.match(r.error!.message, /the target is mass concentration \(8\.62 mg \/ L\), so the value it must equal must be too; 12 mg is mass/);
  });

  it('a target that does not depend on the varied parameter says so', () => {
    const r = tryIt({ min: '100 mg', max: '5000 mg' }, { value: 'k * 1 h', equals: '0.2' });
    assert.equal(r.error!.path, 'cells[3].target.value');
    assert.match(r.error!.message, /does not depend on dose: "k" is not computed from it/);
  });

  it('a wanted value that changes with the varied parameter', () => {
    const r = tryIt({ min: '100 mg', max: '5000 mg' }, { value: 'trough', equals: 'dose / V' });
    assert.equal(r.error!.path, 'cells[3].target.equals');
    assert.match(r.error!.message, /reads "dose", which changes with dose: move it into the target/);
  });

  it('a varied name that is an answer, not a parameter', () => {
    const r = solveOf(base, { vary: { parameter: 'trough', as: 'x', min: '1 mg/L', max: '2 mg/L' }, target: { value: 'trough * 2', equals: '3 mg/L' } });
    assert.equal(r.error!.path, 'cells[3].vary.parameter');
    assert.match(r.error!.message, /only parameters and the initial values of states can be replaced/);
  });

  it('both a range and choices; roundTo with choices; a missing max', () => {
    let r = tryIt({ min: '100 mg', choices: ['1 g'] });
    assert.equal(r.error!.path, 'cells[3].vary.min');
    assert.match(r.error!.message, /either min and max, or choices/);
    r = tryIt({ choices: ['1 g'], roundTo: '1 mg' });
    assert.equal(r.error!.path, 'cells[3].vary.roundTo');
    r = tryIt({ min: '100 mg' });
    assert.equal(r.error!.path, 'cells[3].vary.max');
  });
});

describe('solve: when it runs again', () => {
  it('a change upstream of its target that leaves the target\'s present value unchanged still re-runs it', () => {
    const doc = regimen();
    doc.cells.push({ id: 's', kind: 'solve', vary: { parameter: 'dose', as: 'dose_new', min: '100 mg', max: '5000 mg' }, target: { value: 'trough', equals: '12.5 mg/L' } });
    const s = open(doc);
    const law = { ...(doc.cells[1] as object), rate: '-k * C * 1' };
    const r = s.apply({ type: 'replace', cell: law as never });
    assert.ok(r.ok);
    assert.ok(r.rerun.includes('s'), `re-ran: ${r.rerun.join(', ')}`);
  });
});

describe('solve: property', () => {
  it('random linear one-compartment regimens: solve for the dose, run with it, and the trough is the target to the run\'s tolerance', () => {
    fc.assert(fc.property(
      fc.double({ min: 0.02, max: 0.5, noNaN: true }), // k, 1/h
      fc.double({ min: 5, max: 200, noNaN: true }), // V, L
      fc.integer({ min: 1, max: 10 }), // doses
      fc.constantFrom(4, 6, 8, 12, 24), // interval, h
      fc.double({ min: 0.05, max: 0.95, noNaN: true }), // where the target lies between the troughs at min and max
      (k, V, n, tau, share) => {
        const to = n * tau;
        const doc = regimen({ k: `${k} / h`, V: `${V} L`, n, tau: `${tau} h`, to: `${to} h` });
        // the target: the trough (superposition) at a dose between 10 mg and 10 g
        let perMg = 0;
        for (let j = 0; j < n; j++) perMg += Math.exp(-k * (to - tau * j)) / V;
        const target = perMg * (10 + share * (10000 - 10));
        doc.cells.push({ id: 's', kind: 'solve', vary: { parameter: 'dose', as: 'dose_new', min: '10 mg', max: '10 g' }, target: { value: 'trough', equals: `${target} mg / L` } });
        const s = open(doc);
        const r = s.report().cells[3] as ReportOf<'solve'>;
        assert.ok(r.ok, JSON.stringify(r.error));
        // run with the solved dose written into the study
        const p = structuredClone(doc.cells[0]) as { id: string; items: Array<{ name: string; value: string }> };
        p.items[0].value = `${r.solution!.si * 1e6} mg`;
        const e = s.apply({ type: 'replace', cell: p as never });
        assert.ok(e.ok);
        const run = e.report.cells[2] as ReportOf<'simulate'>;
        const trough = (run.results!.trough as { si: number }).si;
        // the run's relative tolerance is 1e-6; a few tolerances of slack for the two runs
        near(trough, target * 1e-3, 1e-5, 'trough with the solved dose');
      },
    ), { numRuns: 25 });
  });
});
