/**
 * The report of the study-format contract: what `ratebook run --json` prints, typed per cell
 * kind. A cell's report is its common fields (id, kind, ok, errors) and the fields its kind's
 * nodes output; `NodeOutput<K>` is what a builder of kind K may output, so the registry in
 * cells/index.ts checks each builder against its kind here.
 */
import type { CellKind } from '../study/types.ts';
import type { CellError, MessagePart } from './node.ts';
import type { ReportQuantity } from '../units/quantity.ts';
import type { SimulationPlot } from '../simulate/plot-data.ts';
import type { Stability } from '../numerics/phase/equilibria.ts';
import type { CsvRowProblem } from '../csv/read.ts';
import type { GlanceEntry } from '../output/glance.ts';
import type { ItemTex } from '../output/sheet-tex.ts';
import type { Side } from '../numerics/phase/approach.ts';
import type { SensitivityFields, CompareFields } from './report-scenarios.ts';

export type { ReportQuantity } from '../units/quantity.ts';
export type { SimulationPlot } from '../simulate/plot-data.ts';
export type * from './report-scenarios.ts';

/** What every cell's report has, whatever its kind. */
export interface ReportBase<K extends CellKind = CellKind> {
  id: string;
  kind: K;
  title?: string;
  ok: boolean;
  error?: CellError;
  /** Every problem of the cell, the first of which is `error`. */
  errors?: CellError[];
  /** Ids of upstream cells whose failure this cell waits on. */
  waitsOn?: string[];
}

/** Output of a node that only checked its cell (mode 'check'), or that explains why it computed nothing. */
export interface Unfinished {
  computed?: false;
  message?: string;
}

// parameters

/** A parameter's value: a quantity, `truth` for a condition, `range` for a slider. */
export interface ParameterValue extends ReportQuantity {
  truth?: boolean;
  /** Given with a picked `unit`: the unit the value is shown in with no pick. */
  originalUnit?: string;
  range?: ReportQuantity[];
  /** Its spread (a Ratebook report of the `spread` field), in the value's unit. */
  spread?: SpreadReport;
}

/**
 * A parameter's spread as reported: the distribution, its figures in the value's unit (`sd`
 * a difference for a temperature), and `text` for people ("0.6 /h ± 15%", "0.6 /h ± 0.05 /h",
 * "0.5–0.7 /h").
 */
export interface SpreadReport {
  distribution: 'normal' | 'lognormal' | 'uniform';
  sd?: ReportQuantity;
  cv?: number;
  from?: ReportQuantity;
  to?: ReportQuantity;
  text: string;
  /** A Ratebook addition: on a value computed from values with spreads of their own, that this spread stands for theirs, naming them. */
  note?: string;
}

export interface ParametersFields {
  values: Record<string, ParameterValue>;
  /** By item name: the TeX of its name and value, for the printed sheet (added by the session). */
  tex?: Record<string, ItemTex>;
}

// rate

export interface RateFields {
  state: string;
  /** The state's unit as text. */
  unit: string;
  /** The unit the initial value is written in, when it is not `unit`. */
  originalUnit?: string;
  initial: ReportQuantity;
  /** The law at the initial state and t = 0. */
  rateAtStart: ReportQuantity;
  warning?: string;
  /** The law as a TeX equation, for the printed sheet (added by the session). */
  tex?: string;
}

// phase

export interface PhaseEquilibrium extends ReportQuantity {
  stability: Stability;
  /** df/dy at the point, per the law's time unit. */
  slope: ReportQuantity;
  /** A semi-stable point's side: `below` when the rate is positive on both sides, `above` when negative. */
  attractsFrom?: Side;
}

export interface PhaseInterval {
  from: ReportQuantity | null;
  to: ReportQuantity | null;
  sign: '+' | '-' | '0' | 'none';
}

export interface QuantitySpan {
  from: ReportQuantity;
  to: ReportQuantity;
}

/** What the phase plot draws, in the study's units. */
export interface PhasePlotData {
  stateUnit: string;
  rateUnit: string;
  timeUnit: string;
  y: Array<number | null>;
  f: Array<number | null>;
  solutions: Array<{ start: number | null; t: number[]; y: Array<number | null> }>;
}

export interface SweepPoint {
  parameter: ReportQuantity;
  value: ReportQuantity;
  stability: Stability;
}

export interface SweepFold {
  parameter: ReportQuantity;
  value: ReportQuantity;
  pair: 'vanishes' | 'appears';
  located: 'newton' | 'bisection' | 'grid';
  converged: boolean;
}

export interface SweepReport {
  parameter: string;
  range: ReportQuantity[];
  branches: SweepPoint[][];
  folds: SweepFold[];
  evaluations: number;
  summary: string;
  warnings?: string[];
  incomplete?: string;
}

export interface PhaseFields {
  equilibria: PhaseEquilibrium[];
  intervals: PhaseInterval[];
  poles?: ReportQuantity[];
  jumps?: ReportQuantity[];
  gaps?: QuantitySpan[];
  zeroIntervals?: QuantitySpan[];
  evaluations: number;
  notes?: string[];
  plot: PhasePlotData;
  summary: string;
  sweep?: SweepReport;
}

// simulate

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

// data

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

// fit

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

// nca

export interface NcaFields {
  values: Record<string, ReportQuantity>;
  pointsUsed: { count: number; times: ReportQuantity[] };
  note?: string;
  warnings?: string[];
}

// solve

/** One value tried by a solve cell with `choices`: what the target gives there, or why it has no value. */
export interface SolveChoice {
  value: ReportQuantity;
  achieved?: ReportQuantity;
  reason?: string;
  /** The choice whose target is nearest the wanted value: the one defined. */
  chosen?: true;
}

export interface SolveFields {
  /** The value found (in the unit of `vary.min`, or of the choices). */
  solution: ReportQuantity;
  /** The target at the solution (in the unit of `target.equals`). */
  achieved: ReportQuantity;
  /** The solution rounded to a multiple of `vary.roundTo`, and the target there (absent when it has no value there: see `message`). */
  rounded?: ReportQuantity;
  achievedRounded?: ReportQuantity;
  /** Every value in [min, max] that meets the target, smallest first. */
  solutions?: ReportQuantity[];
  /** The target's lowest and highest value seen over [min, max] (also given when no value meets it). */
  targetRange?: { low: ReportQuantity; high: ReportQuantity };
  /** Stretches of [min, max] where the target has no value, with the first reason. */
  undefinedIn?: Array<{ from: ReportQuantity; to: ReportQuantity; reason: string }>;
  /** With `choices`: the target at each, in the order given. */
  choices?: SolveChoice[];
  /** What-if runs made. */
  evaluations: number;
  message: string;
}

// uncertainty

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
  /** Monte Carlo (a Ratebook addition): how precise the figure is, in words, and whether the samples were enough for its digits (JCGM 101:2008 7.9). */
  precision?: string;
  /** Monte Carlo (a Ratebook addition): each percentile's own precision, from order statistics. */
  percentiles?: { p025: PercentilePrecision; median: PercentilePrecision; p975: PercentilePrecision };
  /** Monte Carlo (a Ratebook addition): the SD's standard error for large n, sd·sqrt((κ − 1)/(4n)) with the samples' kurtosis κ, in the SD's unit. */
  sdSE?: ReportQuantity;
  /** Monte Carlo (a Ratebook addition): the percentiles' and the SD's precision in words. */
  percentilePrecision?: string;
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

// note

export type NoteFields = Record<never, never>;

/** The fields each kind adds to its cell's report. */
export interface CellFields {
  parameters: ParametersFields;
  rate: RateFields;
  phase: PhaseFields;
  simulate: SimulateFields;
  data: DataFields;
  fit: FitFields;
  nca: NcaFields;
  solve: SolveFields;
  uncertainty: UncertaintyFields;
  note: NoteFields;
  sensitivity: SensitivityFields;
  compare: CompareFields;
}

/**
 * What one node of a cell of kind K outputs: some of its kind's fields (a rate cell's state
 * node gives `state`, its law node `rateAtStart`), merged into the cell's report.
 */
export type NodeOutput<K extends CellKind> = Partial<CellFields[K]> & Unfinished;

/** Every field name some kind adds. */
type AnyField = { [K in CellKind]: keyof CellFields[K] }[CellKind];

/** The fields of the other kinds, marked absent: any cell report can be asked for any field. */
type OtherFields<K extends CellKind> = { [P in Exclude<AnyField, keyof CellFields[K] | keyof Unfinished>]?: undefined };

/**
 * The report of a cell of kind K. Its kind's fields are absent when the cell failed or was
 * only checked; other kinds' fields are always absent.
 */
export type ReportOf<K extends CellKind> = ReportBase<K> & Unfinished & Partial<CellFields[K]> & OtherFields<K>;

/** The report of one cell: narrow it on `kind`. */
export type CellReport = { [K in CellKind]: ReportOf<K> }[CellKind];

export interface Report {
  title: string;
  ok: boolean;
  warnings: string[];
  /** The same warnings as message parts, one list per warning in order: their places as `{ path }`, for words. */
  warningParts?: MessagePart[][];
  /** Cautions the study must show (doses, temperature limits), in the order to show them. */
  cautions: Array<{ kind: string; text: string }>;
  /** The results at a glance, chosen by the engine (see output/glance.ts). */
  glance?: GlanceEntry[];
  cells: CellReport[];
}

/** Narrows a cell report to its kind. */
export function isKind<K extends CellKind>(r: CellReport, kind: K): r is Extract<CellReport, { kind: K }> {
  return r.kind === kind;
}

/** Merges node outputs of one cell: objects merge key by key, other values are replaced. */
export function mergeOutput(into: Record<string, unknown>, part: object): void {
  for (const [k, v] of Object.entries(part)) {
    const old = into[k];
    if (isPlain(old) && isPlain(v)) into[k] = { ...old, ...v };
    else into[k] = v;
  }
}

function isPlain(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}
