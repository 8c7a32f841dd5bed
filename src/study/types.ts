/**
 * The study document, version 1, as fixed by the study-format contract. Fields hold the
 * user's text (expressions are strings); nothing here is evaluated.
 */
import { METHODS, type Method } from '../numerics/ode/integrate.ts';
export const FORMAT = 'ratebook-study';
export const CURRENT_VERSION = 1;

export const CELL_KINDS = ['parameters', 'rate', 'phase', 'simulate', 'data', 'fit', 'nca', 'solve', 'note', 'sensitivity', 'compare', 'uncertainty'] as const;
export type CellKind = (typeof CELL_KINDS)[number];

export interface CellBase {
  id: string;
  kind: CellKind;
  title?: string;
}

export interface ParameterItem {
  name: string;
  value: string;
  range?: [string, string];
  note?: string;
  /** The unit to show the value in (optional; the unit written in `value` otherwise). */
  unit?: string;
  /** Listed among the results at a glance (optional; see output/glance.ts). */
  glance?: boolean;
  /** How uncertain the value is (optional): a distribution around it, for the uncertainty cell. */
  spread?: ParameterSpread;
}

/** The distributions a parameter's spread may take. */
export const DISTRIBUTIONS = ['normal', 'lognormal', 'uniform'] as const;
export type Distribution = (typeof DISTRIBUTIONS)[number];
/**
 * A parameter's spread: `normal` with `sd` (an expression in the value's unit), `lognormal`
 * with `cv` (a plain number; the value is the median), `uniform` from `from` to `to`.
 */
export interface ParameterSpread {
  distribution: Distribution;
  sd?: string;
  cv?: number | string;
  from?: string;
  to?: string;
}

export interface ParametersCell extends CellBase { kind: 'parameters'; items: ParameterItem[] }
export interface RateCell extends CellBase { kind: 'rate'; state: string; unit: string; rate: string; initial: string }
export interface PhaseCell extends CellBase {
  kind: 'phase';
  rate: string;
  from: string;
  to: string;
  sweep?: { name: string; from: string; to: string; steps: number };
}

/** A simulate cell's integration methods: the solver's own list, so the two cannot drift apart. */
export { METHODS, type Method };

export interface ScheduleEvent {
  at: string;
  every?: string;
  /**
   * How many times the event acts: a whole number, or an expression giving one (`n_doses`,
   * `round(72 h / tau)`). None: it repeats every `every` until the end of the run.
   */
  count?: number | string;
  for?: string;
  add?: Record<string, string>;
  set?: Record<string, string>;
  infuse?: Record<string, string>;
}

export const FIND_KINDS = ['crossing', 'maximum', 'minimum', 'timeOfMaximum', 'timeOfMinimum', 'valueOf', 'integralOf', 'timeAbove', 'timeBelow'] as const;
/** What a question asks (one of FIND_KINDS). */
export type FindKind = (typeof FIND_KINDS)[number];

export interface FindQuery {
  name: string;
  crossing?: string; maximum?: string; minimum?: string; timeOfMaximum?: string; timeOfMinimum?: string;
  valueOf?: string; integralOf?: string; timeAbove?: string; timeBelow?: string;
  level?: string;
  direction?: 'up' | 'down' | 'either';
  occurrence?: number;
  at?: string;
  from?: string;
  to?: string;
  /** The unit to show the answer in (optional). */
  unit?: string;
  /** Listed among the results at a glance (optional; see output/glance.ts). */
  glance?: boolean;
}

export interface SimulateCell extends CellBase {
  kind: 'simulate';
  rates: string[];
  from: string;
  to: string;
  method?: Method;
  step?: string;
  tolerance?: { relative?: number; absolute?: string };
  events?: ScheduleEvent[];
  find?: FindQuery[];
  /**
   * How the plot's state axis is drawn (optional, a Ratebook display field): `linear` (the
   * default) or `log`. It changes no value the run computes.
   */
  plotScale?: PlotScale;
  /**
   * Show the band of the 2.5 and 97.5 percentiles around the curves (optional, a Ratebook
   * display field, true or false): drawn from the samples of an uncertainty cell that asks about
   * this run's answers. It changes no value the run computes.
   */
  band?: boolean;
}

/** The state axis of a simulate cell's plot: linear, or logarithmic (base 10). */
export const PLOT_SCALES = ['linear', 'log'] as const;
export type PlotScale = (typeof PLOT_SCALES)[number];

export interface DataColumn { name: string; unit: string }
export interface DataCell extends CellBase { kind: 'data'; columns: DataColumn[]; rows?: Array<Array<number | null>>; csv?: string }

export const WEIGHTINGS = ['none', 'relative', 'proportional'] as const;
/**
 * A log-normal prior on an estimate: log P ~ N(log median, omega²). `omega` is a plain number,
 * written as a number or as an expression.
 */
export interface FitPrior { median: string; omega: number | string }
export interface FitEstimate {
  parameter: string; as: string; guess: string; min?: string; max?: string;
  /** unit to show the estimate in (optional) */ unit?: string;
  /** makes the fit a Bayesian (MAP) estimate (optional) */ prior?: FitPrior;
}
/**
 * A fit's error model: σ² = additive² + (proportional · f)². `additive` is an expression in the
 * observed column's unit; `proportional` a plain number (a number or an expression).
 */
export interface FitErrorModel { additive?: string; proportional?: number | string }
export interface FitCell extends CellBase {
  kind: 'fit';
  /** The rate cells whose laws are fitted from t = 0 with no events; absent when `run` is given. */
  rates?: string[];
  /** A simulate cell whose span start, laws and whole schedule are the model (instead of `rates`). */
  run?: string;
  data: string;
  time: string;
  observe: Record<string, string>;
  estimate: FitEstimate[];
  weighting?: (typeof WEIGHTINGS)[number];
  /** The measurement error model (required when an estimate has a prior). */
  error?: FitErrorModel;
  /**
   * How the fitted curve's state axis is drawn (optional, a Ratebook display field), as a
   * simulate cell's `plotScale`; the residual plot stays linear (residuals are signed).
   */
  plotScale?: PlotScale;
}

export const ROUTES = ['iv-bolus', 'infusion', 'extravascular'] as const;
/** What a profile summary defines (each with the cell's prefix). */
export const NCA_RESULTS: readonly string[] = ['Cmax', 'tmax', 'Clast', 'tlast', 'AUClast', 'AUCinf', 'AUCextrap', 'lambda_z', 't_half', 'CL', 'Vz', 'AUMClast', 'MRT', 'r2adj'];
export const AUC_RULES = ['linear', 'linear-up-log-down'] as const;
export interface NcaCell extends CellBase {
  kind: 'nca';
  data: string;
  time: string;
  concentration: string;
  dose: string;
  route: (typeof ROUTES)[number];
  duration?: string;
  auc?: (typeof AUC_RULES)[number];
  terminal?: 'auto' | number;
  prefix?: string;
  /** Units to show results in, by result name without the prefix (optional): { "CL": "L / h" }. */
  units?: Record<string, string>;
}

export interface NoteCell extends CellBase { kind: 'note'; text: string }

/**
 * A solve cell: the value of a parameter (or a state's initial value) in [min, max], or among
 * `choices`, at which the target expression equals `equals` (cells/solve.ts).
 */
export interface SolveCell extends CellBase {
  kind: 'solve';
  vary: {
    parameter: string;
    as: string;
    min?: string;
    max?: string;
    /** Round the solution to a multiple of this (a vial, a tablet, a pump setting). */
    roundTo?: string;
    /** Values to try instead of a range; the one whose target is nearest is defined. */
    choices?: string[];
    /** With several solutions, the one nearest this is defined (default: the smallest). */
    guess?: string;
  };
  target: { value: string; equals: string };
}

/** How an uncertainty cell propagates: sampling, or first-order (the law of propagation of uncertainty). */
export const UNCERTAINTY_METHODS = ['monte-carlo', 'linear'] as const;
export type UncertaintyMethod = (typeof UNCERTAINTY_METHODS)[number];
/** The most samples an uncertainty cell draws. */
export const MAX_SAMPLES = 100_000;
/**
 * An uncertainty cell: every spread and fit covariance upstream of the names in `of` carried to
 * them (cells/uncertainty.ts).
 */
export interface UncertaintyCell extends CellBase {
  kind: 'uncertainty';
  of: string[];
  method?: UncertaintyMethod;
  /** Monte Carlo samples, 1 to MAX_SAMPLES (default 2000). */
  samples?: number;
  /** The seed of the draws, a whole number from 0 to 4294967295 (default 1). */
  seed?: number;
}

/**
 * A sensitivity cell: for each name in `of` and each parameter (or state, its initial value),
 * d of / d parameter and d ln of / d ln parameter (cells/sensitivity.ts).
 */
export interface SensitivityCell extends CellBase { kind: 'sensitivity'; of: string[]; parameters: string[] }

/** One scenario of a compare cell: its name (a part of the names it defines) and the values it replaces. */
export interface CompareScenario { name: string; set: Record<string, string> }
/** A compare cell: the simulate cell `run` again under each scenario (cells/compare.ts). */
export interface CompareCell extends CellBase { kind: 'compare'; run: string; scenarios: CompareScenario[] }

export type Cell = ParametersCell | RateCell | PhaseCell | SimulateCell | DataCell | FitCell | NcaCell | SolveCell | NoteCell
  | SensitivityCell | CompareCell | UncertaintyCell;

export interface Study {
  format: typeof FORMAT;
  version: number;
  title: string;
  description?: string;
  /** Who prepared the study (optional; printed on the sheet). */
  author?: string;
  cells: Cell[];
}

export const NAME_PATTERN = /^[A-Za-z_][A-Za-z0-9_]*$/;
export const ID_PATTERN = /^[a-z][a-z0-9_-]*$/;
