/**
 * Shows a study name's current value ("k = 0.35 1 / h") in a tooltip: when the pointer rests
 * on the name, and when the keyboard cursor is in or right after it while the field has
 * focus, so that the value is reachable without a mouse.
 */
import { StateEffect, StateField, type EditorState, type Extension } from '@codemirror/state';
import { EditorView, hoverTooltip, showTooltip, type Tooltip } from '@codemirror/view';
import { fieldProps } from './props.ts';
import { wordAt } from './tokens.ts';

interface NameSpot {
  readonly from: number;
  readonly to: number;
  readonly name: string;
  readonly detail?: string;
}

/** The study name at `pos`, if the word there is one. */
function nameAt(state: EditorState, pos: number): NameSpot | undefined {
  const w = wordAt(state.doc.toString(), pos);
  const names = state.field(fieldProps).names;
  if (!w || !names.has(w.word)) return undefined;
  return { from: w.from, to: w.to, name: w.word, detail: names.get(w.word) };
}

function tooltip(spot: NameSpot): Tooltip {
  return {
    pos: spot.from,
    end: spot.to,
    above: true,
    create() {
      const dom = document.createElement('div');
      dom.className = 'cm-x-nameinfo';
      dom.setAttribute('role', 'tooltip');
      const name = document.createElement('strong');
      name.textContent = spot.name;
      dom.append(name, spot.detail === undefined ? ' has no value yet' : ` = ${spot.detail}`);
      return { dom };
    },
  };
}

const focusChanged = StateEffect.define<boolean>();

const focused = StateField.define<boolean>({
  create: () => false,
  update: (v, tr) => tr.effects.reduce((f, e) => (e.is(focusChanged) ? e.value : f), v),
});

/** The spot the cursor is on, while focused with an empty selection. */
const cursorSpot = StateField.define<NameSpot | undefined>({
  create: () => undefined,
  update(spot, tr) {
    const sel = tr.state.selection.main;
    if (!tr.state.field(focused) || !sel.empty) return undefined;
    const next = nameAt(tr.state, sel.head);
    if (spot && next && spot.from === next.from && spot.name === next.name && spot.detail === next.detail) return spot;
    return next;
  },
  provide: (f) => showTooltip.from(f, (spot) => (spot ? tooltip(spot) : null)),
});

const onHover = hoverTooltip((view, pos, side) => {
  const spot = nameAt(view.state, pos);
  if (!spot || (pos === spot.from && side < 0) || (pos === spot.to && side > 0)) return null;
  const atCursor = view.state.field(cursorSpot);
  if (atCursor && atCursor.from === spot.from) return null; // already shown
  return tooltip(spot);
}, { hoverTime: 300 });

/** Name info on hover and at the cursor; needs `fieldProps` in the same state. */
export const nameInfo: Extension = [
  focused,
  EditorView.focusChangeEffect.of((_state, isFocused) => focusChanged.of(isFocused)),
  cursorSpot,
  onHover,
  EditorView.baseTheme({
    '.cm-tooltip.cm-x-nameinfo, .cm-x-nameinfo': { padding: '0.25rem 0.5rem', fontFamily: 'system-ui, sans-serif', fontSize: '0.9rem' },
  }),
];
