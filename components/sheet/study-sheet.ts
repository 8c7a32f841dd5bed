import { LitElement, html, css, nothing, unsafeCSS } from 'lit';
import { RANKING_CSS } from '../plots/ranking-bars.ts';
import { HISTOGRAM_CSS } from '../plots/histogram-plot.ts';
import { cellWords, type Progress, type Report, type Study } from '../../src/index.ts';
import { section, glance } from './sections.ts';
import { pendingNotice, PENDING_SHEET_CSS } from './pending-sheet.ts';
import { GLANCE_VALUE_CSS } from '../glance-values.ts';

/** What the sheet's header says about the stored study. */
export interface SheetMeta {
  /** 1 when created, one more on each saved change. */
  readonly revision?: number;
  /** When the study was last saved (ms since the epoch). */
  readonly updated?: number;
}

/**
 * `<study-sheet>`: the study as a document to hand over and print. A header with title,
 * author, date and revision; the cautions; the cells still computing when printed, marked
 * (`pending-sheet.ts`: their figures are the previous ones); every cell as a static section (tables, typeset
 * laws, phase lines, charts drawn as SVG, found results, the checks made), each with the
 * notes an inspector needs in plain language (`inspectorNotes`); the report's warnings about
 * how the study's text is read are for its author and are not printed. No controls. Sections and figures are kept whole across page breaks.
 */
export class StudySheet extends LitElement {
  static override properties = { study: { attribute: false }, report: { attribute: false }, meta: { attribute: false }, pending: { attribute: false }, progress: { attribute: false } };
  study?: Study;
  report?: Report;
  meta: SheetMeta = {};
  /** Cells still computing (their figures are the previous ones), and the progress of the one computing: marked on the sheet. */
  pending: readonly string[] = [];
  progress?: Progress;

  static override styles = css`
    ${unsafeCSS(RANKING_CSS)}
    ${unsafeCSS(HISTOGRAM_CSS)}
    ${unsafeCSS(PENDING_SHEET_CSS)}
    ${unsafeCSS(GLANCE_VALUE_CSS)}
    :host { display: block; color: #111; font: 10.5pt/1.4 Georgia, 'Times New Roman', serif; background: #fff; }
    header.doc { border-bottom: 2px solid #222; padding-bottom: 0.4rem; margin-bottom: 0.8rem; }
    h1 { font: 700 17pt/1.2 system-ui, sans-serif; margin: 0 0 0.3rem; }
    .meta { display: flex; flex-wrap: wrap; gap: 0.2rem 1.6rem; font: 9pt system-ui, sans-serif; color: #333; }
    .description { margin: 0.4rem 0 0; }
    .caution { border: 1.5px solid #8a4b00; padding: 0.35rem 0.6rem; margin: 0.6rem 0; font-size: 9.5pt; }
    section.cell { margin: 0 0 0.9rem; }
    h2 { font: 650 12pt/1.3 system-ui, sans-serif; margin: 0.2rem 0 0.35rem; border-bottom: 0.5px solid #999; break-after: avoid; }
    h2 .kind { font-weight: 400; font-size: 8.5pt; color: #555; margin-left: 0.5rem; }
    h3 { font: 600 10.5pt system-ui, sans-serif; margin: 0.5rem 0 0.3rem; break-after: avoid; }
    table { border-collapse: collapse; width: 100%; margin: 0.3rem 0 0.5rem; font-size: 9.5pt; break-inside: avoid; }
    table.data { width: auto; }
    table.parameters { table-layout: fixed; }
    table.parameters col.narrow { width: 17%; }
    table.parameters col.wide { width: 33%; }
    table.parameters td { overflow-wrap: anywhere; }
    tr.has-formula td { border-bottom-style: dotted; }
    tr.formula td { border-top: none; padding: 0.1rem 0.4rem 0.3rem 1.2rem; overflow-x: hidden; }
    th, td { border: 0.5px solid #999; padding: 0.15rem 0.4rem; text-align: left; vertical-align: top; }
    th { background: #eee; font: 600 9pt system-ui, sans-serif; }
    thead { display: table-header-group; }
    tr { break-inside: avoid; }
    td.num { text-align: right; white-space: nowrap; font-variant-numeric: tabular-nums; }
    /* the parameters' columns have fixed widths: a long value, or the spread under it, wraps in its column, never over the note beside it */
    table.parameters td.num { white-space: normal; }
    td.name { font-family: ui-monospace, monospace; font-size: 9pt; }
    figure { margin: 0.3rem 0 0.5rem; break-inside: avoid; }
    .keep { break-inside: avoid; }
    /* kept on the page of what is above it, where the two fit: a chart with the table it illustrates (a run's
       answers, a fit's estimates, a compare cell's scenarios), a run's check against its exact solution */
    .follows { break-before: avoid; break-inside: avoid; }
    /* what opens a section stays with what follows it (a run's span and schedule with its chart, a
       data cell's row count with its table), so that a heading never ends a page with only its first lines */
    .lead { break-after: avoid; break-inside: avoid; }
    /* small sections are kept whole: a law with its starting value, a solve's target with its answer, a profile's results */
    section.cell.rate, section.cell.solve, section.cell.nca { break-inside: avoid; }
    figure svg { max-width: 100%; height: auto; }
    .equation { margin: 0.3rem 0; font-size: 12pt; break-inside: avoid; }
    .summary { font-style: italic; margin: 0.2rem 0 0.4rem; }
    section.glance h2 { border-bottom-width: 1.5px; }
    section.glance td.from { color: #444; font-size: 9pt; }
    /* a result with how sure: the figures and the point value each on a line, wrapping in the column */
    section.glance tr.with-sure td.num { white-space: normal; }
    .check { font-size: 9.5pt; margin: 0.2rem 0; }
    .note-text { white-space: pre-wrap; margin: 0.2rem 0; }
    .error { color: #8b0000; font-weight: 600; }
    .muted { color: #555; }
    code { font-size: 9pt; }
    pre { font-size: 8.5pt; white-space: pre-wrap; }
    /* never a page of its own: it takes the last lines before it along */
    footer { border-top: 0.5px solid #999; margin-top: 1rem; padding-top: 0.3rem; font: 8.5pt system-ui, sans-serif; color: #333; break-before: avoid; }
    math { font-size: 1.05em; }
  `;

  override render() {
    const study = this.study;
    if (!study) return nothing;
    const byId = new Map((this.report?.cells ?? []).map((c) => [c.id, c] as const));
    const work = { pending: this.pending, ...(this.progress ? { progress: this.progress } : {}) };
    const when = (ms: number) => new Date(ms).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' });
    return html`
      <header class="doc">
        <h1>${study.title}</h1>
        <div class="meta">
          <span>Prepared by: ${study.author?.trim() || '________________'}</span>
          ${this.meta.revision !== undefined ? html`<span>Revision ${this.meta.revision}</span>` : nothing}
          ${this.meta.updated !== undefined ? html`<span>Saved ${when(this.meta.updated)}</span>` : nothing}
          <span>Printed ${when(Date.now())}</span>
        </div>
        ${study.description ? html`<p class="description">${study.description}</p>` : nothing}
      </header>
      ${(this.report?.cautions ?? []).map((c) => html`<p class="caution"><strong>Caution.</strong> ${c.text}</p>`)}
      ${pendingNotice(work, (id) => cellWords(study, id))}
      ${this.report ? glance(this.report, study, work) : nothing}
      ${this.report ? study.cells.map((c) => section(c, byId.get(c.id), study, this.report!, work)) : html`<p class="muted">Computing…</p>`}
      <footer>Every value on this sheet was computed by Ratebook from the inputs shown, with the units shown. It is an aid to analysis and does not replace professional judgement, local codes or licensed practice.</footer>`;
  }
}

customElements.define('study-sheet', StudySheet);

declare global {
  interface HTMLElementTagNameMap { 'study-sheet': StudySheet }
}
