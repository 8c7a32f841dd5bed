// Every example study evaluates with every cell ok, and the examples' own cross-checks hold.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readdirSync, readFileSync } from 'node:fs';
import { runStudy, type CellReport } from '../../src/index.ts';

const dir = new URL('../../examples/', import.meta.url);
const files = readdirSync(dir).filter((f) => f.endsWith('.ratebook.json'));
const run = (f: string) => {
  const r = runStudy(readFileSync(new URL(f, dir), 'utf8'));
  assert.ok(r.ok, f);
  return (r as { report: { ok: boolean; cells: CellReport[] } }).report;
};
type Q = { value: number; unit: string; si: number };

describe('examples', () => {
  for (const f of files) {
    it(`${f} evaluates with every cell ok`, () => {
      const report = run(f);
      assert.deepEqual(report.cells.filter((c) => !c.ok).map((c) => `${c.id}: ${c.error?.message}`), []);
    });
  }

  it('plasma levels: the profile summary and the one-compartment fit agree on clearance', () => {
    // for a mono-exponential decline, CL = dose/AUCinf (NCA) equals k·V (one compartment) (common practice)
    const report = run('plasma-levels.ratebook.json');
    const nca = report.cells.find((c) => c.id === 'nca')!.values as Record<string, Q>;
    const compare = report.cells.find((c) => c.id === 'compare')!.values as Record<string, Q>;
    assert.ok(Math.abs(nca.CL.si - compare.CL_fit.si) < 0.02 * nca.CL.si, `${nca.CL.value} vs ${compare.CL_fit.value}`);
  });

  it('cooling data: the prediction from the fit matches a run of the fitted model', () => {
    // T(t) = Ta + (T0 - Ta) e^{-kt} reaches 5 degC at ln((T0 - Ta)/(5 degC - Ta))/k (Newton cooling closed form)
    const report = run('cooling-data-fit.ratebook.json');
    const fit = report.cells.find((c) => c.id === 'fit-k')!.estimates as Record<string, { value: Q }>;
    const k = fit.k_fit.value.si, T0 = fit.T0_fit.value.si, Ta = 274.15;
    const t5 = (report.cells.find((c) => c.id === 'predict')!.values as Record<string, Q>).t_to_5C.si;
    assert.ok(Math.abs(Ta + (T0 - Ta) * Math.exp(-k * t5) - 278.15) < 1e-9);
  });
});
