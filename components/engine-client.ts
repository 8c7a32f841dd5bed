/**
 * The one place that talks to the engine's worker. Edits are sent as they come; while the
 * worker is busy they are batched, and when it has been busy too long with work a newer edit
 * makes stale, the worker is replaced and handed the latest study, so the old run is
 * cancelled. An answer older than the newest one shown is dropped.
 *
 * After its answer the worker computes the long cells (a Monte Carlo) in slices: their
 * progress and their late report are let through only while they reflect the newest edit sent
 * (no edit in flight or waiting), so a result for values the page no longer shows never appears.
 */
import { lazyResiduals, type Edit, type FromWorker, type Progress, type Report, type ResidualColumns, type Study, type ToWorker } from '../src/index.ts';

/** A run longer than this, with newer edits waiting, is cancelled. */
export const CANCEL_AFTER_MS = 250;

export interface EngineAnswer {
  readonly received?: number;
  readonly sent?: number;
  readonly report: Report;
  readonly rerun: readonly string[];
  readonly changed: readonly string[];
  readonly ms: number;
  /** Cells still computing (their figures are the previous ones), and how far the one computing is. */
  readonly pending?: readonly string[];
  readonly progress?: Progress;
  /** A pending cell finished after the answer to the newest edit. */
  readonly late?: true;
}

export interface EngineClientEvents {
  answer(answer: EngineAnswer): void;
  /** How far the pending cell computing is (a few times a second at most). */
  progress?(progress: Progress): void;
  refused(message: string, path: string): void;
  busy(busy: boolean): void;
}

export class EngineClient {
  private worker?: Worker;
  private seq = 0;
  private inFlight?: { seq: number; since: number };
  private queued: Edit[] = [];
  private latest?: Study;
  private cancelTimer?: ReturnType<typeof setTimeout>;

  constructor(private readonly events: EngineClientEvents, private readonly makeWorker: () => Worker = defaultWorker) {}

  /** Loads a study, replacing whatever was open (and cancelling any run). */
  open(study: Study): void {
    this.latest = study;
    this.queued = [];
    this.restart();
  }

  /** Sends one edit; `study` is the document after it, kept in case the worker must restart. */
  edit(edit: Edit, study: Study): void {
    this.latest = study;
    if (!this.worker) return this.restart();
    if (!this.inFlight) return this.send({ type: 'edits', seq: ++this.seq, edits: [edit] });
    this.queued.push(edit);
    this.scheduleCancel();
  }

  dispose(): void {
    clearTimeout(this.cancelTimer);
    this.worker?.terminate();
    this.worker = undefined;
  }

  private restart(): void {
    clearTimeout(this.cancelTimer);
    this.worker?.terminate();
    this.worker = this.makeWorker();
    this.worker.onmessage = (e: MessageEvent<FromWorker>) => this.receive(e.data);
    this.worker.onerror = (e) => { e.preventDefault(); this.events.refused(`the engine stopped unexpectedly: ${e.message}`, ''); this.inFlight = undefined; this.events.busy(false); };
    this.queued = [];
    if (this.latest) this.send({ type: 'open', seq: ++this.seq, doc: this.latest });
  }

  private send(msg: ToWorker): void {
    this.inFlight = { seq: msg.seq, since: performance.now() };
    this.events.busy(true);
    this.worker!.postMessage(msg);
  }

  private scheduleCancel(): void {
    if (this.cancelTimer !== undefined || !this.inFlight) return;
    const wait = Math.max(0, CANCEL_AFTER_MS - (performance.now() - this.inFlight.since));
    this.cancelTimer = setTimeout(() => {
      this.cancelTimer = undefined;
      if (this.inFlight && this.queued.length) this.restart();
    }, wait);
  }

  private receive(msg: FromWorker): void {
    if (msg.type === 'progress' || (msg.type === 'report' && msg.late)) {
      // work after the answer to the newest edit: stale once another edit is sent
      if (this.inFlight || this.queued.length || msg.seq !== this.seq) return;
      if (msg.type === 'progress') this.events.progress?.(msg.progress);
      else this.events.answer(withResiduals(msg));
      return;
    }
    if (!this.inFlight || msg.seq !== this.inFlight.seq) return; // an answer from a cancelled run
    this.inFlight = undefined;
    clearTimeout(this.cancelTimer);
    this.cancelTimer = undefined;
    if (msg.type === 'refused') this.events.refused(msg.error.message, msg.error.path);
    else this.events.answer(withResiduals(msg)); // newer than anything shown; queued edits follow at once
    if (this.queued.length) {
      const edits = this.queued;
      this.queued = [];
      this.send({ type: 'edits', seq: ++this.seq, edits });
    } else {
      this.events.busy(false);
    }
  }
}

/** A fit's residuals came as columns: the report reads as the engine wrote it. */
function withResiduals<M extends Extract<FromWorker, { type: 'report' }>>(msg: M): M {
  for (const c of msg.report.cells) {
    const columns = (c as { residualColumns?: ResidualColumns }).residualColumns;
    if (columns && !('residuals' in c)) lazyResiduals(c, columns);
  }
  return msg;
}

function defaultWorker(): Worker {
  return new Worker(new URL('./engine.worker.ts', import.meta.url), { type: 'module' });
}
