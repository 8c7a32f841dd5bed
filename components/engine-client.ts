/**
 * The one place that talks to the engine's worker. Edits are sent as they come; while the
 * worker is busy they are batched, and when it has been busy too long with work a newer edit
 * makes stale, the worker is replaced and handed the latest study, so the old run is
 * cancelled. An answer older than the newest one shown is dropped.
 */
import { lazyResiduals, type Edit, type FromWorker, type Report, type ResidualColumns, type Study, type ToWorker } from '../src/index.ts';

/** A run longer than this, with newer edits waiting, is cancelled. */
export const CANCEL_AFTER_MS = 250;

export interface EngineAnswer {
  readonly received?: number;
  readonly sent?: number;
  readonly report: Report;
  readonly rerun: readonly string[];
  readonly changed: readonly string[];
  readonly ms: number;
}

export interface EngineClientEvents {
  answer(answer: EngineAnswer): void;
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
    if (!this.inFlight || msg.seq !== this.inFlight.seq) return; // an answer from a cancelled run
    this.inFlight = undefined;
    clearTimeout(this.cancelTimer);
    this.cancelTimer = undefined;
    if (msg.type === 'refused') this.events.refused(msg.error.message, msg.error.path);
    else {
      // a fit's residuals came as columns: the report reads as the engine wrote it
      for (const c of msg.report.cells) {
        const columns = (c as { residualColumns?: ResidualColumns }).residualColumns;
        if (columns && !('residuals' in c)) lazyResiduals(c, columns);
      }
      this.events.answer(msg); // newer than anything shown; queued edits follow at once
    }
    if (this.queued.length) {
      const edits = this.queued;
      this.queued = [];
      this.send({ type: 'edits', seq: ++this.seq, edits });
    } else {
      this.events.busy(false);
    }
  }
}

function defaultWorker(): Worker {
  return new Worker(new URL('./engine.worker.ts', import.meta.url), { type: 'module' });
}
