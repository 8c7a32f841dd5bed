// The units a time axis may be relabelled in (src/output/display-units.ts, timeAxisUnits), with
// their factors, and the simulate and fit reports that carry them in `plot.timeUnits`.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { timeAxisUnits, runStudy } from '../../src/index.ts';

const units = (unit: string, span: number) => timeAxisUnits(unit, span).map((u) => u.unit);
const factor = (from: string, to: string, span: number) => timeAxisUnits(from, span).find((u) => u.unit === to)?.factor;
const close = (a: number | undefined, b: number) => assert.ok(a !== undefined && Math.abs(a - b) <= 1e-12 * Math.abs(b), `${a} vs ${b}`);

describe('time axis units', () => {
  // Definitions of the units (SI brochure, non-SI units accepted for use with the SI):
  // 1 min = 60 s, 1 h = 3600 s, 1 d = 86 400 s; a week is 7 d.
  it('converts between the units by their definitions', () => {
    close(factor('h', 'min', 10), 60);
    close(factor('h', 'h', 10), 1);
    close(factor('h', 'd', 48), 1 / 24);
    close(factor('d', 'h', 2), 24);
    close(factor('min', 'h', 600), 1 / 60);
    close(factor('min', 's', 10), 60);
    close(factor('d', 'week', 70), 1 / 7);
  });

  it('offers the units in which the span reads between 0.5 and 10 000, smallest first', () => {
    // hand-worked: 10 h = 600 min = 36 000 s (too many) = 0.4167 d (too few)
    assert.deepEqual(units('h', 10), ['min', 'h']);
    // hand-worked: 48 h = 2880 min = 2 d = 0.286 week (too few); 172 800 s is too many
    assert.deepEqual(units('h', 48), ['min', 'h', 'd']);
    // hand-worked: 70 d = 1680 h = 10 weeks = 0.19 year (too few); 100 800 min is too many
    assert.deepEqual(units('d', 70), ['h', 'd', 'week']);
  });

  it('always offers the axis\'s own unit, and only it when the unit is not a time or the span is empty', () => {
    // hand-worked: 0.001 h = 3.6 s; 0.06 min and 4.2e-5 d are too few, yet h stays
    assert.deepEqual(units('h', 0.001), ['s', 'h']);
    assert.deepEqual(timeAxisUnits('kg', 3), [{ unit: 'kg', factor: 1 }]);
    assert.deepEqual(timeAxisUnits('not a unit', 3), [{ unit: 'not a unit', factor: 1 }]);
    assert.deepEqual(timeAxisUnits('h', 0), [{ unit: 'h', factor: 1 }]);
  });
});

describe('plots report their time axis units', () => {
  const example = (f: string) => JSON.parse(readFileSync(new URL(`../../examples/${f}`, import.meta.url), 'utf8'));

  it('a simulate cell\'s plot carries the units for its span', () => {
    const r = runStudy(example('cooling-stock-pot.ratebook.json'));
    assert.ok(r.ok);
    const plot = r.report.cells.find((c) => c.kind === 'simulate')!.plot as { timeUnit: string; t: number[]; timeUnits: unknown };
    assert.equal(plot.timeUnit, 'h');
    assert.deepEqual(plot.timeUnits, timeAxisUnits('h', plot.t[plot.t.length - 1] - plot.t[0]));
    // hand-worked: the run lasts 10 h, so minutes (60 per hour) and hours
    assert.deepEqual(plot.timeUnits, [{ unit: 'min', factor: 60 }, { unit: 'h', factor: 1 }]);
  });

  it('a fit cell\'s plot carries them too, for the data\'s span', () => {
    const r = runStudy(example('plasma-levels.ratebook.json'));
    assert.ok(r.ok);
    const plot = r.report.cells.find((c) => c.kind === 'fit')!.plot!;
    assert.deepEqual(plot.timeUnits, timeAxisUnits(plot.timeUnit, plot.t[plot.t.length - 1] - plot.t[0]));
    assert.ok(plot.timeUnits.some((u) => u.unit === plot.timeUnit));
  });
});
