/**
 * Owns the CodeMirror view of an `<expr-field>`: creates it on the element the host renders
 * for it, keeps it in step with the host's properties, and turns the user's edits into the
 * host's events. The host only renders; this is its behaviour.
 */
import { Annotation, EditorState, Transaction, type Extension } from '@codemirror/state';
import { EditorView, drawSelection, keymap, type ViewUpdate } from '@codemirror/view';
import { standardKeymap } from '@codemirror/commands';
import type { ReactiveController, ReactiveControllerHost } from 'lit';
import { fieldProps, namesMap, setProps, type FieldError, type FieldProps, type StudyName } from './props.ts';
import { errorMark } from './error-mark.ts';
import { exprHighlight, highlightTheme } from './highlight.ts';
import { exprCompletion } from './complete.ts';
import { nameInfo } from './name-info.ts';
import { keepClearOfParts } from './keep-clear.ts';
import { joinLines, singleLine } from './single-line.ts';
import { fieldTheme } from './theme.ts';
import { clearTyping, typingHistory } from './typing-history.ts';
import { typeOverSelection } from './type-over.ts';
import { dropUpdate, putOffUpdate, shouldWait, showWaiting, stopWatching, updateNow, wakeWhenNear } from './deferred.ts';

/** What the controller reads from its host. */
export interface ExprFieldHost extends ReactiveControllerHost, EventTarget {
  value: string;
  names: ReadonlyArray<StudyName>;
  error?: FieldError;
  label: string;
  readonly: boolean;
  /** The field can read states (the engine's `fieldReadsStates` for its path); false when absent. */
  readsStates?: boolean;
}

export interface ExprInputDetail {
  readonly value: string;
}

/** Marks a transaction that brings in the host's value, so it fires no input event. */
const fromHost = Annotation.define<boolean>();

export class ExprEditorController implements ReactiveController {
  private view?: EditorView;
  private parent?: Element;
  /** The text as last committed or set by the host: a blur commits only when it differs. */
  private committed = '';
  private props?: FieldProps;
  private namesFrom?: ReadonlyArray<StudyName>;
  private readsStatesFrom = false;
  /** The plain box shown while the editor waits to be needed (`deferred.ts`). */
  private waiting?: HTMLElement;
  /** The field was needed (near the viewport, or focused): it gets its editor whatever the count. */
  private needed = false;

  /**
   * @param host the element
   * @param errorId id of the element that shows the error message, for aria-describedby
   */
  constructor(private readonly host: ExprFieldHost, private readonly errorId: string) {
    host.addController(this);
  }

  /**
   * Ref callback for the element the editor lives in; undefined when it leaves the document.
   * The view is made once that element is in the document (on first render Lit calls this
   * while the element is still in a detached fragment).
   */
  readonly mount = (parent?: Element): void => {
    if (parent !== this.parent) this.destroy();
    this.parent = parent;
    this.create();
  };

  hostUpdated(): void {
    this.create();
    if (!this.view) {
      if (this.waiting) showWaiting(this.waiting, this.waitingView());
      return;
    }
    this.syncProps();
    this.syncValue();
  }

  /** Takes focus with the cursor after the text (making the editor if it was waiting). */
  focusAtEnd(): void {
    if (!this.view) {
      this.needed = true;
      this.create();
    }
    const view = this.view;
    if (!view) return;
    view.focus();
    view.dispatch({ selection: { anchor: view.state.doc.length }, annotations: fromHost.of(true) });
  }

  hostDisconnected(): void {
    this.destroy();
  }

  private create(): void {
    const parent = this.parent;
    if (this.view || !parent?.isConnected) return;
    if (!this.needed && shouldWait()) {
      this.wait(parent);
      return;
    }
    this.stopWaiting();
    this.committed = joinLines(this.host.value ?? '');
    this.view = new EditorView({
      parent,
      root: parent.getRootNode() as Document | ShadowRoot,
      state: EditorState.create({ doc: this.committed, extensions: this.extensions() }),
    });
    this.props = undefined;
    this.syncProps(true);
  }

  private destroy(): void {
    dropUpdate(this);
    this.view?.destroy();
    this.view = undefined;
    this.stopWaiting();
  }

  /** Shows the field's text in a plain box until the field is needed, then makes the editor. */
  private wait(parent: Element): void {
    if (!this.waiting) {
      const box = document.createElement('div');
      box.className = 'waiting';
      const wake = () => {
        this.needed = true;
        const focused = (box.getRootNode() as ShadowRoot | Document).activeElement === box;
        this.create();
        if (focused) this.view?.focus();
      };
      box.addEventListener('focus', wake);
      parent.append(box);
      this.waiting = box;
      wakeWhenNear(parent, wake);
    }
    showWaiting(this.waiting, this.waitingView());
  }

  private waitingView() {
    const h = this.host;
    return { text: joinLines(h.value ?? ''), label: h.label ?? '', readonly: !!h.readonly, invalid: !!h.error, describedBy: h.error ? this.errorId : undefined };
  }

  private stopWaiting(): void {
    if (this.parent) stopWatching(this.parent);
    this.waiting?.remove();
    this.waiting = undefined;
  }

  private extensions(): Extension {
    return [
      fieldProps,
      errorMark,
      typingHistory,
      typeOverSelection,
      drawSelection(),
      EditorView.lineWrapping,
      singleLine((view) => this.commit(view)),
      keymap.of(standardKeymap),
      exprHighlight,
      highlightTheme,
      exprCompletion,
      keepClearOfParts,
      nameInfo,
      fieldTheme,
      EditorView.updateListener.of((u) => this.onUpdate(u)),
    ];
  }

  private onUpdate(u: ViewUpdate): void {
    if (u.focusChanged && u.view.hasFocus) queueMicrotask(() => updateNow(this)); // not inside this update
    if (u.docChanged && !u.transactions.some((tr) => tr.annotation(fromHost))) {
      this.emit('expr-input', u.state.doc.toString());
    }
    if (u.focusChanged && !u.view.hasFocus) {
      if (u.state.doc.toString() !== this.committed) this.commit(u.view);
      else clearTyping(u.view); // leaving the field ends its own undo, committed or not
    }
  }

  private commit(view: EditorView): void {
    this.committed = view.state.doc.toString();
    clearTyping(view);
    this.emit('expr-commit', this.committed);
  }

  private emit(type: 'expr-input' | 'expr-commit', value: string): void {
    this.host.dispatchEvent(new CustomEvent<ExprInputDetail>(type, { detail: { value }, bubbles: true, composed: true }));
  }

  /** Gives the editor the host's names, error, label: at once when `now`, when the editor has focus or the study is small; else a little later (`putOffUpdate`). */
  private syncProps(now = false): void {
    const h = this.host;
    const old = this.props;
    const reads = !!h.readsStates;
    const keep = old && reads === this.readsStatesFrom && (this.namesFrom === h.names || sameNamesUpdated(old.names, h.names ?? [], reads));
    const names = keep ? old.names : namesMap(h.names ?? [], reads);
    this.namesFrom = h.names;
    this.readsStatesFrom = reads;
    const error = old && sameError(old.error, h.error) ? old.error : h.error;
    const next: FieldProps = { names, error, label: h.label ?? '', readonly: !!h.readonly, errorId: this.errorId };
    if (old && old.names === next.names && old.error === next.error && old.label === next.label && old.readonly === next.readonly) return;
    this.props = next;
    const view = this.view!;
    const give = () => { if (this.view === view && this.props === next) view.dispatch({ effects: setProps.of(next) }); };
    if (!now && shouldWait() && !view.hasFocus) putOffUpdate(this, give);
    else {
      dropUpdate(this);
      give();
    }
  }

  /**
   * Brings in the host's value unless the user is typing (focused with uncommitted edits).
   * Equal text changes nothing, so the cursor stays; other text replaces only the part that
   * differs, so a cursor outside that part stays where it was.
   */
  private syncValue(): void {
    const view = this.view!;
    const value = joinLines(this.host.value ?? '');
    const doc = view.state.doc.toString();
    if (value === doc) return;
    if (view.hasFocus && doc !== this.committed) return;
    let start = 0;
    while (start < value.length && start < doc.length && value[start] === doc[start]) start++;
    let endV = value.length;
    let endD = doc.length;
    while (endV > start && endD > start && value[endV - 1] === doc[endD - 1]) { endV--; endD--; }
    this.committed = value;
    view.dispatch({
      changes: { from: start, to: endD, insert: value.slice(start, endV) },
      annotations: [fromHost.of(true), Transaction.addToHistory.of(false)],
    });
    // typing from before an outside change (an undo of the study) would no longer fit the text
    clearTyping(view);
  }
}

/**
 * When the study defines the same names as before (a slider moved: only values changed), the
 * shown values are updated in place and the editor is left alone: colours depend on the
 * names, not their values, and the tooltip and completion read the values when they open.
 */
function sameNamesUpdated(map: ReadonlyMap<string, string | undefined>, names: ReadonlyArray<StudyName>, readsStates: boolean): boolean {
  const fresh = namesMap(names, readsStates);
  if (fresh.size !== map.size) return false;
  for (const key of fresh.keys()) if (!map.has(key)) return false;
  for (const [key, detail] of fresh) (map as Map<string, string | undefined>).set(key, detail);
  return true;
}

function sameError(a: FieldError | undefined, b: FieldError | undefined): boolean {
  if (a === b) return true;
  if (!a || !b) return false;
  return a.message === b.message && a.span?.[0] === b.span?.[0] && a.span?.[1] === b.span?.[1];
}
