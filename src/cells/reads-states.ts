/**
 * Which fields of a cell can read states: a rate law, an event's amounts under add or infuse,
 * and the fields that name a state (a law's own state, an event's targets, the state a
 * question asks about, a fitted or swept parameter). In every other field a state's name
 * that is spelled like a unit is that unit (`every: "12 h"` beside a tank level `h`). The
 * builders mark their uses by the same rule (`test/engine/reads-states.test.ts` holds them to
 * it); the editor colours a field's words by it. Pure; the path alone decides.
 */
import type { CellKind } from '../study/types.ts';

const RULES: Readonly<Record<CellKind, readonly RegExp[]>> = {
  parameters: [],
  rate: [/^\.rate$/, /^\.state$/],
  phase: [/^\.sweep\.name$/],
  simulate: [/^\.events\[\d+\]\.(add|infuse)\.[^.]+$/, /^\.events\[\d+\]\.(add|set|infuse)$/, /^\.find\[\d+\]\.(crossing|maximum|minimum|timeOfMaximum|timeOfMinimum|valueOf|integralOf|timeAbove|timeBelow)$/],
  data: [],
  fit: [/^\.estimate\[\d+\]\.parameter$/],
  nca: [],
  solve: [/^\.vary\.parameter$/],
  uncertainty: [],
  note: [],
  sensitivity: [/^\.parameters\[\d+\]$/],
  compare: [/^\.scenarios\[\d+\]\.set$/],
};

/**
 * True when the field at `path` (relative to its cell: `.rate`, `.events[0].add.C`) of a cell
 * of `kind` can read states. Cost: a few regular-expression tests.
 */
export function fieldReadsStates(kind: CellKind, path: string): boolean {
  return (RULES[kind] ?? []).some((re) => re.test(path));
}
