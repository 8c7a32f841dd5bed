/**
 * Other spellings of a unit, from the unit table: `h` is also `hour`, `L` also `liter`, `mg`
 * also `milligram`. A study name that hides a unit leaves the unit its other spellings; the
 * messages that explain a hidden unit offer one.
 */
import { math } from './mathjs.ts';
import { lookupUnit, EXTRA_UNIT_NAMES, type UnitDef } from './units.ts';
import { sameDim } from './dimension.ts';

/** A unit's name as a word (`hour`), with its plural when the table knows one (`hours`). */
export interface Spelling {
  readonly word: string;
  readonly plural?: string;
}

interface TableUnit { readonly value: unknown; readonly offset: unknown }
interface TablePrefix { readonly value: unknown }
// read when first needed: reading `math.Unit` makes mathjs build its unit class, most of its set-up
const unitTable = () => (math.Unit as unknown as { UNITS: Record<string, TableUnit> }).UNITS;
const longPrefixes = () => (math.Unit as unknown as { PREFIXES: { LONG: Record<string, TablePrefix> } }).PREFIXES.LONG;

/** Words the expression syntax reads as operators, never as units. */
const OPERATOR_WORDS = new Set(['to', 'mod', 'and', 'or', 'not', 'xor']);

const cache = new Map<string, Spelling | null>();

/**
 * Another way to write the unit `name`, preferring a word (h -> hour, s -> second, mL ->
 * milliliter, d -> day); undefined when `name` is not a unit or the table has no other
 * spelling of it (Pa, bar, degF). Cost: a scan of the unit table on the first call per name.
 */
export function otherSpelling(name: string): Spelling | undefined {
  if (!cache.has(name)) cache.set(name, find(name));
  return cache.get(name) ?? undefined;
}

function find(name: string): Spelling | null {
  const def = lookupUnit(name);
  if (!def) return null;
  const { base, prefix } = split(name);
  const baseDef = lookupUnit(base)!;
  const alike = [...Object.keys(unitTable()), ...EXTRA_UNIT_NAMES]
    .filter((k) => k !== base && /^[A-Za-z]+$/.test(k) && !OPERATOR_WORDS.has(k) && same(lookupUnit(k), baseDef));
  const words = alike.filter((k) => /^[a-z]{4,}$/.test(k));
  // a plural is offered beside its singular, never for it
  const spellings = [base, ...alike];
  const singular = (list: string[]) => list.filter((k) => !(k.endsWith('s') && spellings.includes(k.slice(0, -1))) && !(k.endsWith('es') && spellings.includes(k.slice(0, -2))));
  const ranked = [...singular(words), ...singular(alike.filter((k) => !words.includes(k)))]
    .sort((a, b) => Number(!words.includes(a)) - Number(!words.includes(b)) || a.length - b.length || (a < b ? -1 : 1));
  for (const w of ranked) {
    const word = prefix ? `${prefix}${w}` : w;
    if (word === name || !same(lookupUnit(word), def)) continue;
    const plural = [`${word}s`, `${word}es`].find((p) => spellings.includes(p.slice(prefix.length)) && same(lookupUnit(p), def));
    return plural ? { word, plural } : { word };
  }
  return null;
}

/** The unit without its prefix, and the prefix's long name: mg -> gram's alias g and "milli". */
function split(name: string): { base: string; prefix: string } {
  if (EXTRA_UNIT_NAMES.includes(name)) return { base: name, prefix: '' };
  const parsed = math.Unit.parse(name).units[0] as unknown as { unit: { name: string }; prefix: { name: string; value: unknown } };
  if (!parsed.prefix.name) return { base: parsed.unit.name, prefix: '' };
  const long = Object.entries(longPrefixes()).find(([p, v]) => p !== '' && Number(v.value) === Number(parsed.prefix.value));
  return { base: parsed.unit.name, prefix: long ? long[0] : parsed.prefix.name };
}

function same(a: UnitDef | undefined, b: UnitDef): boolean {
  return !!a && Math.abs(a.factor - b.factor) <= 1e-12 * Math.abs(b.factor) && a.zero === b.zero && sameDim(a.dim, b.dim);
}
