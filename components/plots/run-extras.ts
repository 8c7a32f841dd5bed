/**
 * What a run's plot draws over its curves: dose and event times as dashed vertical markers,
 * levels as dashed lines, measured points as open dots (one per device pixel), the points the
 * run found as labelled dots, and the labels placed clear of each other and of the curves.
 */
import type uPlot from 'uplot';
import { formatNumber, type SimulationPlot } from '../../src/index.ts';
import { ratioOf } from './axes.ts';
import { eventTimes, onLogAxis, type MeasuredPoints, type Panel } from './time-plot-parts.ts';
import { drawOverlay, around, curveBoxes, type PointLabel, type EventMarker } from './overlay.ts';
import { EVENT_LINE, seriesColour } from './palette.ts';
import { onePerPixel } from './one-per-pixel.ts';
import type { Box } from './label-placement.ts';

/** One chart of a run's plot, as `drawRunExtras` needs it. */
export interface ExtrasView {
  readonly plot: SimulationPlot;
  readonly panel: Panel;
  readonly isLog: boolean;
  readonly points: readonly MeasuredPoints[];
  /** Time shown = time × factor, in `shownUnit`. */
  readonly factor: number;
  readonly shownUnit: string;
}

const fmt = (v: number) => formatNumber(v, 6);
/** How far past the plot's edge, in device pixels, a point's centre may lie (rounding) and still be drawn. */
const EDGE = 0.5;

/** Events, levels, found points and measured points, drawn after the curves. */
export function drawRunExtras(u: uPlot, view: ExtrasView): void {
  const p = view.plot;
  const panel = view.panel;
  const r = ratioOf(u);
  const { left, top, width, height } = u.bbox;
  const ctx = u.ctx;
  const stateIndex = (name: string) => p.states.findIndex((s) => s.name === name);
  const inPanel = (name: string) => panel.states.includes(stateIndex(name));
  const scaleOf = (name: string) => `y${panel.units.indexOf(p.states[stateIndex(name)].unit)}`;
  ctx.save();
  ctx.beginPath();
  ctx.rect(left, top, width, height);
  ctx.clip();

  const times = eventTimes(p);
  ctx.strokeStyle = EVENT_LINE;
  ctx.fillStyle = EVENT_LINE;
  ctx.lineWidth = 1.5 * r;
  ctx.setLineDash([3 * r, 3 * r]);
  for (const ev of times) {
    const x = u.valToPos(ev.time, 'x', true);
    ctx.beginPath();
    ctx.moveTo(x, top);
    ctx.lineTo(x, top + height);
    ctx.stroke();
    ctx.beginPath();
    ctx.moveTo(x - 5 * r, top);
    ctx.lineTo(x + 5 * r, top);
    ctx.lineTo(x, top + 7 * r);
    ctx.fill();
  }

  ctx.setLineDash([7 * r, 5 * r]);
  ctx.lineWidth = 1.25 * r;
  const placeable = (v: number) => !view.isLog || onLogAxis(v);
  for (const l of p.levels.filter((l) => inPanel(l.state) && placeable(l.value))) {
    const y = u.valToPos(l.value, scaleOf(l.state), true);
    ctx.strokeStyle = seriesColour(stateIndex(l.state));
    ctx.beginPath();
    ctx.moveTo(left, y);
    ctx.lineTo(left + width, y);
    ctx.stroke();
  }
  ctx.setLineDash([]);
  ctx.restore();

  // Measured and found points are drawn whole, unclipped: a point at the end of the span or
  // at the top of the axis sits on the plot's edge, and clipped there it showed half a dot.
  // Only those whose centre is inside the plot are drawn (half a device pixel of rounding).
  // Measured points: one path per series, one dot per device pixel (one-per-pixel.ts):
  // thousands of measurements draw in one fill and one stroke, each place once
  const shownBoxes: Box[] = [];
  const bounds = { left: left - EDGE, top: top - EDGE, right: left + width + EDGE, bottom: top + height + EDGE };
  const within = (x: number, y: number) => x >= bounds.left && x <= bounds.right && y >= bounds.top && y <= bounds.bottom;
  ctx.save();
  for (const m of view.points.filter((m) => inPanel(m.state))) {
    const scale = scaleOf(m.state);
    const xs = new Float64Array(m.t.length);
    const ys = new Float64Array(m.t.length);
    const kept = onePerPixel(m.t.length, (i) => (xs[i] = u.valToPos(m.t[i], 'x', true)), (i) => (ys[i] = u.valToPos(m.values[i], scale, true)), bounds, (i) => !placeable(m.values[i]));
    ctx.strokeStyle = seriesColour(stateIndex(m.state));
    ctx.fillStyle = '#fff';
    ctx.lineWidth = 1.5 * r;
    ctx.beginPath();
    for (const i of kept) {
      const x = xs[i];
      const y = ys[i];
      ctx.moveTo(x + 3.5 * r, y);
      ctx.arc(x, y, 3.5 * r, 0, 2 * Math.PI);
      shownBoxes.push(around((x - left) / r, (y - top) / r, 4));
    }
    ctx.fill();
    ctx.stroke();
  }

  const marks = p.marks.filter((m) => inPanel(m.state) && placeable(m.value));
  for (const m of marks) {
    const x = u.valToPos(m.time, 'x', true);
    const y = u.valToPos(m.value, scaleOf(m.state), true);
    if (!within(x, y)) continue;
    ctx.beginPath();
    ctx.arc(x, y, 4.5 * r, 0, 2 * Math.PI);
    ctx.fillStyle = '#1d2630';
    ctx.strokeStyle = '#fff';
    ctx.lineWidth = 2 * r;
    ctx.stroke();
    ctx.fill();
  }
  ctx.restore();

  const cssW = width / r;
  const inside = (x: number, y: number) => x >= 0 && x <= cssW && y >= 0 && y <= height / r;
  const labels: PointLabel[] = [];
  const clear: Box[] = shownBoxes;
  for (const m of marks) {
    const x = u.valToPos(m.time, 'x');
    const y = u.valToPos(m.value, scaleOf(m.state));
    if (!inside(x, y)) continue;
    labels.push({ x, y, text: m.label, kind: 'mark' });
    clear.push(around(x, y));
  }
  for (const l of p.levels.filter((l) => inPanel(l.state) && placeable(l.value))) {
    const y = u.valToPos(l.value, scaleOf(l.state));
    if (inside(cssW, y)) labels.push({ x: cssW - 2, y, text: l.label, kind: 'level', along: [0.75, 0.5, 0.25].map((f) => f * cssW) });
  }
  const events: EventMarker[] = times
    .map((ev) => ({ x: u.valToPos(ev.time, 'x'), text: `${ev.labels.join('; ')} at ${fmt(ev.time * view.factor)} ${view.shownUnit}` }))
    .filter((ev) => ev.x >= 0 && ev.x <= cssW);
  drawOverlay(u, labels, events, [...clear, ...curveBoxes(u, panel.states.map((_, j) => j + 1))]);
}
