/**
 * The ranking of a sensitivity cell as horizontal bars, one per pair with a normalized slope,
 * in the engine's order (largest |normalized| first), drawn as SVG (sharp in print): the bar's
 * length is |normalized| against the largest, its class `up` (same way) or `down` (the other
 * way), its value written at its end. An image named by the engine's summary.
 */
import { html, svg, nothing } from 'lit';
import { formatNumber, type SensitivityFields } from '../../src/index.ts';

const BAR = 22;
/** Room for the bars and for the value written after the longest, in SVG units (CSS pixels at full size). */
const PLOT = 240;
const VALUE = 64;
/** About the width of one character of the 12 px labels. */
const CHAR = 7;

export function rankingBars(r: Pick<SensitivityFields, 'ranking' | 'results' | 'summary'>) {
  const ranked = r.ranking.flatMap(({ of, parameter }) => {
    const n = r.results[of]?.[parameter]?.normalized;
    return typeof n === 'number' ? [{ label: `${parameter} → ${of}`, n }] : [];
  });
  if (!ranked.length) return nothing;
  const largest = Math.max(...ranked.map((x) => Math.abs(x.n))) || 1;
  // The labels' column as wide as the longest label, so that a phone shrinks the drawing (and its text) as little as it can.
  const LABEL = Math.min(Math.max(...ranked.map((x) => x.label.length)) * CHAR + 12, 220);
  const plot = PLOT;
  const WIDTH = LABEL + PLOT + VALUE;
  const height = ranked.length * BAR + 8;
  return html`<svg class="ranking" viewBox="0 0 ${WIDTH} ${height}" width=${WIDTH} height=${height} role="img" aria-label=${r.summary}>
    <title>${r.summary}</title>
    ${ranked.map(({ label, n }, i) => {
      const w = Math.max((Math.abs(n) / largest) * plot, 1);
      const y = 4 + i * BAR;
      return svg`<text x=${LABEL - 6} y=${y + 15} text-anchor="end">${label}</text>
        <rect class=${n >= 0 ? 'up' : 'down'} x=${LABEL} y=${y + 3} width=${w} height=${BAR - 8}></rect>
        <text x=${LABEL + w + 6} y=${y + 15}>${n >= 0 ? '+' : '−'}${formatNumber(Math.abs(n), 3)}</text>`;
    })}
    <line x1=${LABEL} x2=${LABEL} y1="0" y2=${height}></line>
  </svg>`;
}

/** The bars' styles, for the cell and the sheet. */
export const RANKING_CSS = `
  svg.ranking { max-width: 100%; height: auto; display: block; margin: 0.5rem 0; }
  svg.ranking text { font: 12px system-ui, sans-serif; fill: #1c2329; }
  svg.ranking .up { fill: #2f6fb0; }
  svg.ranking .down { fill: #b5562a; }
  svg.ranking line { stroke: #6b7782; }`;
