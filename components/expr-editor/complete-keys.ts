/**
 * The keys of the completion list. The list opens as the user types but nothing in it is
 * selected: Enter accepts an option only after the user moved into the list (ArrowDown,
 * ArrowUp, PageDown, PageUp); otherwise it closes the list and goes on to commit the field,
 * so what was typed stays. Tab closes the list and moves focus on as usual; Escape closes it.
 * Neither changes the text.
 */
import { acceptCompletion, closeCompletion, moveCompletionSelection, startCompletion } from '@codemirror/autocomplete';
import { Prec, type Extension } from '@codemirror/state';
import { keymap, type EditorView } from '@codemirror/view';

/** Closes the list and lets the key do what it does without one. */
const closeThenPass = (view: EditorView): boolean => {
  closeCompletion(view);
  return false;
};

/** Accepts the option the user selected; with none selected, closes the list and passes Enter on. */
const acceptSelected = (view: EditorView): boolean => acceptCompletion(view) || closeThenPass(view);

/** The completion keymap; pair it with `autocompletion({ selectOnOpen: false, defaultKeymap: false })`. */
export const completionKeys: Extension = Prec.highest(keymap.of([
  { key: 'Ctrl-Space', run: startCompletion },
  { key: 'Escape', run: closeCompletion },
  { key: 'ArrowDown', run: moveCompletionSelection(true) },
  { key: 'ArrowUp', run: moveCompletionSelection(false) },
  { key: 'PageDown', run: moveCompletionSelection(true, 'page') },
  { key: 'PageUp', run: moveCompletionSelection(false, 'page') },
  { key: 'Enter', run: acceptSelected },
  { key: 'Tab', run: closeThenPass, shift: closeThenPass },
]));
