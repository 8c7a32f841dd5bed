/**
 * A one-line text that wraps instead of being cut: a text area one line high that grows with
 * its text, for the study's title, each cell's title and a parameter's note. Enter types
 * nothing (the text is one line, as in a text input) and line breaks pasted in become spaces. It sizes itself with CSS alone: a hidden copy
 * of its text in the same grid cell gives the box its height, so it follows any width.
 */
import { css, html, nothing } from 'lit';

/** Styles for {@link wrapField}; the host sets the font on `.grow` (or its parent). */
export const wrapFieldStyles = css`
  .grow { display: grid; min-width: 0; }
  .grow::after { content: attr(data-text) ' '; white-space: pre-wrap; overflow-wrap: anywhere; visibility: hidden; }
  .grow > textarea, .grow::after {
    grid-area: 1 / 1; font: inherit; color: inherit; line-height: 1.3; padding: 0.15rem 0.35rem; margin: 0;
    border: 1px solid transparent; border-radius: 4px; box-sizing: border-box; min-width: 0;
  }
  .grow > textarea { resize: none; overflow: hidden; background: transparent; overflow-wrap: anywhere; }
  .grow > textarea:hover, .grow > textarea:focus, .grow.boxed > textarea { border-color: #9aa6b1; background: #fff; }
  .grow > textarea:focus-visible { outline: 2px solid #1d5fa8; outline-offset: 1px; }
`;

export interface WrapFieldOptions {
  /** Class of the wrapper (for its size and place) and of the text area; with "boxed" its border always shows. */
  readonly cls: string;
  readonly label: string;
  /** The path of the format field it edits, as `data-field` (see DEVELOPERS.md, components/cells/). */
  readonly field?: string;
  readonly value: string;
  readonly placeholder?: string;
  /** Called with the text as one line on every change the user makes. */
  readonly onInput: (title: string) => void;
}

/** The field (see the module's comment). */
export function wrapField(o: WrapFieldOptions) {
  return html`<div class="grow ${o.cls}" data-text=${o.value || (o.placeholder ?? '')}><textarea class=${o.cls} rows="1" data-field=${o.field ?? nothing} aria-label=${o.label}
    placeholder=${o.placeholder ?? ''} .value=${o.value} @keydown=${ignoreEnter}
    @input=${(e: Event) => { growWith(e); o.onInput(oneLine((e.target as HTMLTextAreaElement).value)); }}></textarea></div>`;
}

/**
 * Gives the hidden copy the text as typed, so that the box grows at once: the view is drawn
 * again only with the engine's answer to the edit, which may come a few frames later.
 */
export function growWith(e: Event): void {
  const box = e.target as HTMLTextAreaElement;
  const grow = box.parentElement;
  if (grow?.classList.contains('grow')) grow.dataset.text = box.value || box.placeholder;
}

function ignoreEnter(e: KeyboardEvent) {
  if (e.key === 'Enter') e.preventDefault();
}

/** Line breaks (and the spaces around them) as one space. */
export function oneLine(text: string): string {
  return text.replace(/[ \t]*[\r\n]+[ \t]*/g, ' ');
}
