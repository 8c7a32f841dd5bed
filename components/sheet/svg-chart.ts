/**
 * A static line chart drawn as SVG for the printed sheet: vector lines and text, so it is
 * sharp at any print resolution, and no canvas or script is needed once drawn. Axes with
 * round ticks, curves (gaps where a value is null), measured points, dashed levels, event
 * times and labelled marks. Shows what it is given; it computes nothing but the layout. The
 * chart is an image named by its `label` (aria-label and <title>), the engine's summary.
 */
import { svg, type SVGTemplateResult } from 'lit';
import { formatNumber } from '../../src/index.ts';
import { tickLabels } from '../plots/axes.ts';
import { placeLabels, type Box, type Segment, type Taken } from '../plots/label-placement.ts';
import { INK, seriesColour } from '../plots/palette.ts';
import { foldMark } from '../plots/sweep-runs.ts';

export interface ChartLine {
  readonly label: string; readonly x: readonly number[]; readonly y: ReadonlyArray<number | null>; readonly axis?: 0 | 1;
  /** A colour of its own (else the series colour of its place) and a dashed stroke. */
  readonly colour?: string; readonly dashed?: boolean;
  /** Left out of the legend (a further piece of a line already listed). */
  readonly unlisted?: boolean;
}
export interface ChartPoints { readonly label: string; readonly x: readonly number[]; readonly y: readonly number[]; readonly axis?: 0 | 1; readonly colourOf?: number }
/** A shaded band between two curves (a run's 2.5 and 97.5 percentiles), drawn behind the lines in the colour of line `colourOf`. */
export interface ChartBand { readonly label: string; readonly x: readonly number[]; readonly lo: readonly number[]; readonly hi: readonly number[]; readonly axis?: 0 | 1; readonly colourOf: number }
export interface ChartSpec {
  /** The chart's text alternative (the engine's summary of what it shows): its name and its title. */
  readonly label: string;
  readonly xLabel: string;
  /** One label per y axis: a second axis on the right when there are two. */
  readonly yLabels: readonly string[];
  readonly lines: readonly ChartLine[];
  readonly points?: readonly ChartPoints[];
  readonly bands?: readonly ChartBand[];
  readonly levels?: ReadonlyArray<{ readonly y: number; readonly label: string; readonly axis?: 0 | 1 }>;
  readonly events?: ReadonlyArray<{ readonly x: number; readonly label: string }>;
  readonly marks?: ReadonlyArray<{ readonly x: number; readonly y: number; readonly label: string; readonly axis?: 0 | 1 }>;
  /** A sweep's folds: each a diamond (`foldMark`) with its label placed as a mark's, and one legend entry, `key`, for them all. */
  readonly folds?: { readonly key: string; readonly at: ReadonlyArray<{ readonly x: number; readonly y: number; readonly label: string }> };
  /** The x axis spans exactly this range (a sweep's swept range), widened to the data's round ticks only when the data reaches past it. */
  readonly xRange?: readonly [number, number];
  /** A horizontal line at zero (the rate in a phase plot). */
  readonly zeroLine?: boolean;
  /**
   * The y axes logarithmic (base 10): values at or below zero have no place there and are
   * left out of the drawing (the caller says so beside the chart).
   */
  readonly logY?: boolean;
  readonly width?: number;
  readonly height?: number;
}

const FONT = 11;
/** Labels of marks and levels: their font size, and a width per character no glyph of it exceeds on average (sans-serif). */
const LABEL_FONT = 10;
const LABEL_CHAR = 0.62 * LABEL_FONT;
const LABEL_HEIGHT = 12;
/** The x axis's tick labels' baseline under the plot: low enough that the first and last clear the y axes' lowest labels at the corners. */
const X_TICK_BELOW = 17;
/** Space under the legend for the labels that found no room on the plot. */
const UNPLACED_ROW = 16;

/** A label's box for its text, in the chart's units: wide enough for the text in the sheet's font. */
const labelSize = (text: string) => ({ w: Math.ceil(text.length * LABEL_CHAR) + 2, h: LABEL_HEIGHT });

interface PlacedLabel { readonly text: string; readonly box: Box; readonly leader?: Segment }

/** Round tick values covering [lo, hi]: steps of 1, 2, 2.5 or 5 times a power of ten. */
export function niceTicks(lo: number, hi: number, most = 7): { ticks: number[]; step: number } {
  // A flat curve (a level held exactly, up to rounding) gets a band of ±10% around it.
  if (!(hi - lo > 1e-9 * Math.max(Math.abs(lo), Math.abs(hi)))) { const pad = Math.abs(lo) * 0.1 || 1; lo -= pad; hi += pad; }
  const raw = (hi - lo) / most;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const ticks: number[] = [];
  const first = Math.ceil(lo / step - 1e-9);
  for (let i = first; i * step <= hi + step * 1e-9 && ticks.length <= 2 * most + 2; i++) ticks.push(Math.abs(i * step) < step * 1e-9 ? 0 : i * step);
  return { ticks, step };
}

function extent(values: Iterable<number | null>): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) if (v !== null && Number.isFinite(v)) { if (v < lo) lo = v; if (v > hi) hi = v; }
  return lo <= hi ? [lo, hi] : [0, 1];
}

/** Widens [lo, hi] to its outer ticks. */
function axisRange(lo: number, hi: number): { lo: number; hi: number; ticks: number[]; step: number } {
  if (!(hi - lo > 1e-9 * Math.max(Math.abs(lo), Math.abs(hi)))) { const pad = Math.abs(lo) * 0.1 || 1; lo -= pad; hi += pad; }
  const first = niceTicks(lo, hi);
  const step = first.step;
  const a = Math.floor(lo / step + 1e-9) * step;
  const b = Math.ceil(hi / step - 1e-9) * step;
  const { ticks } = niceTicks(a, b);
  return b > a ? { lo: a, hi: b, ticks: ticks.filter((v) => v >= a - step * 1e-9 && v <= b + step * 1e-9), step } : { lo: a - step, hi: a + step, ticks: [a - step, a, a + step], step };
}

/** The x axis: exactly `range` (its ticks the round ones inside it) when the data keeps within it, else widened to the outer ticks of both. */
function xAxisRange([lo, hi]: [number, number], range?: readonly [number, number]): { lo: number; hi: number; ticks: number[]; step: number } {
  if (!range || !Number.isFinite(range[0]) || !Number.isFinite(range[1]) || range[0] === range[1]) return axisRange(lo, hi);
  const a = Math.min(range[0], range[1]);
  const b = Math.max(range[0], range[1]);
  if (lo < a || hi > b) return axisRange(Math.min(lo, a), Math.max(hi, b));
  return { lo: a, hi: b, ...niceTicks(a, b) };
}

/** A y axis: its ticks with their labels, and where a value sits on it (0 bottom, 1 top; null: nowhere). */
interface YAxis { readonly ticks: number[]; readonly labels: string[]; readonly at: (v: number) => number | null }

function linearAxis(values: Array<number | null>): YAxis {
  const r = axisRange(...extent(values));
  return { ticks: r.ticks, labels: tickLabels(r.ticks, r.step), at: (v) => (v - r.lo) / (r.hi - r.lo) };
}

/** Whole decades around the positive values; ticks at powers of ten (every few when there are many), and at 2 and 5 times them over two decades or less. */
function logAxis(values: Array<number | null>): YAxis {
  const positive = values.filter((v): v is number => v !== null && v > 0 && Number.isFinite(v));
  // nothing the axis can place (or an axis with nothing on it): one decade, 1 to 10
  const [lo, hi] = positive.length ? extent(positive) : [1, 10];
  const a = Math.floor(Math.log10(lo) + 1e-9);
  const b = Math.max(a + 1, Math.ceil(Math.log10(hi) - 1e-9));
  const ticks: number[] = [];
  // every decade up to 8 of them, else every few so that at most about 8 are labelled
  const every = Math.ceil((b - a) / 8);
  // counted down from the top decade, so that the top of the axis is labelled
  for (let e = b; e >= a; e -= every) for (const m of b - a <= 2 ? [5, 2, 1] : [1]) if (e < b || m === 1) ticks.unshift(m * 10 ** e);
  return { ticks, labels: ticks.map((v) => formatNumber(v, 3)), at: (v) => (v > 0 ? (Math.log10(v) - a) / (b - a) : null) };
}

export function lineChart(spec: ChartSpec): SVGTemplateResult {
  const width = spec.width ?? 640;
  const height = spec.height ?? 250;
  const twoAxes = spec.yLabels.length > 1;
  const left = 62;
  const right = twoAxes ? 62 : 16;
  const top = 10;
  const bottom = 42;
  const pw = width - left - right;
  const ph = height - top - bottom;
  const xs = [...spec.lines.flatMap((l) => l.x), ...(spec.points ?? []).flatMap((p) => p.x), ...(spec.folds?.at ?? []).map((f) => f.x)];
  const xr = xAxisRange(extent(xs), spec.xRange);
  const yr = [0, 1].map((axis) => {
    const on = <T extends { axis?: 0 | 1 }>(list: readonly T[] | undefined) => (list ?? []).filter((l) => (l.axis ?? 0) === axis);
    const ys = [...on(spec.lines).flatMap((l) => l.y), ...on(spec.points).flatMap((p) => p.y), ...on(spec.bands).flatMap((b) => [...b.lo, ...b.hi]), ...on(spec.levels).map((l) => l.y), ...(spec.zeroLine && axis === 0 ? [0] : []), ...(axis === 0 ? (spec.folds?.at ?? []).map((f) => f.y) : [])];
    return spec.logY ? logAxis(ys) : linearAxis(ys);
  });
  const X = (v: number) => left + ((v - xr.lo) / (xr.hi - xr.lo)) * pw;
  /** NaN where the axis has no place for the value (at or below zero on a log axis). */
  const Y = (v: number, axis: 0 | 1 = 0) => top + ph - (yr[axis].at(v) ?? NaN) * ph;
  const onAxis = (v: number, axis: 0 | 1 = 0) => Number.isFinite(Y(v, axis));
  const levels = (spec.levels ?? []).filter((l) => onAxis(l.y, l.axis ?? 0));
  const marks = (spec.marks ?? []).filter((m) => onAxis(m.y, m.axis ?? 0));
  const folds = (spec.folds?.at ?? []).filter((f) => onAxis(f.y));
  const points = (spec.points ?? []).map((p) => ({ ...p, shown: p.x.flatMap((x, j) => (onAxis(p.y[j], p.axis ?? 0) ? [j] : [])) }));
  const path = (l: ChartLine) => {
    let d = '';
    let pen = false;
    for (let i = 0; i < l.x.length; i++) {
      const y = l.y[i];
      if (y === null || !Number.isFinite(y) || !Number.isFinite(l.x[i]) || !onAxis(y, l.axis ?? 0)) { pen = false; continue; }
      d += `${pen ? 'L' : 'M'}${X(l.x[i]).toFixed(1)},${Y(y, l.axis ?? 0).toFixed(1)}`;
      pen = true;
    }
    return d;
  };
  const xLabels = tickLabels(xr.ticks, xr.step);
  const yLabels = yr.map((r) => r.labels);
  const listed = spec.lines.map((l, i) => ({ l, i })).filter(({ l }) => !l.unlisted);
  const legend = listed.length > 1 || (spec.points ?? []).length > 0 || (spec.bands ?? []).length > 0 || folds.length > 0;
  // a band's outline: along its lower edge and back along its upper one, where the axis can place both
  const bandPath = (b: ChartBand) => {
    const axis = b.axis ?? 0;
    const ok = (i: number) => Number.isFinite(b.x[i]) && onAxis(b.lo[i], axis) && onAxis(b.hi[i], axis);
    let d = '';
    for (let i = 0; i < b.x.length;) {
      while (i < b.x.length && !ok(i)) i++;
      let j = i;
      while (j < b.x.length && ok(j)) j++;
      if (j - i > 1) {
        for (let k = i; k < j; k++) d += `${k === i ? 'M' : 'L'}${X(b.x[k]).toFixed(1)},${Y(b.lo[k], axis).toFixed(1)}`;
        for (let k = j - 1; k >= i; k--) d += `L${X(b.x[k]).toFixed(1)},${Y(b.hi[k], axis).toFixed(1)}`;
        d += 'Z';
      }
      i = j;
    }
    return d;
  };
  // labels of marks, then levels, placed so that none covers another, off the curves where there is room
  const taken: Taken = { labels: [], leaders: [], clear: [
    ...curveBoxes(spec.lines, X, Y),
    ...points.flatMap((p) => p.shown.map((j) => around(X(p.x[j]), Y(p.y[j], p.axis ?? 0), 4))),
    ...marks.map((m) => around(X(m.x), Y(m.y, m.axis ?? 0), 4)),
    ...folds.map((f) => around(X(f.x), Y(f.y), 6)),
  ] };
  const bounds: Box = { x: left + 1, y: top + 1, w: pw - 2, h: ph - 2 };
  // marks and folds first, then levels (anywhere along their line), placed together: none covers another, no leader crosses another
  const wanted = [
    ...marks.map((m) => ({ text: m.label, x: X(m.x), y: Y(m.y, m.axis ?? 0) })),
    ...folds.map((f) => ({ text: f.label, x: X(f.x), y: Y(f.y) })),
    ...levels.map((l) => ({ text: l.label, x: left + pw - 4, y: Y(l.y, l.axis ?? 0), along: [left + pw / 2, left + 8] })),
  ];
  const placed: PlacedLabel[] = [];
  const unplaced: string[] = [];
  placeLabels(wanted.map((q) => ({ ...q, ...labelSize(q.text) })), taken, bounds).forEach((p, i) => {
    if (!p) unplaced.push(wanted[i].text);
    // a label pushed away from its point gets a thin line back to it
    else placed.push({ text: wanted[i].text, box: p.box, ...(p.leader ? { leader: p.leader } : {}) });
  });
  const extra = (legend ? 18 : 0) + (unplaced.length ? UNPLACED_ROW : 0);
  return svg`<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} ${height + extra}" width="${width}" height="${height + extra}" font-family="sans-serif" font-size="${FONT}" role="img" aria-label=${spec.label}>
    <title>${spec.label}</title>
    <g stroke="#d5dbe0" stroke-width="0.6">
      ${xr.ticks.map((v) => svg`<line x1=${X(v)} x2=${X(v)} y1=${top} y2=${top + ph} />`)}
      ${yr[0].ticks.map((v) => svg`<line x1=${left} x2=${left + pw} y1=${Y(v)} y2=${Y(v)} />`)}
    </g>
    <rect x=${left} y=${top} width=${pw} height=${ph} fill="none" stroke=${INK} stroke-width="0.8" />
    ${spec.zeroLine && !spec.logY && (yr[0].at(0) ?? -1) > 0 && (yr[0].at(0) ?? 2) < 1 ? svg`<line x1=${left} x2=${left + pw} y1=${Y(0)} y2=${Y(0)} stroke=${INK} stroke-width="0.8" />` : ''}
    <g fill=${INK}>
      ${xr.ticks.map((v, i) => svg`<text x=${X(v)} y=${top + ph + X_TICK_BELOW} text-anchor="middle">${xLabels[i]}</text>`)}
      ${yr[0].ticks.map((v, i) => svg`<text x=${left - 5} y=${Y(v) + 4} text-anchor="end">${yLabels[0][i]}</text>`)}
      ${twoAxes ? yr[1].ticks.map((v, i) => svg`<text x=${left + pw + 5} y=${Y(v, 1) + 4}>${yLabels[1][i]}</text>`) : ''}
      <text x=${left + pw / 2} y=${top + ph + X_TICK_BELOW + 18} text-anchor="middle">${spec.xLabel}</text>
      <text transform="translate(13 ${top + ph / 2}) rotate(-90)" text-anchor="middle">${spec.yLabels[0]}</text>
      ${twoAxes ? svg`<text transform="translate(${width - 8} ${top + ph / 2}) rotate(90)" text-anchor="middle">${spec.yLabels[1]}</text>` : ''}
    </g>
    ${(spec.events ?? []).map((e) => svg`<line x1=${X(e.x)} x2=${X(e.x)} y1=${top} y2=${top + ph} stroke="#7a5ba8" stroke-width="0.8" stroke-dasharray="2 3"><title>${e.label}</title></line>`)}
    ${levels.map((l) => svg`<line x1=${left} x2=${left + pw} y1=${Y(l.y, l.axis ?? 0)} y2=${Y(l.y, l.axis ?? 0)} stroke="#555" stroke-width="0.8" stroke-dasharray="5 3" />`)}
    ${(spec.bands ?? []).map((b) => svg`<path class="band" d=${bandPath(b)} fill=${seriesColour(b.colourOf)} fill-opacity="0.2" stroke=${seriesColour(b.colourOf)} stroke-opacity="0.5" stroke-width="0.6" />`)}
    ${spec.lines.map((l, i) => svg`<path d=${path(l)} fill="none" stroke=${l.colour ?? seriesColour(i)} stroke-width="1.6" stroke-linejoin="round" stroke-dasharray=${l.dashed ? '6 4' : 'none'} />`)}
    ${points.map((p, i) => p.shown.map((j) => svg`<circle cx=${X(p.x[j])} cy=${Y(p.y[j], p.axis ?? 0)} r="2.8" fill="#fff" stroke=${seriesColour(p.colourOf ?? i)} stroke-width="1.2" />`))}
    ${marks.map((m) => svg`<circle cx=${X(m.x)} cy=${Y(m.y, m.axis ?? 0)} r="3" fill=${INK} />`)}
    ${folds.map((f) => foldMark(X(f.x), Y(f.y), 5.5))}
    <g stroke="#777" stroke-width="0.6">${placed.filter((p) => p.leader).map(({ leader: [x1, y1, x2, y2] = [0, 0, 0, 0] }) => svg`<line x1=${x1} y1=${y1} x2=${x2} y2=${y2} />`)}</g>
    <g class="labels" font-size=${LABEL_FONT} fill=${INK}>${placed.map((p) => svg`<text class="lbl" x=${p.box.x + 1} y=${p.box.y + p.box.h - 3}>${p.text}</text>`)}</g>
    ${unplaced.length ? svg`<text class="unplaced" x=${left} y=${height + extra - 4} font-size="10" fill=${INK}>Marked but not labelled, for want of room: ${unplaced.join(', ')}</text>` : ''}
    ${legend ? svg`<g font-size="10" fill=${INK}>${[...listed.map(({ l, i }) => ({ label: l.label, colour: l.colour ?? seriesColour(i), dashed: !!l.dashed, dot: false })), ...(spec.points ?? []).map((p, i) => ({ label: p.label, colour: seriesColour(p.colourOf ?? i), dashed: false, dot: true })),
      ...(spec.bands ?? []).map((b) => ({ label: b.label, colour: seriesColour(b.colourOf), dashed: false, dot: false, band: true })),
      ...(folds.length ? [{ label: spec.folds!.key, colour: INK, dashed: false, dot: false, fold: true }] : [])].map((item, k) => svg`
      <g transform="translate(${left + k * 150} ${height + 8})">
        ${'fold' in item ? foldMark(8, 0, 5) : 'band' in item ? svg`<rect x="0" y="-4" width="16" height="8" fill=${item.colour} fill-opacity="0.2" stroke=${item.colour} stroke-opacity="0.5" stroke-width="0.6" />` : item.dot ? svg`<circle cx="8" cy="0" r="2.8" fill="#fff" stroke=${item.colour} stroke-width="1.2" />` : svg`<line x1="0" x2="16" y1="0" y2="0" stroke=${item.colour} stroke-width="1.6" stroke-dasharray=${item.dashed ? '6 4' : 'none'} />`}
        <text x="21" y="3.5">${item.label}</text></g>`)}</g>` : ''}
  </svg>`;
}

/** A small square around a point, to keep labels off it. */
const around = (x: number, y: number, r: number): Box => ({ x: x - r, y: y - r, w: 2 * r, h: 2 * r });

/** Small boxes along the drawn lines (every few units), so that labels keep off the curves where they can. */
function curveBoxes(lines: readonly ChartLine[], X: (v: number) => number, Y: (v: number, axis?: 0 | 1) => number, step = 4): Box[] {
  const boxes: Box[] = [];
  for (const l of lines) {
    let prev: [number, number] | undefined;
    for (let i = 0; i < l.x.length; i++) {
      const v = l.y[i];
      if (v === null || !Number.isFinite(v) || !Number.isFinite(l.x[i]) || !Number.isFinite(Y(v, l.axis ?? 0))) { prev = undefined; continue; }
      const p: [number, number] = [X(l.x[i]), Y(v, l.axis ?? 0)];
      const n = prev ? Math.min(200, Math.floor(Math.hypot(p[0] - prev[0], p[1] - prev[1]) / step)) : 0;
      for (let k = 1; k < n; k++) boxes.push(around(prev![0] + ((p[0] - prev![0]) * k) / n, prev![1] + ((p[1] - prev![1]) * k) / n, 1.5));
      boxes.push(around(p[0], p[1], 1.5));
      prev = p;
    }
  }
  return boxes;
}
