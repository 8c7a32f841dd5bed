/**
 * Short text summaries of results, for screen readers beside each plot and for the printed
 * sheet: "T falls from 74 degC to 4.31 degC; t_21 (T falls through 21 degC) at 2.643 h".
 * Built from quantities the engine computed; numbers are shown to 4 significant figures.
 */
import { type Quantity, describe } from '../units/quantity.ts';

export interface StatePath {
  readonly name: string;
  readonly start: Quantity;
  readonly end: Quantity;
  readonly min: Quantity;
  readonly max: Quantity;
}

export interface FoundText {
  readonly name: string;
  /** What was asked, in words: "T falls through 21 degC". */
  readonly what: string;
  /** The answer, or the reason there is none. */
  readonly answer: string;
}

/** One sentence per state, then the answers to the questions asked. */
export function simulationSummary(paths: readonly StatePath[], found: readonly FoundText[]): string {
  const parts = paths.map((p) => {
    const rel = Math.abs(p.end.si - p.start.si) / Math.max(Math.abs(p.start.si), Math.abs(p.end.si), 1e-300);
    const monotone = (p.min.si >= Math.min(p.start.si, p.end.si) * (1 - 1e-12) - 1e-300) && (p.max.si <= Math.max(p.start.si, p.end.si) * (1 + 1e-12) + 1e-300);
    if (rel < 1e-9 && Math.abs(p.max.si - p.min.si) <= 1e-9 * Math.max(Math.abs(p.max.si), 1e-300)) return `${p.name} stays at ${describe(p.start)}`;
    const verb = p.end.si > p.start.si ? 'rises' : 'falls';
    const base = `${p.name} ${verb} from ${describe(p.start)} to ${describe(p.end)}`;
    return monotone ? base : `${base}, between ${describe(p.min)} and ${describe(p.max)}`;
  });
  for (const f of found) parts.push(`${f.name} (${f.what}): ${f.answer}`);
  return `${parts.join('; ')}.`;
}

export interface EquilibriumText {
  readonly value: Quantity;
  readonly stability: string;
}

/** The equilibria and where the state goes from each side: "T settles at 21 degC (attractor)...". */
export function phaseSummary(state: string, equilibria: readonly EquilibriumText[], signs: ReadonlyArray<{ from?: Quantity; to?: Quantity; sign: string }>, poles: readonly Quantity[]): string {
  const parts: string[] = [];
  if (equilibria.length === 0) parts.push(`${state} has no equilibrium in the range`);
  else parts.push(`${state} has ${equilibria.length === 1 ? 'one equilibrium' : `${equilibria.length} equilibria`}: ${equilibria.map((e) => `${describe(e.value)} (${e.stability})`).join(', ')}`);
  for (const p of poles) parts.push(`a pole at ${describe(p)} (not an equilibrium)`);
  const moves = signs.filter((s) => s.sign === '+' || s.sign === '-').map((s) => {
    const where = s.from && s.to ? `between ${describe(s.from)} and ${describe(s.to)}` : s.from ? `above ${describe(s.from)}` : s.to ? `below ${describe(s.to)}` : 'everywhere in the range';
    return `${where} it ${s.sign === '+' ? 'rises' : 'falls'}`;
  });
  if (moves.length) parts.push(moves.join(', '));
  return `${parts.join('; ')}.`;
}

/** Folds of a sweep: "two equilibria meet and vanish at H = 125 kg / d (N = 500 kg)". */
export function sweepSummary(parameter: string, state: string, branches: number, folds: ReadonlyArray<{ parameter: Quantity; value: Quantity; pair: string }>): string {
  const head = `${branches === 1 ? 'one branch' : `${branches} branches`} of equilibria as ${parameter} varies`;
  if (folds.length === 0) return `${head}; no fold in the range.`;
  const f = folds.map((x) => `two equilibria ${x.pair === 'vanishes' ? 'meet and vanish' : 'appear'} at ${parameter} = ${describe(x.parameter)} (${state} = ${describe(x.value)})`);
  return `${head}; ${f.join('; ')}.`;
}
