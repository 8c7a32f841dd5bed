/**
 * Edits of a study: the one definition of what each edit does to the document, used by the
 * engine's session and by the app (which keeps its own copy for undo and saving). Pure: the
 * input is never changed; a refused edit returns a problem and no document.
 */
import type { Cell, Study } from './types.ts';
import { CELL_KINDS, ID_PATTERN } from './types.ts';
import { readStudy, type Problem } from './validate.ts';
import { isObject } from './checker.ts';
import { copyPlain, shortJson, valueLimitProblem } from './limits.ts';

export type Edit =
  | { readonly type: 'replace'; readonly cell: unknown }
  | { readonly type: 'insert'; readonly index: number; readonly cell: unknown }
  | { readonly type: 'remove'; readonly id: string }
  | { readonly type: 'move'; readonly id: string; readonly to: number }
  | { readonly type: 'retitle'; readonly title: string }
  | { readonly type: 'author'; readonly author: string }
  /** The study's description (blank text removes it). */
  | { readonly type: 'describe'; readonly description: string }
  /**
   * The whole document at once (undo and redo send the study as it was). Checked like a
   * study being opened; the session re-runs only the cells whose text changed.
   */
  | { readonly type: 'document'; readonly study: unknown };

export type EditOutcome =
  | {
    readonly ok: true; readonly study: Study;
    /** The cell written by a replace or insert. */
    readonly written?: Cell;
    /** After a whole-document edit: the field problems of its cells, by id (none listed: none found). */
    readonly problems?: ReadonlyMap<string, readonly Problem[]>;
  }
  | { readonly ok: false; readonly error: Problem };

/** Applies one edit to a study. Cost: O(cells) plus a copy of the written cell. */
export function applyEdit(study: Study, edit: Edit): EditOutcome {
  const refuse = (message: string, path: string): EditOutcome => ({ ok: false, error: { message, path } });
  if (!isObject(edit)) return refuse('an edit must be an object with a "type"', '');
  const cells = study.cells;
  const at = (id: string) => cells.findIndex((c) => c.id === id);
  switch (edit.type) {
    case 'retitle':
      if (typeof edit.title !== 'string') return refuse('a title must be text', 'title');
      return { ok: true, study: { ...study, title: edit.title } };
    case 'author': {
      if (typeof edit.author !== 'string') return refuse('an author must be text', 'author');
      const { author: _old, ...rest } = study;
      return { ok: true, study: edit.author.trim() ? { ...rest, author: edit.author } : rest };
    }
    case 'describe': {
      if (typeof edit.description !== 'string') return refuse('a description must be text', 'description');
      const { description: _old, ...rest } = study;
      return { ok: true, study: edit.description.trim() ? { ...rest, description: edit.description } : rest };
    }
    case 'document': {
      const bound = valueLimitProblem(edit.study);
      if (bound) return { ok: false, error: bound };
      let copy: unknown;
      try {
        copy = copyPlain(edit.study);
      } catch {
        return refuse('a study must be plain data (text, numbers, lists and objects)', '');
      }
      const read = readStudy(copy);
      if (!read.ok) return read;
      return { ok: true, study: read.study, problems: read.cellProblems };
    }
    case 'remove': {
      const i = at(edit.id);
      if (i < 0) return refuse(`there is no cell "${edit.id}"`, 'cells');
      return { ok: true, study: { ...study, cells: cells.filter((_, j) => j !== i) } };
    }
    case 'move': {
      const i = at(edit.id);
      if (i < 0) return refuse(`there is no cell "${edit.id}"`, 'cells');
      const to = Math.max(0, Math.min(cells.length - 1, Math.trunc(Number.isFinite(edit.to) ? edit.to : i)));
      const next = cells.filter((_, j) => j !== i);
      next.splice(to, 0, cells[i]);
      return { ok: true, study: { ...study, cells: next } };
    }
    case 'replace':
    case 'insert': {
      const c = edit.cell;
      if (!isObject(c)) return refuse('a cell must be an object', 'cells');
      const bound = valueLimitProblem(c);
      if (bound) return { ok: false, error: { ...bound, path: bound.path ? `cell.${bound.path}` : 'cell' } };
      if (typeof c.id !== 'string' || !ID_PATTERN.test(c.id)) return refuse('a cell id must be lower-case letters, digits, "-" or "_", starting with a letter', 'id');
      if (typeof c.kind !== 'string' || !(CELL_KINDS as readonly string[]).includes(c.kind)) {
        return refuse(`unknown cell kind ${shortJson(c.kind)}; the kinds are ${CELL_KINDS.join(', ')}`, 'kind');
      }
      let written: Cell;
      try {
        written = copyPlain(c) as unknown as Cell;
      } catch {
        return refuse('a cell must be plain data (text, numbers, lists and objects)', 'cell');
      }
      const existing = at(c.id);
      if (edit.type === 'replace') {
        if (existing < 0) return refuse(`there is no cell "${c.id}" to replace`, 'id');
        return { ok: true, study: { ...study, cells: cells.map((x, j) => (j === existing ? written : x)) }, written };
      }
      if (existing >= 0) return refuse(`the cell id "${c.id}" is already used`, 'id');
      const index = Math.max(0, Math.min(cells.length, Math.trunc(Number.isFinite(edit.index) ? edit.index : cells.length)));
      const next = [...cells];
      next.splice(index, 0, written);
      return { ok: true, study: { ...study, cells: next }, written };
    }
    default:
      return refuse('unknown edit', '');
  }
}

/** A cell id not yet used in the study: `prefix`, `prefix-2`, `prefix-3`... */
export function freshId(study: Study, prefix: string): string {
  const base = prefix.toLowerCase().replace(/[^a-z0-9_-]/g, '') || 'cell';
  const start = /^[a-z]/.test(base) ? base : `c${base}`;
  const used = new Set(study.cells.map((c) => c.id));
  if (!used.has(start)) return start;
  for (let i = 2; ; i++) if (!used.has(`${start}-${i}`)) return `${start}-${i}`;
}
