/**
 * The report fields of an `uncertainty` cell: each name's figures (Monte Carlo or linear), the
 * inputs drawn, histograms and the bands around runs. Part of `CellFields` in report.ts.
 */
import type { ReportQuantity } from '../units/quantity.ts';

/** A histogram of one result: bin edges (one more than counts) in `unit`. */
export interface Histogram {
  unit: string;
  edges: number[];
  counts: number[];
}

/** What an uncertainty cell found for one name. */
export interface UncertaintyResult {
  /** Quantities (mean, median, percentiles in the name's unit, sd a difference); absent for a verdict. */
  mean?: ReportQuantity;
  sd?: ReportQuantity;
  median?: ReportQuantity;
  p025?: ReportQuantity;
  p975?: ReportQuantity;
  /** For a yes/no verdict: the share of samples in which it is yes. */
  probability?: number;
  /** Monte Carlo (a Ratebook addition): the probability's standard error sqrt(p(1 − p)/n), its Wilson 95% interval, the probability shown to the place of its standard error's first digit ("62%"). */
  probabilitySE?: number;
  probabilityCI95?: { low: number; high: number };
  shown?: string;
  /** Monte Carlo (a Ratebook addition): the mean's standard error SD/sqrt(n), a difference in the SD's unit. */
  meanSE?: ReportQuantity;
  /** Monte Carlo (a Ratebook addition): how precise the figure is, in words: the place it is shown to and how many samples would settle that digit (JCGM 101:2008 7.9). */
  precision?: string;
  /** Monte Carlo (a Ratebook addition): each percentile's own precision, from order statistics. */
  percentiles?: { p025: PercentilePrecision; median: PercentilePrecision; p975: PercentilePrecision };
  /** Monte Carlo (a Ratebook addition): the SD's standard error for large n, sd·sqrt((κ − 1)/(4n)) with the samples' kurtosis κ, in the SD's unit. */
  sdSE?: ReportQuantity;
  /** Monte Carlo (a Ratebook addition): the percentiles' and the SD's precision in words. */
  percentilePrecision?: string;
  /**
   * Monte Carlo (a Ratebook addition): the mean and the SD as shown, each with its unit, to the
   * place of its own standard error's first digit, and the two standard errors with one or two
   * significant digits (the Particle Data Group's rule): `{ mean: "13.2 mg / L", meanSE: "0.14 mg / L", sd: "6.1 mg / L", sdSE: "0.12 mg / L" }`.
   * Display only: `mean`, `sd`, `meanSE`, `sdSE` keep their full values.
   */
  shownFigures?: { mean: string; meanSE: string; sd: string; sdSE: string };
  /** For a verdict under the linear method: its value at the present values. */
  truth?: boolean;
  /** Monte Carlo: the samples' histogram. */
  histogram?: Histogram;
  /** Samples in which the name had no value, and the first reason. */
  failed: number;
  reason?: string;
}

/**
 * A Monte Carlo percentile's precision (a Ratebook addition): its distribution-free 95% interval
 * from order statistics, the standard uncertainty that interval gives, and the percentile shown
 * to the place that uncertainty supports.
 */
export interface PercentilePrecision {
  /** The percentile with its unit, rounded to the place of the first digit of `u` ("3.1 h"), to at most 12 significant digits; 4 significant figures where there is no `u`. */
  shown: string;
  /** The samples of ranks `ranks[0]` and `ranks[1]` (1-based, ascending) hold the percentile of the distribution with probability `coverage` (at least 0.95); absent with too few samples. */
  ci95?: { low: ReportQuantity; high: ReportQuantity };
  ranks?: [number, number];
  coverage?: number;
  /** Standard uncertainty: `ci95`'s width / (2 · 1.96), a difference in the SD's unit. */
  u?: ReportQuantity;
}

/** An uncertain input as the cell drew it. */
export interface UncertainInput {
  name: string;
  /** For a fit's estimate: the fit cell whose covariance it is drawn from. */
  cell?: string;
  /** In words: "0.6 /h ± 15% (log-normal)", "fit "cooling", joint normal, SE 0.01 /h". */
  text: string;
}

/**
 * A run's band from an uncertainty cell's samples (a Ratebook addition): the 2.5 and 97.5
 * percentiles and the median of each state at fixed times, in the run's plot units. `reason`
 * instead when there is none (the run's curves depend on no input with a spread).
 */
export interface UncertaintyBand {
  /** The simulate cell's id. */
  run: string;
  /** Times in the run's plot time unit: 201 evenly over the span, and both sides of each action time. */
  timeUnit?: string;
  t?: number[];
  /** Per state of the run, in its unit: the percentile curves at the times `t`. */
  states?: Array<{ name: string; unit: string; p025: number[]; median: number[]; p975: number[] }>;
  /** Samples the band is drawn from, and those in which the run gave no curve (with the first reason). */
  samples?: number;
  failed?: number;
  failedReason?: string;
  /** What the band is, in words (for the chart's note). */
  note?: string;
  reason?: string;
}

export interface UncertaintyFields {
  method: 'monte-carlo' | 'linear';
  results: Record<string, UncertaintyResult>;
  inputs: UncertainInput[];
  /** Monte Carlo: the samples drawn, the seed, and how many had some name undefined (with the first reason). */
  samples?: number;
  seed?: number;
  failed: number;
  failedReason?: string;
  /** What-if runs made. */
  evaluations: number;
  /** How the figures are defined (quantiles, or the linear method's interval). */
  notes: string[];
  summary: string;
  /** The bands of the runs with `band: true` whose answers are among the names (Monte Carlo). */
  bands?: UncertaintyBand[];
  /** A Ratebook addition: per value with a spread of its own computed from values with spreads, which of those it hides (uncertainty-shadows.ts). */
  warnings?: string[];
}
