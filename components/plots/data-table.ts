/**
 * `<chart-data>`: a chart's data as HTML tables, behind a disclosure button, so that a reader
 * who cannot see the chart (or wants the numbers) reaches every plotted value by keyboard.
 * The host passes a function giving the tables ready to show (columns with their units, each
 * value as text), called only while the tables are open; this element formats nothing and
 * computes nothing. Long tables scroll inside a region that
 * takes focus, so the arrow keys scroll it.
 */
import { LitElement, html, css, nothing } from 'lit';

/** One table: a caption, column headings (with units) and rows of text, one entry per column. */
export interface DataTable {
  readonly caption: string;
  readonly columns: readonly string[];
  readonly rows: ReadonlyArray<readonly string[]>;
}

let nextId = 0;

export class ChartData extends LitElement {
  static override properties = { tables: { attribute: false }, name: {}, open: { type: Boolean, reflect: true } };

  static override styles = css`
    :host { display: block; margin-top: 0.3rem; font-size: 12px; color: #1d2630; }
    button { font: inherit; padding: 0.1rem 0.5rem; border: 1px solid #8795a1; border-radius: 4px; background: #f3f5f7; color: #1c2329; cursor: pointer; }
    button:focus-visible, .region:focus-visible { outline: 2px solid #1d5fa8; outline-offset: 1px; }
    .mark { display: inline-block; width: 1em; }
    .region { max-height: 18rem; overflow: auto; margin-top: 0.3rem; border: 1px solid #d5dbe0; }
    table { border-collapse: collapse; margin: 0 0 0.6rem; }
    caption { text-align: left; font-weight: 600; padding: 0.3rem 0.4rem; }
    th, td { padding: 0.1rem 0.6rem; border-bottom: 1px solid #e4e9ee; text-align: right; white-space: nowrap; }
    th { position: sticky; top: 0; background: #fff; font-weight: 600; }
    td.text { text-align: left; }
    @media print { :host { display: none; } }
  `;

  /** The tables to show, asked for only while open (a new function on each host render is fine). */
  tables?: () => readonly DataTable[];
  /** What the chart shows, for the region's name ("Data of …"). */
  name = '';
  /** Whether the tables are shown. */
  open = false;

  private readonly regionId = `chart-data-${nextId++}`;

  override render() {
    if (!this.tables) return nothing;
    return html`
      <button class="data-toggle" aria-expanded=${this.open ? 'true' : 'false'} aria-controls=${this.regionId}
        @click=${() => { this.open = !this.open; }}><span class="mark" aria-hidden="true">${this.open ? '▾' : '▸'}</span>Data table</button>
      <div id=${this.regionId} class="region" role="region" tabindex="0" aria-label=${`Data of ${this.name || 'the chart'}`} ?hidden=${!this.open}>
        ${this.open ? this.tables().map((t) => html`<table>
          <caption>${t.caption}</caption>
          <thead><tr>${t.columns.map((c) => html`<th scope="col">${c}</th>`)}</tr></thead>
          <tbody>${t.rows.map((r) => html`<tr>${r.map((v) => html`<td class=${numeric(v) ? '' : 'text'}>${v}</td>`)}</tr>`)}</tbody>
        </table>`) : nothing}
      </div>`;
  }
}

/** Numbers align right, words left. */
const numeric = (v: string) => /^[-−+]?[\d.]/.test(v);

customElements.define('chart-data', ChartData);

declare global {
  interface HTMLElementTagNameMap { 'chart-data': ChartData }
}
