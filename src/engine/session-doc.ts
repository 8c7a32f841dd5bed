/**
 * The document a session holds: its cells, title, description and author, the field problems
 * the document check found in each cell, and where each cell stands. `apply` changes it by the
 * engine's one edit function (study/edit.ts); a refused edit changes nothing. Split from
 * session.ts.
 */
import type { Cell, Study } from '../study/types.ts';
import { checkCell, type Problem } from '../study/validate.ts';
import { applyEdit, type Edit } from '../study/edit.ts';
import { copyPlain } from '../study/limits.ts';

export class SessionDocument {
  cells: Cell[];
  title: string;
  private description?: string;
  private author?: string;
  /** By cell: the problems the document check found in its fields. */
  readonly problems = new Map<string, readonly Problem[]>();
  private positions?: Map<string, number>;

  constructor(study: Study, problems: ReadonlyMap<string, readonly Problem[]>) {
    // its own copy: the session tells an unchanged cell by its identity (session-nodes.ts), so
    // the caller's objects, which it may change, are not kept
    this.cells = study.cells.map((c) => copyPlain(c));
    this.title = study.title;
    this.description = study.description;
    this.author = study.author;
    for (const [id, p] of problems) this.problems.set(id, p);
  }

  /** The study as it now stands, in the contract's format; `copy` gives copies of its cells. */
  study(copy = false): Study {
    return {
      format: 'ratebook-study',
      version: 1,
      title: this.title,
      ...(this.description !== undefined ? { description: this.description } : {}),
      ...(this.author !== undefined ? { author: this.author } : {}),
      cells: copy ? this.cells.map((c) => structuredClone(c)) : this.cells,
    };
  }

  /** Applies one edit; its problem when refused (nothing changes then). */
  apply(edit: Edit): Problem | undefined {
    const out = applyEdit(this.study(), edit);
    if (!out.ok) return out.error;
    this.positions = undefined;
    this.cells = out.study.cells;
    this.title = out.study.title;
    this.description = out.study.description;
    this.author = out.study.author;
    // a whole document brings the problems of all its cells; the cells it leaves unchanged
    // keep their nodes, so only what differs re-runs
    if (out.problems) {
      this.problems.clear();
      for (const [id, p] of out.problems) this.problems.set(id, p);
    }
    const live = new Set(this.cells.map((c) => c.id));
    for (const id of [...this.problems.keys()]) if (!live.has(id)) this.problems.delete(id);
    if (out.written) {
      const problems = checkCell(out.written as unknown as Record<string, unknown>, `cells[${this.indexOf(out.written.id)}]`);
      if (problems.length) this.problems.set(out.written.id, problems);
      else this.problems.delete(out.written.id);
    }
    return undefined;
  }

  /** A cell's position; -1 when absent. Cost: O(1) after the first call since the last edit. */
  indexOf(id: string): number {
    this.positions ??= new Map(this.cells.map((c, i) => [c.id, i]));
    return this.positions.get(id) ?? -1;
  }

  /** A cell as warnings name it: its title, else its id. */
  cellName(id: string): string {
    const title = this.cells[this.indexOf(id)]?.title;
    return typeof title === 'string' && title.trim() ? `"${title.trim()}"` : `cell "${id}"`;
  }
}
