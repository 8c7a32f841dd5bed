/// <reference lib="webworker" />
/**
 * The engine's worker: one study session off the main thread, so that long runs and sweeps
 * never freeze the page. It only relays: every computation is the engine's.
 *
 * The session defers its long cells (a Monte Carlo uncertainty cell): each edit is answered
 * with every other cell, then the long ones are computed in slices of SLICE_MS, each posted
 * behind a message to itself, so an edit that arrives meanwhile is applied between two slices.
 * A long cell whose inputs an edit changed starts again only once no edit has changed them for
 * SETTLE_MS (a slider being dragged sends one every frame, and each would start it again);
 * one the edits did not reach goes on between them. A batch of edits is applied with one
 * evaluation. Progress goes out every PROGRESS_EVERY_MS at most; a finished cell goes out as
 * a `late` report.
 */
import { openStudy, residualBuffers, residualColumns, type CellReport, type FromWorker, type StudySession, type ToWorker } from '../src/index.ts';

/** The longest slice of deferred work, in ms: an edit waits at most this long (plus one sample) before it is applied. */
const SLICE_MS = 2;
/**
 * The quiet time after an edit that changed a long cell's inputs before that cell starts again,
 * in ms: edits of its inputs closer together than this (a drag, held arrow keys, typing) find
 * it idle, as work started between them would be thrown away by the next; its result comes this
 * much later. Long cells the edits do not reach go on between them.
 */
const SETTLE_MS = 100;
/** The least time between two progress messages, in ms. */
const PROGRESS_EVERY_MS = 250;

let session: StudySession | undefined;
/** The seq of the last message applied: what a late report or a progress message reflects. */
let seq = 0;

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
    const progress = session?.progress();
    message = {
      ...message, report: { ...message.report, cells }, pending: session?.pending() ?? [], ...(progress ? { progress } : {}),
      ...(message.late ? {} : { received }), sent: performance.timeOrigin + performance.now(),
    };
  }
  (self as unknown as Worker).postMessage(message, transfer);
}

let received = 0;

// deferred work: one slice per message to this port, so the worker's own messages come between
const slices = new MessageChannel();
let scheduled = false;
let lastProgress = 0;
/** Set while every long cell that could start had its inputs edited less than SETTLE_MS ago. */
let settle: ReturnType<typeof setTimeout> | undefined;

/** The next slice, unless one is on its way or the long cells wait for a pause in edits. */
function schedule(): void {
  if (scheduled || settle !== undefined || !session?.pending().length) return;
  scheduled = true;
  slices.port2.postMessage(0);
}

slices.port1.onmessage = () => {
  scheduled = false;
  if (!session || settle !== undefined) return;
  const started = performance.now();
  const step = session.work(started + SLICE_MS, started - SETTLE_MS);
  if (!step) return;
  if (step.notBefore !== undefined) {
    settle = setTimeout(() => { settle = undefined; schedule(); }, Math.max(0, step.notBefore + SETTLE_MS - started));
    return;
  }
  const now = performance.now();
  if (step.answer) {
    const { report, rerun, changed } = step.answer;
    post({ type: 'report', seq, report, rerun, changed, ms: now - started, late: true });
  } else if (step.progress && now - lastProgress >= PROGRESS_EVERY_MS) {
    lastProgress = now;
    post({ type: 'progress', seq, progress: step.progress });
  }
  schedule();
};

/** After an edit (or opening): the session says again which long cells may start (an edit may have reached them, or not). */
function afterEdit(): void {
  clearTimeout(settle);
  settle = undefined;
  schedule();
}

self.onmessage = (event: MessageEvent<ToWorker>) => {
  received = performance.timeOrigin + performance.now();
  const msg = event.data;
  seq = msg.seq;
  const started = performance.now();
  if (msg.type === 'open') {
    const opened = openStudy(msg.doc, { defer: true });
    if (!opened.ok) {
      session = undefined;
      post({ type: 'refused', seq: msg.seq, error: opened.error });
      return;
    }
    session = opened.session;
    const report = session.report();
    post({ type: 'report', seq: msg.seq, report, rerun: report.cells.map((c) => c.id), changed: report.cells.map((c) => c.id), ms: performance.now() - started });
    afterEdit();
    return;
  }
  if (!session) {
    post({ type: 'refused', seq: msg.seq, error: { message: 'no study is open', path: '' } });
    return;
  }
  const r = session.applyAll(msg.edits);
  if (!r.ok) post({ type: 'refused', seq: msg.seq, error: r.error });
  else post({ type: 'report', seq: msg.seq, report: r.report, rerun: r.rerun, changed: r.changed, ms: performance.now() - started });
  afterEdit();
};
