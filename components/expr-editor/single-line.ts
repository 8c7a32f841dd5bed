/**
 * Keeps the expression on one line: Enter (with or without modifiers) commits instead of
 * breaking the line, and any inserted text that holds line breaks (a paste, a drop) has each
 * break, with the spaces around it, joined into one space.
 */
import { EditorSelection, EditorState, Prec, Transaction, type Extension } from '@codemirror/state';
import { keymap, type EditorView } from '@codemirror/view';

/** Text with its line breaks (and the spaces around them) turned into single spaces. */
export function joinLines(text: string): string {
  return text.replace(/[ \t]*(?:\r\n?|\n|\u2028|\u2029)\s*/g, ' ');
}

const joinBreaks = EditorState.transactionFilter.of((tr) => {
  if (!tr.docChanged || tr.newDoc.lines === 1) return tr;
  const specs: Array<{ from: number; to: number; insert: string }> = [];
  tr.changes.iterChanges((from, to, _fromB, _toB, inserted) => {
    specs.push({ from, to, insert: joinLines(inserted.sliceString(0, inserted.length, '\n')) });
  });
  const changes = tr.startState.changes(specs);
  const userEvent = tr.annotation(Transaction.userEvent);
  return {
    changes,
    selection: EditorSelection.create(tr.startState.selection.ranges.map((r) => r.map(changes, 1)), tr.startState.selection.mainIndex),
    effects: tr.effects,
    scrollIntoView: tr.scrollIntoView,
    ...(userEvent ? { userEvent } : {}),
  };
});

/**
 * One line, with `commit` run on Enter. Enter accepts a completion option first when the user
 * selected one in the list: the completion keys (`complete-keys.ts`) have the highest precedence.
 */
export function singleLine(commit: (view: EditorView) => void): Extension {
  const run = (view: EditorView) => {
    commit(view);
    return true;
  };
  return [
    joinBreaks,
    Prec.high(keymap.of([
      { key: 'Enter', run, shift: run },
      { key: 'Mod-Enter', run },
      { key: 'Alt-Enter', run },
    ])),
  ];
}
