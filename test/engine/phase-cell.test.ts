// The phase cell through the engine: equilibria with units, stability, intervals, poles, sweeps.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { runStudy, type CellReport } from '../../src/index.ts';

function phase(law: string, from: string, to: string, unit = 'mg / L', extra: Record<string, unknown> = {}, params: unknown[] = []): CellReport {
  const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'u', value: `1 ${unit}` }, { name: 'tu', value: '1 h' }, ...params] },
    { id: 'law', kind: 'rate', state: 'y', unit, rate: law, initial: `1 ${unit}` },
    { id: 'ph', kind: 'phase', rate: 'law', from, to, ...extra },
  ] });
  assert.ok(r.ok);
  const c = (r as { report: { cells: CellReport[] } }).report.cells[2];
  assert.ok(c.ok, JSON.stringify(c.error));
  return c;
}
type Eq = { value: number; unit: string; si: number; stability: string; slope: { value: number; unit: string } };
const eqs = (c: CellReport) => c.equilibria as Eq[];

describe('equilibria and their stability', () => {
  it('the logistic law y (3 - 4 y) has a repeller at 0 and an attractor at 3/4', () => {
    // zeros of y(3 - 4y): 0 and 3/4; f' = 3 - 8y: +3 at 0 (repeller), -3 at 3/4 (attractor) (calculus, common practice)
    const c = phase('y / u * (3 u - 4 y) / tu', '-1 mg / L', '2 mg / L');
    assert.deepEqual(eqs(c).map((e) => e.stability), ['repeller', 'attractor']);
    assert.ok(Math.abs(eqs(c)[0].value) < 1e-12);
    assert.ok(Math.abs(eqs(c)[1].value - 0.75) < 1e-12);
    assert.equal(eqs(c)[1].unit, 'mg / L');
    assert.ok(Math.abs(eqs(c)[1].slope.value + 3) < 1e-6);
    assert.equal(eqs(c)[1].slope.unit, '1 / h');
    assert.deepEqual((c.intervals as Array<{ sign: string }>).map((i) => i.sign), ['-', '+', '-']);
  });

  it('(y - 1)^2 has a semi-stable point at 1', () => {
    const c = phase('(y - u)^2 / u / tu', '-2 mg / L', '3 mg / L');
    assert.equal(eqs(c).length, 1);
    assert.equal(eqs(c)[0].stability, 'semi-stable');
    assert.ok(Math.abs(eqs(c)[0].value - 1) < 1e-6);
  });

  it('reports the side a semi-stable point attracts from: below for (y - 1)^2, above for -(y - 1)^2', () => {
    // closed form: (y - 1)^2 > 0 on both sides of 1, so a state just below 1 rises into it and one
    // just above rises away: it attracts from below; -(y - 1)^2 < 0 on both sides: from above
    type Side = Eq & { attractsFrom?: string };
    const up = eqs(phase('(y - u)^2 / u / tu', '-2 mg / L', '3 mg / L'))[0] as Side;
    assert.equal(up.stability, 'semi-stable');
    assert.equal(up.attractsFrom, 'below');
    const down = eqs(phase('-(y - u)^2 / u / tu', '-2 mg / L', '3 mg / L'))[0] as Side;
    assert.equal(down.stability, 'semi-stable');
    assert.equal(down.attractsFrom, 'above');
    // closed form: y (3 - 4 y) crosses zero at 0 and 3/4; neither point is semi-stable
    for (const e of eqs(phase('y / u * (3 u - 4 y) / tu', '-1 mg / L', '2 mg / L')) as Side[]) assert.equal(e.attractsFrom, undefined);
  });

  it('a semi-stable point at the end of the range still knows its side', () => {
    // closed form: (y - 1)^2 at the upper end 1 of [0, 1] and -(y - 1)^2 at the lower end 1 of [1, 3]
    assert.equal((eqs(phase('(y - u)^2 / u / tu', '0 mg / L', '1 mg / L'))[0] as { attractsFrom?: string }).attractsFrom, 'below');
    assert.equal((eqs(phase('-(y - u)^2 / u / tu', '1 mg / L', '3 mg / L'))[0] as { attractsFrom?: string }).attractsFrom, 'above');
  });

  it('1 / (y - 1) has no equilibrium and a pole at 1', () => {
    const c = phase('u^2 / (y - u) / tu', '-2 mg / L', '3 mg / L');
    assert.equal(eqs(c).length, 0);
    const poles = c.poles as Array<{ value: number }>;
    assert.equal(poles.length, 1);
    assert.ok(Math.abs(poles[0].value - 1) < 1e-9);
    assert.match((c.notes as string[])[0], /pole at y = 1 mg \/ L/);
  });

  it('Newton cooling settles at the ambient temperature, on any scale', () => {
    // T* = Ta (Newton's law of cooling); 70 degF = 21.1111 degC = 294.2611 K
    const c = phase('-(T - 70 degF) / (2 h)'.replace(/T/g, 'y'), '0 degC', '100 degC', 'degC');
    assert.equal(eqs(c).length, 1);
    assert.ok(Math.abs(eqs(c)[0].si - (70 + 459.67) * 5 / 9) < 1e-9);
    assert.equal(eqs(c)[0].unit, 'degC');
    assert.equal(eqs(c)[0].stability, 'attractor');
  });

  it('refuses a law that reads t, or another state', () => {
    const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [
      { id: 'law', kind: 'rate', state: 'y', unit: 'm', rate: '-y / (1 s) + t * 1 m / s^2', initial: '1 m' },
      { id: 'ph', kind: 'phase', rate: 'law', from: '0 m', to: '2 m' },
    ] });
    assert.ok(r.ok);
    if (r.ok) assert.match(r.report.cells[1].error!.message, /does not change with time; the law of y reads t/);
  });
});

describe('sweeps', () => {
  it('logistic growth with constant harvest folds at H = rK/4', () => {
    // y' = r y (1 - y/K) - H: equilibria meet at y = K/2 when H = rK/4 (common practice)
    const c = phase('r * y * (1 - y / K) - H', '0 kg', '1200 kg', 'kg',
      { sweep: { name: 'H', from: '0 kg / d', to: '200 kg / d', steps: 41 } },
      [{ name: 'r', value: '0.5 / d' }, { name: 'K', value: '1000 kg' }, { name: 'H', value: '50 kg / d' }]);
    const sweep = c.sweep as { folds: Array<{ parameter: { value: number; unit: string }; value: { value: number } }>; branches: unknown[][] };
    assert.equal(sweep.folds.length, 1);
    assert.ok(Math.abs(sweep.folds[0].parameter.value - 125) < 125 * 1e-8, `${sweep.folds[0].parameter.value}`);
    assert.equal(sweep.folds[0].parameter.unit, 'kg / d');
    assert.ok(Math.abs(sweep.folds[0].value.value - 500) < 500 * 1e-6);
  });

  it('saturable elimination under an infusion has a steady state only while R < Vmax', () => {
    // C' = (R - Vmax C / (Km + C)) / V: C* = Km R / (Vmax - R) for R < Vmax, none beyond (Michaelis–Menten; common practice)
    const c = phase('(R - Vmax * y / (Km + y)) / V', '0 mg / L', '1000 mg / L', 'mg / L',
      { sweep: { name: 'R', from: '10 mg / h', to: '150 mg / h', steps: 29 } },
      [{ name: 'Vmax', value: '100 mg / h' }, { name: 'Km', value: '4 mg / L' }, { name: 'V', value: '50 L' }, { name: 'R', value: '60 mg / h' }]);
    const branches = (c.sweep as { branches: Array<Array<{ parameter: { value: number }; value: { value: number }; stability: string }>> }).branches;
    assert.equal(branches.length, 1);
    for (const pt of branches[0]) {
      const R = pt.parameter.value;
      assert.ok(R < 100);
      const exact = 4 * R / (100 - R);
      assert.ok(Math.abs(pt.value.value - exact) <= 1e-8 * exact, `R = ${R}: ${pt.value.value} vs ${exact}`);
      assert.equal(pt.stability, 'attractor');
    }
    // R = 95 mg/h gives C* = 76 mg/L, inside the range; R = 100 and above have none
    assert.equal(Math.max(...branches[0].map((p) => p.parameter.value)), 95);
  });

  it('refuses to sweep a name the law does not read directly', () => {
    const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'a', value: '1 / s' }, { name: 'k', value: '2 * a' }] },
      { id: 'law', kind: 'rate', state: 'y', unit: 'm', rate: '-k * y', initial: '1 m' },
      { id: 'ph', kind: 'phase', rate: 'law', from: '0 m', to: '2 m', sweep: { name: 'a', from: '1 / s', to: '2 / s', steps: 5 } },
    ] });
    assert.ok(r.ok);
    if (r.ok) assert.match(r.report.cells[2].error!.message, /reads "k", which is computed from "a"/);
  });
});

describe('what a phase plot and a reader get', () => {
  it('samples the rate and follows solutions toward the attractor', () => {
    const c = phase('-(y - 3 u) / tu', '0 mg / L', '6 mg / L');
    const plot = c.plot as { stateUnit: string; rateUnit: string; y: number[]; f: number[]; solutions: Array<{ start: number; y: Array<number | null> }> };
    assert.equal(plot.stateUnit, 'mg / L');
    assert.equal(plot.rateUnit, 'mg / (L * h)');
    // f(0) = 3 mg/(L h), f(6) = -3 (the law itself)
    assert.ok(Math.abs(plot.f[0] - 3) < 1e-12 && Math.abs(plot.f[plot.f.length - 1] + 3) < 1e-12);
    // after 4 time constants every start is within e^-4 of the attractor (closed form, common practice)
    for (const s of plot.solutions) {
      const end = s.y[s.y.length - 1]!;
      assert.ok(Math.abs(end - 3 - (s.start - 3) * Math.exp(-4)) < 1e-4, `${s.start} -> ${end}`);
    }
    assert.equal(c.summary, 'y has one equilibrium: 3 mg / L (attractor); below 3 mg / L it rises, above 3 mg / L it falls.');
  });
});
