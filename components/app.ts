import { LitElement, css, html } from 'lit';

/** Placeholder shell; the study view replaces this later. */
export class RatebookApp extends LitElement {
  static override styles = css`
    :host {
      display: block;
      font-family: system-ui, sans-serif;
      margin: 2rem;
    }
  `;

  override render() {
    return html`
      <h1>Ratebook</h1>
      <p>The study view arrives in a later version.</p>
    `;
  }
}

customElements.define('ratebook-app', RatebookApp);

declare global {
  interface HTMLElementTagNameMap {
    'ratebook-app': RatebookApp;
  }
}
