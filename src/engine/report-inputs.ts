/**
 * The report fields of the cells that give a study its values: `parameters` (each value, its
 * spread, a slider's range) and `rate` (a state's law at its start). Part of `CellFields` in
 * report.ts.
 */
import type { ReportQuantity } from '../units/quantity.ts';
import type { ItemTex } from '../output/sheet-tex.ts';

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
