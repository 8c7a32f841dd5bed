/**
 * The field's look inside the editor: a one-line text box in the app's type, the error
 * underline, and the completion list and tooltips in the app's colours. The box border and
 * focus ring belong to the host element, which draws them around the editor.
 */
import { EditorView } from '@codemirror/view';

const INK = '#1c2329';
const ERROR = '#b3261e';
const ACCENT = '#1a5788';

export const fieldTheme = EditorView.theme({
  '&': { color: INK, backgroundColor: '#fff', fontSize: '1rem' },
  '&.cm-focused': { outline: 'none' },
  '.cm-scroller': { fontFamily: 'ui-monospace, "SFMono-Regular", Menlo, Consolas, monospace', lineHeight: '1.5' },
  '.cm-content': { padding: '0.4rem 0', caretColor: INK },
  '.cm-line': { padding: '0 0.6rem' },
  '&.cm-focused .cm-cursor': { borderLeftColor: INK, borderLeftWidth: '2px' },
  '&.cm-focused .cm-selectionBackground, .cm-selectionBackground, ::selection': { backgroundColor: '#c7dcef' },
  '.cm-x-error': {
    textDecoration: `underline wavy ${ERROR}`,
    textDecorationSkipInk: 'none',
    textUnderlineOffset: '3px',
    backgroundColor: '#fbe9e7',
  },
  '.cm-x-error-point': {
    display: 'inline-block',
    width: '0.5em',
    height: '1.1em',
    verticalAlign: 'text-bottom',
    borderBottom: `3px solid ${ERROR}`,
    backgroundColor: '#fbe9e7',
  },
  '.cm-tooltip': {
    border: '1px solid #6b7682',
    borderRadius: '4px',
    backgroundColor: '#fff',
    color: INK,
    boxShadow: '0 2px 6px rgb(0 0 0 / 0.15)',
  },
  // the list drops below the whole field (its padding and border), not just below the text
  '.cm-tooltip.cm-tooltip-autocomplete.cm-tooltip-below': { marginTop: '1rem' },
  '.cm-tooltip.cm-tooltip-autocomplete > ul': {
    fontFamily: 'ui-monospace, "SFMono-Regular", Menlo, Consolas, monospace',
    maxHeight: '14em',
    minWidth: '14em',
    maxWidth: 'min(28em, 90vw)',
  },
  '.cm-tooltip.cm-tooltip-autocomplete > ul > li': { padding: '0.2rem 0.6rem', lineHeight: '1.4' },
  '.cm-tooltip-autocomplete ul li[aria-selected]': { backgroundColor: ACCENT, color: '#fff' },
  '.cm-tooltip-autocomplete ul li[aria-selected] .cm-completionDetail': { color: '#fff' },
  '.cm-completionDetail': { color: '#4a5560', fontStyle: 'normal', marginLeft: '1em' },
  '.cm-completionMatchedText': { textDecoration: 'none', fontWeight: '700' },
  '.cm-tooltip.cm-tooltip-autocomplete completion-section': {
    fontFamily: 'system-ui, sans-serif',
    fontSize: '0.8rem',
    color: '#4a5560',
    borderBottom: '1px solid #c9cfd6',
    padding: '0.2rem 0.6rem',
    display: 'list-item',
    listStyle: 'none',
  },
});
