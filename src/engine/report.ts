/** The report of the study-format contract: what `ratebook run --json` prints. */
import type { CellError } from './node.ts';
import type { GlanceEntry } from '../output/glance.ts';

export interface CellReport {
  id: string;
  kind: string;
  title?: string;
  ok: boolean;
  error?: CellError;
  /** Every problem of the cell, the first of which is `error`. */
  errors?: CellError[];
  /** Ids of upstream cells whose failure this cell waits on. */
  waitsOn?: string[];
  [key: string]: unknown;
}

export interface Report {
  title: string;
  ok: boolean;
  warnings: string[];
  /** Cautions the study must show (doses, temperature limits), in the order to show them. */
  cautions: Array<{ kind: string; text: string }>;
  /** The results at a glance, chosen by the engine (a Ratebook addition; see output/glance.ts). */
  glance?: GlanceEntry[];
  cells: CellReport[];
}

/** Merges node outputs of one cell: objects merge key by key, other values are replaced. */
export function mergeOutput(into: Record<string, unknown>, part: Readonly<Record<string, unknown>>): void {
  for (const [k, v] of Object.entries(part)) {
    const old = into[k];
    if (isPlain(old) && isPlain(v)) into[k] = { ...old, ...v };
    else into[k] = v;
  }
}

function isPlain(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}
