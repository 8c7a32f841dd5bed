// The uncertainty templates against closed forms: Newton cooling at a fixed time, and the
// one-compartment superposition trough after repeated IV boluses, integrated over the
// log-normal spreads of clearance and volume on a fine grid (an independent reference).
// Monte Carlo tolerances: 4 sampling SDs (a proportion: sqrt(p(1 - p)/n); a quantile:
// sqrt(p(1 - p)/n) / f(x_p)).
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { runStudy, type CellReport, type ReportOf } from '../../src/index.ts';
import { normalQuantile, normalUpperTail } from '../../src/numerics/fit/student-t.ts';

const cells = (file: string): CellReport[] => {
  const r = runStudy(readFileSync(new URL(`../../examples/${file}`, import.meta.url), 'utf8'));
  assert.ok(r.ok);
  return (r as { report: { cells: CellReport[] } }).report.cells;
};
const byId = (cs: CellReport[], id: string) => cs.find((c) => c.id === id)!;
const Phi = (z: number) => 1 - normalUpperTail(z);

it('cooling fail probability: the share of failing batches is Φ((k* - k_fit)/SE), k* the least constant that meets both stages; T at 2 h maps k\'s quantiles', () => {
  const cs = cells('cooling-fail-probability.ratebook.json');
  assert.ok(cs.every((c) => c.ok), JSON.stringify(cs.find((c) => !c.ok)?.error));
  const fit = byId(cs, 'fit') as ReportOf<'fit'>;
  const k = fit.estimates!.k_fit.value.value, se = fit.estimates!.k_fit.standardError!.value; // 1/h
  // Newton cooling from 57 degC in 2 degC air: T(t) = 2 + 55 e^(-k t) (closed form); the rule's
  // levels 21 degC at 2 h and 5 degC at 6 h need k >= ln(55/19)/2 h and k >= ln(55/3)/6 h
  const kStar = Math.max(Math.log(55 / 19) / 2, Math.log(55 / 3) / 6);
  const p = Phi((kStar - k) / se);
  const how = byId(cs, 'how-sure') as ReportOf<'uncertainty'>;
  const got = how.results!.fails.probability!;
  assert.ok(Math.abs(got - p) < 4 * Math.sqrt(p * (1 - p) / 2000) + 1 / 2000, `P(fails) ${got}, closed form ${p}`);
  // T at 2 h falls with k: its 97.5% point is T at k's 2.5% point
  const T2 = (kk: number) => 2 + 55 * Math.exp(-2 * kk);
  const z = normalQuantile(0.975);
  const exact = T2(k - z * se);
  const density = Math.exp(-z * z / 2) / Math.sqrt(2 * Math.PI) / (se * 2 * 55 * Math.exp(-2 * (k - z * se)));
  const p975 = how.results!.T_at_stage1.p975!.value;
  assert.ok(Math.abs(p975 - exact) < 4 * Math.sqrt(0.975 * 0.025 / 2000) / density, `p975 ${p975}, exact ${exact}`);
  assert.deepEqual(how.inputs!.map((i) => i.name), ['k_fit']);
});

it('trough in range: the share of patients with 10 <= trough <= 20 mg/L matches the superposition trough integrated over the spreads of CL and V', () => {
  const cs = cells('trough-in-range-probability.ratebook.json');
  assert.ok(cs.every((c) => c.ok), JSON.stringify(cs.find((c) => !c.ok)?.error));
  // one-compartment superposition after 8 boluses of 1000 mg every 12 h, read at 96 h: (D/V) Σ_{j=1..8} e^(-k·12j)
  const trough = (cl: number, v: number) => { let s = 0; for (let j = 1; j <= 8; j++) s += Math.exp(-(cl / v) * 12 * j); return (1000 / v) * s; };
  const run = byId(cs, 'run') as ReportOf<'simulate'>;
  const atMedians = (run.results!.trough as { value: number }).value;
  assert.ok(Math.abs(atMedians - trough(4, 50)) < 1e-4 * atMedians, `${atMedians}`);
  // log-normal CL (median 4 L/h, CV 0.3) and V (median 50 L, CV 0.2), independent: a grid over
  // both standard normals (step 0.01 from -7 to 7; the indicator's edge costs about 1e-3)
  const s1 = Math.sqrt(Math.log(1 + 0.09)), s2 = Math.sqrt(Math.log(1 + 0.04));
  let p = 0;
  const h = 0.01;
  const w = (z: number) => Math.exp(-z * z / 2) / Math.sqrt(2 * Math.PI) * h;
  for (let a = -7; a <= 7; a += h) {
    const cl = 4 * Math.exp(s1 * a), wa = w(a);
    for (let b = -7; b <= 7; b += h) {
      const t = trough(cl, 50 * Math.exp(s2 * b));
      if (t >= 10 && t <= 20) p += wa * w(b);
    }
  }
  const how = byId(cs, 'between-patients') as ReportOf<'uncertainty'>;
  const got = how.results!.in_range.probability!;
  assert.ok(Math.abs(got - p) < 4 * Math.sqrt(p * (1 - p) / 2000) + 2e-3, `P(in range) ${got}, reference ${p}`);
  assert.deepEqual(how.inputs!.map((i) => i.name), ['CL', 'V']);
});
