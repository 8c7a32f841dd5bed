import { LitElement, html, css } from 'lit';
import { unitChoicesFor } from '../src/index.ts';

/** Detail of a `unit-pick` event: the unit to show the value in, or undefined for the unit it was written in. */
export interface UnitPickDetail { readonly unit: string | undefined }

/**
 * `<unit-pick>`: a small menu beside a result that switches the unit it is shown in, listing the
 * trade units of the same dimension (from the engine). Choosing one fires `unit-pick`; "as
 * written" clears the choice. Renders nothing when there is nothing to offer.
 */
export class UnitPick extends LitElement {
  static override properties = { unit: {}, original: {}, picked: {}, label: {} };
  /** The unit the value is shown in now (from the report). */
  unit = '';
  /** The unit the value had before any pick (the report's `originalUnit`): always offered. */
  original?: string;
  /** The unit the study picked, if any. */
  picked?: string;
  label = 'Show in another unit';

  static override styles = css`
    :host { display: inline-block; }
    select { appearance: none; font: inherit; font-size: 0.85em; color: #44525e; border: 1px solid transparent; border-radius: 3px; background: transparent; padding: 0 0.25rem; width: 1.6rem; cursor: pointer; }
    select:hover, select:focus { border-color: #9aa6b1; background: #fff; }
    select:focus-visible { outline: 2px solid #1d5fa8; outline-offset: 1px; }
  `;

  override render() {
    const choices = unitChoicesFor(this.unit, this.original);
    if (choices.length === 0 && !this.picked) return html``;
    // The closed menu shows a small mark beside the result; open, it lists the other units.
    return html`<select aria-label=${this.label} title=${this.label} @change=${this.choose}>
      <option value="" disabled selected hidden>⇄</option>
      ${choices.map((u) => html`<option value=${u}>${u}</option>`)}
      ${this.picked ? html`<option value="=">as written</option>` : ''}
    </select>`;
  }

  private choose = (e: Event) => {
    const select = e.target as HTMLSelectElement;
    const value = select.value;
    select.selectedIndex = 0;
    this.dispatchEvent(new CustomEvent<UnitPickDetail>('unit-pick', { detail: { unit: value === '=' ? undefined : value }, bubbles: true, composed: true }));
  };
}

customElements.define('unit-pick', UnitPick);

declare global {
  interface HTMLElementTagNameMap { 'unit-pick': UnitPick }
}
