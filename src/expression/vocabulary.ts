/**
 * The words an expression may use, for an editor's completion and highlighting: unit names,
 * function names and constant names. The lists only name things; whether a name is a unit is
 * still decided by `lookupUnit`, and every listed unit resolves through it.
 */
import { math } from '../units/mathjs.ts';
import { lookupUnit } from '../units/units.ts';
import { FUNCTION_NAMES } from './functions.ts';
import { CONSTANTS, isConstantName } from './constants.ts';

/**
 * Prefixed forms offered beside their unit: the ones lab, clinic and plant work writes
 * ("common practice"). Any other prefix mathjs knows still works when typed.
 */
const PREFIXED: Readonly<Record<string, readonly string[]>> = {
  g: ['u', 'm', 'k'],
  m: ['n', 'u', 'm', 'c', 'k'],
  L: ['u', 'm', 'c', 'd'],
  s: ['u', 'm'],
  mol: ['n', 'u', 'm', 'k'],
  Pa: ['h', 'k', 'M'],
  bar: ['m'],
  J: ['k', 'M'],
  W: ['m', 'k', 'M'],
  Wh: ['k', 'M'],
  N: ['k'],
  A: ['m'],
  V: ['m', 'k'],
  Hz: ['k', 'M'],
  eV: ['k', 'M'],
};

/** Units of Ratebook's own table (units.ts) that mathjs lacks. */
const EXTRA_UNITS = ['d', 'cal', 'kcal'];

/**
 * Plural spellings mathjs accepts ("hours", "mins", "feet"): left out of the list because each
 * has a singular beside it. Irregular ones are named here; regular ones are found by rule.
 */
const IRREGULAR_PLURALS: Readonly<Record<string, string>> = { feet: 'foot', millennia: 'millennium' };

interface MathjsUnit {
  value: number;
  offset: number;
  base: { key: string };
}

let units: readonly string[] | undefined;

/**
 * The unit names to offer: every singular unit name in mathjs's table, each followed by its
 * common prefixed forms, then Ratebook's extra units. Left out: plural spellings, `t` (always
 * time in a study, never the tonne), names a constant takes, and information units (bit,
 * byte), which no rate law measures. Every name resolves with `lookupUnit`.
 * Cost: built once, a few hundred look-ups; later calls return the same frozen array.
 */
export function unitNames(): readonly string[] {
  if (!units) units = Object.freeze(buildUnitNames());
  return units;
}

function buildUnitNames(): string[] {
  const table = math.Unit.UNITS as unknown as Record<string, MathjsUnit>;
  const out = new Set<string>();
  const offer = (name: string) => {
    if (name === 't' || isConstantName(name) || out.has(name) || !lookupUnit(name)) return;
    out.add(name);
  };
  for (const name of Object.keys(table)) {
    const unit = table[name];
    if (unit.base.key === 'BIT' || isPlural(name, table)) continue;
    offer(name);
    for (const prefix of PREFIXED[name] ?? []) offer(prefix + name);
  }
  for (const name of EXTRA_UNITS) offer(name);
  return [...out];
}

function isPlural(name: string, table: Record<string, MathjsUnit>): boolean {
  const singulars = IRREGULAR_PLURALS[name] ? [IRREGULAR_PLURALS[name]]
    : name.endsWith('ies') ? [`${name.slice(0, -3)}y`]
    : name.endsWith('es') ? [name.slice(0, -2), name.slice(0, -1)]
    : name.endsWith('s') ? [name.slice(0, -1)]
    : [];
  const unit = table[name];
  return singulars.some((s) => {
    const other = Object.prototype.hasOwnProperty.call(table, s) ? table[s] : undefined;
    return !!other && other.value === unit.value && other.offset === unit.offset && other.base.key === unit.base.key;
  });
}

/**
 * The units dosing, cold-chain, heating and plant work write most (common practice): an
 * editor offers these first among units that match equally well. All are in `unitNames()`.
 */
const COMMON_UNITS: readonly string[] = Object.freeze([
  'mg', 'ug', 'g', 'kg', 'mL', 'uL', 'dL', 'L', 's', 'min', 'h', 'd', 'degC', 'degF', 'K', 'degR',
  'W', 'kW', 'J', 'kJ', 'kWh', 'BTU', 'cal', 'kcal', 'm', 'cm', 'mm', 'ft', 'inch', 'gal', 'mol', 'mmol',
  'umol', 'Pa', 'kPa', 'bar', 'atm', 'psi', 'lb', 'oz',
]);

/** The most used units, a subset of `unitNames()`. */
export function commonUnitNames(): readonly string[] {
  return COMMON_UNITS;
}

let functions: readonly string[] | undefined;

/** The functions an expression may call: the function table's names and `pow`. */
export function functionNames(): readonly string[] {
  if (!functions) functions = Object.freeze([...FUNCTION_NAMES, 'pow']);
  return functions;
}

const constants: readonly string[] = Object.freeze(Object.keys(CONSTANTS));

/** The named constants an expression may use (pi, e, gasConstant, ...). */
export function constantNames(): readonly string[] {
  return constants;
}
