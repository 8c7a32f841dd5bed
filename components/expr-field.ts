import { LitElement, css, html, nothing } from 'lit';
import { ref } from 'lit/directives/ref.js';
import { ExprEditorController, type ExprInputDetail } from './expr-editor/controller.ts';
import type { FieldError, StudyName } from './expr-editor/props.ts';

export type { ExprInputDetail, FieldError, StudyName };

const ERROR_ID = 'error';

/**
 * A one-line expression editor: `<expr-field label="Rate constant" .value=${'0.35 / h'}>`.
 *
 * Properties: `value` (the text), `names` (the study's names, each with its current value
 * text as `detail`, for completion, colouring and the name tooltip), `error` (shown below
 * the field; its `span` is underlined, and without a span the whole field is outlined),
 * `label` (the accessible name), `readonly`, `readsStates` (the engine's fact that this field
 * can read states: elsewhere a state's name is not the study's, and `h` is the hour).
 *
 * Events (bubbling, composed; detail `{ value }`): `expr-input` on every change the user
 * makes; `expr-commit` on Enter, and on blur when the text changed since the last commit.
 * A `value` set from outside replaces the text without an event, except while the user is
 * typing (focused with uncommitted edits); equal text leaves the cursor where it is.
 */
export class ExprField extends LitElement {
  static override properties = {
    value: { type: String },
    names: { attribute: false },
    error: { attribute: false },
    label: { type: String },
    readonly: { type: Boolean, reflect: true },
    readsStates: { attribute: false },
  };

  value = '';
  names: ReadonlyArray<StudyName> = [];
  error?: FieldError;
  label = '';
  readonly = false;
  /** The field can read states: set from the engine's `fieldReadsStates` for the field's path. */
  readsStates = false;

  private readonly editor = new ExprEditorController(this, ERROR_ID);

  static override styles = css`
    :host { display: block; min-width: 0; contain: layout style; }
    .box {
      border: 1px solid #6b7682;
      border-radius: 4px;
      background: #fff;
      min-height: 2.5rem;
      box-sizing: border-box;
    }
    .box.invalid { border-color: #b3261e; box-shadow: inset 0 0 0 1px #b3261e; }
    .box:focus-within { outline: 3px solid #1a5788; outline-offset: 2px; }
    :host([readonly]) .box { background: #f4f6f8; border-style: dashed; }
    :host([readonly]) .box .cm-editor { background: transparent; }
    .message { color: #b3261e; margin: 0.3rem 0 0; font-size: 0.9rem; }
    /* the field's text until its editor is made (expr-editor/deferred.ts): the editor's type and spacing */
    .waiting {
      font: 1rem/1.5 ui-monospace, "SFMono-Regular", Menlo, Consolas, monospace;
      color: #1c2329; padding: 0.4rem 0.6rem; white-space: pre-wrap; overflow-wrap: anywhere; min-height: 1.5em;
    }
    .waiting:focus { outline: none; }
  `;

  /** Takes focus with the cursor after the text. */
  focusAtEnd(): void {
    this.editor.focusAtEnd();
  }

  override render() {
    const error = this.error;
    return html`
      <div class="box ${error && !error.span ? 'invalid' : ''}" ${ref(this.editor.mount)}></div>
      ${error ? html`<p id=${ERROR_ID} class="message" role="alert">${error.message}</p>` : nothing}`;
  }
}

customElements.define('expr-field', ExprField);

declare global {
  interface HTMLElementTagNameMap { 'expr-field': ExprField }
  interface HTMLElementEventMap {
    'expr-input': CustomEvent<ExprInputDetail>;
    'expr-commit': CustomEvent<ExprInputDetail>;
  }
}
