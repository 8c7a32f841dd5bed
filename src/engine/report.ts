/**
 * The report of the study-format contract: what `ratebook run --json` prints, typed per cell
 * kind. A cell's report is its common fields (id, kind, ok, errors) and the fields its kind's
 * nodes output; `NodeOutput<K>` is what a builder of kind K may output, so the registry in
 * cells/index.ts checks each builder against its kind here. Each kind's fields are typed in a
 * file of their own (report-inputs.ts, report-phase.ts, report-run.ts, report-measured.ts,
 * report-solve.ts, report-uncertainty.ts, report-scenarios.ts) and exported from here.
 */
import type { CellKind } from '../study/types.ts';
import type { CellError, MessagePart } from './node.ts';
import type { GlanceEntry } from '../output/glance.ts';
import type { ParametersFields, RateFields } from './report-inputs.ts';
import type { PhaseFields } from './report-phase.ts';
import type { SimulateFields } from './report-run.ts';
import type { DataFields, FitFields, NcaFields } from './report-measured.ts';
import type { SolveFields } from './report-solve.ts';
import type { UncertaintyFields } from './report-uncertainty.ts';
import type { SensitivityFields, CompareFields } from './report-scenarios.ts';

export type { ReportQuantity } from '../units/quantity.ts';
export type { SimulationPlot } from '../simulate/plot-data.ts';
export type * from './report-inputs.ts';
export type * from './report-phase.ts';
export type * from './report-run.ts';
export type * from './report-measured.ts';
export type * from './report-solve.ts';
export type * from './report-uncertainty.ts';
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

/** A note cell adds nothing to its report. */
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
