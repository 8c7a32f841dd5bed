/**
 * Reading CSV text into a table in the CSV worker (`csv.worker.ts`), so that a long text never
 * holds the page's thread: one worker per read, ended when the read is done or abandoned.
 */
import type { CsvRead, DeclaredColumn, FromCsvWorker, ToCsvWorker } from '../src/index.ts';

/**
 * Reads `text` for a cell declaring `columns`, as `tableFromCsv` does, in a worker. `onProgress`
 * is told the rows read so far. Resolves with the read, or with undefined when `signal` aborts
 * first (the worker is then ended). A worker that fails resolves as a failed read whose message
 * says so; nothing is thrown.
 */
export function readCsvOffThread(text: string, columns: readonly DeclaredColumn[], onProgress: (rowsRead: number) => void, signal?: AbortSignal): Promise<CsvRead | undefined> {
  return new Promise((resolve) => {
    const worker = new Worker(new URL('./csv.worker.ts', import.meta.url), { type: 'module' });
    const end = (result: CsvRead | undefined) => {
      worker.terminate();
      signal?.removeEventListener('abort', abandon);
      resolve(result);
    };
    const abandon = () => end(undefined);
    if (signal?.aborted) return abandon();
    signal?.addEventListener('abort', abandon);
    worker.onmessage = (e: MessageEvent<FromCsvWorker>) => {
      if (e.data.type === 'progress') onProgress(e.data.rowsRead);
      else end(e.data.result);
    };
    worker.onerror = (e) => {
      e.preventDefault();
      end({ ok: false, message: `the CSV text could not be read: the reader stopped (${e.message || 'no reason given'})`, problems: [], notes: [] });
    };
    const message: ToCsvWorker = { type: 'read', text, columns: columns.map((c) => ({ name: c.name, unit: c.unit })) };
    worker.postMessage(message);
  });
}
