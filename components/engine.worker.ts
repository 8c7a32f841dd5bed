/// <reference lib="webworker" />
/**
 * The engine's worker: one study session off the main thread, so that long runs and sweeps
 * never freeze the page. It only relays: every computation is the engine's.
 */
import { openStudy, residualBuffers, residualColumns, type CellReport, type FromWorker, type StudySession, type ToWorker } from '../src/index.ts';

let session: StudySession | undefined;

/**
 * The page plots the `plot` samples; the raw `series` (for the command line) would only cost
 * copying. A fit's residuals go as columns whose buffers are transferred (see worker-protocol).
 */
function post(message: FromWorker): void {
  const transfer: ArrayBuffer[] = [];
  if (message.type === 'report') {
    const cells = message.report.cells.map((c): CellReport => {
      const { series: _s, ...rest } = c as CellReport & { series?: unknown };
      if (rest.kind !== 'fit' || !Array.isArray((rest as { residuals?: unknown }).residuals)) return rest as CellReport;
      const { residuals, ...fit } = rest as Extract<CellReport, { kind: 'fit' }>;
      const columns = residualColumns(residuals ?? []);
      transfer.push(...residualBuffers(columns));
      return { ...fit, residualColumns: columns } as unknown as CellReport;
    });
    message = { ...message, report: { ...message.report, cells }, received, sent: performance.timeOrigin + performance.now() };
  }
  (self as unknown as Worker).postMessage(message, transfer);
}

let received = 0;

self.onmessage = (event: MessageEvent<ToWorker>) => {
  received = performance.timeOrigin + performance.now();
  const msg = event.data;
  const started = performance.now();
  if (msg.type === 'open') {
    const opened = openStudy(msg.doc);
    if (!opened.ok) {
      session = undefined;
      post({ type: 'refused', seq: msg.seq, error: opened.error });
      return;
    }
    session = opened.session;
    const report = session.report();
    post({ type: 'report', seq: msg.seq, report, rerun: report.cells.map((c) => c.id), changed: report.cells.map((c) => c.id), ms: performance.now() - started });
    return;
  }
  if (!session) {
    post({ type: 'refused', seq: msg.seq, error: { message: 'no study is open', path: '' } });
    return;
  }
  const rerun = new Set<string>();
  const changed = new Set<string>();
  for (const edit of msg.edits) {
    const r = session.apply(edit);
    if (!r.ok) {
      post({ type: 'refused', seq: msg.seq, error: r.error });
      return;
    }
    r.rerun.forEach((id) => rerun.add(id));
    r.changed.forEach((id) => changed.add(id));
  }
  post({ type: 'report', seq: msg.seq, report: session.report(), rerun: [...rerun], changed: [...changed], ms: performance.now() - started });
};
