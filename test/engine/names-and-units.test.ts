// Study names spelled like units. A state's name hides a unit only where states can be read
// (rate laws, event amounts, the state a question names); any other study name hides it
// everywhere. Warnings only for the trades' common units; errors on a field that reads such
// a name say so, with the unit's other spelling.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { openStudy, type CellReport, type Report } from '../../src/index.ts';
import { otherSpelling } from '../../src/units/spellings.ts';
import { isCommonUnit } from '../../src/units/common.ts';
import { near, reportOf as studyReport, cell } from './helpers.ts';

type Q = { value: number; unit: string; si: number };

const reportOf = (cells: unknown[]): Report => studyReport({ format: 'ratebook-study', version: 1, title: 'names and units', cells });

const values = (c: CellReport) => c.values as Record<string, Q>;
const results = (c: CellReport) => c.results as Record<string, Q>;

/** |a - b| within `units` tolerance units of rtol and atol (the simulate tests' measure). */
function withinTolerance(actual: number, exact: number, rtol: number, atol: number, units = 10, what = '') {
  const err = Math.abs(actual - exact) / (atol + rtol * Math.abs(exact));
  assert.ok(err <= units, `${what}: ${actual} vs exact ${exact}: ${err.toFixed(2)} tolerance units`);
}

describe('a tank level h beside hours', () => {
  // A tank flushed in proportion to its level: h' = -k h, with a top-up of 0.2 m at 1 h
  // repeated every 12 h (so once in an 8 h run).
  const cells: Array<Record<string, unknown>> = [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.9 / h' }, { name: 'hold', value: '2 h + 30 min' }, { name: 'tau', value: '1 / k', range: ['0.5 h', '3 h'] }] },
    { id: 'tank', kind: 'rate', title: 'Tank level', state: 'h', unit: 'm', rate: '-k * h', initial: '1.5 m' },
    { id: 'run', kind: 'simulate', rates: ['tank'], from: '0 h', to: '8 h', step: '0.01 h',
      events: [{ at: '1 h', every: '12 h', add: { h: '0.2 m' } }],
      find: [
        { name: 'h_end', valueOf: 'h', at: '8 h' },
        { name: 'h_half', valueOf: 'h', at: '0.5 h' },
        { name: 't_low', crossing: 'h', level: '0.5 m', direction: 'down', from: '1 h' },
      ] },
    { id: 'use', kind: 'parameters', items: [{ name: 'late', value: 't_low + 1 h' }] },
  ];
  const report = reportOf(cells);

  it('every cell computes, with no error', () => {
    assert.equal(report.ok, true, JSON.stringify(report.cells.filter((c) => !c.ok).map((c) => c.error ?? c.errors)));
  });

  it('parameters read h as hours', () => {
    const v = values(cell(report, 'p'));
    // hand-worked: 0.9 / h = 0.9 / 3600 s = 2.5e-4 / s
    near(v.k.si, 2.5e-4);
    // hand-worked: 2 h + 30 min = 9000 s
    near(v.hold.si, 9000);
    // hand-worked: 1 / (2.5e-4 / s) = 4000 s; the range 0.5 h .. 3 h = 1800 s .. 10800 s
    near(v.tau.si, 4000);
    near((v.tau as unknown as { range: Q[] }).range[0].si, 1800);
    near((v.tau as unknown as { range: Q[] }).range[1].si, 10800);
  });

  it('the run lasts 8 hours and the top-up lands at 1 h, once', () => {
    const run = cell(report, 'run');
    const t = (run.series as { t: number[] }).t;
    // hand-worked: 8 h = 28800 s
    assert.equal(t[0], 0);
    near(t[t.length - 1], 28800);
    const k = 2.5e-4;
    // closed form: h(t) = 1.5 e^{-kt} before the top-up
    withinTolerance(results(run).h_half.si, 1.5 * Math.exp(-k * 1800), 1e-6, 1.5e-9, 10, 'h(0.5 h)');
    // closed form: h(8 h) = (1.5 e^{-k 3600} + 0.2) e^{-k 7 * 3600}; the next top-up (13 h) is after the end
    const h8 = (1.5 * Math.exp(-k * 3600) + 0.2) * Math.exp(-k * 7 * 3600);
    withinTolerance(results(run).h_end.si, h8, 1e-6, 1.5e-9, 10, 'h(8 h)');
    // closed form: after the top-up h = h1 e^{-k (t - 3600)} falls to 0.5 m at t = 3600 + ln(h1 / 0.5) / k
    const h1 = 1.5 * Math.exp(-k * 3600) + 0.2;
    near(results(run).t_low.si, 3600 + Math.log(h1 / 0.5) / k, 1e-5, 't_low');
    assert.equal(results(run).t_low.unit, 'h');
  });

  it('a cell below reads the answer, and 1 h there is an hour', () => {
    const v = values(cell(report, 'use'));
    // hand-worked: t_low + 3600 s
    near(v.late.si, results(cell(report, 'run')).t_low.si + 3600);
  });

  it('the rate law still reads the state h', () => {
    const tank = cell(report, 'tank');
    // hand-worked: -k h at the start = -2.5e-4 / s * 1.5 m = -3.75e-4 m/s = -1.35 m/h
    near((tank.rateAtStart as Q).si, -3.75e-4);
    assert.equal((tank.rateAtStart as Q).unit, 'm / h');
    near((tank.rateAtStart as Q).value, -1.35);
  });

  it('warns once, about the rate law, in plain words with the title', () => {
    const about = report.warnings.filter((w) => w.includes('"h"'));
    assert.equal(about.length, 1, JSON.stringify(report.warnings));
    assert.match(about[0], /the state "h" of "Tank level" hides the unit h in the rate law of "Tank level": there h is the state; for hours write hour/);
    assert.ok(!about[0].includes('cells['), about[0]);
  });

  it('an event amount still sees the state (and is refused for reading it)', () => {
    const r = reportOf([cells[0], cells[1], { ...cells[2], events: [{ at: '1 h', add: { h: '0.1 * h' } }] }]);
    const run = cell(r, 'run');
    assert.equal(run.ok, false);
    assert.equal(run.error?.path, 'cells[2].events[0].add.h');
    assert.match(run.error!.message, /cannot read "h"/);
  });

  it('a state whose name is not a unit is still refused in a time field, on that field', () => {
    const r = reportOf([
      { id: 'law', kind: 'rate', state: 'level', unit: 'm', rate: '-level / (2 h)', initial: '1 m' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '8 h', events: [{ at: 'level / (1 m / h)', add: { level: '1 m' } }] },
    ]);
    const run = cell(r, 'run');
    assert.equal(run.error?.path, 'cells[1].events[0].at');
    assert.match(run.error!.message, /"level" is the state of rate cell "law": it changes with time, so it can be read only in rate laws and event amounts/);
  });
});

describe('a state s beside seconds', () => {
  // s' = -k s with k = 0.5 / s: s(t) = s0 e^{-kt}
  const cells = (rate: string) => [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / s' }] },
    { id: 'law', kind: 'rate', state: 's', unit: 'mg / L', rate, initial: '10 mg / L' },
    { id: 'run', kind: 'simulate', rates: ['law'], from: '0 s', to: '2 s', find: [{ name: 's_end', valueOf: 's', at: '2 s' }] },
  ];

  it('2 s in a time field is two seconds', () => {
    const report = reportOf(cells('-k * s'));
    assert.equal(report.ok, true, JSON.stringify(report.cells.filter((c) => !c.ok).map((c) => c.error)));
    const run = cell(report, 'run');
    const t = (run.series as { t: number[] }).t;
    near(t[t.length - 1], 2);
    // closed form: 10 mg/L * e^{-0.5 * 2} = 3.6788 mg/L = 3.6788e-3 kg/m^3
    withinTolerance(results(run).s_end.si, 10e-3 * Math.exp(-1), 1e-6, 1e-11, 10, 's(2 s)');
  });

  it('in the rate law s is the state, and an error there says how to write seconds', () => {
    const report = reportOf(cells('-s / (4 s)'));
    const law = cell(report, 'law');
    assert.equal(law.error?.path, 'cells[1].rate');
    assert.match(law.error!.message, /here s is the state defined at cells\[1\]\.state; for seconds write second/);
  });

  it('the same law with second computes', () => {
    const report = reportOf(cells('-s / (4 second)'));
    // hand-worked: -10 mg/L / 4 s = -2.5 mg/(L s) = -2.5e-3 kg/(m^3 s)
    near((cell(report, 'law').rateAtStart as Q).si, -2.5e-3);
    // closed form: 10 mg/L * e^{-2 / 4} = 6.0653 mg/L
    withinTolerance(results(cell(report, 'run')).s_end.si, 10e-3 * Math.exp(-0.5), 1e-6, 1e-11, 10, 's(2 s)');
  });
});

describe('a parameter h (a heat-transfer coefficient) hides hours everywhere', () => {
  const cells = (to: string) => [
    { id: 'p', kind: 'parameters', items: [{ name: 'A', value: '0.8 m^2' }, { name: 'h', value: '25 W / (m^2 K)' }] },
    { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-h * A / (4000 J / K) * (T - 20 degC)', initial: '80 degC' },
    { id: 'run', kind: 'simulate', rates: ['law'], from: '0 s', to, find: [{ name: 'T_end', valueOf: 'T', at: to }] },
  ];

  it('a time written 2 h fails, and the error says h is the parameter and how to write hours', () => {
    const report = reportOf(cells('2 h'));
    const run = cell(report, 'run');
    assert.equal(run.ok, false);
    assert.equal(run.error?.path, 'cells[2].to');
    assert.match(run.error!.message, /must be a time/);
    assert.match(run.error!.message, /\(here h is the parameter defined at cells\[0\]\.items\[1\]; for hours write hour\)$/);
  });

  it('the hint follows its definer when that cell moves, without re-running the failed cell', () => {
    const o = openStudy({ format: 'ratebook-study', version: 1, title: 'moves', cells: [
      { id: 'note', kind: 'note', text: 'a note above the parameters' }, ...cells('2 h'),
    ] });
    assert.ok(o.ok);
    if (!o.ok) return;
    assert.match(o.session.report().cells[3].error!.message, /defined at cells\[1\]\.items\[1\]/);
    const moved = o.session.apply({ type: 'move', id: 'note', to: 2 });
    assert.ok(moved.ok);
    if (!moved.ok) return;
    assert.deepEqual(moved.rerun, []);
    assert.match(moved.report.cells[3].error!.message, /defined at cells\[0\]\.items\[1\]; for hours write hour/);
  });

  it('written 2 hour, it runs two hours', () => {
    const report = reportOf(cells('2 hour'));
    const run = cell(report, 'run');
    assert.equal(run.ok, true, JSON.stringify(run.error));
    const t = (run.series as { t: number[] }).t;
    // hand-worked: 2 hour = 7200 s
    near(t[t.length - 1], 7200);
    // closed form (Newton cooling): T = 20 degC + 60 K e^{-hA/C t}, hA/C = 25 * 0.8 / 4000 = 0.005 / s
    withinTolerance(results(run).T_end.si, 293.15 + 60 * Math.exp(-0.005 * 7200), 1e-6, 1e-6 * 353.15 * 1e-3, 10, 'T(2 h)');
  });

  it('is warned about, as it hides a common unit', () => {
    const report = reportOf(cells('2 hour'));
    const w = report.warnings.filter((x) => x.includes('"h"'));
    assert.equal(w.length, 1, JSON.stringify(report.warnings));
    assert.match(w[0], /the name "h" \(cell "p", cells\[0\]\.items\[1\]\) hides the unit h: in this study h means that value everywhere; for hours write hour/);
  });
});

describe('warnings only where they matter', () => {
  it('a study with T and C gives no tesla or coulomb warning', () => {
    const report = reportOf([
      { id: 'p', kind: 'parameters', items: [{ name: 'V', value: '42 L' }, { name: 'dose', value: '500 mg' }, { name: 'k', value: '0.2 / h' }, { name: 'Ta', value: '20 degC' }] },
      { id: 'drug', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: 'dose / V' },
      { id: 'cool', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '60 degC' },
      { id: 'run', kind: 'simulate', rates: ['drug', 'cool'], from: '0 h', to: '12 h', find: [{ name: 'C6', valueOf: 'C', at: '6 h' }] },
    ]);
    assert.equal(report.ok, true);
    assert.deepEqual(report.warnings, []);
    // closed form: C(6 h) = 500 mg / 42 L * e^{-1.2} = 3.5857 mg/L
    withinTolerance(results(cell(report, 'run')).C6.si, 500 / 42 * 1e-3 * Math.exp(-1.2), 1e-6, 1e-11, 10, 'C(6 h)');
  });

  it('a state C read as a unit in a parameter: the parameter computes coulombs, and an error there says so', () => {
    const report = reportOf([
      { id: 'drug', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-C / (2 h)', initial: '5 mg / L' },
      { id: 'p', kind: 'parameters', items: [{ name: 'q', value: '3 C' }, { name: 'bad', value: 'C + 1 mg / L' }] },
    ]);
    const p = cell(report, 'p');
    // hand-worked: 3 coulomb = 3 A s
    near(values(p).q.si, 3);
    const bad = p.error!;
    assert.equal(bad.path, 'cells[1].items[1].value');
    assert.match(bad.message, /here C is coulombs, not the state defined at cells\[0\]\.state: a state is read only in rate laws and event amounts/);
  });

  it('an error that is no matter of units (a division by zero) gets no hint', () => {
    const report = reportOf([
      { id: 'p', kind: 'parameters', items: [{ name: 'V', value: '0 L' }, { name: 'C0', value: '500 mg / V' }] },
    ]);
    const p = cell(report, 'p');
    assert.equal(p.error?.path, 'cells[0].items[1].value');
    assert.match(p.error!.message, /is infinite/);
    assert.ok(!p.error!.message.includes('here V'), p.error!.message);
  });

  it('a parameter L (a pipe length) hides litres everywhere, with a warning; liter still means litres', () => {
    const report = reportOf([
      { id: 'p', kind: 'parameters', title: 'Pipe', items: [{ name: 'L', value: '2 m' }, { name: 'stretch', value: '3 L' }, { name: 'vol', value: '3 liter' }] },
    ]);
    const v = values(cell(report, 'p'));
    // hand-worked: 3 * 2 m = 6 m; 3 liter = 3e-3 m^3
    near(v.stretch.si, 6);
    assert.equal(v.stretch.unit, 'm');
    near(v.vol.si, 3e-3);
    assert.deepEqual(report.warnings, ['the name "L" ("Pipe", cells[0].items[0]) hides the unit L: in this study L means that value everywhere; for liters write liter']);
  });

  it('a state m (a mass) is warned about only when a state field writes it', () => {
    const quiet = reportOf([
      { id: 'law', kind: 'rate', state: 'm', unit: 'kg', rate: '-0.1 kg / h', initial: '2 kg' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '5 h', find: [{ name: 'm_end', valueOf: 'm', at: '5 h' }] },
    ]);
    assert.deepEqual(quiet.warnings, []);
    // hand-worked: 2 kg - 0.1 kg/h * 5 h = 1.5 kg
    withinTolerance(results(cell(quiet, 'run')).m_end.si, 1.5, 1e-6, 2e-9, 10, 'm(5 h)');
    const loud = reportOf([{ id: 'law', kind: 'rate', state: 'm', unit: 'kg', rate: '-m / (10 h)', initial: '2 kg' }]);
    assert.equal(loud.warnings.length, 1);
    assert.match(loud.warnings[0], /the state "m" of cell "law" hides the unit m in the rate law of cell "law": there m is the state; for meters write meter/);
  });
});

describe('the lists behind the messages', () => {
  it('common units are the ones these trades write (common practice)', () => {
    for (const u of ['h', 'min', 's', 'd', 'L', 'mL', 'g', 'mg', 'kg', 'm', 'K', 'degC', 'degF', 'W', 'J', 'mol', 'Pa', 'bar']) assert.ok(isCommonUnit(u), u);
    for (const u of ['T', 'C', 'V', 'A', 'S', 'F', 'H', 'N']) assert.ok(!isCommonUnit(u), u);
  });

  it('other spellings come from the unit table', () => {
    assert.deepEqual(otherSpelling('h'), { word: 'hour', plural: 'hours' });
    assert.deepEqual(otherSpelling('s'), { word: 'second', plural: 'seconds' });
    assert.deepEqual(otherSpelling('min'), { word: 'minute', plural: 'minutes' });
    assert.deepEqual(otherSpelling('L'), { word: 'liter', plural: 'liters' });
    assert.deepEqual(otherSpelling('mg'), { word: 'milligram', plural: 'milligrams' });
    assert.deepEqual(otherSpelling('mL'), { word: 'milliliter', plural: 'milliliters' });
    assert.deepEqual(otherSpelling('d'), { word: 'day', plural: 'days' });
    assert.deepEqual(otherSpelling('K'), { word: 'kelvin' });
    assert.equal(otherSpelling('Pa'), undefined);
    assert.equal(otherSpelling('not_a_unit'), undefined);
  });
});
