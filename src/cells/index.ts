/**
 * The registry of cell kinds: how each kind becomes graph nodes. Adding a kind is one
 * builder here plus its element in components/.
 */
import type { Cell, CellKind } from '../study/types.ts';
import type { GraphNode } from '../engine/node.ts';
import type { NodeOutput } from '../engine/report.ts';
import { parameterNodes } from './parameters.ts';
import { rateNodes } from './rate.ts';
import { noteNodes } from './note.ts';
import { simulateNodes } from './simulate.ts';
import { phaseNodes } from './phase.ts';
import { dataNodes } from './data.ts';
import { ncaNodes } from './nca.ts';
import { fitNodes } from './fit.ts';
import { solveNodes } from './solve.ts';
import { uncertaintyNodes } from './uncertainty.ts';
import { sensitivityNodes } from './sensitivity.ts';
import { compareNodes, runQuestions } from './compare.ts';
import { bandRuns } from './uncertainty-band.ts';

/**
 * A builder of kind K: its nodes output that kind's report fields (checked here, at compile
 * time). `cells` is the study, for a kind that reads another cell's document when it is built
 * (a compare cell, its run's questions); what it reads must be in `buildContext`.
 */
export type Builder<K extends CellKind> = (cell: Extract<Cell, { kind: K }>, at: string, cells?: readonly Cell[]) => Array<GraphNode<NodeOutput<K>>>;

const BUILDERS: { readonly [K in CellKind]: Builder<K> } = {
  parameters: parameterNodes,
  rate: rateNodes,
  note: noteNodes,
  phase: phaseNodes,
  simulate: simulateNodes,
  data: dataNodes,
  fit: fitNodes,
  nca: ncaNodes,
  solve: solveNodes,
  uncertainty: uncertaintyNodes,
  sensitivity: sensitivityNodes,
  compare: compareNodes,
};

/**
 * The nodes of one cell. Paths inside are relative to the cell (`@.items[0].value`), so a
 * cell that moves keeps its nodes and results; the session writes `@` as `cells[i]` when it
 * reports. Never throws on malformed fields.
 */
export function buildCellNodes(cell: Cell, cells: readonly Cell[] = []): GraphNode[] {
  return (BUILDERS[cell.kind] as Builder<CellKind>)(cell, CELL_PATH, cells);
}

/**
 * What of the other cells' documents a cell's nodes are built from (empty for most kinds):
 * the session builds a cell again when this or the cell's own text changes. Cost: O(cells).
 */
export function buildContext(cell: Cell, cells: readonly Cell[]): string {
  if (cell.kind === 'uncertainty') return bandRuns(cell.of, cells).join(',');
  return cell.kind === 'compare' ? runQuestions(cell.run, cells).join(',') : '';
}

/** The placeholder for "this cell's path" in node paths. */
export const CELL_PATH = '@';

/** A node path written out for the cell at `index`. */
export function resolvePath(path: string, index: number): string {
  return path.startsWith(CELL_PATH) ? `cells[${index}]${path.slice(CELL_PATH.length)}` : path;
}
