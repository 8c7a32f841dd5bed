/**
 * Quantities: an SI magnitude with its dimension, the unit to show it in, and, for
 * temperatures, whether it is a point on a scale or a difference.
 *
 * All arithmetic is done on SI magnitudes (kelvin for temperatures), so a point minus a point
 * is already the right difference: `80 degF - 20 degC` is 299.82 K - 293.15 K = 6.67 K. The
 * temperature kind only decides what is allowed and how a result is shown.
 */
import { type Dim, DIMENSIONLESS, TEMPERATURE, sameDim, mulDim, divDim, powDim, isDimensionless, describeDim } from './dimension.ts';
import { type DisplayUnit, NO_UNIT, lookupUnit, isOffsetTemperature, unitFactor, unitDim, mulUnits, powUnits, siUnitFor, formatUnit, unitAfterNumber } from './units.ts';

/**
 * point: a reading on a scale (20 degC); delta: a difference of two readings;
 * absolute: a kelvin or rankine value, which serves as either.
 */
export type TempKind = 'point' | 'delta' | 'absolute';

export interface Quantity {
  readonly si: number;
  readonly dim: Dim;
  readonly unit: DisplayUnit;
  /** Set only when dim is temperature. */
  readonly temp?: TempKind;
}

/** A failure of arithmetic on quantities; the message is for the user. */
export class QuantityError extends Error {}

export function plain(x: number): Quantity {
  return { si: x, dim: DIMENSIONLESS, unit: NO_UNIT };
}

/** A quantity from a number written in a display unit; `20` in [[degC,1]] is the point 20 degC. */
export function fromUnit(value: number, unit: DisplayUnit): Quantity {
  const dim = unitDim(unit);
  if (unit.length === 1 && unit[0][1] === 1) {
    const def = lookupUnit(unit[0][0])!;
    if (isOffsetTemperature(def)) return { si: value * def.factor + def.zero, dim, unit, temp: 'point' };
    if (sameDim(dim, TEMPERATURE)) return { si: value * def.factor, dim, unit, temp: 'absolute' };
  }
  const q: Quantity = { si: value * unitFactor(unit), dim, unit };
  return sameDim(dim, TEMPERATURE) ? { ...q, temp: 'delta' } : q;
}

/** The number q is in `unit` (a point temperature is read on the unit's scale). */
export function valueIn(q: Quantity, unit: DisplayUnit): number {
  if (q.temp === 'point' && unit.length === 1 && unit[0][1] === 1) {
    const def = lookupUnit(unit[0][0])!;
    return (q.si - def.zero) / def.factor;
  }
  return q.si / unitFactor(unit);
}

/**
 * `valueIn` for many numbers of one kind: the reading in `unit` of an SI value of the kind of
 * `q` (its temperature kind), with the unit's factor and zero looked up once. The same numbers
 * as `valueIn({ ...q, si }, unit)`, without an object per value.
 */
export function readingIn(q: Pick<Quantity, 'temp'>, unit: DisplayUnit): (si: number) => number {
  if (q.temp === 'point' && unit.length === 1 && unit[0][1] === 1) {
    const def = lookupUnit(unit[0][0])!;
    const zero = def.zero, factor = def.factor;
    return (si) => (si - zero) / factor;
  }
  const factor = unitFactor(unit);
  return (si) => si / factor;
}

/** The unit q is shown in: its own, or SI when its own does not fit its dimension. */
export function shownUnit(q: Quantity): DisplayUnit {
  return sameDim(unitDim(q.unit), q.dim) ? q.unit : siUnitFor(q.dim);
}

export function describe(q: Quantity): string {
  const u = unitAfterNumber(formatUnit(shownUnit(q)));
  const v = valueIn(q, shownUnit(q));
  return u ? `${formatNumber(v)} ${u}` : formatNumber(v);
}

/** A number with 4 significant figures by default, without trailing zeros. */
export function formatNumber(x: number, digits = 4): string {
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return '0';
  const a = Math.abs(x);
  if (a >= 1e-4 && a < 1e7) return String(Number(x.toPrecision(digits)));
  return x.toExponential(digits - 1).replace(/\.?0+e/, 'e');
}

/** A unit with each temperature scale replaced by its size of degree: degC differences are shown in K, degF in degR. */
export function deltaUnit(u: DisplayUnit): DisplayUnit {
  return u.map(([n, p]) => {
    const def = lookupUnit(n)!;
    if (!isOffsetTemperature(def)) return [n, p] as const;
    return [def.factor === 1 ? 'K' : 'degR', p] as const;
  });
}

/** Shown unit for a quantity used as a factor: a temperature point counts as absolute. */
function factorUnit(q: Quantity): DisplayUnit {
  return q.temp === 'point' ? deltaUnit(shownUnit(q)) : q.unit;
}

function withKind(q: { si: number; dim: Dim; unit: DisplayUnit }, temp?: TempKind): Quantity {
  if (!sameDim(q.dim, TEMPERATURE)) return { si: q.si, dim: q.dim, unit: q.unit };
  return { si: q.si, dim: q.dim, unit: q.unit, temp: temp ?? 'absolute' };
}

function requireSameDim(a: Quantity, b: Quantity, verb: string): void {
  if (!sameDim(a.dim, b.dim)) {
    throw new QuantityError(`cannot ${verb} ${describeDim(a.dim)} (${describe(a)}) and ${describeDim(b.dim)} (${describe(b)})`);
  }
}

export function add(a: Quantity, b: Quantity): Quantity {
  requireSameDim(a, b, 'add');
  const si = a.si + b.si;
  if (!a.temp) return { si, dim: a.dim, unit: pickUnit(a, b) };
  if (a.temp === 'point' && b.temp === 'point') {
    throw new QuantityError(`adding two temperatures (${describe(a)} + ${describe(b)}) is ambiguous: write a change of temperature in K or degR, such as ${describe(a)} + 5 K`);
  }
  if (a.temp === 'point') return { si, dim: a.dim, unit: a.unit, temp: 'point' };
  if (b.temp === 'point') return { si, dim: a.dim, unit: b.unit, temp: 'point' };
  const temp = a.temp === 'delta' || b.temp === 'delta' ? 'delta' : 'absolute';
  return { si, dim: a.dim, unit: pickUnit(a, b), temp };
}

export function sub(a: Quantity, b: Quantity): Quantity {
  requireSameDim(a, b, 'subtract');
  const si = a.si - b.si;
  if (!a.temp) return { si, dim: a.dim, unit: pickUnit(a, b) };
  if (b.temp === 'point') {
    if (a.temp === 'delta') throw new QuantityError(`cannot subtract a temperature (${describe(b)}) from a temperature difference (${describe(a)})`);
    return { si, dim: a.dim, unit: deltaUnit(a.temp === 'point' ? a.unit : b.unit), temp: 'delta' };
  }
  return { si, dim: a.dim, unit: a.unit, temp: a.temp };
}

/** The unit of a sum: the left operand's, unless it has none to offer. */
function pickUnit(a: Quantity, b: Quantity): DisplayUnit {
  return a.unit.length || isDimensionless(a.dim) ? a.unit : b.unit;
}

export function mul(a: Quantity, b: Quantity): Quantity {
  return withKind({ si: a.si * b.si, dim: mulDim(a.dim, b.dim), unit: mulUnits(factorUnit(a), factorUnit(b)) },
    scaledKind(a, b));
}

export function div(a: Quantity, b: Quantity): Quantity {
  return withKind({ si: a.si / b.si, dim: divDim(a.dim, b.dim), unit: mulUnits(factorUnit(a), factorUnit(b), -1) },
    isDimensionless(b.dim) ? scaledKind(a, b) : undefined);
}

/** A difference scaled by a plain number stays a difference; anything else is absolute. */
function scaledKind(a: Quantity, b: Quantity): TempKind | undefined {
  if (a.temp === 'delta' && isDimensionless(b.dim)) return 'delta';
  if (b.temp === 'delta' && isDimensionless(a.dim)) return 'delta';
  return undefined;
}

export function pow(a: Quantity, p: number): Quantity {
  if (!isDimensionless(a.dim) && !Number.isFinite(p)) throw new QuantityError('a quantity with a unit cannot be raised to a non-finite power');
  const dim = powDim(a.dim, p);
  return withKind({ si: Math.pow(a.si, p), dim, unit: powUnits(factorUnit(a), p) }, p === 1 ? a.temp : undefined);
}

export function neg(a: Quantity): Quantity {
  if (a.temp === 'point') throw new QuantityError(`cannot negate a temperature (${describe(a)}); negate a difference such as (T - Ta) instead`);
  return { ...a, si: -a.si };
}

/** Compares two quantities of one dimension; returns a.si - b.si's sign as a JS comparison would. */
export function compare(a: Quantity, b: Quantity, op: string): boolean {
  requireSameDim(a, b, 'compare');
  switch (op) {
    case '<': return a.si < b.si;
    case '>': return a.si > b.si;
    case '<=': return a.si <= b.si;
    case '>=': return a.si >= b.si;
    case '==': return a.si === b.si;
    default: return a.si !== b.si;
  }
}

/** The contract's `{ value, unit, si }` form. */
export interface ReportQuantity {
  value: number;
  unit: string;
  si: number;
}

export function report(q: Quantity): ReportQuantity {
  const unit = shownUnit(q);
  return { value: tidy(valueIn(q, unit)), unit: formatUnit(unit), si: q.si };
}

/**
 * Drops the last bits of floating-point noise from a converted value (39.99999999999996 degF
 * becomes 40): 14 significant digits, far finer than any input a study holds.
 */
export function tidy(x: number): number {
  return Number.isFinite(x) && x !== 0 ? Number(x.toPrecision(14)) : x;
}
