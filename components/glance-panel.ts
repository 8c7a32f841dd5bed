/**
 * Results at a glance at the top of the study view: the engine's `glance` list as it stands,
 * each result with its value (and how sure, where an uncertainty cell follows it: the same
 * words as the printed sheet, `glance-values.ts`) and the cell it comes from. On a phone each
 * result is a block. Renders only.
 */
import { html, css, nothing, unsafeCSS, type TemplateResult } from 'lit';
import type { Cell, Report } from '../src/index.ts';
import { NARROW_PX } from './cells/common.ts';
import { glanceValue, glancePending, GLANCE_VALUE_CSS, type GlanceWork } from './glance-values.ts';

/** The panel; nothing when the report lists no result at a glance. */
export function glancePanel(report: Report | undefined, study: { readonly cells: readonly Cell[] }, work: GlanceWork): TemplateResult | typeof nothing {
  const list = report?.glance ?? [];
  if (!report || !list.length) return nothing;
  const fromOf = (id: string) => { const c = study.cells.find((x) => x.id === id); return (typeof c?.title === 'string' && c.title) || id; };
  return html`<section class="glance" aria-labelledby="glance-heading"><h2 id="glance-heading">Results at a glance</h2>
    <table><thead><tr><th>Result</th><th>Value</th><th>From</th></tr></thead>
    <tbody>${list.map((g) => html`<tr class=${g.sure ? 'with-sure' : ''} data-glance=${g.name}><td class="name" data-label="Result">${g.name}</td>
      <td class="value" data-label="Value">${glanceValue(g, study, work)}${glancePending(g, work)}</td><td class="from" data-label="From">${fromOf(g.cell)}</td></tr>`)}</tbody></table></section>`;
}

export const glancePanelStyles = css`
  section.glance { border: 1px solid #c9d1d8; border-radius: 6px; background: #fff; margin: 0 0 0.9rem; padding: 0.5rem 0.9rem 0.6rem; }
  section.glance h2 { font-size: 1rem; margin: 0 0 0.3rem; color: #13202b; }
  section.glance table { border-collapse: collapse; width: 100%; font-size: 0.92rem; }
  section.glance th { text-align: left; font-size: 0.8rem; font-weight: 600; color: #44525e; border-bottom: 1px solid #c9d1d8; padding: 0.15rem 0.5rem 0.15rem 0; }
  section.glance td { vertical-align: top; padding: 0.25rem 0.5rem 0.25rem 0; border-bottom: 1px solid #e8edf1; }
  section.glance tr:last-child td { border-bottom: none; }
  section.glance td.name { font-family: ui-monospace, monospace; white-space: nowrap; }
  section.glance td.value { font-variant-numeric: tabular-nums; color: #1c2329; }
  section.glance td.from { color: #4a5560; font-size: 0.85rem; }
  section.glance .pending-glance { color: #6b3d00; font-size: 0.85rem; }
  ${unsafeCSS(GLANCE_VALUE_CSS)}
  section.glance span.sure.still { color: #6b3d00; }
  /* a phone: each result a block, its name above its value, the cell it comes from after */
  @media (max-width: ${unsafeCSS(NARROW_PX)}px) {
    section.glance thead { display: none; }
    section.glance tr, section.glance td { display: block; }
    section.glance tr { border-bottom: 1px solid #e8edf1; padding: 0.3rem 0; }
    section.glance tr:last-child { border-bottom: none; }
    section.glance td { border: none; padding: 0.05rem 0; }
    section.glance td.name { font-weight: 600; }
    section.glance td.from::before { content: 'from '; }
  }
`;
