/**
 * The edit that writes a solve cell's answer into the study: the value it defines (the rounded
 * one when it rounds, else the solution to 6 significant figures) becomes the text of the
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

/** The value as text a field reads back: `1500 mg`, `0.2 /h`, `4.5 degC`. */
export function solutionText(q: ReportQuantity, exact: boolean): string {
  const v = exact ? String(q.value) : formatNumber(q.value, 6);
  return q.unit ? `${v} ${unitAfterNumber(q.unit)}` : v;
}

/**
 * The edit for the solve cell `solve` given its report; undefined when it has no answer or
 * the varied name is neither a parameter nor a state of the study.
 */
export function solutionEdit(cells: readonly Cell[], solve: SolveCell, report: { ok: boolean; solution?: ReportQuantity; rounded?: ReportQuantity } | undefined): SolutionEdit | undefined {
  if (!report?.ok || !report.solution) return undefined;
  const name = solve.vary?.parameter;
  const text = report.rounded ? solutionText(report.rounded, true) : solutionText(report.solution, Array.isArray(solve.vary?.choices));
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
