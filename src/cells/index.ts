/**
 * The registry of cell kinds: how each kind becomes graph nodes. Adding a kind is one
 * builder here plus its element in components/.
 */
import type { Cell } from '../study/types.ts';
import type { GraphNode } from '../node.ts';
import { parameterNodes } from './parameters.ts';
import { rateNodes } from './rate.ts';
import { noteNodes } from './note.ts';
import { pendingNodes } from './pending.ts';

type Builder = (cell: any, at: string) => GraphNode[];

const BUILDERS: Record<Cell['kind'], Builder> = {
  parameters: parameterNodes,
  rate: rateNodes,
  note: noteNodes,
  phase: pendingNodes,
  simulate: pendingNodes,
  data: pendingNodes,
  fit: pendingNodes,
  nca: pendingNodes,
};

/** The nodes of one cell at position `index`. Never throws on malformed fields. */
export function buildCellNodes(cell: Cell, index: number): GraphNode[] {
  return BUILDERS[cell.kind](cell, `cells[${index}]`);
}
