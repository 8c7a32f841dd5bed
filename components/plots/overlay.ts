/**
 * Text laid over a uPlot chart's plotting area as HTML: labels beside points (placed so that
 * they do not overlap) and focusable event markers whose label shows on hover or focus. HTML
 * rather than canvas text so that the labels can be read, selected, found by tests, and
 * printed sharp. Brought up to date on every draw of the chart (data, size), never on cursor
 * moves.
 */
import type uPlot from 'uplot';
import { type Box, type Taken, placeLabel } from './label-placement.ts';
import { ratioOf } from './axes.ts';
import { labelSize } from './label-sizes.ts';

/** A label tied to a point, in CSS pixels relative to the plotting area. */
export interface PointLabel {
  readonly x: number;
  readonly y: number;
  readonly text: string;
  /** Class added to the label (`mark`, `level`, `equilibrium`, `fold`...). */
  readonly kind: string;
  /** Other x positions on the same horizontal line where the label may go (for a level). */
  readonly along?: readonly number[];
}

/** An event marker: a vertical line's position and what happened there. */
export interface EventMarker {
  readonly x: number;
  readonly text: string;
}

const LAYER = 'plot-labels';

/** The layer's elements, kept from one draw to the next: a draw changes only what differs. */
interface LayerParts {
  readonly events: HTMLButtonElement[];
  readonly leaders: SVGSVGElement;
  readonly labels: HTMLSpanElement[];
}
const partsOf = new WeakMap<HTMLElement, LayerParts>();

/** The chart's label layer, made on first use (inside `u.over`). */
export function labelLayer(u: uPlot): HTMLElement {
  let layer = u.over.querySelector<HTMLElement>(`:scope > .${LAYER}`);
  if (!layer) {
    layer = document.createElement('div');
    layer.className = LAYER;
    u.over.append(layer);
  }
  return layer;
}

function layerParts(layer: HTMLElement): LayerParts {
  let parts = partsOf.get(layer);
  if (!parts) {
    const leaders = document.createElementNS(SVG, 'svg');
    leaders.setAttribute('class', 'leaders');
    leaders.setAttribute('aria-hidden', 'true');
    layer.replaceChildren(leaders);
    partsOf.set(layer, (parts = { events: [], leaders, labels: [] }));
  }
  return parts;
}

/** Sets an attribute or property only when it differs: an unchanged label costs no style or layout work. */
function put<T extends object, K extends keyof T>(o: T, key: K, value: T[K]): void {
  if (o[key] !== value) o[key] = value;
}

/** The event markers: one button per event, kept in order before the leaders. */
function syncEvents(parts: LayerParts, events: readonly EventMarker[], w: number): void {
  while (parts.events.length > events.length) parts.events.pop()!.remove();
  while (parts.events.length < events.length) {
    const b = document.createElement('button');
    b.type = 'button';
    const tip = document.createElement('span');
    tip.className = 'tip';
    tip.setAttribute('role', 'tooltip');
    b.append(tip);
    parts.leaders.before(b);
    parts.events.push(b);
  }
  events.forEach((ev, i) => {
    const b = parts.events[i];
    put(b, 'className', 'event' + (ev.x > w / 2 ? ' flip' : ''));
    put(b.style, 'left', `${ev.x}px`);
    if (b.getAttribute('aria-label') !== ev.text) b.setAttribute('aria-label', ev.text);
    put(b.firstChild as HTMLElement, 'textContent', ev.text);
  });
}

/**
 * Lays the chart's event markers and labels over its plotting area: event markers first,
 * then the labels, each placed so that it never covers one before it, and clear of
 * `keepClear` (the points, the curves) where it can be; a label with no room left is hidden.
 * The elements are kept from draw to draw and changed only where they differ, and the labels'
 * sizes are measured from their text (`label-sizes.ts`): a draw never lays the page out.
 */
export function drawOverlay(u: uPlot, labels: readonly PointLabel[], events: readonly EventMarker[] = [], keepClear: Box[] = []): void {
  const layer = labelLayer(u);
  const parts = layerParts(layer);
  const w = u.bbox.width / ratioOf(u);
  const h = u.bbox.height / ratioOf(u);
  syncEvents(parts, events, w);
  const bounds: Box = { x: 0, y: 0, w, h };
  const taken: Taken = { labels: [], clear: keepClear };
  while (parts.labels.length > labels.length) parts.labels.pop()!.remove();
  while (parts.labels.length < labels.length) {
    const el = document.createElement('span');
    layer.append(el);
    parts.labels.push(el);
  }
  const lines: SVGLineElement[] = [];
  labels.forEach((l, i) => {
    const el = parts.labels[i];
    put(el, 'className', `lbl ${l.kind}`);
    put(el, 'textContent', l.text);
    const [lw, lh] = labelSize(layer, el);
    const box = placeLabel(l.x, l.y, lw, lh, taken, bounds, l.along);
    // no room left that would not cover another label: the label is left out (its value is
    // in the cell's results and the chart's data table)
    put(el, 'hidden', !box);
    if (!box) return;
    put(el.style, 'left', `${box.x}px`);
    put(el.style, 'top', `${box.y}px`);
    // A label pushed away from its point gets a thin line back to it (a level's label, only
    // when pushed off its line).
    const ax = l.along ? Math.min(Math.max(l.x, box.x), box.x + box.w) : l.x;
    const nx = Math.min(Math.max(ax, box.x), box.x + box.w);
    const ny = Math.min(Math.max(l.y, box.y), box.y + box.h);
    if (Math.hypot(nx - ax, ny - l.y) > LEADER_FROM) {
      const line = document.createElementNS(SVG, 'line');
      line.setAttribute('x1', String(ax));
      line.setAttribute('y1', String(l.y));
      line.setAttribute('x2', String(nx));
      line.setAttribute('y2', String(ny));
      lines.push(line);
    }
  });
  if (lines.length || parts.leaders.firstChild) parts.leaders.replaceChildren(...lines);
}

const SVG = 'http://www.w3.org/2000/svg';
/** Distance from a point to its label, CSS pixels, beyond which a leader line is drawn. */
const LEADER_FROM = 14;

/** A small square around a point, to keep labels off the point itself. */
export const around = (x: number, y: number, r = 5): Box => ({ x: x - r, y: y - r, w: 2 * r, h: 2 * r });

/**
 * Small boxes along the drawn curves of `series` (every `step` CSS pixels), so that labels
 * keep off the lines as well as off each other.
 */
export function curveBoxes(u: uPlot, series: readonly number[], step = 4): Box[] {
  const boxes: Box[] = [];
  const xs = u.data[0];
  const w = u.bbox.width / ratioOf(u);
  const h = u.bbox.height / ratioOf(u);
  const add = (x: number, y: number) => { if (x >= 0 && x <= w && y >= 0 && y <= h) boxes.push({ x: x - 1.5, y: y - 1.5, w: 3, h: 3 }); };
  for (const s of series) {
    const ys = u.data[s];
    const scale = u.series[s].scale ?? 'y';
    let px: number | undefined;
    let py: number | undefined;
    for (let i = 0; i < xs.length; i++) {
      const v = ys[i];
      if (v == null) { if (v === null) px = py = undefined; continue; }
      const x = u.valToPos(xs[i], 'x');
      const y = u.valToPos(v, scale);
      if (px !== undefined && py !== undefined) {
        const n = Math.min(200, Math.floor(Math.hypot(x - px, y - py) / step));
        for (let k = 1; k < n; k++) add(px + ((x - px) * k) / n, py + ((y - py) * k) / n);
      }
      add(x, y);
      px = x;
      py = y;
    }
  }
  return boxes;
}
