/**
 * A session's report, kept from one evaluation to the next: a cell's report is made again only
 * when its cell re-ran, was rebuilt, moved, or the hints on its errors changed; else the same
 * object stays (only its printed sheet's TeX is put in afresh), so a report that did not change
 * is the same object as before. Says which cells' reports changed. Split from session.ts.
 */
import type { Cell } from '../study/types.ts';
import type { CellError, GraphNode, Outcome } from './node.ts';
import { resolvePath } from '../cells/index.ts';
import { type CellReport, type Report, mergeOutput } from './report.ts';
import { cautionsFor, cellWords, type CellWords } from '../study/cautions.ts';
import { glanceOf } from '../output/glance.ts';
import { KeptTex } from '../output/sheet-tex.ts';
import { bounded, deepEqual } from './session-parts.ts';

/** What the report cache reads of the session. */
export interface ReportSource {
  readonly cells: Cell[];
  indexOf(id: string): number;
  nodesOf(id: string): readonly GraphNode[];
  /** A key for what a cell's nodes were built from (equal keys, equal cells): a cell's TeX is kept while it stays the same. */
  sigOf(id: string): string;
  /** A node's outcome as reported: with a hint on its error where a name hides a unit. */
  outcome(node: GraphNode): Outcome | undefined;
}

/** What goes into the whole report besides the cells. */
export interface ReportFrame {
  readonly title: string;
  readonly warnings: readonly string[];
  readonly warningParts: Report['warningParts'];
}

export class ReportCache {
  /** Each cell's last report, with the position it was made at. */
  private readonly reports = new Map<string, { index: number; report: CellReport }>();
  /** By cell: the error messages its report was last written with (see `hintText`). */
  private readonly hintTexts = new Map<string, string>();
  /** Each cell's sheet TeX, kept until the cell or the study's names change. */
  private readonly tex = new KeptTex();
  /** Each cell's words for the cautions, by cell object (the session's cells are its own and never changed in place). */
  private readonly words = new WeakMap<Cell, CellWords>();
  private readonly wordsOf = (cell: Cell): CellWords => {
    let w = this.words.get(cell);
    if (!w) this.words.set(cell, (w = cellWords(cell)));
    return w;
  };

  /** The report after an evaluation in which `rerun` cells re-ran and `rebuilt` were built again; the ids of the cells whose report changed. */
  update(src: ReportSource, rerun: ReadonlySet<string>, rebuilt: ReadonlySet<string>, frame: ReportFrame): { report: Report; changed: string[] } {
    const changed: string[] = [];
    const reports: CellReport[] = [];
    // the TeX the printed sheet typesets, made here (in the app: in the engine's worker); made
    // again for a cell whose text changed, and for every cell when the study's names change
    // (they decide how a symbol is set)
    this.tex.study(src.cells);
    for (const cell of src.cells) {
      const old = this.reports.get(cell.id);
      let r = old;
      const index = src.indexOf(cell.id);
      const tex = this.tex.of(cell, src.sigOf(cell.id));
      if (!r || rerun.has(cell.id) || rebuilt.has(cell.id) || r.index !== index
        || (!r.report.ok && hintText(src, cell) !== this.hintTexts.get(cell.id))) r = { index, report: this.cellReport(src, cell, index, tex) };
      else if (!deepEqual(r.report.tex, tex)) {
        const { tex: _old, ...rest } = r.report;
        r = { index, report: (tex === undefined ? rest : { ...rest, tex }) as CellReport };
      }
      if (r !== old) {
        if (!old || !deepEqual(old.report, r.report)) changed.push(cell.id);
        this.reports.set(cell.id, r);
      }
      reports.push(r.report);
    }
    for (const id of [...this.reports.keys()]) if (src.indexOf(id) < 0) this.reports.delete(id);
    for (const id of [...this.hintTexts.keys()]) if (src.indexOf(id) < 0) this.hintTexts.delete(id);
    return { report: studyReport(src.cells, reports, frame, this.wordsOf), changed };
  }

  /** A cell's report from its nodes' outcomes, with `tex` last (as a report whose TeX changed alone gets it). */
  private cellReport(src: ReportSource, cell: Cell, index: number, tex: CellReport['tex']): CellReport {
    const errors: CellError[] = [];
    const waits = new Set<string>();
    const output: Record<string, unknown> = {};
    for (const node of src.nodesOf(cell.id)) {
      const o = src.outcome(node);
      if (!o) continue;
      if (o.output) mergeOutput(output, o.output);
      if (!o.ok) {
        const { cause: _cause, ...error } = o.error;
        // two nodes of a cell that fail alike (a run and its model) report it once
        if (errors.some((e) => e.message === bounded(error.message) && e.path === resolvePath(o.error.path, index))) continue;
        errors.push({ ...error, message: bounded(error.message), path: resolvePath(o.error.path, index) });
        if (o.error.waitsOn !== undefined) waits.add(o.error.waitsOn);
      }
    }
    this.hintTexts.set(cell.id, hintText(src, cell));
    // one object literal: assigning the fields one by one after made each report a slow object
    const r: CellReport = { id: cell.id, kind: cell.kind, ...(typeof cell.title === 'string' ? { title: cell.title } : {}), ok: errors.length === 0, ...output };
    if (errors.length) {
      r.error = errors[0];
      if (errors.length > 1) r.errors = errors;
      if (waits.size) r.waitsOn = [...waits];
    }
    if (tex !== undefined) r.tex = tex;
    return r;
  }
}

/** The hints a cell's errors carry, to tell when its report must be written again. */
function hintText(src: ReportSource, cell: Cell): string {
  return src.nodesOf(cell.id).map((n) => {
    const o = src.outcome(n);
    return o && !o.ok ? o.error.message : '';
  }).join('\n');
}

/**
 * The report of the whole study from its cells' reports. A function of its own: built inline
 * in the evaluation, it threw away the evaluation's optimised code on most edits (a deopt
 * loop, 715 in 1,000 edits of the 49-cell chain).
 */
function studyReport(cells: readonly Cell[], reports: CellReport[], frame: ReportFrame, wordsOf: (cell: Cell) => CellWords): Report {
  return {
    title: frame.title,
    ok: reports.every((c) => c.ok),
    warnings: [...frame.warnings],
    warningParts: frame.warningParts,
    cautions: cautionsFor(cells, wordsOf),
    glance: glanceOf(cells, reports),
    cells: reports,
  };
}
