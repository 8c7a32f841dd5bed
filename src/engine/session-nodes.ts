/**
 * The graph nodes of a session's cells, kept from one evaluation to the next: a cell's nodes
 * are built again only when its content (or what its builder reads of other cells,
 * `buildContext`) changed. Field problems found by the document check fail, on their path,
 * the node that owns the field (a parameter's item), else a cell's first node (and the nodes
 * that share them). Split from session.ts.
 */
import type { Cell } from '../study/types.ts';
import type { Problem } from '../study/validate.ts';
import type { CellError, GraphNode } from './node.ts';
import { buildCellNodes, buildContext, CELL_PATH } from '../cells/index.ts';
import { sameContent } from '../study/same.ts';

export class CellNodes {
  /** By cell id: the cell its nodes were built from, what its builder read of the others, and the build's number. */
  private readonly built = new Map<string, { cell: Cell; context: string; version: number; nodes: GraphNode[] }>();
  private builds = 0;

  /**
   * Nodes of every cell, in order, rebuilt only for cells whose content or context changed (their
   * ids added to `rebuilt`). A cell an edit did not touch is the same object as before (the
   * session's document is its own: edits copy what they write), so it is not read at all; a
   * cell that is a new object with the same content (a whole-document edit) is compared with
   * `sameContent`, which stops at its first difference.
   */
  all(cells: readonly Cell[], problems: ReadonlyMap<string, readonly Problem[]>, rebuilt: Set<string>): GraphNode[] {
    const all: GraphNode[] = [];
    const live = new Set<string>();
    for (const cell of cells) {
      live.add(cell.id);
      const context = buildContext(cell, cells);
      let entry = this.built.get(cell.id);
      if (!entry || entry.context !== context || (entry.cell !== cell && !sameContent(entry.cell, cell))) {
        entry = { cell, context, version: ++this.builds, nodes: withShapeProblems(cell, buildCellNodes(cell, cells), problems.get(cell.id)) };
        this.built.set(cell.id, entry);
        rebuilt.add(cell.id);
      } else entry.cell = cell;
      all.push(...entry.nodes);
    }
    for (const id of [...this.built.keys()]) if (!live.has(id)) this.built.delete(id);
    return all;
  }

  /** What a cell's nodes were built from, as a key: equal keys, equal cells (content and context). */
  sigOf(id: string): string {
    const entry = this.built.get(id);
    return entry ? String(entry.version) : '';
  }

  /** A cell's nodes as last built (none for an unknown cell). */
  of(id: string): readonly GraphNode[] {
    return this.built.get(id)?.nodes ?? [];
  }
}

/**
 * Field problems found by the document check fail, on their path, the node that owns the field
 * (`ownsFields`: a parameter's item), else the cell's first node (and those sharing its problems).
 */
function withShapeProblems(cell: Cell, nodes: GraphNode[], problems: readonly Problem[] | undefined): GraphNode[] {
  if (!problems?.length) return nodes;
  const errors: CellError[] = problems.map((p) => ({ kind: 'shape', message: p.message, path: p.path.replace(/^cells\[\d+\]/, CELL_PATH) }));
  if (nodes.length === 0) {
    return [{ key: `${cell.id}/shape`, cell: cell.id, defines: [], uses: [], allowsTime: false, signature: JSON.stringify(errors), problems: errors, run: () => ({ ok: true, bindings: new Map(), output: {} }) }];
  }
  const owner = (e: CellError) => nodes.findIndex((n) => n.ownsFields !== undefined && under(e.path, n.ownsFields));
  const owned = errors.map(owner);
  return nodes.map((n, i) => {
    const mine = errors.filter((_, k) => (owned[k] === -1 ? i === 0 || n.sharesShapeProblems : owned[k] === i));
    return mine.length ? { ...n, problems: [...mine, ...n.problems], signature: `${n.signature}|${JSON.stringify(mine)}` } : n;
  });
}

/** Whether `path` is `prefix` or a field inside it (`@.items[1]` holds `@.items[1].spread.sd`, not `@.items[10]`). */
function under(path: string, prefix: string): boolean {
  return path === prefix || (path.startsWith(prefix) && (path[prefix.length] === '.' || path[prefix.length] === '['));
}
