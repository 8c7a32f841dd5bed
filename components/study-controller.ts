import type { ReactiveController, ReactiveControllerHost } from 'lit';
import { applyEdit, sameContent, type Edit, type Progress, type Report, type Study } from '../src/index.ts';
import { EngineClient, type EngineAnswer } from './engine-client.ts';
import { keepPendingReports } from './pending-reports.ts';
import { createAutosaver, type Autosaver, type AutosaveState } from './autosaver.ts';

/** Consecutive edits with the same merge key within this time are one undo step (a drag, typing in a field). */
const MERGE_WINDOW_MS = 1200;
const UNDO_LIMIT = 200;
/** How long an edit waits for the engine's answer before it is rendered on its own. */
const RENDER_WAIT_MS = 40;

export interface StudyControllerOptions {
  /** Persists the study; called a moment after each change. */
  readonly save?: (id: string, study: Study) => Promise<void>;
  /** Whether a failed save is worth retrying by itself (default: yes). */
  readonly retry?: (err: unknown) => boolean;
  /** Called synchronously on every change, before it is rendered (the crash-safe journal). */
  readonly journal?: (id: string, study: Study) => void;
  /** Makes the engine client (tests pass one with a fake worker). */
  readonly engine?: (events: ConstructorParameters<typeof EngineClient>[0]) => EngineClient;
}

/**
 * The open study in the app: its document, undo and redo, the engine's latest report, and
 * saving. The one way the app changes a study: `edit()`, which applies the engine's own edit
 * function to the document, records the undo step, sends the edit to the engine's worker and
 * schedules a save. Undo and redo take the same path with a whole-document edit, so the
 * worker re-runs only the cells that differ; only `open()` hands the worker a study afresh.
 * It computes nothing itself.
 */
export class StudyController implements ReactiveController {
  id?: string;
  study?: Study;
  report?: Report;
  /** Cells that re-ran in the latest answer, and whose results changed. */
  rerun: readonly string[] = [];
  changed: readonly string[] = [];
  busy = false;
  /** Cells whose figures are the previous ones while the engine computes them (a Monte Carlo), and how far the one computing is. */
  pending: readonly string[] = [];
  progress?: Progress;
  /** A refused edit or an engine failure, for the status line. */
  problem?: string;
  saveState: AutosaveState = 'saved';
  /** Why the last save failed, while `saveState` is 'error'. */
  saveError?: string;
  lastRunMs = 0;
  /** When the worker got the last edit, sent its answer, and the answer arrived here (ms since the epoch): for the benchmark. */
  lastTiming = { received: 0, sent: 0, arrived: 0 };

  private undoStack: Study[] = [];
  private redoStack: Study[] = [];
  private lastMerge?: { key: string; at: number };
  private holding = false;
  private readonly engine: EngineClient;
  private saver?: Autosaver<{ id: string; study: Study }>;
  private readonly listeners = new Set<(a: EngineAnswer) => void>();
  private readonly journal?: (id: string, study: Study) => void;

  constructor(private readonly host: ReactiveControllerHost, options: StudyControllerOptions = {}) {
    host.addController(this);
    const events = {
      answer: (a: EngineAnswer) => {
        this.report = keepPendingReports(this.report, this.pending, a.report, a.pending ?? []);
        this.rerun = a.rerun;
        this.changed = a.changed;
        this.pending = a.pending ?? [];
        this.progress = a.progress;
        this.lastRunMs = a.ms;
        this.lastTiming = { received: a.received ?? 0, sent: a.sent ?? 0, arrived: performance.timeOrigin + performance.now() };
        this.problem = undefined;
        this.listeners.forEach((l) => l(a));
        clearTimeout(this.renderTimer);
        this.renderTimer = undefined;
        this.host.requestUpdate();
      },
      progress: (p: Progress) => {
        this.progress = p;
        this.host.requestUpdate();
      },
      refused: (message: string, path: string) => {
        this.problem = path ? `${path}: ${message}` : message;
        this.host.requestUpdate();
      },
      busy: (busy: boolean) => {
        this.busy = busy;
        // a typing or dragging edit is rendered with its answer (`renderSoon`), the status too:
        // rendering the view now would draw every cell twice per slider position
        if (busy && this.renderTimer !== undefined) return;
        this.host.requestUpdate();
      },
    };
    this.engine = options.engine ? options.engine(events) : new EngineClient(events);
    this.journal = options.journal;
    if (options.save) {
      const save = options.save;
      this.saver = createAutosaver(({ id, study }) => save(id, study), undefined, { retry: options.retry });
      this.saver.onchange = (state, error) => { this.saveState = state; this.saveError = error; this.host.requestUpdate(); };
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
    this.pending = [];
    this.progress = undefined;
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
   * and was recent (dragging one slider), or however long ago while a step is held open
   * (typing in an expression field until it commits: see `holdStep`). Returns the problem
   * when the edit is refused (nothing changes then).
   */
  edit(edit: Edit, mergeKey?: string): string | undefined {
    if (!this.study || !this.id) return 'no study is open';
    const before = this.study;
    const problem = this.apply(edit, mergeKey !== undefined);
    if (problem !== undefined) return problem;
    const now = performance.now();
    const merging = mergeKey !== undefined && this.lastMerge?.key === mergeKey && (this.holding || now - this.lastMerge.at < MERGE_WINDOW_MS);
    if (!merging) {
      // an edit that changes nothing is no step, and keeps what can be redone
      if (sameStudy(before, this.study)) {
        this.lastMerge = undefined;
        return undefined;
      }
      this.undoStack.push(before);
      if (this.undoStack.length > UNDO_LIMIT) this.undoStack.shift();
    } else if (sameStudy(this.undoStack.at(-1), this.study)) {
      // typing that comes back to where its step began (undone in the field) leaves no step
      this.undoStack.pop();
      this.lastMerge = undefined;
      this.redoStack = [];
      return undefined;
    }
    this.redoStack = [];
    this.lastMerge = mergeKey !== undefined ? { key: mergeKey, at: now } : undefined;
    return undefined;
  }

  /** Ends the current undo step (a field committed, focus moved on): the next edit starts a new one. */
  endStep(): void {
    this.lastMerge = undefined;
  }

  /**
   * While held, edits with one merge key make one undo step however slowly they come: the
   * study view holds it while an expression field has focus, whose own undo covers the
   * typing until it commits. Holding or letting go also ends the current step.
   */
  holdStep(hold: boolean): void {
    this.holding = hold;
    this.lastMerge = undefined;
  }

  get canUndo(): boolean {
    return this.undoStack.length > 0;
  }

  get canRedo(): boolean {
    return this.redoStack.length > 0;
  }

  /** Goes back one step: the study as it was, sent to the engine as a whole-document edit. */
  undo(): void {
    const previous = this.undoStack.at(-1);
    if (!previous || !this.study) return;
    const current = this.study;
    if (this.apply({ type: 'document', study: previous }, false) !== undefined) return;
    this.undoStack.pop();
    this.redoStack.push(current);
    this.lastMerge = undefined;
  }

  /** Goes forward one undone step, as a whole-document edit. */
  redo(): void {
    const next = this.redoStack.at(-1);
    if (!next || !this.study) return;
    const current = this.study;
    if (this.apply({ type: 'document', study: next }, false) !== undefined) return;
    this.redoStack.pop();
    this.undoStack.push(current);
    this.lastMerge = undefined;
  }

  /** Saves now (before leaving the study): 'saved', or 'error' when the save failed. */
  async flush(): Promise<'saved' | 'error'> {
    return (await this.saver?.flush()) ?? 'saved';
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

  /**
   * The one path of every change: the engine's `applyEdit` on this copy, the same edit to the
   * engine's session, a save. `typing` edits (merged) wait for the engine's answer to render.
   */
  private apply(edit: Edit, typing: boolean): string | undefined {
    const out = applyEdit(this.study!, edit);
    if (!out.ok) {
      this.problem = out.error.message;
      this.host.requestUpdate();
      return out.error.message;
    }
    this.study = out.study;
    this.journal?.(this.id!, out.study);
    // typing and dragging wait for the answer; a structural change shows at once
    if (typing) this.renderSoon();
    this.engine.edit(edit, out.study);
    this.saver?.schedule({ id: this.id!, study: out.study });
    if (!typing) this.host.requestUpdate();
    return undefined;
  }
}

/** Two documents with the same content. Cost: at most O(size of the study); cells both share cost nothing. */
function sameStudy(a: Study | undefined, b: Study | undefined): boolean {
  return a !== undefined && b !== undefined && sameContent(a, b);
}
