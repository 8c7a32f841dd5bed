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

/** The exact solution of a law `a + b·state`, beside the run. */
export interface ClosedFormReport {
  form: string;
  rateConstant: ReportQuantity;
  maxError: ReportQuantity;
  maxErrorInTolerances: number;
  timeConstant?: ReportQuantity;
  halfLife?: ReportQuantity;
  doublingTime?: ReportQuantity;
  equilibrium?: ReportQuantity;
  stable?: boolean;
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
