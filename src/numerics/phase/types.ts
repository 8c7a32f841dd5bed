/**
 * The public shapes of a phase-line analysis (`findEquilibria` in `equilibria.ts`): the
 * equilibria with their stability, poles, jumps, gaps, zero intervals, sign intervals, and the
 * options of the search.
 */
export type Stability = 'attractor' | 'repeller' | 'semi-stable';
/** The sign of f somewhere: rising, falling, or zero to within the tolerance. */
export type FSign = '+' | '-' | '0';

export interface Equilibrium {
  /** y* with f(y*) = 0. */
  readonly value: number;
  readonly stability: Stability;
  /** f'(y*): the caller's derivative when given and finite, else the central difference. */
  readonly slope: number;
  readonly slopeSource: 'derivative' | 'difference';
  /** The central-difference estimate of f'(y*) (NaN when f is not defined on either side). */
  readonly slopeDifference: number;
  /** Sign of f just below and just above y* (null where f is not defined there). */
  readonly left: FSign | null;
  readonly right: FSign | null;
  /** f(y*) as evaluated. */
  readonly residual: number;
  /** False when the slope's sign contradicts the side signs (a warning says so too). */
  readonly consistent: boolean;
  /** False when the location could not be refined to tolerance (budget or a failed search). */
  readonly converged: boolean;
}

/** A point where f is not crossed continuously: |f| unbounded (pole) or a finite jump in sign. */
export interface Singularity {
  readonly at: number;
  readonly left: FSign | null;
  readonly right: FSign | null;
}

export interface Span {
  readonly from: number;
  readonly to: number;
}

/**
 * The sign of f on a piece of [from, to]. `from`/`to` null mean the range's own edge.
 * sign: '+' rising, '-' falling, '0' f identically zero there, 'none' f not defined (a gap).
 */
export interface SignInterval {
  readonly from: number | null;
  readonly to: number | null;
  readonly sign: '+' | '-' | '0' | 'none';
}

export interface PhaseAnalysis {
  /** In increasing order of value. */
  readonly equilibria: readonly Equilibrium[];
  /** Points where |f| grows without bound (with or without a change of sign). */
  readonly poles: readonly Singularity[];
  /** Points where f changes sign by a finite jump, without passing through zero. */
  readonly jumps: readonly Singularity[];
  /** Where f is not a finite number (NaN, ±Infinity, or f threw). */
  readonly gaps: readonly Span[];
  /** Where f is identically zero (every point there is an equilibrium). */
  readonly zeroIntervals: readonly Span[];
  /** Cover [from, to] in order, split at every equilibrium, pole, jump, gap and zero interval. */
  readonly intervals: readonly SignInterval[];
  /** Calls of f. */
  readonly evaluations: number;
  /** True when the evaluation budget cut the work short (the result may be incomplete). */
  readonly budgetExhausted: boolean;
  readonly warnings: readonly string[];
  /** Typical |f|: the median of |f| on the initial grid (zero itself is judged locally, see zeroTolerance). */
  readonly scale: { readonly f: number };
}

export interface EquilibriumOptions {
  /** Panels in the initial grid; each panel is two cells (default 32, so 65 samples). */
  readonly panels?: number;
  /** Levels of panel bisection allowed beyond the initial grid (default 6). */
  readonly maxDepth?: number;
  /** Hard cap on calls of f (default 3000). */
  readonly maxEvaluations?: number;
  /** Absolute location tolerance (default 1e-12 times the width of [from, to]). */
  readonly xtol?: number;
  /** Relative location tolerance (default 4 machine epsilons). */
  readonly rtol?: number;
  /**
   * |f| at or below this fraction of the local size of f (the largest |f| on the initial grid
   * within two cells) counts as zero (default 1e-10). Local, so that exp(y) - 5 on [0, 50] is
   * judged near its root by values near its root.
   */
  readonly zeroTolerance?: number;
  /** f'(y), when known exactly: used for the reported slope and to polish touching zeros. */
  readonly derivative?: (y: number) => number;
}
