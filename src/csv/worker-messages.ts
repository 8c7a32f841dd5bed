/**
 * Messages between the app and its CSV worker, which reads CSV text into a table off the
 * page's thread (a paste turned into a table, a file imported). The app sends one `read`; the
 * worker answers with `progress` every few thousand rows, then one `done` with what
 * `readCsvTable` gave (with `adopt`: the header's columns where the cell's do not match).
 */
import type { CsvRead, DeclaredColumn } from './read.ts';

export type ToCsvWorker = { readonly type: 'read'; readonly text: string; readonly columns: readonly DeclaredColumn[] };

export type FromCsvWorker =
  | { readonly type: 'progress'; readonly rowsRead: number }
  | { readonly type: 'done'; readonly result: CsvRead };

/**
 * The most rows a paste into a data cell's CSV text may hold; a longer paste is refused with
 * a message that points to "Import a CSV file", which reads straight into the table (100,000
 * rows and more). Text in the box is kept in the study and read again by the engine after
 * each change of it, and a browser's text box grows slow with very long text.
 */
export const PASTE_ROW_LIMIT = 20_000;

/** The number of rows a CSV text holds, about: its non-empty lines less the header. Linear, no parsing. */
export function roughRowCount(text: string): number {
  let lines = 0;
  let filled = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 10 || c === 13) {
      if (filled) lines++;
      filled = false;
    } else if (c !== 32 && c !== 9) filled = true;
  }
  if (filled) lines++;
  return Math.max(0, lines - 1);
}
