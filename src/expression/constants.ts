/**
 * Named constants an expression may use. Values are exact in the 2019 SI (SI Brochure,
 * 9th edition, BIPM 2019) or derived from exact values; standard gravity is the CGPM 1901
 * conventional value.
 */
import { type DisplayUnit } from '../units/units.ts';

export interface ConstantDef {
  readonly si: number;
  /** Shown in SI base units. */
  readonly unit: DisplayUnit;
}

const u = (...terms: Array<[string, number]>): DisplayUnit => Object.freeze(terms.map((t) => Object.freeze(t) as readonly [string, number]));

const AVOGADRO = 6.02214076e23;
const BOLTZMANN = 1.380649e-23;

export const CONSTANTS: Readonly<Record<string, ConstantDef>> = Object.freeze({
  pi: { si: Math.PI, unit: u() },
  e: { si: Math.E, unit: u() },
  avogadro: { si: AVOGADRO, unit: u(['mol', -1]) },
  boltzmann: { si: BOLTZMANN, unit: u(['J', 1], ['K', -1]) },
  gasConstant: { si: AVOGADRO * BOLTZMANN, unit: u(['J', 1], ['mol', -1], ['K', -1]) },
  // sigma = 2 pi^5 k^4 / (15 h^3 c^2), exact in the 2019 SI; 5.670374419e-8 to 10 digits
  stefanBoltzmann: { si: 5.670374419e-8, unit: u(['W', 1], ['m', -2], ['K', -4]) },
  gravity: { si: 9.80665, unit: u(['m', 1], ['s', -2]) },
});

export function isConstantName(name: string): boolean {
  return Object.prototype.hasOwnProperty.call(CONSTANTS, name);
}
