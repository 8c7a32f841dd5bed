/**
 * A histogram as SVG (sharp on screen and in print): the engine's bins (edges and counts)
 * drawn as bars, the 2.5 and 97.5 percentiles as dashed lines, with its name as the image's
 * label and, on screen, a "Data table" of every bin. Draws only what the report gives.
 */
import { html, svg, nothing } from 'lit';
import type { Histogram, ReportQuantity } from '../../src/index.ts';
import { formatNumber, unitAfterNumber } from '../../src/index.ts';
import './data-table.ts';

const W = 320, H = 120, PAD = 18;

/** The histogram of `name`; `marks` are the percentiles drawn over it (in the histogram's unit). */
export function histogramPlot(name: string, h: Histogram, marks: ReadonlyArray<ReportQuantity | undefined>, withTable = true) {
  const lo = h.edges[0], hi = h.edges[h.edges.length - 1];
  const top = Math.max(1, ...h.counts);
  const x = (v: number) => PAD + ((v - lo) / (hi - lo || 1)) * (W - 2 * PAD);
  const y = (c: number) => H - PAD - (c / top) * (H - 2 * PAD);
  const unit = unitAfterNumber(h.unit);
  const label = `Histogram of ${name}: ${h.counts.reduce((a, b) => a + b, 0)} samples from ${formatNumber(lo)} to ${formatNumber(hi)}${unit ? ` ${unit}` : ''}`;
  return html`<figure class="histogram">
    <figcaption class="histogram-title">${name}: samples per bin${unit ? ` (${unit})` : ''}, dashed at the 2.5 and 97.5 percentiles</figcaption>
    <svg viewBox="0 0 ${W} ${H}" role="img" aria-label=${label} class="histogram-svg">
      <title>${label}</title>
      ${h.counts.map((c, i) => svg`<rect class="bar" x=${x(h.edges[i])} y=${y(c)} width=${Math.max(0.5, x(h.edges[i + 1]) - x(h.edges[i]) - 0.5)} height=${H - PAD - y(c)}></rect>`)}
      ${marks.map((m) => (m ? svg`<line class="mark" x1=${x(m.value)} x2=${x(m.value)} y1=${PAD / 2} y2=${H - PAD}></line>` : nothing))}
      <line class="axis" x1=${PAD} x2=${W - PAD} y1=${H - PAD} y2=${H - PAD}></line>
      <text class="tick" x=${PAD} y=${H - 4} text-anchor="start">${formatNumber(lo)}</text>
      <text class="tick" x=${W - PAD} y=${H - 4} text-anchor="end">${formatNumber(hi)}${unit ? ` ${unit}` : ''}</text>
    </svg>
    ${withTable ? html`<chart-data .name=${`the histogram of ${name}`} .tables=${() => [{
      caption: `Samples of ${name} per bin`,
      columns: [`from${unit ? ` (${unit})` : ''}`, `to${unit ? ` (${unit})` : ''}`, 'samples'],
      rows: h.counts.map((c, i) => [formatNumber(h.edges[i]), formatNumber(h.edges[i + 1]), String(c)]),
    }]}></chart-data>` : nothing}
  </figure>`;
}

/** The styles the histogram needs, for the element that shows it. */
export const HISTOGRAM_CSS = `
  figure.histogram { margin: 0.3rem 0 0.6rem; }
  figcaption.histogram-title { font-size: 0.85rem; color: #3b4650; margin-bottom: 0.1rem; }
  svg.histogram-svg { width: 100%; max-width: 26rem; height: auto; display: block; }
  svg.histogram-svg rect.bar { fill: #7aa6d6; }
  svg.histogram-svg line.mark { stroke: #1c2329; stroke-dasharray: 3 2; stroke-width: 1; }
  svg.histogram-svg line.axis { stroke: #5b6670; stroke-width: 1; }
  svg.histogram-svg text.tick { font-size: 9px; fill: #3b4650; }
`;
