/**
 * How an equilibrium looks, the same on the rate chart, the phase line, the key and the printed
 * sheet: an attractor is a filled dot, a repeller an open ring, a semi-stable point a ring
 * filled on the side the state comes in from (the engine's `attractsFrom`: `below` is the left
 * half on an axis where the state grows to the right). A semi-stable point whose side the
 * engine does not know is an open ring in its colour.
 */
import { html, svg, nothing, type SVGTemplateResult } from 'lit';
import { STABLE, UNSTABLE } from './palette.ts';

export type Stability = 'attractor' | 'repeller' | 'semi-stable';
/** The side a semi-stable point draws the state in from, as the engine reports it. */
export type Side = 'below' | 'above';

const SEMI = '#6b3fa0';

const colourOf = (stability: string) => (stability === 'attractor' ? STABLE : stability === 'repeller' ? UNSTABLE : SEMI);

/** Draws the mark centred at (x, y), radius `radius`, in canvas pixels (`r` per CSS pixel). */
export function drawEquilibriumDot(ctx: CanvasRenderingContext2D, x: number, y: number, radius: number, r: number,
  stability: Stability, attractsFrom?: Side): void {
  ctx.save();
  ctx.setLineDash([]);
  ctx.lineWidth = 2 * r;
  const colour = colourOf(stability);
  ctx.beginPath();
  ctx.arc(x, y, radius, 0, 2 * Math.PI);
  ctx.fillStyle = stability === 'attractor' ? colour : '#fff';
  ctx.fill();
  if (stability === 'semi-stable' && attractsFrom) {
    ctx.beginPath();
    // left half: from the top (-π/2) anticlockwise to the bottom; right half the other way.
    ctx.arc(x, y, radius, -Math.PI / 2, Math.PI / 2, attractsFrom === 'below');
    ctx.closePath();
    ctx.fillStyle = colour;
    ctx.fill();
  }
  ctx.beginPath();
  ctx.arc(x, y, radius, 0, 2 * Math.PI);
  ctx.strokeStyle = colour;
  ctx.stroke();
  ctx.restore();
}

/** The same mark as SVG shapes centred at (cx, cy), for the key and the printed phase line. */
export function equilibriumMark(cx: number, cy: number, radius: number, stability: string, attractsFrom?: string, stroke = 2): SVGTemplateResult {
  const colour = colourOf(stability);
  // the half toward the side the state comes from: sweep 0 runs anticlockwise (left), 1 clockwise (right)
  const half = stability === 'semi-stable' && (attractsFrom === 'below' || attractsFrom === 'above')
    ? svg`<path class="half ${attractsFrom}" d="M${cx} ${cy - radius} A${radius} ${radius} 0 0 ${attractsFrom === 'below' ? 0 : 1} ${cx} ${cy + radius} Z" fill=${colour}/>`
    : nothing;
  return svg`<circle class="equilibrium ${stability}" cx=${cx} cy=${cy} r=${radius} fill=${stability === 'attractor' ? colour : '#fff'} stroke=${colour} stroke-width=${stroke}/>${half}`;
}

/** The mark as a small SVG for the key under the chart (a semi-stable point filled from below). */
export function equilibriumKey(stability: Stability) {
  return html`<svg width="14" height="14" viewBox="0 0 14 14">${equilibriumMark(7, 7, 5, stability, 'below')}</svg>`;
}
