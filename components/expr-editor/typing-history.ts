/**
 * The field's own undo: the typing since the field last committed (Enter, or focus leaving
 * it) or took a value from outside. Ctrl+Z / Cmd+Z undo that typing, Ctrl+Shift+Z /
 * Cmd+Shift+Z and Ctrl+Y redo it. When there is nothing left to undo or redo, the key is not
 * handled here and goes on to the study's undo (the study view's key handler), so one key
 * press is never handled twice.
 */
import { Compartment, type Extension } from '@codemirror/state';
import { keymap, type EditorView } from '@codemirror/view';
import { history, redo, redoDepth, undo, undoDepth } from '@codemirror/commands';

const slot = new Compartment();

/** The history and its keys. The commands return false (key not handled) when there is nothing to do. */
export const typingHistory: Extension = [
  slot.of(history()),
  keymap.of([
    { key: 'Mod-z', run: undo },
    { key: 'Mod-Shift-z', run: redo },
    { key: 'Mod-y', run: redo },
  ]),
];

/**
 * Forgets the field's typing (at a commit, or when an outside value replaces the text).
 * Done just after the current update, so it may be called from an update listener. A history
 * with nothing to undo or redo (a value from outside, as at each position of a slider drag,
 * comes in without a step) is left alone: each transaction costs the editor a reading of the
 * page's selection, which lays the page out.
 */
export function clearTyping(view: EditorView): void {
  queueMicrotask(() => {
    if (undoDepth(view.state) === 0 && redoDepth(view.state) === 0) return;
    // removing the history and putting it back starts it empty
    view.dispatch({ effects: slot.reconfigure([]) });
    view.dispatch({ effects: slot.reconfigure(history()) });
  });
}
