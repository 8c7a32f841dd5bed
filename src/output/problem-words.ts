/**
 * A cell's problems in words, for the app and the printed sheet: places written as a person
 * sees them (`output/field-words.ts`), and a wait said once per cell with what it waits on
 * and why. Made from the errors' data (kind, path, `waitsOn`, `parts`) and the report's other
 * cells, never from a message's text. The JSON report and the command line keep paths.
 */
import type { CellError, MessagePart } from '../engine/node.ts';
import { partsText } from '../engine/node.ts';
import type { CellReport } from '../engine/report.ts';
import { cellWords, fieldWords, type CellsOf } from './field-words.ts';

/** The reports of the study's cells, as much as the words need. */
export type ReportsOf = { readonly cells: ReadonlyArray<Pick<CellReport, 'id' | 'ok' | 'error' | 'errors' | 'waitsOn'>> };

/**
 * One problem in words, without the place it is on (the field shows it, or the caller puts
 * `fieldWords` before it). A wait is said as `waitWords` says it.
 */
export function problemWords(study: CellsOf, report: ReportsOf, error: CellError): string {
  if (error.kind === 'waits' && error.waitsOn !== undefined) return waitWords(study, report, error.waitsOn, [error]);
  return error.parts ? partsWords(study, error.parts) : error.message;
}

/**
 * A wait in words: `waits on Parameters "b", which waits on Parameters "a": parameter "k",
 * value: unknown name "kk"` (the place of the problem within the last cell named). Follows the cells waited on to the first with a problem of its
 * own and says that problem with its place. A chain that ends at a cell with no problem of its
 * own (a name it left undefined: a crossing not reached) ends with that cell's reason, taken
 * from the `undefinedName` of the waiting cell's `errors` (the data the engine carries down the
 * chain); without them the cell is named alone. Cost: linear in the cells.
 */
export function waitWords(study: CellsOf, report: ReportsOf, cellId: string, waiting: readonly CellError[] = []): string {
  const chain: string[] = [];
  const seen = new Set<string>();
  let id: string | undefined = cellId;
  while (id !== undefined && !seen.has(id)) {
    seen.add(id);
    chain.push(cellWords(study, id));
    const r = report.cells.find((c) => c.id === id);
    const errors = r?.errors ?? (r?.error ? [r.error] : []);
    const own = errors.find((e) => e.kind !== 'waits');
    if (own) return `waits on ${chain.join(', which waits on ')}: ${fieldWords(study, own.path, false)}: ${problemWords(study, report, own)}`;
    id = errors.find((e) => e.waitsOn !== undefined)?.waitsOn;
  }
  const last = [...seen].pop();
  const why = waiting.find((e) => e.waitsOn === cellId && e.undefinedName?.cell === last)?.undefinedName;
  return `waits on ${chain.join(', which waits on ')}${why ? `: ${why.reason}` : ''}`;
}

/** A message's parts in words: each place as `fieldWords` says it (a report warning's `warningParts`). */
export function partsWords(study: CellsOf, parts: readonly MessagePart[]): string {
  return partsText(parts, (path) => fieldWords(study, path));
}

/** The distinct cells a cell's problems wait on, in order. */
export function waitedOn(errors: readonly CellError[]): string[] {
  return [...new Set(errors.flatMap((e) => (e.kind === 'waits' && e.waitsOn !== undefined ? [e.waitsOn] : [])))];
}
