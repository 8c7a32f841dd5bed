/**
 * The report fields of the cells that re-run a study with values replaced and set the answers
 * side by side: `sensitivity` (slopes of results against parameters) and `compare` (a run
 * under named scenarios). Part of `CellFields` in report.ts.
 */
import type { ReportQuantity } from '../units/quantity.ts';
import type { SimulationPlot } from '../simulate/plot-data.ts';
import type { FindResult } from './report-run.ts';

/** One slope of a sensitivity cell: a name in `of` against one parameter. */
export interface SensitivityEntry {
  /** d of / d parameter, in the simplest unit of of's unit over the parameter's; null when it could not be formed (see `note`). */
  coefficient: ReportQuantity | null;
  /** d ln of / d ln parameter: the share by which of changes per share of change of the parameter; null with `note` saying why. */
  normalized: number | null;
  /** Why `normalized` or `coefficient` is null, or why the coefficient is 0 (of does not depend on the parameter). */
  note?: string;
  /** Where one side of the parameter gave of no value: the slope is one-sided, from this side. */
  oneSided?: 'above' | 'below';
}

export interface SensitivityFields {
  /** `results[of][parameter]`. */
  results: Record<string, Record<string, SensitivityEntry>>;
  /** Every pair, largest |normalized| first (pairs without one after, in the cell's order). */
  ranking: Array<{ of: string; parameter: string }>;
  /** The relative accuracy of a run assumed for the step (the step rule: slopes.ts). */
  accuracy: number;
  /** How good each slope is, in words: about accuracy^(2/3) relative (slopes.ts), and the runs' accuracy. */
  accuracyWords: string;
  /** What-if runs made. */
  evaluations: number;
  summary: string;
}

/** One scenario of a compare cell, as run. */
export interface CompareScenarioReport {
  name: string;
  ok: boolean;
  /** The run's answers under the scenario, keyed as the run's `results`. */
  results: Record<string, FindResult>;
  /** The values the scenario replaced, as read (in the units they were written in). */
  set: Record<string, ReportQuantity>;
  /** Why the scenario has no answers or curve (a run that failed with these values). */
  message?: string;
}

/**
 * Every scenario's curves on one chart, in the shape of a run's plot: one entry of `states`
 * per scenario and state (named by the scenario, and the state when the run has several), on
 * one time axis; `series` says which scenario and state each entry is, in the same order.
 */
export interface ComparePlot extends SimulationPlot {
  series: Array<{ scenario: string; state: string }>;
}

export interface CompareFields {
  scenarios: CompareScenarioReport[];
  plot: ComparePlot;
  /** The run's questions, in its order: the rows of the scenario table. */
  questions: string[];
  evaluations: number;
  summary: string;
}
