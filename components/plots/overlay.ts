/**
 * Text laid over a uPlot chart's plotting area as HTML: labels beside points (placed so that
 * they do not overlap) and focusable event markers whose label shows on hover or focus. HTML
 * rather than canvas text so that the labels can be read, selected, found by tests, and
 * printed sharp. Brought up to date on every draw of the chart (data, size), never on cursor
 * moves.
 */
import type uPlot from 'uplot';
import { type Box, type Taken, placeLabels } from './label-placement.ts';
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

/**
 * The event markers: one button per event, kept in order before the leaders. Returns the
 * region each marker and its label take at the top of the plot (the head drawn on the canvas,
 * the label shown on hover or focus), which the chart's labels keep off.
 */
function syncEvents(layer: HTMLElement, parts: LayerParts, events: readonly EventMarker[], w: number): Box[] {
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
  const regions: Box[] = [];
  events.forEach((ev, i) => {
    const b = parts.events[i];
    const flip = ev.x > w / 2;
    put(b, 'className', 'event' + (flip ? ' flip' : ''));
    put(b.style, 'left', `${ev.x}px`);
    if (b.getAttribute('aria-label') !== ev.text) b.setAttribute('aria-label', ev.text);
    const tip = b.firstChild as HTMLElement;
    put(tip, 'textContent', ev.text);
    // the head (chart-styles.ts: the button 12 px wide; the canvas's triangle 7 px tall) and the
    // label beside it (10 px off the marker, TIP_TOP from the top), with a label's gap below
    const [tw, th] = labelSize(layer, tip);
    regions.push({ x: ev.x - HEAD_HALF_WIDTH, y: 0, w: 2 * HEAD_HALF_WIDTH, h: HEAD_HEIGHT + KEEP_GAP });
    regions.push({ x: flip ? ev.x - TIP_OFFSET - tw : ev.x + TIP_OFFSET, y: 0, w: tw, h: TIP_TOP + th + KEEP_GAP });
  });
  return regions;
}

/**
 * Lays the chart's event markers and labels over its plotting area: event markers first,
 * then the labels, placed together (`placeLabels`) so that none covers another, each leader
 * crosses no other leader nor label, and clear of the event markers and their labels and of
 * `keepOffPoints` (the labelled points of a phase or sweep plot: a label over another's point
 * reads as that point's), then of `keepClear` (the points, the curves), where they can be; a
 * label with no room left is hidden.
 * The elements are kept from draw to draw and changed only where they differ, and the labels'
 * sizes are measured from their text (`label-sizes.ts`): a draw never lays the page out.
 */
export function drawOverlay(u: uPlot, labels: readonly PointLabel[], events: readonly EventMarker[] = [], keepClear: Box[] = [], keepOffPoints: readonly Box[] = []): void {
  const layer = labelLayer(u);
  const parts = layerParts(layer);
  const w = u.bbox.width / ratioOf(u);
  const h = u.bbox.height / ratioOf(u);
  const keepOff = [...syncEvents(layer, parts, events, w), ...keepOffPoints];
  const bounds: Box = { x: 0, y: 0, w, h };
  const taken: Taken = { labels: [], clear: keepClear, keepOff, leaders: [] };
  while (parts.labels.length > labels.length) parts.labels.pop()!.remove();
  while (parts.labels.length < labels.length) {
    const el = document.createElement('span');
    layer.append(el);
    parts.labels.push(el);
  }
  const requests = labels.map((l, i) => {
    const el = parts.labels[i];
    put(el, 'className', `lbl ${l.kind}`);
    put(el, 'textContent', l.text);
    const [lw, lh] = labelSize(layer, el);
    return { x: l.x, y: l.y, w: lw, h: lh, along: l.along };
  });
  const placed = placeLabels(requests, taken, bounds);
  const lines: SVGLineElement[] = [];
  placed.forEach((p, i) => {
    const el = parts.labels[i];
    // no room left that would not cover another label: the label is left out (its value is
    // in the cell's results and the chart's data table)
    put(el, 'hidden', !p);
    if (!p) return;
    put(el.style, 'left', `${p.box.x}px`);
    put(el.style, 'top', `${p.box.y}px`);
    // a label pushed away from its point gets a thin line back to it (a level's label, only
    // when pushed off its line)
    if (p.leader) {
      const line = document.createElementNS(SVG, 'line');
      line.setAttribute('x1', String(p.leader[0]));
      line.setAttribute('y1', String(p.leader[1]));
      line.setAttribute('x2', String(p.leader[2]));
      line.setAttribute('y2', String(p.leader[3]));
      lines.push(line);
    }
  });
  if (lines.length || parts.leaders.firstChild) parts.leaders.replaceChildren(...lines);
}

const SVG = 'http://www.w3.org/2000/svg';
/** An event marker's head: half its width (the button's) and its height (the canvas's triangle, run-extras.ts), CSS pixels. */
const HEAD_HALF_WIDTH = 6;
const HEAD_HEIGHT = 7;
/** Where an event's label shows (chart-styles.ts `.event .tip`): its offset from the marker and from the top. */
const TIP_OFFSET = 10;
const TIP_TOP = 2;
/** The gap a label keeps below an event's head and label. */
const KEEP_GAP = 2;

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
