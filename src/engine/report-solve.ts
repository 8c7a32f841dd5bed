/**
 * The report fields of a `solve` cell: the value found for the target, its rounding, every
 * solution in the range, or the target at each choice. Part of `CellFields` in report.ts.
 */
import type { ReportQuantity } from '../units/quantity.ts';

/** One value tried by a solve cell with `choices`: what the target gives there, or why it has no value. */
export interface SolveChoice {
  value: ReportQuantity;
  achieved?: ReportQuantity;
  reason?: string;
  /** The choice whose target is nearest the wanted value: the one defined. */
  chosen?: true;
}

export interface SolveFields {
  /** The value found (in the unit of `vary.min`, or of the choices), as computed: the name defined downstream has it whole. */
  solution: ReportQuantity;
  /**
   * Over a range: the significant digits of `solution` its accuracy supports (the runs'
   * tolerance over the target's slope, and the search's own; the rule in `cells/solve-digits.ts`),
   * the digits the app shows it with and writes it with; absent when nothing bounds the runs'
   * error (a fixed step).
   */
  digits?: number;
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
