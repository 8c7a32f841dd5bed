/**
 * `<phase-plot>`: where a one-state law y' = f(y) settles, from a phase cell's report. Three
 * parts: the rate f against the state with its zero line, the equilibria (marked by stability)
 * and any poles; under it, the phase line: the state's range with arrows showing which way the
 * state moves on each interval; and a direction field over time and state, with slope marks
 * taken from the sampled rate and the engine's solutions drawn over it. A "Data table"
 * disclosure shows the plotted values (`<chart-data>`, tables from plot-tables.ts).
 */
import { LitElement, html, nothing, type PropertyValues } from 'lit';
import uPlot from 'uplot';
import { formatNumber, type ReportQuantity } from '../../src/index.ts';
import { ChartController, type ChartSpec } from './chart-controller.ts';
import { chartStyles } from './chart-styles.ts';
import { xAxis, yAxis, ratioOf } from './axes.ts';
import { drawOverlay, around, curveBoxes, type PointLabel } from './overlay.ts';
import { INK, MUTED, STABLE, ZERO_LINE } from './palette.ts';
import { phaseTables } from './plot-tables.ts';
import './data-table.ts';
import { drawEquilibriumDot, equilibriumKey, type Side, type Stability } from './equilibrium-dot.ts';
import { drawDirectionField, drawPhaseLine } from './phase-plot-layers.ts';

/** A quantity as the report gives it, in display units; the chart reads its value and unit. */
export type ShownQuantity = Readonly<Partial<ReportQuantity> & Pick<ReportQuantity, 'value' | 'unit'>>;

/** The phase cell's `plot`. */
export interface PhasePlotData {
  readonly stateUnit: string;
  readonly rateUnit: string;
  readonly timeUnit: string;
  readonly y: ReadonlyArray<number | null>;
  readonly f: ReadonlyArray<number | null>;
  readonly solutions: ReadonlyArray<{ readonly start: number | null; readonly t: readonly number[]; readonly y: ReadonlyArray<number | null> }>;
}

/** One of the cell's `equilibria`; `attractsFrom` is the engine's side of a semi-stable point. */
export interface PhaseEquilibrium extends ShownQuantity { readonly stability: Stability; readonly slope?: ShownQuantity; readonly attractsFrom?: Side }
export interface PhaseInterval { readonly from: ShownQuantity | null; readonly to: ShownQuantity | null; readonly sign: string }

const RATE_HEIGHT = 240;
const FIELD_HEIGHT = 260;
const fmt = (v: number) => formatNumber(v, 4);

export class PhasePlot extends LitElement {
  static override properties = {
    plot: { attribute: false },
    equilibria: { attribute: false },
    intervals: { attribute: false },
    poles: { attribute: false },
    summary: {},
    state: {},
  };

  static override styles = chartStyles;

  /** The phase cell's `plot`. */
  plot?: PhasePlotData;
  /** The cell's `equilibria`. */
  equilibria: readonly PhaseEquilibrium[] = [];
  /** The cell's `intervals` (null ends are the ends of the range). */
  intervals: readonly PhaseInterval[] = [];
  /** The cell's `poles`, if any. */
  poles: readonly ShownQuantity[] = [];
  /** The cell's `summary`. */
  summary = '';
  /** The state's name, for the axis labels (the plot data do not carry it). */
  state = 'y';

  private rateData: uPlot.AlignedData = [[]];
  private fieldData: uPlot.AlignedData = [[]];
  private readonly chart = new ChartController(this, () => this.specs());

  /** The uPlot charts: the rate against the state, then the direction field. */
  get charts(): readonly uPlot[] {
    return this.chart.charts;
  }

  override willUpdate(changed: PropertyValues<this>): void {
    // A host may pass a fresh (equal) list of poles on every render: rebuild only on a real change.
    const before = changed.get('poles') as readonly ShownQuantity[] | undefined;
    const polesMoved = changed.has('poles') && (before?.length !== this.poles.length || this.poles.some((q, i) => q.value !== before[i].value));
    if (changed.has('plot') || polesMoved) this.rateData = this.plot ? rateTable(this.plot, this.poles) : [[]];
    if (changed.has('plot')) this.fieldData = this.plot ? solutionTable(this.plot) : [[]];
  }

  override render() {
    if (!this.plot) return nothing;
    const kinds = new Set(this.equilibria.map((e) => e.stability));
    return html`
      <figure>
        <div class="chart rate"></div>
        <ul class="key" aria-hidden="true">
          ${(['attractor', 'repeller', 'semi-stable'] as const).filter((k) => kinds.has(k)).map((k) => html`<li>${equilibriumKey(k)}${k}</li>`)}
          ${this.poles.length ? html`<li><svg width="12" height="14"><line x1="6" y1="0" x2="6" y2="14" stroke=${MUTED} stroke-width="1.5" stroke-dasharray="3 2"/></svg>pole</li>` : nothing}
          <li><svg width="16" height="10"><path d="M1 5h12M9 1l5 4-5 4" fill="none" stroke=${INK} stroke-width="1.5"/></svg>the way ${this.state} moves</li>
        </ul>
        <div class="chart field"></div>
        <p class="summary">${this.summary}</p>
        <chart-data .name=${this.summary || `the phase of ${this.state}`} .tables=${() => phaseTables(this.plot!, this.state, this.equilibria, this.fieldData)}></chart-data>
      </figure>`;
  }

  private specs(): ChartSpec[] {
    const p = this.plot;
    if (!p) return [];
    const rate = this.renderRoot.querySelector<HTMLElement>('.chart.rate')!;
    const field = this.renderRoot.querySelector<HTMLElement>('.chart.field')!;
    const units = [p.stateUnit, p.rateUnit, p.timeUnit, this.state];
    return [
      { target: rate, key: JSON.stringify(units), height: RATE_HEIGHT, options: () => this.rateOptions(), data: this.rateData, label: this.summary || `rate of ${this.state} against ${this.state}` },
      {
        target: field, key: JSON.stringify([...units, p.solutions.length]), height: FIELD_HEIGHT, options: () => this.fieldOptions(), data: this.fieldData,
        label: `${this.state} against time from ${p.solutions.length} starting values, over the direction field`,
      },
    ];
  }

  private rateOptions(): Omit<uPlot.Options, 'width' | 'height'> {
    const p = this.plot!;
    return {
      scales: {
        x: { time: false, range: (_u, min, max) => [min, max] },
        y: { range: (u, min, max) => this.rateRange(u, min, max) },
      },
      series: [
        { label: this.state, value: (_u, v) => (v == null ? '–' : `${fmt(v)} ${p.stateUnit}`) },
        { label: `d${this.state}/dt`, stroke: INK, width: 2, points: { show: false }, value: (_u, v) => (v == null ? '–' : `${fmt(v)} ${p.rateUnit}`) },
      ],
      axes: [xAxis(`${this.state} (${p.stateUnit})`), yAxis('y', `d${this.state}/dt (${p.rateUnit})`)],
      legend: { show: true, live: true },
      cursor: { points: { size: 7 }, drag: { x: false, y: false } },
      hooks: {
        drawAxes: [(u) => this.drawZeroAndPoles(u)],
        draw: [(u) => { this.drawEquilibria(u); drawPhaseLine(u, this); }],
      },
    };
  }

  /**
   * The rate axis always shows zero. Next to a pole the rate is unbounded, so there the axis
   * shows the bulk of the curve (up to twice the 90th percentile of |f|) and lets the spikes
   * leave the plot.
   */
  private rateRange(_u: uPlot, min: number | null, max: number | null): uPlot.Range.MinMax {
    let lo = Math.min(min ?? 0, 0);
    let hi = Math.max(max ?? 0, 0);
    if (this.poles.length) {
      const sizes = this.plot!.f.filter((v): v is number => v !== null).map(Math.abs).sort((a, b) => a - b);
      const cap = 2 * (sizes[Math.floor(0.9 * (sizes.length - 1))] ?? 0);
      if (cap > 0) { lo = Math.max(lo, -cap); hi = Math.min(hi, cap); }
    }
    if (lo === hi) { lo -= 1; hi += 1; }
    const pad = 0.08 * (hi - lo);
    return [lo - pad, hi + pad];
  }

  private drawZeroAndPoles(u: uPlot): void {
    const r = ratioOf(u);
    const { left, top, width, height } = u.bbox;
    const ctx = u.ctx;
    ctx.save();
    ctx.lineWidth = 1.25 * r;
    ctx.strokeStyle = ZERO_LINE;
    const y0 = u.valToPos(0, 'y', true);
    ctx.beginPath();
    ctx.moveTo(left, y0);
    ctx.lineTo(left + width, y0);
    ctx.stroke();
    ctx.strokeStyle = MUTED;
    ctx.setLineDash([5 * r, 4 * r]);
    for (const pole of this.poles) {
      const x = u.valToPos(pole.value, 'x', true);
      ctx.beginPath();
      ctx.moveTo(x, top);
      ctx.lineTo(x, top + height);
      ctx.stroke();
    }
    ctx.restore();
  }

  private drawEquilibria(u: uPlot): void {
    const r = ratioOf(u);
    const labels: PointLabel[] = [];
    const clear = [];
    for (const e of this.equilibria) {
      drawEquilibriumDot(u.ctx, u.valToPos(e.value, 'x', true), u.valToPos(0, 'y', true), 5.5 * r, r, e.stability, e.attractsFrom);
      const x = u.valToPos(e.value, 'x');
      const y = u.valToPos(0, 'y');
      labels.push({ x, y, text: `${e.stability}: ${fmt(e.value)} ${e.unit}`, kind: 'equilibrium' });
      clear.push(around(x, y, 7));
    }
    for (const pole of this.poles) {
      labels.push({ x: u.valToPos(pole.value, 'x'), y: 10, text: `pole: ${fmt(pole.value)} ${pole.unit}`, kind: 'pole' });
    }
    // a label keeps off the other equilibria before it keeps off the curve
    drawOverlay(u, labels, [], curveBoxes(u, [1]), clear);
  }

  private fieldOptions(): Omit<uPlot.Options, 'width' | 'height'> {
    const p = this.plot!;
    const ys = p.y.filter((v): v is number => v !== null);
    const yLo = ys[0];
    const yHi = ys[ys.length - 1];
    return {
      scales: {
        x: { time: false, range: (_u, min, max) => [min, max] },
        y: { range: () => [yLo, yHi] },
      },
      series: [
        { label: 'time' },
        ...p.solutions.map((s): uPlot.Series => ({
          label: s.start === null ? 'solution' : `from ${fmt(s.start)} ${p.stateUnit}`,
          stroke: STABLE, width: 1.75, points: { show: false }, spanGaps: false,
        })),
      ],
      axes: [xAxis(`time (${p.timeUnit})`), yAxis('y', `${this.state} (${p.stateUnit})`)],
      legend: { show: false },
      cursor: { show: false, drag: { x: false, y: false } },
      hooks: { drawAxes: [(u) => { if (this.plot) drawDirectionField(u, this.plot, this.equilibria); }] },
    };
  }


}

/** The rate curve as a table, with a gap at each pole so that no line joins its two sides. */
function rateTable(p: PhasePlotData, poles: readonly ShownQuantity[]): uPlot.AlignedData {
  const xs: number[] = [];
  const fs: Array<number | null> = [];
  p.y.forEach((y, i) => {
    if (y === null) return;
    const prev = xs[xs.length - 1];
    for (const pole of poles) if (prev !== undefined && prev < pole.value && pole.value < y) { xs.push(pole.value); fs.push(null); }
    xs.push(y);
    fs.push(p.f[i]);
  });
  return [xs, fs];
}

/** The solutions as one table over time (joined on their times when they differ). */
function solutionTable(p: PhasePlotData): uPlot.AlignedData {
  const sols = p.solutions;
  if (!sols.length) return [[]];
  const t0 = sols[0].t;
  const shared = sols.every((s) => s.t.length === t0.length && s.t.every((t, i) => t === t0[i]));
  if (shared) return [t0 as number[], ...sols.map((s) => s.y as Array<number | null>)];
  return uPlot.join(sols.map((s) => [s.t as number[], s.y as Array<number | null>]), sols.map(() => [0, 1]));
}

customElements.define('phase-plot', PhasePlot);

declare global {
  interface HTMLElementTagNameMap { 'phase-plot': PhasePlot }
}
