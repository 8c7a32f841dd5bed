/**
 * Time units a plot's axis can be relabelled in. Only the labels change: the data stay in the
 * unit the engine gave them. The factors are plain definitions (seconds per unit).
 */

/** Seconds in one of each unit the switch offers. */
export const SECONDS_PER: Readonly<Record<string, number>> = { s: 1, min: 60, h: 3600, d: 86400 };

/** The units the switch offers, in this order. */
export const SWITCH_UNITS = ['s', 'min', 'h', 'd'] as const;

/**
 * How many `to` make one `from`: multiply a time in `from` by this to read it in `to`.
 * Undefined when either unit is not in the table (a plot in weeks keeps its own unit).
 */
export function timeFactor(from: string, to: string): number | undefined {
  const a = SECONDS_PER[from];
  const b = SECONDS_PER[to];
  return a === undefined || b === undefined ? undefined : a / b;
}

/**
 * The units worth offering for a run that lasts `span` (in `unit`): the plot's own unit always,
 * and each table unit in which the span reads between 0.5 and 10 000 (so that ticks are
 * neither all fractions nor all huge numbers). Ordered from the smallest unit up.
 */
export function timeUnitChoices(unit: string, span: number): string[] {
  if (SECONDS_PER[unit] === undefined || !(span > 0)) return [unit];
  return SWITCH_UNITS.filter((u) => {
    if (u === unit) return true;
    const inU = span * timeFactor(unit, u)!;
    return inU >= 0.5 && inU <= 10_000;
  });
}
