/**
 * The session's words and checks that need no session: the error of a node that waits on a
 * failed input, of one that threw, a node's change signature, the reason a name is
 * unavailable, report equality, and messages kept short. Split from session.ts to keep it readable.
 */
import type { Binding, CellError, GraphNode, Outcome } from './node.ts';
import type { Graph } from './graph.ts';
import type { Unavailable } from './what-if.ts';
import { CELL_PATH, resolvePath } from '../cells/index.ts';

export type Slot = Binding | Unavailable;

/** The binding in a slot; undefined when its name is unavailable. */
export function bound(slot: Slot | undefined): Binding | undefined {
  return slot && slot.kind !== 'unavailable' ? slot : undefined;
}

/**
 * The error of a node that reads a name whose definer failed or computed nothing; undefined when
 * all its inputs are bound. An optional use is not waited on, unless it `waitsOnError` and its
 * definer failed with an error.
 */
export function waitingOn(graph: Graph, node: GraphNode, slotOf: (name: string) => Slot | undefined): CellError | undefined {
  const sources = graph.sources.get(node.key)!;
  for (const use of node.uses) {
    const src = sources.get(use.name);
    if (!src || !('node' in src) || (src.optional && !use.waitsOnError)) continue;
    const slot = slotOf(use.name);
    if (!bound(slot)) {
      const unavailable = slot as Unavailable | undefined;
      // an optional name left undefined with a reason (no error at its root) is not waited on
      if (src.optional && (!unavailable || unavailable.root.name !== undefined)) continue;
      return waitsOnCell(unavailable?.cell ?? graph.nodes.get(src.node)!.cell, unavailable, use.path);
    }
  }
  return undefined;
}

/** A node's change signature: its own, where each name it reads comes from, its graph problem, what it defines. */
export function staticSignature(graph: Graph, key: string): string {
  const node = graph.nodes.get(key)!;
  const problem = graph.problems.get(key);
  let sig = node.signature;
  for (const [name, s] of graph.sources.get(key)!) sig += `|${name}=${'node' in s ? s.node : s.builtin}`;
  if (problem) sig += `|!${problem.path}:${problem.message}`;
  for (const d of node.defines) sig += `|${d.name}@${d.path}:${graph.definers.get(d.name) === key}`;
  return sig;
}

/** What a node that threw is reported as. */
export function internalError(node: GraphNode, err: unknown): Outcome {
  return { ok: false, error: { kind: 'internal', message: `internal error while computing this cell: ${(err as Error)?.message ?? String(err)}`, path: node.defines[0]?.path ?? CELL_PATH } };
}

export function unavailable(node: GraphNode, name: string, outcome: Outcome, index: number): Unavailable {
  if (!outcome.ok) {
    const { error } = outcome;
    const reason = bounded(error.waitsOn !== undefined ? error.message : `${show(name)} has an error (${resolvePath(error.path, index)}: ${error.message})`);
    const root = error.cause ?? { cell: node.cell, reason };
    return { kind: 'unavailable', cell: node.cell, reason, root, sig: `unavailable|${root.cell}|${reason}` };
  }
  const message = (outcome.output as { message?: unknown }).message;
  const reason = outcome.reasons?.get(name) ?? (typeof message === 'string' ? message : `${show(name)} was not computed`);
  // the definer has no problem of its own: the name it left undefined travels with the reason
  return { kind: 'unavailable', cell: node.cell, reason, root: { cell: node.cell, reason, name }, sig: `unavailable|${reason}` };
}

/**
 * The error of a node that reads a name of `cell` that is unavailable: it names that cell and
 * the cause once (where the failure began, when further up, and its own reason), never the
 * messages of the cells between, so a chain of waits costs the same per cell however long.
 */
function waitsOnCell(cell: string, slot: Unavailable | undefined, path: string): CellError {
  const cause = slot?.root ?? { cell, reason: 'it has not been computed' };
  const message = cause.cell === cell ? `waits on cell "${cell}": ${cause.reason}` : `waits on cell "${cell}" (the cause is in cell "${cause.cell}"): ${cause.reason}`;
  const undefinedName = cause.name !== undefined ? { undefinedName: { cell: cause.cell, name: cause.name, reason: cause.reason } } : {};
  return { kind: 'waits', waitsOn: cell, message, path, cause, ...undefinedName };
}

/** Structural equality of plain JSON-like values (reports): cheaper than comparing their JSON. */
export function deepEqual(a: unknown, b: unknown): boolean {
  if (Object.is(a, b)) return true;
  if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null) return false;
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  if (Array.isArray(a)) {
    const bb = b as unknown[];
    if (a.length !== bb.length) return false;
    for (let i = 0; i < a.length; i++) if (!deepEqual(a[i], bb[i])) return false;
    return true;
  }
  const ka = Object.keys(a as object);
  if (ka.length !== Object.keys(b as object).length) return false;
  for (const k of ka) {
    if (!Object.prototype.hasOwnProperty.call(b, k)) return false;
    if (!deepEqual((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k])) return false;
  }
  return true;
}

/**
 * Longest message a report carries, in characters: a message that quotes the study's text (an
 * unknown name 5,000 letters long) is cut, so that messages never grow with what they quote.
 */
const MAX_MESSAGE = 1000;

export function bounded(message: string): string {
  return message.length > MAX_MESSAGE ? `${message.slice(0, MAX_MESSAGE)}…` : message;
}

function show(name: string): string {
  return name.startsWith('#') ? `cell "${name.slice(1)}"` : `"${name}"`;
}
