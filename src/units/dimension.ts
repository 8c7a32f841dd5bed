/**
 * Physical dimensions as exponent vectors over the base quantities that mathjs uses:
 * mass, length, time, current, temperature, luminous intensity, amount of substance,
 * angle and bit. Exponents may be fractional (a square root of a volume).
 */
export type Dim = readonly number[];

export const BASE_COUNT = 9;
const BASE_NAMES = ['mass', 'length', 'time', 'current', 'temperature', 'luminous intensity',
  'amount', 'angle', 'bit'];
/** SI base unit symbol of each base quantity, for showing values with no chosen unit. */
export const BASE_SI_UNITS = ['kg', 'm', 's', 'A', 'K', 'cd', 'mol', 'rad', 'bits'];

export const DIMENSIONLESS: Dim = Object.freeze(new Array(BASE_COUNT).fill(0));
export const TIME: Dim = basis(2);
export const TEMPERATURE: Dim = basis(4);

function basis(i: number): Dim {
  const d = new Array(BASE_COUNT).fill(0);
  d[i] = 1;
  return Object.freeze(d);
}

/** Tolerant comparison: fractional exponents come from sqrt and may carry rounding. */
export function sameDim(a: Dim, b: Dim): boolean {
  for (let i = 0; i < BASE_COUNT; i++) if (Math.abs(a[i] - b[i]) > 1e-9) return false;
  return true;
}

export function isDimensionless(d: Dim): boolean {
  return sameDim(d, DIMENSIONLESS);
}

export function mulDim(a: Dim, b: Dim): Dim {
  return a.map((x, i) => x + b[i]);
}

export function divDim(a: Dim, b: Dim): Dim {
  return a.map((x, i) => x - b[i]);
}

export function powDim(a: Dim, p: number): Dim {
  return a.map((x) => x * p);
}

const NAMED: Array<[string, number[]]> = [
  ['time', [0, 0, 1]],
  ['temperature', [0, 0, 0, 0, 1]],
  ['temperature per time', [0, 0, -1, 0, 1]],
  ['mass', [1]],
  ['length', [0, 1]],
  ['volume', [0, 3]],
  ['amount', [0, 0, 0, 0, 0, 0, 1]],
  ['rate (per time)', [0, 0, -1]],
  ['mass concentration', [1, -3]],
  ['mass concentration per time', [1, -3, -1]],
  ['molar concentration', [0, -3, 0, 0, 0, 0, 1]],
  ['mass per time', [1, 0, -1]],
  ['volume per time', [0, 3, -1]],
  ['speed', [0, 1, -1]],
  ['acceleration', [0, 1, -2]],
  ['power', [1, 2, -3]],
  ['energy', [1, 2, -2]],
  ['pressure', [1, -1, -2]],
  ['area', [0, 2]],
  ['temperature difference times time', [0, 0, 1, 0, 1]],
];

/** A readable name for a dimension, such as "volume per time" or "mass^1 length^-3". */
export function describeDim(d: Dim): string {
  if (isDimensionless(d)) return 'a plain number';
  for (const [name, v] of NAMED) {
    const full = [...v, ...new Array(BASE_COUNT - v.length).fill(0)];
    if (sameDim(d, full)) return name;
  }
  const parts: string[] = [];
  d.forEach((p, i) => {
    if (Math.abs(p) > 1e-12) parts.push(p === 1 ? BASE_NAMES[i] : `${BASE_NAMES[i]}^${round6(p)}`);
  });
  return parts.join(' ');
}

function round6(x: number): number {
  return Math.round(x * 1e6) / 1e6;
}
