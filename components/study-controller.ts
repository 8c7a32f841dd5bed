import type { ReactiveController, ReactiveControllerHost } from 'lit';
import { applyEdit, type Edit, type Report, type Study } from '../src/index.ts';
import { EngineClient, type EngineAnswer } from './engine-client.ts';
import { createAutosaver, type Autosaver, type AutosaveState } from './autosaver.ts';

/** Consecutive edits with the same merge key within this time are one undo step (a drag, typing in a field). */
const MERGE_WINDOW_MS = 1200;
const UNDO_LIMIT = 200;
/** How long an edit waits for the engine's answer before it is rendered on its own. */
const RENDER_WAIT_MS = 40;

export interface StudyControllerOptions {
  /** Persists the study; called a moment after each change. */
  readonly save?: (id: string, study: Study) => Promise<void>;
  /** Makes the engine client (tests pass one with a fake worker). */
  readonly engine?: (events: ConstructorParameters<typeof EngineClient>[0]) => EngineClient;
}

/**
 * The open study in the app: its document, undo and redo, the engine's latest report, and
 * saving. The one way the app changes a study: `edit()`, which applies the engine's own edit
 * function to the document, records the undo step, sends the edit to the engine's worker and
 * schedules a save. It computes nothing itself.
 */
export class StudyController implements ReactiveController {
  id?: string;
  study?: Study;
  report?: Report;
  /** Cells that re-ran in the latest answer, and whose results changed. */
  rerun: readonly string[] = [];
  changed: readonly string[] = [];
  busy = false;
  /** A refused edit or an engine failure, for the status line. */
  problem?: string;
  saveState: AutosaveState = 'saved';
  lastRunMs = 0;
  /** When the worker got the last edit, sent its answer, and the answer arrived here (ms since the epoch): for the benchmark. */
  lastTiming = { received: 0, sent: 0, arrived: 0 };

  private undoStack: Study[] = [];
  private redoStack: Study[] = [];
  private lastMerge?: { key: string; at: number };
  private readonly engine: EngineClient;
  private saver?: Autosaver<{ id: string; study: Study }>;
  private readonly listeners = new Set<(a: EngineAnswer) => void>();

  constructor(private readonly host: ReactiveControllerHost, options: StudyControllerOptions = {}) {
    host.addController(this);
    const events = {
      answer: (a: EngineAnswer) => {
        this.report = a.report;
        this.rerun = a.rerun;
        this.changed = a.changed;
        this.lastRunMs = a.ms;
        this.lastTiming = { received: a.received ?? 0, sent: a.sent ?? 0, arrived: performance.timeOrigin + performance.now() };
        this.problem = undefined;
        this.listeners.forEach((l) => l(a));
        clearTimeout(this.renderTimer);
        this.renderTimer = undefined;
        this.host.requestUpdate();
      },
      refused: (message: string, path: string) => {
        this.problem = path ? `${path}: ${message}` : message;
        this.host.requestUpdate();
      },
      busy: (busy: boolean) => {
        this.busy = busy;
        this.host.requestUpdate();
      },
    };
    this.engine = options.engine ? options.engine(events) : new EngineClient(events);
    if (options.save) {
      const save = options.save;
      this.saver = createAutosaver(({ id, study }) => save(id, study));
      this.saver.onchange = (state) => { this.saveState = state; this.host.requestUpdate(); };
    }
  }

  hostDisconnected(): void {
    void this.saver?.flush();
    this.engine.dispose();
  }

  /** Opens a study (its undo history starts empty). */
  open(id: string, study: Study): void {
    this.id = id;
    this.study = study;
    this.report = undefined;
    this.undoStack = [];
    this.redoStack = [];
    this.lastMerge = undefined;
    this.engine.open(study);
    this.host.requestUpdate();
  }

  /** Calls back after each answer of the engine (tests and the benchmark wait on it). */
  onAnswer(listener: (a: EngineAnswer) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  /**
   * Applies an edit. `mergeKey` joins it to the previous undo step when that had the same key
   * and was recent (typing in one field, dragging one slider). Returns the problem when the
   * edit is refused (nothing changes then).
   */
  edit(edit: Edit, mergeKey?: string): string | undefined {
    if (!this.study || !this.id) return 'no study is open';
    const out = applyEdit(this.study, edit);
    if (!out.ok) {
      this.problem = out.error.message;
      this.host.requestUpdate();
      return out.error.message;
    }
    const now = performance.now();
    const merging = mergeKey !== undefined && this.lastMerge?.key === mergeKey && now - this.lastMerge.at < MERGE_WINDOW_MS;
    if (!merging) {
      this.undoStack.push(this.study);
      if (this.undoStack.length > UNDO_LIMIT) this.undoStack.shift();
    }
    this.lastMerge = mergeKey !== undefined ? { key: mergeKey, at: now } : undefined;
    this.redoStack = [];
    this.study = out.study;
    this.engine.edit(edit, out.study);
    this.saver?.schedule({ id: this.id, study: out.study });
    // typing and dragging (merged edits) wait for the answer; a structural change shows at once
    if (mergeKey !== undefined) this.renderSoon();
    else this.host.requestUpdate();
    return undefined;
  }

  get canUndo(): boolean {
    return this.undoStack.length > 0;
  }

  get canRedo(): boolean {
    return this.redoStack.length > 0;
  }

  undo(): void {
    const previous = this.undoStack.pop();
    if (!previous || !this.study) return;
    this.redoStack.push(this.study);
    this.restore(previous);
  }

  redo(): void {
    const next = this.redoStack.pop();
    if (!next || !this.study) return;
    this.undoStack.push(this.study);
    this.restore(next);
  }

  /** Saves now (before leaving the study). */
  async flush(): Promise<void> {
    await this.saver?.flush();
  }

  private renderTimer?: ReturnType<typeof setTimeout>;

  /**
   * Renders an edit together with the engine's answer to it, which usually follows within a
   * few milliseconds: one render and one frame instead of two, which keeps a slider drag
   * smooth. The field being edited already shows what was typed; if the answer is slow, the
   * edit is rendered on its own after RENDER_WAIT_MS.
   */
  private renderSoon(): void {
    if (this.renderTimer !== undefined) return;
    this.renderTimer = setTimeout(() => {
      this.renderTimer = undefined;
      this.host.requestUpdate();
    }, RENDER_WAIT_MS);
  }

  private restore(study: Study): void {
    this.study = study;
    this.lastMerge = undefined;
    this.engine.open(study);
    if (this.id) this.saver?.schedule({ id: this.id, study });
    this.host.requestUpdate();
  }
}
