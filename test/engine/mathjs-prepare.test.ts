// The mathjs instance readied a part at a time (`prepareMathjs`, which the page calls in short
// tasks so that no one task builds the instance): every call with no time to spare builds one
// part, the calls end, and afterwards the parser and the unit table answer as a plain mathjs
// instance does (the reference library itself) and as the SI defines the units.
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { create, all } from 'mathjs';
import { prepareMathjs, lookupUnit, parseExpression } from '../../src/index.ts';
import { math } from '../../src/units/mathjs.ts';

it('prepareMathjs builds the instance a part per call when given no time, then says it is done', () => {
  let calls = 0;
  while (!prepareMathjs(0)) {
    calls++;
    assert.ok(calls < 500, 'prepareMathjs never finished');
  }
  // the parser and the unit class are made of some sixty parts (mathjs 15's dependency lists)
  assert.ok(calls >= 20, `only ${calls} calls: the parts were not built one per call`);
  assert.equal(prepareMathjs(0), true);
  assert.equal(prepareMathjs(100), true);
});

it('after it, the parser and the units answer as a full mathjs instance and the SI do', () => {
  prepareMathjs(Infinity);
  const reference = create(all);
  for (const text of ['2 mg / L', '-k * (T - Ta)', '0.35 / h * exp(-t / 50 min)', 'Vmax * C / (Km + C)']) {
    assert.equal(math.parse(text).toString(), reference.parse(text).toString(), text);
  }
  // SI brochure (9th edition), prefixes and the litre: 1 mg = 1e-6 kg, 1 L = 1e-3 m^3, 1 h = 3600 s
  assert.equal(lookupUnit('mg')?.factor, reference.unit('1 mg').toNumber('kg'));
  assert.ok(Math.abs(lookupUnit('mg')!.factor - 1e-6) < 1e-21);
  assert.ok(Math.abs(lookupUnit('L')!.factor - 1e-3) < 1e-18);
  assert.equal(lookupUnit('h')?.factor, 3600);
  assert.ok(parseExpression('2 mg / L').ok);
});
