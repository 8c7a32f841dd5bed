/**
 * The printed sheet's marks of cells still computing when it is printed (a Monte Carlo cell is
 * computed after every other cell, in slices; cells reading its names wait for it): a notice
 * under the header naming them and how far the work is, a line at the top of each such
 * section, and (`glance-values.ts`) a mark beside each of their results at a glance. Their figures on the sheet are
 * the previous ones; the marks say so, so that no old figure reads as current. Layout only.
 */
import { html, nothing, type TemplateResult } from 'lit';
import type { CellReport, Progress } from '../../src/index.ts';

/** What the sheet knows of the work left: the cells pending, and the progress of the one computing. */
export interface SheetPending {
  readonly pending: readonly string[];
  readonly progress?: Progress;
}

const count = (p: Progress) => `${p.done.toLocaleString('en-US')} of ${p.total.toLocaleString('en-US')} ${p.unit}`;

/** The fields every report has, figures or not. */
const BARE = new Set(['id', 'kind', 'title', 'ok', 'computed', 'message']);

/**
 * True when a pending cell's report holds figures from before; false for a first computation
 * still under way, whose report is bare (`{ id, kind, ok }`) or says `computed: false`.
 */
export const hasFigures = (r: CellReport | undefined): boolean => r !== undefined && r.ok && r.computed !== false && Object.keys(r).some((k) => !BARE.has(k));

/** The notice under the sheet's header; nothing when no cell is pending. `name` gives a cell as people read it. */
export function pendingNotice(w: SheetPending, name: (id: string) => string): TemplateResult | typeof nothing {
  if (!w.pending.length) return nothing;
  const p = w.progress;
  const busy = p && w.pending.includes(p.cell) ? `${name(p.cell)} (${count(p)})` : undefined;
  const rest = w.pending.filter((id) => id !== p?.cell).map(name);
  const cells = [busy, ...rest].filter((x): x is string => x !== undefined);
  return html`<p class="pending-notice" role="note"><strong>Still computing when printed:</strong> ${cells.join('; ')}.
    ${cells.length === 1 ? 'Its figures on this sheet are' : 'Their figures on this sheet are'} from the previous inputs, not from the inputs printed here, or not there yet.
    Print again once the study view no longer shows "updating…".</p>`;
}

/** The line at the top of a pending cell's section; nothing for a cell that is current. */
export function pendingMark(id: string, r: CellReport | undefined, w: SheetPending, name: (id: string) => string): TemplateResult | typeof nothing {
  if (!w.pending.includes(id)) return nothing;
  const p = w.progress;
  const what = p?.cell === id ? `Still computing: ${count(p)}.` : p ? `Waits for ${name(p.cell)}, still computing (${count(p)}).` : 'Still computing.';
  const figures = hasFigures(r) ? 'The figures below are from the previous inputs, not from the inputs printed on this sheet.' : 'No figures yet.';
  return html`<p class="pending-mark">${what} ${figures}</p>`;
}

/** The marks' print styles. */
export const PENDING_SHEET_CSS = `
  .pending-notice { border: 2px dashed #8a4b00; padding: 0.35rem 0.6rem; margin: 0.6rem 0; font-size: 9.5pt; }
  section.cell.pending { border-left: 3px dashed #8a4b00; padding-left: 0.5rem; }
  .pending-mark { font: 600 9.5pt system-ui, sans-serif; color: #6b3d00; margin: 0.1rem 0 0.4rem; }
  .pending-glance { font-size: 8.5pt; color: #6b3d00; white-space: normal; }
`;
