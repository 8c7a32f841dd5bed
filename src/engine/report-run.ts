/**
 * The report fields of a `simulate` cell: its answers (or why a crossing was not reached), the
 * exact solution beside the run, the series and what its plot draws. Part of `CellFields` in
 * report.ts.
 */
import type { ReportQuantity } from '../units/quantity.ts';
import type { SimulationPlot } from '../simulate/plot-data.ts';

/** A crossing that did not happen within the run. */
export interface NotReached {
  notReached: true;
  message: string;
  end: ReportQuantity;
}

export type FindResult = ReportQuantity | NotReached;

/** The figures of one law `a + b·state`: b, and with b ≠ 0 its time constant, half-life or doubling time, equilibrium -a/b and whether it attracts. */
export interface LinearFigures {
  rateConstant: ReportQuantity;
  timeConstant?: ReportQuantity;
  halfLife?: ReportQuantity;
  doublingTime?: ReportQuantity;
  equilibrium?: ReportQuantity;
  stable?: boolean;
}

/** A stretch of the run over which one law holds, from one action that changes the law to the next. */
export interface ClosedFormStretch extends LinearFigures {
  from: ReportQuantity;
  to: ReportQuantity;
}

/**
 * The exact solution of a law `a + b·state`, beside the run. Its own figures are those at the
 * start (the contract's); when an action changes a or b within the run (a `set` of a parameter
 * the law reads, an infusion), `stretches` gives each stretch's figures, in order, and the
 * exact solution compared with is the piecewise one.
 */
export interface ClosedFormReport extends LinearFigures {
  form: string;
  maxError: ReportQuantity;
  maxErrorInTolerances: number;
  stretches?: ClosedFormStretch[];
}

export interface SimulateFields {
  method: string;
  steps: number;
  evaluations: number;
  results: Record<string, FindResult>;
  closedForm?: Record<string, ClosedFormReport>;
  /** `t` and one array per state, in SI. */
  series: Record<string, number[]>;
  summary: string;
  /** Each question in words, as the summary puts it. */
  questions: Record<string, string>;
  plot: SimulationPlot;
  /** Each event, in the cell's order: how many times it acts within the run, and its repeats in words. */
  schedule?: Array<{ times: number; repeats: string }>;
  switchedToStiff?: ReportQuantity;
  note?: string;
}
