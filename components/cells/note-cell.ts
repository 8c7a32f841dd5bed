import { html, css } from 'lit';
import { cellStyles } from './common.ts';
import { CellElement } from './cell-element.ts';

/** A note: plain text, shown as text (never as HTML), edited in place. */
export class NoteCellElement extends CellElement<'note'> {
  static override properties = { editing: { state: true } };
  editing = false;
  static override styles = [cellStyles, css`
    .text { white-space: pre-wrap; margin: 0.2rem 0; line-height: 1.45; }
    textarea { width: 100%; min-height: 5rem; box-sizing: border-box; }
    @media print { .edit { display: none; } }
  `];

  override render() {
    const text = typeof this.cell.text === 'string' ? this.cell.text : '';
    if (this.editing) {
      return html`<textarea data-field="text" aria-label="Note text" .value=${text}
        @input=${(e: Event) => this.edit({ text: (e.target as HTMLTextAreaElement).value }, 'text')}
        @blur=${() => { this.editing = false; }}></textarea>`;
    }
    return html`<p class="text">${text || html`<span class="muted">Empty note.</span>`}</p>
      <button class="edit" data-field="text" @click=${() => { this.editing = true; void this.updateComplete.then(() => this.renderRoot.querySelector('textarea')?.focus()); }}>Edit note</button>`;
  }
}

customElements.define('note-cell', NoteCellElement);
