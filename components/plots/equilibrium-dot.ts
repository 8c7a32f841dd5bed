/**
 * How an equilibrium looks, the same on the rate chart, the phase line and the key: an
 * attractor is a filled dot, a repeller an open ring, a semi-stable point a ring filled on the
 * side the state comes in from.
 */
import { html, svg } from 'lit';
import { STABLE, UNSTABLE } from './palette.ts';

export type Stability = 'attractor' | 'repeller' | 'semi-stable';

const SEMI = '#6b3fa0';

/** Draws the mark centred at (x, y), radius `radius`, in canvas pixels (`r` per CSS pixel). */
export function drawEquilibriumDot(ctx: CanvasRenderingContext2D, x: number, y: number, radius: number, r: number,
  stability: Stability, filledSide?: 'left' | 'right'): void {
  ctx.save();
  ctx.setLineDash([]);
  ctx.lineWidth = 2 * r;
  const colour = stability === 'attractor' ? STABLE : stability === 'repeller' ? UNSTABLE : SEMI;
  ctx.beginPath();
  ctx.arc(x, y, radius, 0, 2 * Math.PI);
  ctx.fillStyle = stability === 'attractor' ? colour : '#fff';
  ctx.fill();
  if (stability === 'semi-stable') {
    ctx.beginPath();
    // left half: from the top (-π/2) anticlockwise to the bottom; right half the other way.
    ctx.arc(x, y, radius, -Math.PI / 2, Math.PI / 2, filledSide !== 'right');
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

/** The same mark as a small SVG, for the key under the chart. */
export function equilibriumKey(stability: Stability) {
  const colour = stability === 'attractor' ? STABLE : stability === 'repeller' ? UNSTABLE : SEMI;
  return html`<svg width="14" height="14" viewBox="0 0 14 14">
    <circle cx="7" cy="7" r="5" fill=${stability === 'attractor' ? colour : '#fff'} stroke=${colour} stroke-width="2"/>
    ${stability === 'semi-stable' ? svg`<path d="M7 2 A5 5 0 0 0 7 12 Z" fill=${colour}/>` : ''}
  </svg>`;
}
