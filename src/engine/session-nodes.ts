/**
 * The graph nodes of a session's cells, kept from one evaluation to the next: a cell's nodes
 * are built again only when its text (or what its builder reads of other cells,
 * `buildContext`) changed. Field problems found by the document check fail a cell's first
 * node (and the nodes that share them) on their path. Split from session.ts.
 */
import type { Cell } from '../study/types.ts';
import type { Problem } from '../study/validate.ts';
import type { CellError, GraphNode } from './node.ts';
import { buildCellNodes, buildContext, CELL_PATH } from '../cells/index.ts';

export class CellNodes {
  private readonly built = new Map<string, { sig: string; nodes: GraphNode[] }>();

  /** Nodes of every cell, in order, rebuilt only for cells whose text changed (their ids added to `rebuilt`). */
  all(cells: readonly Cell[], problems: ReadonlyMap<string, readonly Problem[]>, rebuilt: Set<string>): GraphNode[] {
    const all: GraphNode[] = [];
    const live = new Set<string>();
    for (const cell of cells) {
      live.add(cell.id);
      const sig = `${JSON.stringify(cell)}|${buildContext(cell, cells)}`;
      let entry = this.built.get(cell.id);
      if (!entry || entry.sig !== sig) {
        entry = { sig, nodes: withShapeProblems(cell, buildCellNodes(cell, cells), problems.get(cell.id)) };
        this.built.set(cell.id, entry);
        rebuilt.add(cell.id);
      }
      all.push(...entry.nodes);
    }
    for (const id of [...this.built.keys()]) if (!live.has(id)) this.built.delete(id);
    return all;
  }

  /** A cell's nodes as last built (none for an unknown cell). */
  /** The text a cell's nodes were built from (its content and its context): equal texts, equal cells. */
  sigOf(id: string): string {
    return this.built.get(id)?.sig ?? '';
  }

  of(id: string): readonly GraphNode[] {
    return this.built.get(id)?.nodes ?? [];
  }
}

/** Field problems found by the document check fail the cell's first node, on their path. */
function withShapeProblems(cell: Cell, nodes: GraphNode[], problems: readonly Problem[] | undefined): GraphNode[] {
  if (!problems?.length) return nodes;
  const errors: CellError[] = problems.map((p) => ({ kind: 'shape', message: p.message, path: p.path.replace(/^cells\[\d+\]/, CELL_PATH) }));
  if (nodes.length === 0) {
    return [{ key: `${cell.id}/shape`, cell: cell.id, defines: [], uses: [], allowsTime: false, signature: JSON.stringify(errors), problems: errors, run: () => ({ ok: true, bindings: new Map(), output: {} }) }];
  }
  return nodes.map((n, i) => (i === 0 || n.sharesShapeProblems ? { ...n, problems: [...errors, ...n.problems], signature: `${n.signature}|${JSON.stringify(errors)}` } : n));
}
