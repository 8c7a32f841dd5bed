/// <reference lib="webworker" />
/**
 * The CSV worker: reads one CSV text into a table off the page's thread, telling the page how
 * many rows it has read as it goes. It only relays: the reading is the engine's `readCsvTable`.
 */
import { readCsvTable, type FromCsvWorker, type ToCsvWorker } from '../src/index.ts';

const post = (message: FromCsvWorker) => (self as unknown as Worker).postMessage(message);

self.onmessage = (event: MessageEvent<ToCsvWorker>) => {
  const { text, columns } = event.data;
  post({ type: 'progress', rowsRead: 0 });
  const result = readCsvTable(text, columns, { adopt: true, onProgress: (rowsRead) => post({ type: 'progress', rowsRead }) });
  post({ type: 'done', result });
};
