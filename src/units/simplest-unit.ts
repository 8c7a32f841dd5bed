/**
 * The unit a derived value is shown in: the simplest one of its dimension, never a compound
 * of units that cancel (`m^3 * min / L` is shown in min, `mg / L * L` in mg).
 *
 * The study's own units are the units written in its inputs (see `studyUnits` in
 * engine/study-units.ts). The rule, in order:
 * 1. a unit the study wrote for its inputs is kept as it is;
 * 2. else the smallest part of the value's own unit with the value's dimension (the terms
 *    left out cancel), when it is a single unit the study uses somewhere (`min` from `L / min`);
 * 3. else a unit of that dimension the study wrote, preferring one made of units already in
 *    the value's unit (a concentration in the state's mg / L rather than in `mg / m^3`);
 * 4. else that smallest part of its own unit.
 * Only the unit changes: the SI value stays as it was computed.
 */
import { type Dim, sameDim } from './dimension.ts';
import { type DisplayUnit, unitDim, formatUnit } from './units.ts';

/** Units of the study's inputs, with their texts and the unit names they are made of. */
export interface StudyUnits {
  readonly units: readonly DisplayUnit[];
  readonly texts: ReadonlySet<string>;
  readonly names: ReadonlySet<string>;
}

export function studyUnitsOf(units: readonly DisplayUnit[]): StudyUnits {
  const kept = units.filter((u) => u.length > 0);
  return { units: kept, texts: new Set(kept.map(formatUnit)), names: new Set(kept.flatMap((u) => u.map(([n]) => n))) };
}

/** The unit to show a value of dimension `dim`, computed in `unit`, in. Cost: O(2^terms), terms ≤ a few. */
export function simplestUnit(unit: DisplayUnit, dim: Dim, study: StudyUnits): DisplayUnit {
  if (unit.length === 0 || !sameDim(unitDim(unit), dim)) return unit;
  if (study.texts.has(formatUnit(unit))) return unit;
  const part = smallestPart(unit, dim);
  if (part.length === 1 && study.names.has(part[0][0])) return part;
  const own = new Set(unit.map(([n]) => n));
  const written = study.units.filter((u) => sameDim(unitDim(u), dim));
  const best = written.find((u) => u.every(([n]) => own.has(n))) ?? written[0];
  return best ?? part;
}

/** The fewest terms of `unit` (in their order) whose product has dimension `dim`. */
function smallestPart(unit: DisplayUnit, dim: Dim): DisplayUnit {
  if (unit.length > 8) return unit;
  let best = unit;
  for (let mask = 1; mask < 1 << unit.length; mask++) {
    const part = unit.filter((_, i) => mask & (1 << i));
    if (part.length < best.length && sameDim(unitDim(part), dim)) best = Object.freeze(part);
  }
  return best;
}

/**
 * What of `study` the rule can read for a value of dimension `dim`: its units of that
 * dimension and the unit names a power of which has it. A value shown in the study's units
 * is shown again only when this changes. Cost: O(study units).
 */
export function studyUnitsKey(study: StudyUnits, dim: Dim): string {
  // asked for each parameter on every evaluation: kept per study units and dimension
  let keys = unitsKeys.get(study);
  if (!keys) unitsKeys.set(study, keys = new Map());
  const dimKey = dim.join(',');
  let key = keys.get(dimKey);
  if (key === undefined) keys.set(dimKey, key = unitsKeyOf(study, dim));
  return key;
}

const unitsKeys = new WeakMap<StudyUnits, Map<string, string>>();

function unitsKeyOf(study: StudyUnits, dim: Dim): string {
  const units = study.units.filter((u) => sameDim(unitDim(u), dim)).map(formatUnit);
  const names = [...study.names].filter((n) => [1, -1, 2, -2, 3, -3].some((p) => sameDim(unitDim([[n, p]]), dim)));
  return `${units.join(';')}|${names.join(';')}`;
}
