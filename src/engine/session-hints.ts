/**
 * A node's own error as its cell reports it: explained, when its field reads a name that hides
 * a unit (`hidden-units.ts`), with where that name is defined ("the parameter defined at
 * cells[0].items[1]"). Added when the cell is reported, as the place moves with its cell.
 */
import type { Cell } from '../study/types.ts';
import type { GraphNode, MessagePart, Outcome } from './node.ts';
import type { Graph } from './graph.ts';
import { resolvePath } from '../cells/index.ts';
import { unitHints, withUnitHint } from './hidden-units.ts';

/** What a name defined by a cell of each kind is called in messages. */
const KIND_WORDS: Partial<Record<string, string>> = { parameters: 'parameter', simulate: 'answer', fit: 'estimate', nca: 'result' };

/** The cells of the study as the session holds them, and where each stands. */
export interface CellPlaces {
  readonly cells: readonly Cell[];
  indexOf(id: string): number;
}

/**
 * `o` with the hint added to a node's own error (not one it waits on, nor a graph problem);
 * any other outcome as it is.
 */
export function hintedOutcome(graph: Graph, doc: CellPlaces, node: GraphNode, o: Outcome | undefined): Outcome | undefined {
  if (!o || o.ok || graph.problems.has(node.key)) return o;
  return withUnitHint(o, unitHints(node, graph, (definer, def) => definedAt(doc, definer, def.path)));
}

/** What a definer's name is, and where: "the parameter defined at cells[0].items[1]", the place as a part. */
function definedAt(doc: CellPlaces, definer: GraphNode, path: string): MessagePart[] {
  const kind = definer.role === 'state' ? 'state' : KIND_WORDS[doc.cells[doc.indexOf(definer.cell)]?.kind] ?? 'name';
  return [`the ${kind} defined at `, { path: resolvePath(path.replace(/\.name$/, ''), doc.indexOf(definer.cell)) }];
}
