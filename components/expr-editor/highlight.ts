/**
 * Colours the expression by token: numbers, operators, logic keywords, the conditional's
 * "?" and ":", and words by what they stand for (a study name, a unit, a function, a
 * constant). Marks are rebuilt when the text or the study's names change; an expression is
 * one short line, so the whole text is redone (linear in its length).
 */
import type { EditorState, Extension } from '@codemirror/state';
import { Decoration, EditorView, ViewPlugin, type DecorationSet, type ViewUpdate } from '@codemirror/view';
import { fieldProps } from './props.ts';
import { isCalled, tokenize, wordRole, type TokenKind, type WordRole } from './tokens.ts';

const mark = (cls: string) => Decoration.mark({ class: cls });

const BY_KIND: Partial<Record<TokenKind, Decoration>> = {
  number: mark('cm-x-number'),
  operator: mark('cm-x-operator'),
  conditional: mark('cm-x-keyword'),
  bracket: mark('cm-x-operator'),
  comma: mark('cm-x-operator'),
};

const BY_ROLE: Record<WordRole, Decoration | undefined> = {
  keyword: mark('cm-x-keyword'),
  function: mark('cm-x-function'),
  name: mark('cm-x-name'),
  constant: mark('cm-x-constant'),
  unit: mark('cm-x-unit'),
  unknown: undefined,
};

function decorate(state: EditorState): DecorationSet {
  const text = state.doc.toString();
  const names = state.field(fieldProps).names;
  const ranges = [];
  for (const t of tokenize(text)) {
    const deco = t.kind === 'word' ? BY_ROLE[wordRole(text.slice(t.from, t.to), isCalled(text, t.to), names)] : BY_KIND[t.kind];
    if (deco) ranges.push(deco.range(t.from, t.to));
  }
  return Decoration.set(ranges);
}

/** Token colouring; needs `fieldProps` in the same state. */
export const exprHighlight: Extension = ViewPlugin.define(
  (view) => ({
    decorations: decorate(view.state),
    update(u: ViewUpdate) {
      if (u.docChanged || u.startState.field(fieldProps).names !== u.state.field(fieldProps).names) this.decorations = decorate(u.state);
    },
  }),
  { decorations: (v) => v.decorations },
);

/** The colours, chosen for at least 4.5:1 contrast on the white field. */
export const highlightTheme: Extension = EditorView.baseTheme({
  '.cm-x-number': { color: '#1a5788' },
  '.cm-x-operator': { color: '#4a5560' },
  '.cm-x-keyword': { color: '#a3245a', fontWeight: '600' },
  '.cm-x-function': { color: '#8a4600' },
  '.cm-x-constant': { color: '#8a4600', fontStyle: 'italic' },
  '.cm-x-unit': { color: '#2b6a2e' },
  '.cm-x-name': { color: '#5b2a94', fontWeight: '600' },
});
