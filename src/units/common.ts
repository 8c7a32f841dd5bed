/**
 * The units the study's trades (dosing, cooling and heating, tanks and flows) write as units.
 * A study name spelled like one of these is worth a warning: `h` or `L` as a name is likely to
 * be read as hours or litres by someone. A name spelled like any other unit (T for tesla, C for
 * coulomb, V for volt, A for ampere, S for siemens, F for farad, H for henry, N for newton) is
 * not: in these trades those letters are temperatures, concentrations, volumes, areas and
 * amounts, and warning about them buries the warnings that matter.
 */

/** Common units, by spelling: time, volume, mass, amount, length, temperature, energy, power, pressure. */
export const COMMON_UNITS: ReadonlySet<string> = new Set([
  // time
  's', 'min', 'h', 'd', 'hr', 'day', 'hour', 'minute', 'week',
  // volume
  'L', 'l', 'mL', 'dL', 'uL', 'gal',
  // mass and amount
  'g', 'mg', 'ug', 'kg', 'lb', 'oz', 'mol', 'mmol', 'umol',
  // length and area
  'm', 'cm', 'mm', 'km', 'ft', 'inch',
  // temperature
  'K', 'degC', 'degF',
  // energy and power
  'J', 'kJ', 'cal', 'kcal', 'W', 'kW',
  // pressure
  'Pa', 'kPa', 'bar', 'atm', 'psi', 'mmHg',
]);

/** True when `name` is spelled like a unit these trades write (see COMMON_UNITS). */
export function isCommonUnit(name: string): boolean {
  return COMMON_UNITS.has(name);
}
