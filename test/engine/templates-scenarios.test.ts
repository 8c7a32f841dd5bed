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
