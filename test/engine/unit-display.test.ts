// Units in their simplest form: derived values are shown in the simplest unit of their
// dimension the study's inputs use, never in a compound of units that cancel; only the unit
// changes, never the SI value.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync, readdirSync } from 'node:fs';
import { main, type Io } from '../../src/cli/cli.ts';
import { openStudy, unitChoicesFor, type CellReport, type Report } from '../../src/index.ts';
import { unitFromText, shownIn } from '../../src/expression/unit-text.ts';
import { unitDim } from '../../src/units/units.ts';
import { sameDim } from '../../src/units/dimension.ts';
import { describe as describeQ, fromUnit } from '../../src/units/quantity.ts';

type Q = { value: number; unit: string; si: number; originalUnit?: string };
const dir = new URL('../../examples/', import.meta.url);
const examples = readdirSync(dir).filter((f) => f.endsWith('.ratebook.json')).sort();

function reportOf(study: unknown): Report {
  const o = openStudy(study);
  assert.ok(o.ok);
  return o.session.report();
}
const cell = (r: Report, id: string) => r.cells.find((c) => c.id === id)! as CellReport & Record<string, unknown>;
const values = (r: Report, id: string) => cell(r, id).values as Record<string, Q>;

/** Every `{ value, unit, si }` in a report, with where it is. */
function quantities(v: unknown, path = '', out: Array<[string, Q]> = []): Array<[string, Q]> {
  if (Array.isArray(v)) v.forEach((x, i) => quantities(x, `${path}[${i}]`, out));
  else if (v && typeof v === 'object') {
    const o = v as Record<string, unknown>;
    if (typeof o.value === 'number' && typeof o.unit === 'string' && typeof o.si === 'number') out.push([path, o as unknown as Q]);
    for (const [k, x] of Object.entries(o)) if (k !== 'plot' && k !== 'series') quantities(x, `${path}.${k}`, out);
  }
  return out;
}

/** True when some terms of the unit could be left out without changing its dimension (they cancel). */
function hasCancellingTerms(text: string): boolean {
  const unit = unitFromText(text)!;
  const whole = unitDim(unit);
  for (let mask = 1; mask < (1 << unit.length) - 1; mask++) {
    if (sameDim(unitDim(unit.filter((_, i) => mask & (1 << i))), whole)) return true;
  }
  return false;
}

describe('every template', () => {
  for (const file of examples) {
    const report = reportOf(readFileSync(new URL(file, dir), 'utf8'));
    it(`${file}: no parameter is shown in units that cancel, and each shown value is its SI value in its unit`, () => {
      for (const c of report.cells) {
        for (const [path, q] of quantities(c.values)) {
          assert.equal(hasCancellingTerms(q.unit), false, `${c.id}${path}: ${q.unit}`);
        }
        for (const [path, q] of quantities(c)) {
          const unit = unitFromText(q.unit);
          if (!unit || !Number.isFinite(q.si)) continue;
          const back = shownIn(q.si, unit);
          assert.ok(Math.abs(back - q.value) <= 1e-9 * Math.max(Math.abs(back), 1e-300), `${c.id}${path}: ${q.value} ${q.unit} vs si ${q.si}`);
        }
      }
    });
  }
});

describe('ratebook run --json on every template', () => {
  // SI values of every template's cells, written by `ratebook run --json` on main without this
  // display rule: showing a value in another unit must not change one of them.
  const before = JSON.parse(readFileSync(new URL('unit-display-si.json', import.meta.url), 'utf8')) as Record<string, Record<string, number | string>>;
  it('gives the same SI numbers, to the last bit', () => {
    assert.deepEqual(Object.keys(before).sort(), examples);
    for (const file of examples) {
      let out = '';
      const io: Io = { out: (t) => { out += t; }, err: () => {}, read: (p) => readFileSync(p, 'utf8') };
      main(['run', '--json', new URL(file, dir).pathname], io);
      const now: Record<string, number | string> = {};
      const walk = (v: unknown, path: string) => {
        if (Array.isArray(v)) v.forEach((x, i) => walk(x, `${path}[${i}]`));
        else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) {
          if (k === 'si' && typeof x === 'number') now[path] = Number.isFinite(x) ? x : String(x);
          // residualFloor is the size of a plot's axis, not a result, and came after the snapshot;
          // so did meanSE, a Monte Carlo mean's standard error (sd / sqrt(n): uncertainty-precision.test.ts),
          // and sdSE and percentiles, the SD's standard error and each percentile's interval and
          // standard uncertainty from order statistics (order-statistics.test.ts), sampling-error figures too;
          // and stretches, a run's exact solution stretch by stretch where an action changes its law
          // (closed-form-stretches.test.ts: against the closed form of two-stage Newton cooling)
          else if (k !== 'plot' && k !== 'series' && k !== 'residualFloor' && k !== 'meanSE' && k !== 'sdSE' && k !== 'percentiles' && k !== 'stretches') walk(x, `${path}.${k}`);
        }
      };
      // the cells' quantities (a later `glance` repeats some of them; the snapshot predates it)
      walk((JSON.parse(out) as { cells: unknown }).cells, '.cells');
      assert.deepEqual(now, before[file], file);
    }
  });
});

describe('hand-worked values from the templates', () => {
  it('rinse tank: V / Q = 2 m^3 / (100 L/min) = 2000 L / (100 L/min) = 20 min', () => {
    const r = reportOf(readFileSync(new URL('mixing-tank-flush.ratebook.json', dir), 'utf8'));
    const q = values(r, 'tank').residence;
    assert.deepEqual([q.value, q.unit], [20, 'min']); // hand-worked: 2000 / 100 = 20
    assert.equal(q.si, 1200); // hand-worked: 20 min = 1200 s
  });

  it('infusion: k = CL / V = 5 L/h / 50 L = 0.1 /h, and t_half = ln 2 / k in h', () => {
    const r = reportOf(readFileSync(new URL('intermittent-iv-infusion.ratebook.json', dir), 'utf8'));
    const v = values(r, 'regimen');
    assert.deepEqual([v.k.value, v.k.unit], [0.1, '1 / h']); // hand-worked: 5 / 50 = 0.1; the report keeps the contract's "1 / h"
    assert.equal(v.t_half.unit, 'h');
    assert.ok(Math.abs(v.t_half.value - Math.LN2 / 0.1) < 1e-12); // closed form: ln 2 / 0.1 = 6.931 h
  });

  it('a value before 1 / h reads /h in text for people', () => {
    assert.equal(describeQ(fromUnit(0.1, unitFromText('1 / h')!)), '0.1 /h'); // common practice
  });
});

describe('the display rule', () => {
  const study = (items: Array<{ name: string; value: string; unit?: string }>, extra: unknown[] = []) =>
    reportOf({ format: 'ratebook-study', version: 1, title: 't', cells: [{ id: 'p', kind: 'parameters', items }, ...extra] });

  it('cancels units of one dimension: mg / L * L is mg, L / (L / h) is h', () => {
    const v = values(study([{ name: 'c', value: '5 mg / L' }, { name: 'vol', value: '2 L' }, { name: 'q', value: '4 L / h' },
      { name: 'amount', value: 'c * vol' }, { name: 'tau', value: 'vol / q' }]), 'p');
    assert.deepEqual([v.amount.value, v.amount.unit], [10, 'mg']); // hand-worked: 5 mg/L * 2 L = 10 mg
    assert.deepEqual([v.tau.value, v.tau.unit], [0.5, 'h']); // hand-worked: 2 L / 4 L/h = 0.5 h
  });

  it('shows a time in a time unit of its own expression when the study uses it', () => {
    // 3 m^3 / (0.05 m^3/s): the m^3 cancel, and s is written in q
    const v = values(study([{ name: 'vol', value: '3 m^3' }, { name: 'q', value: '0.05 m^3 / s' }, { name: 'tau', value: 'vol / q' }]), 'p');
    assert.deepEqual([v.tau.value, v.tau.unit], [60, 's']); // hand-worked: 3 / 0.05 = 60 s
  });

  it('shows a time in the run\'s time unit when its own unit is none the study uses', () => {
    // sqrt(2 h0 / g) comes out in s from the constant g (m/s^2); the study's times are in min
    const run = [{ id: 'law', kind: 'rate', state: 'x', unit: 'mg', rate: '-x / tau', initial: '1 mg' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 min', to: '5 min' }];
    const v = values(study([{ name: 'h0', value: '4.903325 m' }, { name: 'tau', value: 'sqrt(2 * h0 / gravity)' }], run), 'p');
    assert.equal(v.tau.unit, 'min');
    assert.ok(Math.abs(v.tau.value - 1 / 60) < 1e-15); // closed form: sqrt(2 * 4.903325 / 9.80665) = 1 s = 1/60 min
  });

  it('shows a derived concentration in the state\'s unit rather than in units the study wrote apart', () => {
    const run = [{ id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-C / (1 h)', initial: 'c0' }];
    const v = values(study([{ name: 'dose', value: '500 mg' }, { name: 'vol', value: '0.05 m^3' }, { name: 'c0', value: 'dose / vol' }], run), 'p');
    assert.deepEqual([v.c0.value, v.c0.unit], [10, 'mg / L']); // hand-worked: 500 mg / 50 L = 10 mg/L
  });

  it('keeps a unit written in the value', () => {
    const v = values(study([{ name: 'vol', value: '2 m^3' }, { name: 'q', value: '100 L / min' }]), 'p');
    assert.deepEqual([v.vol.unit, v.q.unit], ['m^3', 'L / min']);
  });

  it('shows a picked unit, and gives the unit it had before the pick', () => {
    const v = values(study([{ name: 'vol', value: '2 m^3' }, { name: 'q', value: '100 L / min' }, { name: 'tau', value: 'vol / q', unit: 'h' }]), 'p');
    assert.equal(v.tau.unit, 'h');
    assert.ok(Math.abs(v.tau.value - 1 / 3) < 1e-12); // hand-worked: 20 min = 1/3 h
    assert.equal(v.tau.originalUnit, 'min');
    assert.equal(values(study([{ name: 'q', value: '100 L / min' }]), 'p').q.originalUnit, undefined);
  });

  it('shows a derived value again when the study\'s units change', () => {
    const run = (unit: string) => ({ id: 'run', kind: 'simulate', rates: ['law'], from: `0 ${unit}`, to: `5 ${unit}` });
    const o = openStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [
      { id: 'a', kind: 'parameters', items: [{ name: 'h0', value: '4.903325 m' }, { name: 'tau', value: 'sqrt(2 * h0 / gravity)' }] },
      { id: 'law', kind: 'rate', state: 'x', unit: 'mg', rate: '-x / tau', initial: '1 mg' }, run('min')] });
    assert.ok(o.ok);
    const e = o.session.apply({ type: 'replace', cell: run('h') });
    assert.ok(e.ok);
    const tau = values(e.report, 'a').tau;
    assert.equal(tau.unit, 'h'); // the run is now in h
    assert.ok(Math.abs(tau.value - 1 / 3600) < 1e-15); // closed form: 1 s = 1/3600 h
  });
});

describe('a picked unit can be picked back', () => {
  it('offers the original unit first, even one the trades list lacks', () => {
    const choices = unitChoicesFor('ug / mL', 'mg / dL');
    assert.equal(choices[0], 'mg / dL');
    assert.ok(choices.includes('mg / L'));
    assert.ok(!choices.includes('ug / mL'));
    assert.deepEqual(unitChoicesFor('ug / mL', 'h'), unitChoicesFor('ug / mL')); // another dimension is not offered
  });

  it('a state shown in another unit gives the unit its initial value is written in', () => {
    const r = reportOf({ format: 'ratebook-study', version: 1, title: 't', cells: [
      { id: 'law', kind: 'rate', state: 'C', unit: 'ug / mL', rate: '-C / (1 h)', initial: '8 mg / dL' }] });
    assert.equal(cell(r, 'law').originalUnit, 'mg / dL');
  });
});

describe('a level on a plot', () => {
  it('is labelled in its state\'s unit, the unit of the axis it is drawn on', () => {
    const r = reportOf({ format: 'ratebook-study', version: 1, title: 't', cells: [
      { id: 'law', kind: 'rate', state: 'C', unit: 'ug / mL', rate: '-C / (1 h)', initial: '8 mg / L' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '4 h', find: [{ name: 't1', crossing: 'C', level: '2 mg / L', direction: 'down' }] }] });
    const plot = cell(r, 'run').plot as { levels: Array<{ value: number; label: string }> };
    assert.deepEqual(plot.levels.map((l) => [l.value, l.label]), [[2, 'C = 2 ug / mL']]); // hand-worked: 1 mg/L = 1 ug/mL
  });
});
