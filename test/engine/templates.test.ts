// Templates check their key results against closed forms (the model library, first part).
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { runStudy, type CellReport } from '../../src/index.ts';

type Q = { value: number; unit: string; si: number };
const cells = (file: string): CellReport[] => {
  const r = runStudy(readFileSync(new URL(`../../examples/${file}`, import.meta.url), 'utf8'));
  assert.ok(r.ok);
  return (r as { report: { cells: CellReport[] } }).report.cells;
};
const byId = (cs: CellReport[], id: string) => cs.find((c) => c.id === id)!;

it('lake with first-order decay: settles at Q Cin / (Q + k V), 90% of the way after ln 10 / (Q/V + k)', () => {
  // completely mixed lake with first-order decay: C* = Q Cin / (Q + kV); C(t) = C*(1 - e^{-(Q/V + k) t})
  // (environmental engineering mass balance, common practice)
  const cs = cells('lake-first-order-decay.ratebook.json');
  const Q = 2e4, V = 5e6, Cin = 40, k = 0.05;
  const star = (Q * Cin) / (Q + k * V);
  const eq = byId(cs, 'settle').equilibria as Array<Q & { stability: string }>;
  assert.equal(eq.length, 1);
  assert.ok(Math.abs(eq[0].value - star) < 1e-9 * star);
  assert.equal(eq[0].stability, 'attractor');
  const t90 = (byId(cs, 'run').results as Record<string, Q>).t90;
  assert.ok(Math.abs(t90.value - Math.log(10) / (Q / V + k)) < 1e-5 * t90.value, `${t90.value}`);
});

it('harvested logistic stock: the equilibria fold at H = r K / 4', () => {
  // N' = r N (1 - N/K) - H has a saddle-node at H = rK/4, N = K/2 (common practice)
  const cs = cells('harvested-stock-fold.ratebook.json');
  const folds = (byId(cs, 'settle').sweep as { folds: Array<{ parameter: Q; value: Q }> }).folds;
  assert.equal(folds.length, 1);
  assert.ok(Math.abs(folds[0].parameter.value - 125) < 125e-8);
  assert.equal(folds[0].parameter.unit, 'tonne / year');
  assert.ok(Math.abs(folds[0].value.value - 500) < 500e-6);
  assert.equal((byId(cs, 'stock').values as Record<string, Q>).H_max.value, 125);
});
