/**
 * A what-if evaluator over a session's study as it stands (`what-if.ts`), wired to the
 * session's graph, units and name slots: the session's `whatIf` and every node's context call it.
 */
import type { Cell } from '../study/types.ts';
import type { Graph } from './graph.ts';
import type { StudyUnits } from '../units/simplest-unit.ts';
import { prepareWhatIf, type Replacement, type WhatIfPrepared } from './what-if.ts';
import { internalError, unavailable, waitingOn, type Slot } from './session-parts.ts';

/**
 * The `wanted` names computed with the `replaced` parameters and states' initial values given
 * new SI values, over `graph` and `cells` as they are now; `slot` reads the session's current
 * binding of a name. Planned once here; each call of its `evaluate` only runs the nodes
 * between them. Never throws.
 */
export function prepareSessionWhatIf(graph: Graph, cells: readonly Cell[], studyUnits: StudyUnits,
  slot: (name: string) => Slot | undefined, wanted: readonly string[], replaced: readonly Replacement[]): WhatIfPrepared {
  const index = new Map(cells.map((c, i) => [c.id, i]));
  const kinds = new Map(cells.map((c) => [c.id, c.kind]));
  return prepareWhatIf({
    graph,
    studyUnits,
    slot,
    cellKind: (id) => kinds.get(id),
    waitingOn: (node, slotOf) => waitingOn(graph, node, slotOf),
    unavailable: (node, name, outcome) => unavailable(node, name, outcome, index.get(node.cell) ?? -1),
    internalError,
  }, wanted, replaced);
}
