// The scenario template (a tank flushed at three pump settings, with a sensitivity cell)
// against the closed form of first-order washout with clean water, c = c0 e^(-Q t / V)
// (common practice for a well-mixed tank at constant volume): t_limit = V/Q ln(c0/limit), so
// d ln t / d ln Q = -1, d ln t / d ln V = 1, d ln t / d ln c0 = 1/ln(c0/limit) and
// d ln t / d ln limit = -1/ln(c0/limit). The template's invented numbers are restated here.
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { runStudy, type CellReport, type ReportOf } from '../../src/index.ts';
import { near } from './helpers.ts';
import { normalUpperTail } from '../../src/numerics/fit/student-t.ts';

const cellsOf = (file: string): CellReport[] => {
  const r = runStudy(readFileSync(new URL(`../../examples/${file}`, import.meta.url), 'utf8'));
  assert.ok(r.ok);
  return (r as { report: { cells: CellReport[] } }).report.cells;
};

it('flush at three pump settings: each scenario\'s time to the limit is V/Q ln(c0/limit), and the slopes are the closed form\'s', () => {
  const cells = cellsOf('flush-pump-settings.ratebook.json');
  for (const c of cells) assert.ok(c.ok, `${c.id}: ${c.error?.message}`);
  const V = 3000, c0 = 60, limit = 1; // L, mg/L (the template's invented numbers)
  const pumps = cells.find((c) => c.id === 'pumps') as ReportOf<'compare'>;
  for (const [name, Q] of [['low', 60], ['mid', 120], ['high', 240]] as const) {
    const s = pumps.scenarios!.find((x) => x.name === name)!;
    const t = s.results.t_limit;
    assert.ok(t && !('notReached' in t));
    assert.equal(t.unit, 'min');
    near(t.value, (V / Q) * Math.log(c0 / limit), 1e-5, `t_limit (${name}, min)`);
    const c30 = s.results.c_30min;
    assert.ok(c30 && !('notReached' in c30));
    near(c30.value, c0 * Math.exp((-Q * 30) / V), 1e-5, `c at 30 min (${name}, mg/L)`);
  }
  const m = cells.find((c) => c.id === 'matters') as ReportOf<'sensitivity'>;
  const e = m.results!.t_limit;
  near(e.Q.normalized!, -1, 1e-3, 'normalized for Q');
  near(e.V.normalized!, 1, 1e-3, 'normalized for V');
  near(e.c0.normalized!, 1 / Math.log(60), 1e-3, 'normalized for c0');
  near(e.limit.normalized!, -1 / Math.log(60), 1e-3, 'normalized for the limit');
  assert.deepEqual(m.ranking!.slice(0, 2).map((x) => x.parameter).sort(), ['Q', 'V']);
  // the names a compare cell defines, read downstream: the time saved is t_low - t_high
  const saved = (cells.find((c) => c.id === 'closed') as ReportOf<'parameters'>).values!.saved;
  near(saved.value, (V / 60 - V / 240) * Math.log(60), 1e-5, 'time saved (min)');
});

it('flush with an uncertain flow: the time to the limit and the band map through the flow\'s log-normal quantiles', () => {
  // Q log-normal, median 120 L/min, CV 0.1 (the template's invented spread): t_limit = V/Q ln(c0/limit)
  // and c(t) = c0 e^(-Q t / V) are decreasing in Q, so a p-quantile of either is the closed form at
  // Q's (1 - p)-quantile. Read back through the closed form, a sample quantile stands at a
  // probability of Q whose SD is sqrt(p(1 - p)/n) (the uniform order statistic; Serfling 1980,
  // 2.3.3): 4 of those SDs are allowed, at the template's fixed seed.
  const cells = cellsOf('flush-pump-settings.ratebook.json');
  const u = cells.find((c) => c.id === 'flow-spread') as ReportOf<'uncertainty'>;
  assert.ok(u.ok, u.error?.message);
  const n = 2000, sigma = Math.sqrt(Math.log(1 + 0.1 ** 2)), V = 3000, c0 = 60;
  assert.equal(u.samples, n);
  const probabilityOfQ = (Q: number) => 1 - normalUpperTail((Math.log(Q) - Math.log(120)) / sigma);
  const allowed = (p: number) => 4 * Math.sqrt((p * (1 - p)) / n);
  const t = u.results!.t_limit;
  for (const [key, p] of [['p025', 0.975], ['median', 0.5], ['p975', 0.025]] as const) {
    const Q = (V / t[key]!.value) * Math.log(60); // t in min, Q in L/min
    assert.ok(Math.abs(probabilityOfQ(Q) - p) < allowed(p), `t_limit ${key}: stands at ${probabilityOfQ(Q)}`);
  }
  const band = u.bands!.find((b) => b.run === 'run')!;
  assert.ok(band.t && band.states, JSON.stringify(band));
  assert.equal(band.timeUnit, 'h');
  const c = band.states[0];
  for (let i = 1; i < band.t.length; i += 10) {
    const minutes: number = band.t[i] * 60;
    for (const [curve, p] of [[c.p025, 0.975], [c.p975, 0.025]] as const) {
      const Q: number = (-Math.log(curve[i] / c0) * V) / minutes;
      assert.ok(Math.abs(probabilityOfQ(Q) - p) < allowed(p), `band at ${minutes} min: stands at ${probabilityOfQ(Q)}`);
    }
  }
  // the question at 30 min is a grid time: the band there is the cell's own result (same samples)
  const at = band.t.findIndex((x) => Math.abs(x - 0.5) < 1e-12);
  near(c.p025[at], u.results!.c_30min.p025!.value, 1e-7, 'p025 at 30 min');
  near(c.p975[at], u.results!.c_30min.p975!.value, 1e-7, 'p975 at 30 min');
});
