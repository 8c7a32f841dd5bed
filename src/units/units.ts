/**
 * Unit look-up and display units.
 *
 * A unit name resolves to its SI factor, its offset (for degC and degF) and its dimension,
 * from mathjs's unit table plus a few units the trades use that mathjs lacks. A display unit
 * is a product of named units with powers ("mg / L", "1 / h"); it remembers what the user
 * wrote so that results are shown in the user's own units.
 */
import { math } from './mathjs.ts';
import { type Dim, DIMENSIONLESS, BASE_COUNT, BASE_SI_UNITS, sameDim, isDimensionless } from './dimension.ts';

export interface UnitDef {
  /** The name as written, with its prefix ("mg"). */
  readonly name: string;
  /** SI value of one unit step (a temperature unit's size: 5/9 for degF). */
  readonly factor: number;
  /** SI value of the unit's zero point (273.15 for degC, 255.37... for degF); 0 for most. */
  readonly zero: number;
  readonly dim: Dim;
}

const EXTRA: Record<string, { factor: number; dim: number[] }> = {
  d: { factor: 86400, dim: [0, 0, 1] }, // day: common practice in dosing schedules
  cal: { factor: 4.184, dim: [1, 2, -2] }, // thermochemical calorie, exact by definition
  kcal: { factor: 4184, dim: [1, 2, -2] },
};

/** The units Ratebook adds to mathjs's table, by name. */
export const EXTRA_UNIT_NAMES: readonly string[] = Object.keys(EXTRA);

const cache = new Map<string, UnitDef | null>();

/** The unit of that name, or undefined when it is not a unit. Cost: a map look-up after the first call. */
export function lookupUnit(name: string): UnitDef | undefined {
  let def = cache.get(name);
  if (def === undefined) {
    def = resolve(name);
    cache.set(name, def);
  }
  return def ?? undefined;
}

function resolve(name: string): UnitDef | null {
  if (!/^[A-Za-z_][A-Za-z0-9_]*$/.test(name)) return null;
  const extra = Object.prototype.hasOwnProperty.call(EXTRA, name) ? EXTRA[name] : undefined;
  if (extra) return { name, factor: extra.factor, zero: 0, dim: pad(extra.dim) };
  try {
    if (!math.Unit.isValuelessUnit(name)) return null;
    const parsed = math.Unit.parse(name);
    if (parsed.units.length !== 1 || parsed.units[0].power !== 1) return null;
    const { unit, prefix } = parsed.units[0] as unknown as { unit: { value: unknown; offset: unknown }; prefix: { value: unknown } };
    const factor = Number(unit.value) * Number(prefix.value);
    const zero = Number(unit.offset) * factor;
    if (!Number.isFinite(factor) || factor === 0) return null;
    return { name, factor, zero, dim: Object.freeze([...parsed.dimensions].map(Number)) };
  } catch {
    return null;
  }
}

function pad(v: number[]): Dim {
  return Object.freeze([...v, ...new Array(9 - v.length).fill(0)]);
}

/** True for degC and degF: temperature scales whose zero is not absolute zero. */
export function isOffsetTemperature(def: UnitDef): boolean {
  return def.zero !== 0 && def.dim[4] === 1 && def.dim.every((x, i) => i === 4 || x === 0);
}

/** A product of named units with powers, in the order first written. */
export type DisplayUnit = ReadonlyArray<readonly [name: string, power: number]>;

export const NO_UNIT: DisplayUnit = Object.freeze([]);

/**
 * The dimension of a display unit. A frozen unit's (display units are made frozen) is kept by
 * identity: the engine asks for the same units' dimensions on every evaluation.
 */
export function unitDim(u: DisplayUnit): Dim {
  if (u.length === 0) return DIMENSIONLESS;
  let d = dims.get(u);
  if (d === undefined) {
    d = dimOf(u);
    if (Object.isFrozen(u)) dims.set(u, d);
  }
  return d;
}

const dims = new WeakMap<DisplayUnit, Dim>();

/** Each term's dimension times its power, summed in order (so the same numbers as a product of mulDim and powDim). */
function dimOf(u: DisplayUnit): Dim {
  const d = new Array<number>(BASE_COUNT).fill(0);
  for (let k = 0; k < u.length; k++) {
    const term = u[k];
    const dim = lookupUnit(term[0])!.dim;
    const p = term[1];
    for (let i = 0; i < BASE_COUNT; i++) d[i] += dim[i] * p;
  }
  return Object.freeze(d);
}

/** SI value of one display unit (temperature units by their size, not their zero). */
export function unitFactor(u: DisplayUnit): number {
  let f = factors.get(u);
  if (f === undefined) {
    f = 1;
    for (let k = 0; k < u.length; k++) f *= Math.pow(lookupUnit(u[k][0])!.factor, u[k][1]);
    if (Object.isFrozen(u)) factors.set(u, f);
  }
  return f;
}

const factors = new WeakMap<DisplayUnit, number>();

export function mulUnits(a: DisplayUnit, b: DisplayUnit, sign = 1): DisplayUnit {
  const out = a.map(([n, p]) => [n, p] as [string, number]);
  for (const [n, p] of b) {
    const hit = out.find((e) => e[0] === n);
    if (hit) hit[1] += sign * p;
    else out.push([n, sign * p]);
  }
  return simplify(out);
}

export function powUnits(a: DisplayUnit, p: number): DisplayUnit {
  return simplify(a.map(([n, q]) => [n, q * p] as [string, number]));
}

/**
 * Merges units of one kind that appear with opposite signs (min * (1 / h) becomes a plain
 * number, mg / g likewise), converting into the first one written; drops zero powers.
 */
function simplify(terms: Array<[string, number]>): DisplayUnit {
  for (let i = 0; i < terms.length; i++) {
    for (let j = i + 1; j < terms.length; j++) {
      const [ni, pi] = terms[i];
      const [nj, pj] = terms[j];
      if (pi === 0 || pj === 0 || Math.sign(pi) === Math.sign(pj)) continue;
      const di = lookupUnit(ni)!.dim;
      const dj = lookupUnit(nj)!.dim;
      if (sameDim(di, dj)) {
        terms[i] = [ni, pi + pj];
        // the factor difference between ni and nj is carried by the SI value, which does
        // not change: only the unit the value is shown in changes.
        terms[j] = [nj, 0];
      }
    }
  }
  return Object.freeze(terms.filter(([, p]) => Math.abs(p) > 1e-12).map(([n, p]) => Object.freeze([n, roundPow(p)] as const)));
}

function roundPow(p: number): number {
  const r = Math.round(p);
  return Math.abs(p - r) < 1e-9 ? r : p;
}

/** The SI display unit for a dimension ("kg / m^3"), used when nothing better is known. */
export function siUnitFor(d: Dim): DisplayUnit {
  if (isDimensionless(d)) return NO_UNIT;
  return Object.freeze(d.flatMap((p, i) => (Math.abs(p) > 1e-12 ? [Object.freeze([BASE_SI_UNITS[i], roundPow(p)] as const)] : [])));
}

/** Text of a display unit, re-readable as an expression: "mg / L", "1 / h", "L / (h * kg)". */
export function formatUnit(u: DisplayUnit): string {
  let text = formatted.get(u);
  if (text === undefined) {
    text = format(u);
    formatted.set(u, text);
  }
  return text;
}

/** Display units are immutable, so their text is cached by identity. */
const formatted = new WeakMap<DisplayUnit, string>();

function format(u: DisplayUnit): string {
  const term = (n: string, p: number) => (p === 1 ? n : `${n}^${p}`);
  const num = u.filter(([, p]) => p > 0).map(([n, p]) => term(n, p));
  const den = u.filter(([, p]) => p < 0).map(([n, p]) => term(n, -p));
  if (num.length === 0 && den.length === 0) return '';
  const top = num.length ? num.join(' * ') : '1';
  if (den.length === 0) return top;
  return `${top} / ${den.length > 1 ? `(${den.join(' * ')})` : den[0]}`;
}

/**
 * Unit text as it reads after a number, for people: "1 / h" becomes "/h" (`0.1 /h`), "1 / (h * kg)"
 * "/(h * kg)"; other units are unchanged. The report's `unit` fields keep the re-readable form.
 */
export function unitAfterNumber(text: string): string {
  return text.startsWith('1 / ') ? `/${text.slice(4)}` : text;
}
