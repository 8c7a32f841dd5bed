/**
 * A cell whose figures are not current: the engine computes it after the other cells (a Monte
 * Carlo) or after a cell it reads, so its previous figures stay, in grey with faded charts
 * (`--stale-color` and `--stale-opacity` reach into the cell element's shadow root), under a
 * line that says so and how far the work is: "1,200 of 2,000 samples" ("model runs" when the
 * samples of a band around a run are counted too). Renders only.
 */
import { html, css } from 'lit';
import type { CellReport, Progress } from '../src/index.ts';

export const pendingStyles = css`
  article.pending { --stale-color: #5b6670; --stale-opacity: 0.4; border-style: dashed; }
  .pending-line { display: flex; flex-wrap: wrap; align-items: center; gap: 0.2rem 0.5rem; margin: 0 0 0.3rem; font-size: 0.85rem; color: #4a5560; }
  .pending-line progress { width: 9rem; }
  .pending-line .count { font-variant-numeric: tabular-nums; color: #1c2329; }
`;

/**
 * The line of a pending cell `id`: its own progress, or the cell it waits for. `name` gives a
 * cell as people read it (its title, else its id); `previous`: whether figures of its previous
 * inputs are shown below (none on a first run, or after a failure of those inputs).
 */
export function pendingLine(id: string, progress: Progress | undefined, name: (id: string) => string, previous: boolean) {
  const own = progress?.cell === id ? progress : undefined;
  const unit = progress?.unit ?? 'samples';
  const label = unit === 'samples' ? 'Samples drawn' : `${unit[0].toUpperCase()}${unit.slice(1)} done`;
  const count = (p: Progress) => `${p.done.toLocaleString('en-US')} of ${p.total.toLocaleString('en-US')} ${p.unit}`;
  return html`<p class="pending-line">
    ${own ? html`<progress aria-label=${label} max=${own.total} .value=${own.done}></progress><span class="count">${count(own)}</span>`
      : progress ? html`<span>Waits for ${name(progress.cell)} (${count(progress)}).</span>`
      : html`<progress aria-label="Computing"></progress><span>Starting…</span>`}
    <span>${previous ? 'Until it is done, the figures below are the previous ones.' : 'Its figures will show when it is done.'}</span></p>`;
}

/** The fields every report has, figures or not. */
const FRAME = new Set(['id', 'kind', 'title', 'ok', 'tex', 'computed', 'message']);

/** Whether a pending cell's report still holds figures of its previous inputs (none on a first run, or after they failed). */
export function hasFigures(r: CellReport | undefined): boolean {
  return !!r?.ok && r.computed !== false && Object.keys(r).some((k) => !FRAME.has(k));
}
