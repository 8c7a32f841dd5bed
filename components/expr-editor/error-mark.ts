/**
 * Underlines the span of the current error. The span is placed when the host sets a new
 * error and then follows the text through edits until the next error replaces it; a span
 * past the end is clipped, and an empty one (a problem at the end of the text) shows a
 * marker instead of an underline.
 */
import { StateField, type Extension, type EditorState } from '@codemirror/state';
import { Decoration, EditorView, WidgetType, type DecorationSet } from '@codemirror/view';
import { fieldProps, setProps } from './props.ts';

const underline = Decoration.mark({ class: 'cm-x-error' });

class PointMarker extends WidgetType {
  override eq(): boolean {
    return true;
  }
  toDOM(): HTMLElement {
    const span = document.createElement('span');
    span.className = 'cm-x-error-point';
    span.setAttribute('aria-hidden', 'true');
    return span;
  }
}
const point = Decoration.widget({ widget: new PointMarker(), side: 1 });

function place(state: EditorState): DecorationSet {
  const span = state.field(fieldProps).error?.span;
  if (!span) return Decoration.none;
  const len = state.doc.length;
  const from = Math.max(0, Math.min(len, span[0]));
  const to = Math.max(from, Math.min(len, span[1]));
  return Decoration.set(from < to ? [underline.range(from, to)] : [point.range(from)]);
}

const errorMarks = StateField.define<DecorationSet>({
  create: place,
  update(marks, tr) {
    const before = tr.startState.field(fieldProps).error;
    if (tr.effects.some((e) => e.is(setProps)) && tr.state.field(fieldProps).error !== before) return place(tr.state);
    return tr.docChanged ? marks.map(tr.changes) : marks;
  },
  provide: (f) => EditorView.decorations.from(f),
});

/** The error underline; needs `fieldProps` in the same state. */
export const errorMark: Extension = errorMarks;
