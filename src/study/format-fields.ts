/**
 * Every field of each cell kind of the study format, as a path (`items[].range`,
 * `sweep.steps`, `events[].add`), so that a test can walk them and check that the editor has a
 * control for each. A record of names (`add`, `observe`, `units`) and a list of plain values
 * (`rates`, `range`, `rows`) count as one field. `FieldPath<T>` derives the paths from the
 * types in `types.ts`; the lists below are checked against it at compile time
 * (test/engine/format-fields.test.ts), so a field added to a type and not here fails the type check.
 */
import type { Cell, CellKind, Study } from './types.ts';

type Plain = string | number | boolean | null;

/** The paths of the fields of T: `name`, `sweep.steps`, `items[].range`. */
export type FieldPath<T> = T extends unknown ? { [K in keyof T & string]-?: PathOf<NonNullable<T[K]>, K> }[keyof T & string] : never;
type PathOf<V, P extends string> =
  V extends readonly (infer U)[] ? (U extends Plain | readonly unknown[] ? P : `${P}[].${FieldPath<U>}`)
  : V extends object ? (string extends keyof V ? P : `${P}.${FieldPath<V>}`)
  : P;

/** The document of a cell of kind K. */
type CellOf<K extends CellKind> = Extract<Cell, { kind: K }>;

/** Every field of every kind, in the order the editor shows them. */
export const FORMAT_FIELDS = {
  parameters: ['id', 'kind', 'title', 'items[].name', 'items[].value', 'items[].range', 'items[].note', 'items[].unit', 'items[].glance', 'items[].spread.distribution', 'items[].spread.sd', 'items[].spread.cv', 'items[].spread.from', 'items[].spread.to'],
  rate: ['id', 'kind', 'title', 'state', 'rate', 'unit', 'initial'],
  phase: ['id', 'kind', 'title', 'rate', 'from', 'to', 'sweep.name', 'sweep.from', 'sweep.to', 'sweep.steps'],
  simulate: [
    'id', 'kind', 'title', 'rates', 'from', 'to', 'method', 'step', 'tolerance.relative', 'tolerance.absolute',
    'events[].at', 'events[].every', 'events[].count', 'events[].add', 'events[].set', 'events[].infuse', 'events[].for',
    'find[].name', 'find[].crossing', 'find[].maximum', 'find[].minimum', 'find[].timeOfMaximum', 'find[].timeOfMinimum',
    'find[].valueOf', 'find[].integralOf', 'find[].timeAbove', 'find[].timeBelow', 'find[].level', 'find[].direction',
    'find[].occurrence', 'find[].at', 'find[].from', 'find[].to', 'find[].unit', 'find[].glance', 'plotScale', 'band',
  ],
  data: ['id', 'kind', 'title', 'columns[].name', 'columns[].unit', 'rows', 'csv'],
  fit: ['id', 'kind', 'title', 'rates', 'run', 'data', 'time', 'observe', 'estimate[].parameter', 'estimate[].as', 'estimate[].guess', 'estimate[].min', 'estimate[].max', 'estimate[].unit', 'estimate[].prior.median', 'estimate[].prior.omega', 'weighting', 'error.additive', 'error.proportional', 'plotScale'],
  nca: ['id', 'kind', 'title', 'data', 'time', 'concentration', 'dose', 'route', 'duration', 'auc', 'terminal', 'prefix', 'units'],
  solve: ['id', 'kind', 'title', 'vary.parameter', 'vary.as', 'vary.min', 'vary.max', 'vary.roundTo', 'vary.choices', 'vary.guess', 'target.value', 'target.equals'],
  uncertainty: ['id', 'kind', 'title', 'of', 'method', 'samples', 'seed'],
  note: ['id', 'kind', 'title', 'text'],
  sensitivity: ['id', 'kind', 'title', 'of', 'parameters'],
  compare: ['id', 'kind', 'title', 'run', 'scenarios[].name', 'scenarios[].set'],
} as const satisfies { [K in CellKind]: ReadonlyArray<FieldPath<CellOf<K>>> };

/** The study's own fields (`cells` holds the cells above). */
export const STUDY_FIELDS = ['format', 'version', 'title', 'description', 'author', 'cells'] as const satisfies ReadonlyArray<keyof Study>;

/**
 * Fields fixed when a cell is made, shown but not edited: its `id` (other cells refer to it;
 * shown as the title's placeholder) and its `kind` (chosen on the "add" bar).
 */
export const FIXED_FIELDS: readonly string[] = ['id', 'kind'];

/** The study's fields that are not edited as text: its `format` and `version` (the file's kind) and `cells` (edited cell by cell). */
export const FIXED_STUDY_FIELDS: readonly string[] = ['format', 'version', 'cells'];

/** A field's path with list positions left out, as `FORMAT_FIELDS` names it: `find[2].from` is `find[].from`, `items[0].range[1]` is `items[].range`. */
export function fieldPathOf(concrete: string): string {
  return concrete.replace(/\[\d+\]/g, '[]').replace(/(\[\])+$/, '');
}

/**
 * The fields present in a cell document, by their concrete paths (`find[2].from`), walking
 * lists and objects down to the fields `FORMAT_FIELDS` lists for its kind. A key the list
 * does not know is returned as it stands. Cost: linear in the document.
 */
export function fieldsIn(cell: Record<string, unknown>): string[] {
  const known = new Set<string>((FORMAT_FIELDS as Record<string, readonly string[]>)[String(cell.kind)] ?? []);
  const out: string[] = [];
  const walk = (v: unknown, path: string) => {
    const generic = fieldPathOf(path);
    if (known.has(generic)) out.push(path);
    else if (Array.isArray(v) && [...known].some((k) => k.startsWith(`${generic}[]`))) v.forEach((x, i) => walk(x, `${path}[${i}]`));
    else if (typeof v === 'object' && v !== null && !Array.isArray(v)) for (const [k, x] of Object.entries(v)) { if (x !== undefined) walk(x, path ? `${path}.${k}` : k); }
    else out.push(path);
  };
  walk(cell, '');
  return out;
}
