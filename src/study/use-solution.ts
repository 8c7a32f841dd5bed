/**
 * The edit that writes a solve cell's answer into the study: the value the cell shows (the
 * rounded one when it rounds, else the solution to the digits its accuracy supports) becomes the text of the
 * varied parameter's value, or of the state's initial value. An ordinary edit: the app applies
 * and undoes it like any other. Pure; reads the document and the solve cell's report.
 */
import type { Cell, ParametersCell, RateCell, SolveCell } from './types.ts';
import type { ReportQuantity } from '../units/quantity.ts';
import { formatNumber } from '../units/quantity.ts';
import { unitAfterNumber } from '../units/units.ts';

export interface SolutionEdit {
  /** The cell to put in place of the one of the same id. */
  readonly cell: Cell;
  /** The value's new text, such as `1500 mg`. */
  readonly text: string;
  /** The name whose value it sets. */
  readonly name: string;
}

/** The digits a solve's answer is shown with when its accuracy is not known: those of every figure of the app. */
export const SHOWN_DIGITS = 4;

/** The value as text a field reads back, `1500 mg`, `0.2 /h`, `4.5 degC`: to `digits` significant digits, or as it is. */
export function solutionText(q: ReportQuantity, digits?: number): string {
  const v = digits === undefined ? String(q.value) : formatNumber(q.value, digits);
  return q.unit ? `${v} ${unitAfterNumber(q.unit)}` : v;
}

/** The text of a solve cell's answer as the cell shows it: a choice or a rounded value as it is, a value found over a range to its `digits`. */
export function shownSolution(solution: ReportQuantity, report: { digits?: number; choices?: unknown }): string {
  return report.choices ? solutionText(solution) : solutionText(solution, report.digits ?? SHOWN_DIGITS);
}

/**
 * The edit for the solve cell `solve` given its report; undefined when it has no answer or
 * the varied name is neither a parameter nor a state of the study. It writes what the cell
 * shows: the rounded value when it rounds, else the answer to the digits it is shown with
 * (`shownSolution`), never a figure the user did not see.
 */
export function solutionEdit(cells: readonly Cell[], solve: SolveCell, report: { ok: boolean; solution?: ReportQuantity; rounded?: ReportQuantity; digits?: number; choices?: unknown } | undefined): SolutionEdit | undefined {
  if (!report?.ok || !report.solution) return undefined;
  const name = solve.vary?.parameter;
  const text = report.rounded ? solutionText(report.rounded) : shownSolution(report.solution, report);
  for (const c of cells) {
    if (c.kind === 'parameters' && Array.isArray(c.items)) {
      const i = c.items.findIndex((it) => it?.name === name);
      if (i < 0) continue;
      const items = c.items.map((it, j) => (j === i ? { ...it, value: text } : it));
      return { cell: { ...c, items } as ParametersCell, text, name };
    }
    if (c.kind === 'rate' && c.state === name) return { cell: { ...c, initial: text } as RateCell, text, name };
  }
  return undefined;
}
