/**
 * Study names spelled like units. A study name hides the unit of the same spelling (a
 * parameter `h` is the parameter, not hours), except that a state's name hides a unit only in
 * the fields that can read states (rate laws, event amounts, the state a question names):
 * elsewhere `12 h` stays twelve hours beside a tank level `h`.
 *
 * Two kinds of help come from here: warnings in the report, only where hiding matters (the
 * unit is one these trades write, and the hiding applies); and a hint added to an error on a
 * field that reads such a name, with the unit's other spelling ("for hours write hour").
 */
import { partsText, type Definition, type GraphNode, type MessagePart, type Outcome, type ProblemKind, type StudyNote, type Use } from './node.ts';
import type { Graph } from './graph.ts';
import { lookupUnit } from '../units/units.ts';
import { isCommonUnit } from '../units/common.ts';
import { otherSpelling } from '../units/spellings.ts';
import { isConstantName } from '../expression/constants.ts';

/** True when `name`, read where no study name claims it, is a unit (a constant comes first). */
export function isUnitName(name: string): boolean {
  return !isConstantName(name) && lookupUnit(name) !== undefined;
}

/** True when the study name defined by `definer` hides its unit in the field of `use`. */
export function hidesUnit(definer: GraphNode, use: Use): boolean {
  return isUnitName(use.name) && (definer.role !== 'state' || use.readsStates === true);
}

/** How a report names a place: `resolve` writes a cell-relative path out; `cellName` gives `"Title"` or `cell "id"`. */
export interface Places {
  resolve(cell: string, path: string): string;
  cellName(cell: string): string;
}

/**
 * Warnings for the study names that hide one of the trades' common units (COMMON_UNITS): a
 * name a parameter, an answer or an estimate defines hides it everywhere; a state's name only
 * in the state fields that write it, so a state is warned about only when one does. Cost:
 * linear in definitions plus uses.
 */
export function hiddenUnitWarnings(list: readonly GraphNode[], definers: ReadonlyMap<string, string>, places: Places): StudyNote[] {
  const nodes = new Map(list.map((n) => [n.key, n]));
  const out: StudyNote[] = [];
  for (const [name, key] of definers) {
    if (name.startsWith('#') || !isCommonUnit(name) || !isUnitName(name)) continue;
    const definer = nodes.get(key)!;
    const def = definer.defines.find((d) => d.name === name)!;
    const write = spellingAdvice(name);
    if (definer.role !== 'state') {
      const rest = ` hides the unit ${name}: in this study ${name} means that value everywhere${write ? `; ${write}` : ''}`;
      const what = whatIs(definer, def, places);
      out.push({ text: `${what.text}${rest}`, parts: [...what.parts, rest] });
      continue;
    }
    const seen = new Set<string>();
    const fields = list.flatMap((n) => n.uses.filter((u) => u.name === name && u.readsStates && u.text).map((u) => fieldName(n, u, places)))
      .filter((f) => !seen.has(f.text) && seen.add(f.text));
    if (fields.length === 0) continue;
    const tail = `: there ${name} is the state${write ? `; ${write}` : ''}. Everywhere else ${name} is the unit.`;
    out.push({
      text: `the state "${name}" of ${places.cellName(definer.cell)} hides the unit ${name} in ${fields.map((f) => f.text).join(', ')}${tail}`,
      parts: [`the state "${name}" of `, { path: places.resolve(definer.cell, '@') }, ` hides the unit ${name} in `, ...fields.flatMap((f, i) => (i ? [', ', ...f.parts] : f.parts)), tail],
    });
  }
  return out;
}

/**
 * For each field of `node` that reads a name hiding a unit, or a state's name that is a unit
 * there, the sentence that explains it, by the field's path, as message parts (the definer's
 * place is a path). `describe` names a definer: ["the parameter defined at ", { path }].
 * Cost: linear in the node's uses.
 */
export function unitHints(node: GraphNode, graph: Graph, describe: (definer: GraphNode, def: Definition) => readonly MessagePart[]): ReadonlyMap<string, readonly MessagePart[]> {
  const hints = new Map<string, MessagePart[][]>();
  const sources = graph.sources.get(node.key);
  for (const u of node.uses) {
    const key = graph.definers.get(u.name);
    const source = sources?.get(u.name);
    if (!key || !u.text || !source || !isUnitName(u.name)) continue;
    const definer = graph.nodes.get(key)!;
    const def = definer.defines.find((d) => d.name === u.name)!;
    let hint: MessagePart[];
    if (hidesUnit(definer, u) && 'node' in source) {
      hint = [`here ${u.name} is `, ...describe(definer, def), advice(u.name, definer)];
    } else if (!hidesUnit(definer, u) && 'builtin' in source) {
      const s = otherSpelling(u.name);
      hint = [`here ${u.name} is ${s?.plural ?? `the unit ${s?.word ?? u.name}`}, not `, ...describe(definer, def), ': a state is read only in rate laws and event amounts'];
    } else continue;
    const list = hints.get(u.path) ?? [];
    if (!list.some((h) => partsText(h) === partsText(hint))) list.push(hint);
    hints.set(u.path, list);
  }
  return new Map([...hints].map(([path, list]) => [path, list.flatMap((h, i) => (i ? ['; ', ...h] : h))]));
}

/**
 * `outcome` with its error explained when it lies on a field `hints` explains and is a unit
 * error or an invalid value: not a value that is infinite (a division by zero is no matter of
 * units), nor an input that failed upstream.
 */
export function withUnitHint(outcome: Outcome, hints: ReadonlyMap<string, readonly MessagePart[]>): Outcome {
  if (outcome.ok || !HINTED_KINDS.has(outcome.error.kind)) return outcome;
  const hint = hints.get(outcome.error.path);
  if (!hint) return outcome;
  const parts = [...(outcome.error.parts ?? [outcome.error.message]), ' (', ...hint, ')'];
  return { ...outcome, error: { ...outcome.error, message: `${outcome.error.message} (${partsText(hint)})`, parts } };
}

/** The kinds of error a name read as the wrong thing can cause. */
const HINTED_KINDS: ReadonlySet<ProblemKind> = new Set(['unit', 'invalid']);

/** "for hours write hour", or undefined when the unit has no other spelling. */
function spellingAdvice(name: string): string | undefined {
  const s = otherSpelling(name);
  if (!s) return undefined;
  return s.plural ? `for ${s.plural} write ${s.word}` : `for the unit ${name} write ${s.word}`;
}

function advice(name: string, definer: GraphNode): string {
  const write = spellingAdvice(name);
  if (write) return `; ${write}`;
  return `; the unit ${name} has no other spelling, so rename the ${definer.role === 'state' ? 'state' : 'name'} to use it`;
}

function whatIs(definer: GraphNode, def: Definition, places: Places): StudyNote {
  const at = places.resolve(definer.cell, def.path.replace(/\.name$/, ''));
  return { text: `the name "${def.name}" (${places.cellName(definer.cell)}, ${at})`, parts: [`the name "${def.name}" (`, { path: at }, ')'] };
}

/** A field in words: "the rate law of "Tank"" for a rate law, else the cell and the path; as parts, the field's place. */
function fieldName(n: GraphNode, u: Use, places: Places): StudyNote {
  const at = places.resolve(n.cell, u.path);
  if (/\.rate$/.test(u.path)) return { text: `the rate law of ${places.cellName(n.cell)}`, parts: [{ path: at }] };
  return { text: `${at} (${places.cellName(n.cell)})`, parts: [{ path: at }] };
}
