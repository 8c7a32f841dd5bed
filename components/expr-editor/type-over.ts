/**
 * Typing over a selection: the field inserts the typed text itself, as a transaction, instead
 * of leaving it to the browser. Chromium's editing engine, replacing a selection that starts in
 * coloured text (a number, a name), wraps the typed text in a `style="color: ..."` span to keep
 * the colour; the app's content security policy refuses style attributes, so each such key
 * press would be reported as a violation. Text typed at a caret, compositions (IME) and pastes
 * keep CodeMirror's own handling. Input handlers (the completion's triggers) still see the text.
 */
import type { Extension } from '@codemirror/state';
import { EditorView } from '@codemirror/view';

export const typeOverSelection: Extension = EditorView.domEventHandlers({
  beforeinput(event, view) {
    const text = event.data;
    if (event.inputType !== 'insertText' || event.isComposing || text == null || view.composing) return false;
    const { state } = view;
    if (state.selection.ranges.every((r) => r.empty)) return false;
    event.preventDefault();
    const { from, to } = state.selection.main;
    const insert = () => state.update(state.replaceSelection(text), { userEvent: 'input.type', scrollIntoView: true });
    if (!state.facet(EditorView.inputHandler).some((h) => h(view, from, to, text, insert))) view.dispatch(insert());
    return true;
  },
});
