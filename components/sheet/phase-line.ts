/**
 * The phase line of a one-state law, drawn as SVG for the sheet: the state's range as an axis,
 * each equilibrium with the same mark as on screen (filled: attractor; open: repeller; filled
 * on the side it attracts from, as the engine reports it: semi-stable), and an arrow on each
 * interval where the state moves. Where the rate is zero on a whole stretch the state stays
 * still (a thick line, no arrow); where the rate is not defined, a dotted gap.
 */
import { svg, type SVGTemplateResult } from 'lit';
import { formatNumber, type ReportQuantity } from '../../src/index.ts';
import { INK, MUTED, STABLE } from '../plots/palette.ts';
import { equilibriumMark } from '../plots/equilibrium-dot.ts';

/** A quantity as the report gives it; the line reads its value and unit. */
type Q = Readonly<Pick<ReportQuantity, 'value' | 'unit'>>;
export interface PhaseLineSpec {
  /** The line's text alternative (the engine's summary of the phase cell): its name and its title. */
  readonly label: string;
  readonly state: string;
  readonly from: number;
  readonly to: number;
  readonly unit: string;
  readonly equilibria: ReadonlyArray<Q & { readonly stability: string; readonly attractsFrom?: string }>;
  readonly intervals: ReadonlyArray<{ readonly from: Q | null; readonly to: Q | null; readonly sign: string }>;
}

/** The labels' font size, and a width per character no glyph of it exceeds on average (sans-serif), as `svg-chart.ts` reckons. */
const FONT = 11;
const CHAR = 0.62 * FONT;
/** The equilibrium's mark's radius, and the room an arrow keeps from it. */
const DOT = 6;
const CLEAR = DOT + 3;
/** An arrow's half-length at most, and the least worth drawing. */
const ARROW = 7;
const ARROW_LEAST = 3;
/** The rows of labels under the line: the first, and the step to the next for a label with no room on it. */
const ROW = 26;
const ROW_STEP = 14;

interface LineLabel { readonly text: string; readonly x: number; readonly anchor: 'start' | 'middle' | 'end'; readonly row: number }

/**
 * The labels under the line: the range's ends, then each equilibrium under its mark, on the
 * first row where it covers no other label. An end label saying what an equilibrium's label
 * says at the same place (an equilibrium at the end of the range) is left out.
 */
export function lineLabels(ends: readonly [string, string], eqs: ReadonlyArray<{ readonly text: string; readonly x: number }>, left: number, right: number, width: number): LineLabel[] {
  const w = (t: string) => Math.ceil(t.length * CHAR);
  const span = (l: LineLabel): [number, number] => (l.anchor === 'start' ? [l.x, l.x + w(l.text)] : l.anchor === 'end' ? [l.x - w(l.text), l.x] : [l.x - w(l.text) / 2, l.x + w(l.text) / 2]);
  const covers = (a: LineLabel, b: LineLabel) => a.row === b.row && span(a)[0] < span(b)[1] + 4 && span(b)[0] < span(a)[1] + 4;
  const endLabels: LineLabel[] = [{ text: ends[0], x: left, anchor: 'start', row: 0 }, { text: ends[1], x: width - right, anchor: 'end', row: 0 }];
  const placed: LineLabel[] = endLabels.filter((e) => !eqs.some((q) => q.text === e.text && covers(e, { text: q.text, x: q.x, anchor: 'middle', row: 0 })));
  for (const q of eqs) {
    // kept inside the drawing: a label near an end is moved in
    const x = Math.min(Math.max(q.x, w(q.text) / 2), width - w(q.text) / 2);
    let row = 0;
    while (placed.some((l) => covers(l, { text: q.text, x, anchor: 'middle', row }))) row++;
    placed.push({ text: q.text, x, anchor: 'middle', row });
  }
  return placed;
}

export function phaseLine(p: PhaseLineSpec, width = 640): SVGTemplateResult {
  const left = 30;
  const right = 30;
  const y = 34;
  const span = p.to - p.from || 1;
  const X = (v: number) => left + ((v - p.from) / span) * (width - left - right);
  const label = (v: number) => `${formatNumber(v, 4)} ${p.unit}`.trim();
  const labels = lineLabels([label(p.from), label(p.to)], p.equilibria.map((e) => ({ text: label(e.value), x: X(e.value) })), left, right, width);
  const marked = (x: number) => p.equilibria.some((e) => Math.abs(X(e.value) - x) < 1);
  const height = y + ROW + ROW_STEP * Math.max(0, ...labels.map((l) => l.row)) + 10;
  return svg`<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} ${height}" width=${width} height=${height} font-family="sans-serif" font-size=${FONT} role="img" aria-label=${p.label}>
    <title>${p.label}</title>
    <line x1=${left} x2=${width - right} y1=${y} y2=${y} stroke=${INK} stroke-width="1.2" />
    <text x=${width / 2} y="12" text-anchor="middle" fill=${INK}>${p.state}</text>
    ${p.intervals.map((iv) => {
      const a = X(iv.from?.value ?? p.from);
      const b = X(iv.to?.value ?? p.to);
      if (iv.sign === '0') return svg`<line class="still" x1=${a} x2=${b} y1=${y} y2=${y} stroke=${STABLE} stroke-width="4" />`;
      if (iv.sign === 'none') {
        return svg`<line x1=${a} x2=${b} y1=${y} y2=${y} stroke="#fff" stroke-width="4" />
          <line class="undefined" x1=${a} x2=${b} y1=${y} y2=${y} stroke=${MUTED} stroke-width="1.2" stroke-dasharray="2 3" />`;
      }
      if (iv.sign !== '+' && iv.sign !== '-') return '';
      // the arrow between the marks at its ends (an end at an equilibrium has one), shorter on a short stretch
      const from = a + (marked(a) ? CLEAR : 0);
      const to = b - (marked(b) ? CLEAR : 0);
      const half = Math.min(ARROW, (to - from) / 2);
      if (half < ARROW_LEAST) return '';
      const mid = (from + to) / 2;
      const d = iv.sign === '+' ? half : -half;
      const h = (6 * half) / ARROW;
      return svg`<path class="arrow ${iv.sign === '+' ? 'rising' : 'falling'}" d="M${mid - d},${y - h} L${mid + d},${y} L${mid - d},${y + h}" fill="none" stroke=${INK} stroke-width="1.6" />`;
    })}
    ${p.equilibria.map((e) => equilibriumMark(X(e.value), y, DOT, e.stability, e.attractsFrom, 1.6))}
    <g class="labels" fill=${INK}>${labels.map((l) => svg`<text x=${l.x} y=${y + ROW + ROW_STEP * l.row} text-anchor=${l.anchor}>${l.text}</text>`)}</g>
  </svg>`;
}
