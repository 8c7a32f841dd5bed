/**
 * What the host element tells the editor, held in the editor state so that every extension
 * (highlighting, completion, name info, the error mark) reads one source. Changed only by the
 * `setProps` effect.
 */
import { EditorState, StateEffect, StateField } from '@codemirror/state';
import { EditorView } from '@codemirror/view';

/** A problem with the expression; `span` is [from, to) in the text. */
export interface FieldError {
  readonly message: string;
  readonly span?: readonly [number, number];
}

/** A name the study defines, with its current value as text ("0.35 1 / h"). */
export interface StudyName {
  readonly name: string;
  readonly detail?: string;
  /** A state: the engine reads it only in fields that can read states; elsewhere its spelling is a unit's, or nothing. */
  readonly state?: boolean;
}

export interface FieldProps {
  /** Study names and their value text (undefined: no value yet). */
  readonly names: ReadonlyMap<string, string | undefined>;
  readonly error?: FieldError;
  /** The accessible name of the text box. */
  readonly label: string;
  readonly readonly: boolean;
  /** Id of the element that shows the error message, in the editor's own tree scope. */
  readonly errorId?: string;
}

const EMPTY: FieldProps = Object.freeze({ names: new Map(), label: '', readonly: false });

/** Replaces the props as a whole. */
export const setProps = StateEffect.define<FieldProps>();

export const fieldProps = StateField.define<FieldProps>({
  create: () => EMPTY,
  update(value, tr) {
    for (const e of tr.effects) if (e.is(setProps)) value = e.value;
    return value;
  },
  provide: (f) => [
    EditorState.readOnly.from(f, (p) => p.readonly),
    EditorView.contentAttributes.from(f, (p): Record<string, string> => ({
      'aria-label': p.label,
      'aria-multiline': 'false',
      ...(p.readonly ? { 'aria-readonly': 'true' } : {}),
      ...(p.error ? { 'aria-invalid': 'true' } : {}),
      ...(p.error && p.errorId ? { 'aria-describedby': p.errorId } : {}),
    })),
  ],
});

/**
 * The name → detail map for a list of study names (later duplicates ignored): the names the
 * engine reads as the study's in this field. Without `readsStates` (the engine's per-field
 * fact, `fieldReadsStates`) states are left out, so a state `h` in `to: "8 h"` is coloured and
 * completed as the hour, as the engine reads it.
 */
export function namesMap(names: ReadonlyArray<StudyName>, readsStates = false): ReadonlyMap<string, string | undefined> {
  const map = new Map<string, string | undefined>();
  for (const n of names) if (!map.has(n.name) && (readsStates || !n.state)) map.set(n.name, n.detail);
  return map;
}
