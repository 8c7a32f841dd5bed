import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { main, type Io } from '../../src/cli/cli.ts';

const root = fileURLToPath(new URL('../../', import.meta.url));

function run(argv: string[], files: Record<string, string> = {}) {
  let out = '';
  let err = '';
  const io: Io = {
    out: (t) => { out += t; },
    err: (t) => { err += t; },
    read: (p) => {
      if (p in files) return files[p];
      const e = new Error('ENOENT') as NodeJS.ErrnoException;
      e.code = 'ENOENT';
      throw e;
    },
  };
  const code = main(argv, io);
  return { code, out, err };
}

const good = JSON.stringify({
  format: 'ratebook-study', version: 1, title: 'Two inputs',
  cells: [{ id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.35 / h' }, { name: 'V', value: '42 L' }] }],
});
const bad = JSON.stringify({
  format: 'ratebook-study', version: 1, title: 'One bad cell',
  cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.35 / h' }] },
    { id: 'q', kind: 'parameters', items: [{ name: 'x', value: 'k + 1 m' }] },
  ],
});

describe('ratebook run', () => {
  it('prints the JSON report of the contract and exits 0 when every cell is ok', () => {
    const r = run(['run', 'good.json', '--json'], { 'good.json': good });
    assert.equal(r.code, 0);
    const report = JSON.parse(r.out);
    assert.equal(report.ok, true);
    // contract example: k = 0.35 / h is { value: 0.35, unit: "1 / h", si: 9.7222e-5 }
    assert.deepEqual(report.cells[0].values.k, { value: 0.35, unit: '1 / h', si: 0.35 / 3600 });
    assert.deepEqual(report.cells[0].values.V, { value: 42, unit: 'L', si: 0.042 });
  });

  it('prints a readable table without --json', () => {
    const r = run(['run', 'good.json'], { 'good.json': good });
    assert.equal(r.code, 0);
    assert.match(r.out, /^Two inputs\n/);
    assert.match(r.out, /\[ok\] p \(parameters\)/);
    assert.match(r.out, /k {2,}0\.35 \/h/);
    assert.match(r.out, /All 1 cells are ok\./);
    // the sheet's TeX is for the app's printed sheet: the command line's table never lists it
    assert.doesNotMatch(r.out, /tex\./);
    assert.doesNotMatch(run(['run', 'bad.json'], { 'bad.json': bad }).out, /tex\./);
  });

  it('exits 1 and names the cell and path when a cell has an error', () => {
    const r = run(['run', 'bad.json', '--json'], { 'bad.json': bad });
    assert.equal(r.code, 1);
    const report = JSON.parse(r.out);
    assert.equal(report.cells[0].ok, true);
    assert.equal(report.cells[1].error.path, 'cells[1].items[0].value');
    assert.match(report.cells[1].error.message, /cannot add rate \(per time\)/);
    const table = run(['run', 'bad.json'], { 'bad.json': bad });
    assert.match(table.out, /\[ERROR\] q \(parameters\)\n {4}cells\[1\]\.items\[0\]\.value: /);
  });

  it('exits 2 with one line when the file is missing or not a study', () => {
    const missing = run(['run', 'nope.json']);
    assert.equal(missing.code, 2);
    assert.equal(missing.err, 'ratebook: cannot read nope.json: no such file\n');
    const notStudy = run(['run', 'x.json'], { 'x.json': '{"format":"spreadsheet"}' });
    assert.equal(notStudy.code, 2);
    assert.match(notStudy.err, /not a readable study \(at format\)/);
    const garbage = run(['check', 'g.json'], { 'g.json': '\u0000\u0001 not json' });
    assert.equal(garbage.code, 2);
    assert.match(garbage.err, /not valid JSON/);
  });

  it('refuses unknown commands and options with the usage', () => {
    assert.equal(run(['simulate', 'a.json']).code, 2);
    assert.equal(run(['run', 'a.json', '--fast']).code, 2);
    assert.equal(run(['check', 'a.json', '--series']).code, 2);
    assert.equal(run([]).code, 2);
    const help = run(['--help']);
    assert.equal(help.code, 0);
    assert.match(help.out, /usage: ratebook run/);
  });
});

describe('ratebook check', () => {
  it('validates without running and uses the same exit status', () => {
    assert.equal(run(['check', 'good.json'], { 'good.json': good }).code, 0);
    assert.equal(run(['check', 'bad.json'], { 'bad.json': bad }).code, 1);
  });
});

describe('the installed command', () => {
  it('runs from npx straight after install, with no build step', () => {
    const r = spawnSync('npx', ['--no-install', 'ratebook', 'run', 'examples/mixed-units-prep.ratebook.json', '--json'], { cwd: root, encoding: 'utf8', timeout: 60_000 });
    assert.equal(r.status, 0, r.stderr);
    const report = JSON.parse(r.stdout);
    assert.equal(report.title, 'Brine batch and chiller loop: inputs in mixed units');
    // hand-worked: 2.35 L / (250 mL/min) = 9.4 min
    assert.equal(report.cells.find((c: { id: string }) => c.id === 'loop').values.tau.si, 564);
  });
});

describe('ratebook run --series', () => {
  it('adds each simulation\'s time series in SI, and leaves it out otherwise', () => {
    const study = JSON.stringify({ format: 'ratebook-study', version: 1, title: 's', cells: [
      { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-C / (2 h)', initial: '8 mg / L' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '4 h' },
    ] });
    const withSeries = JSON.parse(run(['run', 's.json', '--json', '--series'], { 's.json': study }).out);
    const series = withSeries.cells[1].series;
    assert.equal(series.t[0], 0);
    assert.equal(series.t[series.t.length - 1], 4 * 3600);
    assert.equal(series.C.length, series.t.length);
    // C(4 h) = 8 mg/L e^{-2} = 8e-3 kg/m^3 * 0.135335 (exponential decay, common practice)
    assert.ok(Math.abs(series.C[series.C.length - 1] - 8e-3 * Math.exp(-2)) < 1e-9);
    const without = JSON.parse(run(['run', 's.json', '--json'], { 's.json': study }).out);
    assert.equal(without.cells[1].series, undefined);
  });
});

describe('ratebook run: a solve cell', () => {
  // invented numbers: the level after 4 doses of D every 6 h into x' = -0.2/h x, read at 24 h
  const study = JSON.stringify({
    format: 'ratebook-study', version: 1, title: 'Solve',
    cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'D', value: '2 g' }, { name: 'k', value: '0.2 / h' }] },
      { id: 'law', kind: 'rate', state: 'x', unit: 'g / L', rate: '-k * x', initial: '0 g / L' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '24 h', events: [{ at: '0 h', every: '6 h', count: 4, add: { x: 'D / (10 L)' } }], find: [{ name: 'low', valueOf: 'x', at: '24 h' }] },
      { id: 's', kind: 'solve', vary: { parameter: 'D', as: 'D_new', min: '0.1 g', max: '10 g', roundTo: '0.5 g' }, target: { value: 'low', equals: '0.1 g / L' } },
    ],
  });
  // closed form: x(24 h) = (D / 10 L) Σ_{j=0..3} e^{-0.2 (24 - 6 j)}, so D = 0.1 g/L · 10 L / Σ
  const sum = [0, 1, 2, 3].reduce((s, j) => s + Math.exp(-0.2 * (24 - 6 * j)), 0);
  const exact = 1 / sum;

  it('prints the solution, what it gives, the rounded value and the runs, as text and in --json', () => {
    const text = run(['run', 's.json'], { 's.json': study });
    assert.equal(text.code, 0);
    assert.match(text.out, /\[ok\] s \(solve\)/);
    const json = run(['run', 's.json', '--json'], { 's.json': study });
    const s = JSON.parse(json.out).cells[3];
    // the table shows the solution to the digits its accuracy supports (5 at the default tolerance), each one the closed form's
    assert.equal(s.digits, 5);
    assert.match(text.out, new RegExp(`solution +${exact.toPrecision(s.digits).replace('.', '\\.')} g`));
    assert.match(text.out, /rounded +2\.5 g/); // hand-worked: 2.339 g to the nearest 0.5 g
    assert.ok(Math.abs(s.solution.value - exact) <= 1e-5 * exact);
    assert.equal(s.rounded.value, 2.5);
    assert.ok(s.evaluations > 0);
  });
});

describe('a fit in the table', () => {
  // The decay C = C0·e^(−k·t) through three invented levels (exact at k = 0.2 /h, C0 10 mg/L),
  // fitted as a Bayesian estimate and as least squares: each says the digits it vouches for.
  const levels = [[1, 10 * Math.exp(-0.2)], [4, 10 * Math.exp(-0.8)], [9, 10 * Math.exp(-1.8)]];
  const fit = (id: string, extra: Record<string, unknown>) => ({
    id, kind: 'fit', rates: ['drug'], data: 'levels', time: 't', observe: { C: 'C' },
    estimate: [
      { parameter: 'k', as: `k_${id}`, guess: '0.1 / h', ...(extra.error ? { prior: { median: '0.15 / h', omega: 0.5 } } : {}) },
      { parameter: 'C', as: `C0_${id}`, guess: '8 mg / L' }],
    ...extra,
  });
  const doc = JSON.stringify({ format: 'ratebook-study', version: 1, title: 'Fits', cells: [
    { id: 'levels', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: levels },
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.2 / h' }] },
    { id: 'drug', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '10 mg / L' },
    fit('ls', {}),
    fit('map', { error: { additive: '0.1 mg / L', proportional: 0.05 } }),
  ] });

  it('prints each fit\'s digits in words beside the number the JSON report gives', () => {
    const text = run(['run', 'f.json'], { 'f.json': doc });
    const json = JSON.parse(run(['run', 'f.json', '--json'], { 'f.json': doc }).out);
    assert.equal(text.code, 0, text.out);
    for (const at of [3, 4]) {
      const digits = json.cells[at].digits;
      assert.ok(Number.isInteger(digits) && digits >= 6, `cell ${at}: ${digits}`);
      const block = text.out.split('\n\n').find((b) => b.includes(`] ${json.cells[at].id} (fit)`))!;
      assert.match(block, new RegExp(`\\n    digits +${digits} \\(significant digits of every estimate the fit vouches for\\)\\n`));
    }
  });
});
