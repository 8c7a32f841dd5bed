// The extremes a time plot's y ranges must show besides its curves (components/plots/
// time-plot-parts.ts `extentsByUnit`): levels and measured points by unit, not-finite values
// left out, and for a log axis the positive ones only. Hand-worked cases, and a random check
// against Math.min/Math.max over the same values (ECMA-262), from the fixed seed.
import { it } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { extentsByUnit } from '../../components/plots/time-plot-parts.ts';
import type { SimulationPlot } from '../../src/index.ts';

const plot = (levels: SimulationPlot['levels']): SimulationPlot => ({
  timeUnit: 'min', timeUnits: [], t: [0, 1], events: [], marks: [], levels,
  states: [{ name: 'T', unit: 'degC', values: [0, 0] }, { name: 'C', unit: 'mg / L', values: [0, 0] }],
});

it('hand-worked: levels and points by unit, not-finite values left out, positives for a log axis', () => {
  const e = extentsByUnit(plot([{ state: 'T', value: 5, label: 'T = 5 degC' }]), [
    { state: 'T', t: [0, 1, 2, 3], values: [-2, 70, NaN, Infinity] },
    { state: 'C', t: [0, 1], values: [0, 0.25] },
  ]);
  assert.deepEqual(e.get('degC'), { lo: -2, hi: 70, logLo: 5, logHi: 70 });
  assert.deepEqual(e.get('mg / L'), { lo: 0, hi: 0.25, logLo: 0.25, logHi: 0.25 });
});

it('agrees with Math.min and Math.max over 100,000 values without spreading them', () => {
  fc.assert(fc.property(fc.array(fc.double({ noNaN: true, noDefaultInfinity: true }), { minLength: 1, maxLength: 300 }), (vs) => {
    const e = extentsByUnit(plot([]), [{ state: 'C', t: vs.map((_, i) => i), values: vs }]).get('mg / L')!;
    assert.ok(Object.is(e.lo, Math.min(...vs)) || e.lo === Math.min(...vs));
    assert.equal(e.hi, Math.max(...vs));
  }), { numRuns: 200 });
  // a spread of 100,000 values into Math.min can overflow the stack; the loop cannot
  const many = Array.from({ length: 100_000 }, (_, i) => Math.sin(i));
  const e = extentsByUnit(plot([]), [{ state: 'C', t: many, values: many }]).get('mg / L')!;
  assert.ok(e.lo >= -1 && e.lo < -0.9999 && e.hi <= 1 && e.hi > 0.9999);
});
