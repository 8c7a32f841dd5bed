/**
 * The report fields of the cells that read measurements: `data` (the table as read), `fit`
 * (estimates, residuals, the fit's figures) and `nca` (non-compartmental values). Part of
 * `CellFields` in report.ts.
 */
import type { ReportQuantity } from '../units/quantity.ts';
import type { SimulationPlot } from '../simulate/plot-data.ts';
import type { CsvRowProblem } from '../csv/read.ts';

/** What reading a data cell's CSV text said: notes on what was interpreted, the start of clock times, refused rows. */
export interface CsvReadReport {
  notes: string[];
  start?: string;
  problems?: CsvRowProblem[];
}

export interface DataFields {
  columns: Array<{ name: string; unit: string }>;
  rowCount: number;
  missing?: string[];
  note?: string;
  csv?: CsvReadReport;
}

export interface EstimateReport {
  value: ReportQuantity;
  standardError?: ReportQuantity;
  ci95?: ReportQuantity[];
  atBound?: true;
  /**
   * A Bayesian fit's estimate with a prior: the prior's median (in the estimate's unit) and
   * omega, and how far the data moved the estimate from it: `ratio` = estimate / median,
   * `shift` = (log estimate − log median) / omega (in omegas).
   */
  prior?: { median: ReportQuantity; omega: number; ratio: number; shift: number };
  /** The posterior SD of log P, for an estimate with a prior: its ci95 is exp(log P̂ ± 1.96·logSD). */
  logSD?: number;
}

export interface FitResidual {
  /** 1-based row of the data. */
  row: number;
  state: string;
  time: ReportQuantity;
  residual: ReportQuantity;
}

export interface FitFields {
  estimates: Record<string, EstimateReport>;
  /**
   * The objective at the estimate: the sum of squared (weighted) residuals; with an error
   * model, Σ((y − f)/σ)² plus, for a Bayesian fit, Σ(log P − log median)²/omega².
   */
  objective?: number;
  /** True for a Bayesian (MAP) estimate: some estimate has a prior. */
  bayesian?: true;
  /** The error model, when given: σ² = additive² + (proportional · f)². */
  errorModel?: { additive?: ReportQuantity; proportional: number };
  residualSD?: ReportQuantity;
  n: number;
  dof: number;
  iterations: number;
  evaluations: number;
  /**
   * Significant digits of every estimate the fit vouches for, from the run's tolerance, the
   * Jacobian's error and the distance left to the optimum (numerics/fit/fit-digits.ts);
   * absent for a fit with priors or an error model, an estimate on a bound, or a singular fit.
   */
  digits?: number;
  converged: boolean;
  message: string;
  correlation?: { names: string[]; matrix: number[][] };
  warnings?: string[];
  residuals: FitResidual[];
  /** The least half-height of a plot of the residuals around zero (output/residuals.ts), in the first observed state's difference unit. */
  residualFloor?: ReportQuantity;
  summary: string;
  /** The fitted curve over the data's span, with the measurements as points. */
  plot?: SimulationPlot;
}

export interface NcaFields {
  values: Record<string, ReportQuantity>;
  pointsUsed: { count: number; times: ReportQuantity[] };
  note?: string;
  warnings?: string[];
}
