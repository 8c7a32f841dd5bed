// An uncertainty cell whose names have no value now: when an error upstream took them away
// (a bad spread on the dosing interval), no sample can mend it, so the cell waits on that
// error like any other cell instead of drawing every sample in vain; when a name was only left
// undefined at the present values (a crossing not reached in the run), the samples still give
// it values, and the share that do is the normal distribution's tail beyond the rate that
// reaches the level in time (Newton cooling's closed form, the normal CDF from mathjs's erf).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { erf } from 'mathjs';
import { runStudy, type Report } from '../../src/index.ts';

function reportOf(doc: unknown): Report {
  const r = runStudy(doc);
  assert.ok(r.ok);
  return (r as { report: Report }).report;
}

describe('an uncertainty cell and names it has no value for now', () => {
  it('waits on a bad spread upstream (the trough template with its interval spread from 13 h to 11 h), drawing no sample', () => {
    const study = JSON.parse(readFileSync(new URL('../../examples/trough-in-range-probability.ratebook.json', import.meta.url), 'utf8'));
    const regimen = study.cells.find((c: { id: string }) => c.id === 'regimen');
    regimen.items.find((i: { name: string }) => i.name === 'tau').spread = { distribution: 'uniform', from: '13 h', to: '11 h' };
    const cell = reportOf(study).cells.find((c) => c.id === 'between-patients')!;
    assert.equal(cell.ok, false);
    assert.equal(cell.error?.kind, 'waits');
    // it waits on the run that defines the trough, the cause named once: tau's spread
    assert.match(cell.error!.message, /^waits on cell "run" \(the cause is in cell "regimen"\): "tau" has an error .*the spread of tau must run from a lower to a higher value/);
    assert.equal((cell as { samples?: number }).samples, undefined, 'no samples drawn');
  });

  it('still draws when a crossing is not reached at the present values: the share reached is the normal tail', () => {
    // T' = -k (T - Ta), 70 degC toward 20 degC: T reaches 40 degC at ln(50/20)/k, within 6 h when k > ln(2.5)/6 h
    const n = 2000;
    const r = reportOf({ format: 'ratebook-study', version: 1, title: 'not reached now', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.1 / h', spread: { distribution: 'normal', sd: '0.05 / h' } }, { name: 'Ta', value: '20 degC' }] },
      { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '70 degC' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '6 h', find: [{ name: 't_40', crossing: 'T', level: '40 degC', direction: 'down' }] },
      { id: 'how', kind: 'uncertainty', of: ['t_40'], samples: n, seed: 3 },
    ] });
    const how = r.cells.find((c) => c.id === 'how') as { ok: boolean; results?: Record<string, { failed: number }> };
    assert.equal(how.ok, true, JSON.stringify(how).slice(0, 300));
    const kMin = Math.log(2.5) / 6;
    const z = (kMin - 0.1) / 0.05;
    const reached = 1 - 0.5 * (1 + (erf(z / Math.SQRT2) as number));
    const share = 1 - how.results!.t_40.failed / n;
    const se = Math.sqrt(reached * (1 - reached) / n);
    assert.ok(Math.abs(share - reached) < 4 * se, `reached in ${share} of samples; the normal tail gives ${reached.toFixed(4)} ± ${se.toFixed(4)}`);
  });
});
