// What the engine keeps from one evaluation to the next so that an edit does less work (a
// unit's dimension and factor, each cell's sheet TeX, a parameter's study-units key): an edit
// after a kept evaluation must give the new figures, and the same report as a study opened
// afresh. Unit sizes from the SI brochure (BIPM, 9th edition: 1 L = 1 dm³, 1 mg = 1e-6 kg,
// 1 h = 3600 s) and NIST SP 811 (t/°F = 1.8 · t/°C + 32; 0 °C = 273.15 K).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { openStudy, type Report, type StudySession } from '../../src/index.ts';
import { unitDim, unitFactor, type DisplayUnit } from '../../src/units/units.ts';
import { readingIn, valueIn, fromUnit } from '../../src/units/quantity.ts';

const open = (cells: unknown[]): StudySession => {
  const o = openStudy({ format: 'ratebook-study', version: 1, title: 'kept work', cells });
  assert.ok(o.ok, o.ok ? '' : o.error.message);
  return o.session;
};

const edit = (s: StudySession, cell: unknown): Report => {
  const r = s.apply({ type: 'replace', cell: cell as never });
  assert.ok(r.ok, r.ok ? '' : r.error.message);
  return r.report;
};

/** The same study opened afresh: what a kept evaluation must equal. */
const fresh = (s: StudySession): Report => {
  const o = openStudy(s.document());
  assert.ok(o.ok);
  return o.session.report();
};

type Q = { value: number; unit: string; si: number };
const valuesOf = (r: Report, id: string) => r.cells.find((c) => c.id === id)!.values as Record<string, Q>;

describe('a unit\'s dimension and factor, kept by identity', () => {
  it('mg / L: mass · length^-3, factor 1e-6 kg / 1e-3 m³ = 1e-3 (SI brochure)', () => {
    const u: DisplayUnit = Object.freeze([Object.freeze(['mg', 1] as const), Object.freeze(['L', -1] as const)]);
    for (let i = 0; i < 2; i++) {
      assert.deepEqual([...unitDim(u)], [1, -3, 0, 0, 0, 0, 0, 0, 0]);
      assert.ok(Math.abs(unitFactor(u) - 1e-3) <= 1e-18);
    }
  });

  it('a unit array that is not frozen is read afresh each time (it may be changed)', () => {
    const u: Array<[string, number]> = [['L', 1]];
    assert.deepEqual([...unitDim(u)], [0, 3, 0, 0, 0, 0, 0, 0, 0]);
    assert.ok(Math.abs(unitFactor(u) - 1e-3) <= 1e-18);
    u[0] = ['h', -1];
    assert.deepEqual([...unitDim(u)], [0, 0, -1, 0, 0, 0, 0, 0, 0]);
    assert.equal(unitFactor(u), 1 / 3600);
  });

  it('readingIn gives valueIn\'s numbers: 98.6 degF is 37 degC (NIST SP 811), 90 min is 1.5 h', () => {
    const body = fromUnit(98.6, [['degF', 1]]);
    const inC = readingIn(body, [['degC', 1]]);
    assert.equal(inC(body.si), valueIn(body, [['degC', 1]]));
    assert.ok(Math.abs(inC(body.si) - 37) < 1e-12);
    const minutes = fromUnit(90, [['min', 1]]);
    assert.equal(readingIn(minutes, [['h', 1]])(minutes.si), valueIn(minutes, [['h', 1]]));
    assert.equal(readingIn(minutes, [['h', 1]])(minutes.si), 1.5);
  });
});

describe('each cell\'s sheet TeX, kept until the cell or the study\'s names change', () => {
  const cells = [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.35 / h' }] },
    { id: 'q', kind: 'parameters', items: [{ name: 'T0', value: '70 degC' }] },
    { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - 20 degC)', initial: 'T0' },
  ];
  const texOf = (r: Report, id: string) => r.cells.find((c) => c.id === id)!.tex;

  it('an edited value gives its new TeX', () => {
    const s = open(cells);
    assert.deepEqual(texOf(s.report(), 'p'), { k: { name: 'k', value: '\\frac{0.35}{\\mathrm{h}}' } });
    const r = edit(s, { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }] });
    assert.deepEqual(texOf(r, 'p'), { k: { name: 'k', value: '\\frac{0.5}{\\mathrm{h}}' } });
    assert.deepEqual(r, fresh(s));
  });

  it('a name defined elsewhere changes how an unchanged cell sets it (h the hour, then a parameter h)', () => {
    const s = open(cells);
    const r = edit(s, { id: 'q', kind: 'parameters', items: [{ name: 'T0', value: '70 degC' }, { name: 'h', value: '2' }] });
    // cell p is unchanged, but h is now one of the study's names, so it is set as a name
    assert.deepEqual(texOf(r, 'p'), { k: { name: 'k', value: '\\frac{0.35}{h}' } });
    assert.deepEqual(r, fresh(s));
    const back = edit(s, cells[1]);
    assert.deepEqual(texOf(back, 'p'), { k: { name: 'k', value: '\\frac{0.35}{\\mathrm{h}}' } });
    assert.deepEqual(back, fresh(s));
  });
});

describe('a parameter shown in the study\'s units, the units kept per evaluation', () => {
  it('V / Q = 2 m³ / (100 L/min) = 20 min; with Q in L/h the unchanged cell shows 20 h', () => {
    const s = open([
      { id: 'tank', kind: 'parameters', items: [{ name: 'V', value: '2 m^3' }, { name: 'Q', value: '100 L / min' }] },
      { id: 'flush', kind: 'parameters', items: [{ name: 'tau', value: 'V / Q' }] },
    ]);
    const before = valuesOf(s.report(), 'flush').tau;
    assert.deepEqual([before.value, before.unit, before.si], [20, 'min', 1200]); // 2000 L / (100 L/min) = 20 min = 1200 s
    const r = edit(s, { id: 'tank', kind: 'parameters', items: [{ name: 'V', value: '2 m^3' }, { name: 'Q', value: '100 L / h' }] });
    const after = valuesOf(r, 'flush').tau;
    assert.deepEqual([after.value, after.unit, after.si], [20, 'h', 72000]); // 2000 L / (100 L/h) = 20 h = 72,000 s
    assert.deepEqual(r, fresh(s));
  });
});
