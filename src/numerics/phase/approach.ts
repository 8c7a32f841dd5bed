/**
 * The side from which a semi-stable equilibrium draws the state in. The rate has one sign on
 * both sides of such a point: positive on both sides, a state just below rises into it and a
 * state just above rises away (it attracts from below); negative on both sides, the reverse.
 */
import type { Equilibrium } from './equilibria.ts';

export type Side = 'below' | 'above';

/**
 * `below` when f > 0 just below the point, `above` when f < 0 just above it; undefined for an
 * attractor or a repeller, and for a semi-stable point whose sides are both unknown (f not
 * defined on either side, so that only a zero slope called it semi-stable). Cost: none.
 */
export function attractsFrom(e: Pick<Equilibrium, 'stability' | 'left' | 'right'>): Side | undefined {
  if (e.stability !== 'semi-stable') return undefined;
  if (e.left === '+') return 'below';
  if (e.right === '-') return 'above';
  return undefined;
}
