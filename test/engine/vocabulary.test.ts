// The words an editor offers for expressions: every unit it lists must be one the engine
// reads, and the units trade work writes every day must be among them.
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { unitNames, commonUnitNames, functionNames, constantNames } from '../../src/expression/vocabulary.ts';
import { lookupUnit } from '../../src/units/units.ts';
import { parseExpression, FUNCTION_NAMES } from '../../src/index.ts';

// common practice: units of dosing, cold-chain, heating and plant work
const TRADE_UNITS = [
  'mg', 'ug', 'kg', 'g', 'mL', 'L', 'dL', 'uL', 'min', 'h', 'd', 's', 'degC', 'degF', 'K', 'degR',
  'W', 'kW', 'kJ', 'J', 'BTU', 'cal', 'kcal', 'm', 'cm', 'mm', 'ft', 'inch', 'gal', 'mol', 'mmol',
  'umol', 'Pa', 'kPa', 'bar', 'atm', 'psi', 'lb', 'oz', 'kWh',
];

it('every listed unit resolves through lookupUnit', () => {
  const unresolved = unitNames().filter((n) => lookupUnit(n) === undefined);
  assert.deepEqual(unresolved, []);
});

it('the units trade work uses are listed', () => {
  const listed = new Set(unitNames());
  assert.deepEqual(TRADE_UNITS.filter((n) => !listed.has(n)), []);
});

it('the most used units are all in the list', () => {
  const listed = new Set(unitNames());
  assert.deepEqual(commonUnitNames().filter((n) => !listed.has(n)), []);
});

it('the unit list has no duplicates, no plurals with a singular beside them, no time "t", no information units', () => {
  const list = unitNames();
  assert.equal(new Set(list).size, list.length);
  for (const plural of ['hours', 'minutes', 'mins', 'meters', 'feet', 'centuries', 'liters', 'BTUs']) {
    assert.ok(lookupUnit(plural), `${plural} is a unit mathjs reads`);
    assert.ok(!list.includes(plural), `${plural} is left out`);
  }
  assert.ok(!list.includes('t'));
  assert.ok(!list.includes('bit') && !list.includes('b') && !list.includes('B'));
});

it('each listed unit parses as a value after a number', () => {
  const refused = unitNames().filter((n) => !parseExpression(`2 ${n}`).ok);
  assert.deepEqual(refused, []);
});

it('functions are the allowed functions and pow, each accepted by the parser', () => {
  assert.deepEqual(functionNames(), [...FUNCTION_NAMES, 'pow']);
  for (const f of functionNames()) {
    const args = f === 'pow' || f === 'min' || f === 'max' ? '2, 3' : '0.5';
    assert.ok(parseExpression(`${f}(${args})`).ok, f);
  }
  assert.ok(!parseExpression('sum(1, 2)').ok, 'a function outside the list is refused');
});

it('constants include pi, e and gasConstant', () => {
  for (const c of ['pi', 'e', 'gasConstant', 'avogadro']) assert.ok(constantNames().includes(c), c);
});
