import { LitElement, css, html, nothing } from 'lit';
import type { CellReport, Report } from '../src/index.ts';
import { formatNumber } from '../src/index.ts';

interface Q { value: number; unit: string; si: number }

const isQuantity = (v: unknown): v is Q =>
  !!v && typeof v === 'object' && typeof (v as Q).value === 'number' && typeof (v as Q).si === 'number' && typeof (v as Q).unit === 'string';

/** Renders an engine report: one section per cell, its status, its values, its problems. */
export class ReportView extends LitElement {
  static override properties = { report: { attribute: false } };
  report?: Report;

  static override styles = css`
    :host { display: block; }
    section { border: 1px solid #c9cfd6; border-radius: 6px; padding: 0.6rem 0.9rem; margin: 0 0 0.8rem; background: #fff; }
    section.failed { border-color: #b3261e; }
    h3 { margin: 0 0 0.4rem; font-size: 1rem; display: flex; gap: 0.6rem; align-items: baseline; }
    .kind { font-size: 0.8rem; color: #4a5560; font-weight: normal; }
    .status { margin-left: auto; font-size: 0.8rem; font-weight: normal; }
    .status.ok { color: #1d6b35; }
    .status.bad { color: #b3261e; }
    .status.idle { color: #6b5200; }
    table { border-collapse: collapse; font-variant-numeric: tabular-nums; }
    td { padding: 0.1rem 1rem 0.1rem 0; }
    td.num { text-align: right; }
    .error { color: #b3261e; margin: 0.2rem 0; }
    .path { font-family: ui-monospace, monospace; font-size: 0.85rem; }
    .warnings { background: #fff7e0; border: 1px solid #e0c068; border-radius: 6px; padding: 0.5rem 0.9rem; }
  `;

  override render() {
    const r = this.report;
    if (!r) return nothing;
    return html`
      ${r.cells.map((c) => this.cell(c))}
      ${r.warnings.length ? html`<div class="warnings"><strong>Warnings</strong><ul>${r.warnings.map((w) => html`<li>${w}</li>`)}</ul></div>` : nothing}
    `;
  }

  private cell(c: CellReport) {
    const idle = c.ok && c.computed === false;
    const rows = quantities(c);
    return html`
      <section class=${c.ok ? '' : 'failed'} aria-label=${c.title ?? c.id}>
        <h3>${c.title ?? c.id} <span class="kind">${c.kind}</span>
          <span class="status ${c.ok ? (idle ? 'idle' : 'ok') : 'bad'}">${c.ok ? (idle ? 'not computed yet' : 'ok') : 'error'}</span></h3>
        ${(c.errors ?? (c.error ? [c.error] : [])).map((e) => html`<p class="error"><span class="path">${e.path}</span>: ${e.message}</p>`)}
        ${idle ? html`<p>${String(c.message ?? '')}</p>` : nothing}
        ${rows.length ? html`<table>${rows.map(([k, q]) => html`<tr><td>${k}</td><td class="num">${formatNumber(q.value, 6)}</td><td>${q.unit}</td></tr>`)}</table>` : nothing}
      </section>`;
  }
}

/** The quantities a cell report holds, flattened to rows (display only; no arithmetic). */
function quantities(c: CellReport): Array<[string, Q]> {
  const rows: Array<[string, Q]> = [];
  for (const [key, v] of Object.entries(c)) {
    if (isQuantity(v)) rows.push([key, v]);
    else if (v && typeof v === 'object' && !Array.isArray(v) && key !== 'error') {
      for (const [k, w] of Object.entries(v)) if (isQuantity(w)) rows.push([k, w]);
    }
  }
  return rows;
}

customElements.define('report-view', ReportView);

declare global {
  interface HTMLElementTagNameMap { 'report-view': ReportView }
}
