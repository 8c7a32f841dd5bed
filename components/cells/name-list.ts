import { html } from 'lit';
import type { ErrorClaims } from './common.ts';
import { footError } from './common.ts';

/**
 * A list of names edited in place (a sensitivity cell's `of` and `parameters`): one text box
 * per name, each marked with the list's field path and named "<what> N", a remove button
 * (kept while one is left), and an add button that appends `next` and asks for focus in it. Each change is one call of
 * `set` with the whole new list (`key` merges a name's typing into one undo step).
 */
export function nameList(o: {
  readonly field: string;
  readonly what: string;
  readonly names: readonly string[];
  readonly claims: ErrorClaims;
  readonly add: string;
  readonly next: string;
  readonly set: (names: string[], key?: string) => void;
  /** Asks the cell to focus, once drawn, the element the selector finds: the name just added. */
  readonly focus: (selector: string) => void;
}) {
  const { field, what, names, claims } = o;
  return html`${names.map((n, i) => html`<span class="entry">
      <input class="name" type="text" data-field=${field} data-index=${i} aria-label="${what} ${i + 1}" .value=${n}
        @input=${(e: Event) => o.set(names.map((x, j) => (j === i ? (e.target as HTMLInputElement).value : x)), `${field}[${i}]`)} />
      <button class="quiet" aria-label="Remove ${what.toLowerCase()} ${i + 1}" ?disabled=${names.length < 2} @click=${() => o.set(names.filter((_, j) => j !== i))}>✕</button>
      ${footError(claims.take(`.${field}[${i}]`))}</span>`)}
    <button class="add-name" @click=${() => { o.set([...names, o.next]); o.focus(`input[data-field="${field}"][data-index="${names.length}"]`); }}>${o.add}</button>
    ${footError(claims.take(`.${field}`))}`;
}
