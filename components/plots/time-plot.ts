/**
 * `<time-plot>`: a simulation's states against time, as the engine sampled them (see
 * src/simulate/plot-data.ts). Draws one y axis per distinct unit (two per chart; a third unit
 * starts another chart below), event times as vertical markers whose labels show on hover and
 * focus, levels as dashed lines, and the points the run found as labelled dots. A switch
 * relabels the time axis in another of the units the engine offers (`plot.timeUnits`, each with
 * its factor); the data are never converted. Optional measured
 * points are drawn as open dots over the state they measure. The state axes may be
 * logarithmic (`scale`, the host's; with `scaleToggle` a checkbox asks the host to change it by a
 * `plot-scale` event): values at or below zero are then left out of the drawing, and the plot
 * says so. A "Data table" disclosure shows every plotted value as tables (`<chart-data>`).
 * An optional `band` (a run's percentile curves from an uncertainty cell) is shaded behind the
 * curves (band-layer.ts) and listed in the tables.
 */
import { LitElement, html, nothing, type PropertyValues } from 'lit';
import uPlot from 'uplot';
import { formatNumber, type PlotScale, type SimulationPlot } from '../../src/index.ts';
import { ChartController, type ChartSpec } from './chart-controller.ts';
import { chartStyles } from './chart-styles.ts';
import { xAxis, yAxis, ratioOf, tickLabels } from './axes.ts';
import { axisNameOf, extentsByUnit, NO_EXTENT, type Extent, leftOffLog, logDrawn, logSplits, onLogAxis, panelsOf, timePlotTables, timeSplits, type MeasuredPoints, type Panel } from './time-plot-parts.ts';
import './data-table.ts';
import { GRID, seriesColour } from './palette.ts';
import { bandEdges, bandTables, drawBand, type PlotBand } from './band-layer.ts';
import { drawRunExtras } from './run-extras.ts';

export type { MeasuredPoints } from './time-plot-parts.ts';

/** Asks the host to draw the state axes on another scale (`detail.scale`); the plot itself does not change. */
export type PlotScaleEvent = CustomEvent<{ readonly scale: PlotScale }>;

const HEIGHT = 300;
const fmt = (v: number) => formatNumber(v, 6);

export class TimePlot extends LitElement {
  static override properties = {
    plot: { attribute: false },
    summary: {},
    points: { attribute: false },
    unit: {},
    scale: {},
    scaleToggle: { type: Boolean },
    floor: { type: Number },
    band: { attribute: false },
  };

  static override styles = chartStyles;

  /** What to draw, from a simulate cell's report (`plot`). */
  plot?: SimulationPlot;
  /** The cell's `summary`: shown under the chart and given to its canvas as its name. */
  summary = '';
  /** Measured points to draw over the curves. */
  points: readonly MeasuredPoints[] = [];
  /**
   * The unit the time axis is labelled in: one of the plot's `timeUnits` (the reader's pick from
   * the switch, or set by the host); the plot's own unit when empty or not among them.
   */
  unit = '';
  /** How the state axes are drawn: the host's choice (a simulate cell's `plotScale`). */
  scale: PlotScale = 'linear';
  /** Show the log-axis checkbox (the host stores the choice and passes it back as `scale`). */
  scaleToggle = false;

  /**
   * The least half-height of the y axes around zero, in the states' unit (a fit's
   * `residualFloor`): values smaller than it are drawn flat, not magnified. 0 for none.
   */
  floor = 0;

  /** A band to shade behind the curves (the 2.5 and 97.5 percentiles of each state), or none. */
  band?: PlotBand;

  private panels: Panel[] = [];
  /** Each panel's data as drawn: the plot's own, or on a log axis with the values it cannot place left out. */
  private drawn: uPlot.AlignedData[] = [];
  /** The extremes of the levels and measured points by unit, for the y ranges (made when first asked). */
  private extents?: Map<string, Extent>;
  private readonly chart = new ChartController(this, () => this.specs());

  /** The uPlot charts, one per panel (for tests and tools; read-only use). */
  get charts(): readonly uPlot[] {
    return this.chart.charts;
  }

  override willUpdate(changed: PropertyValues<this>): void {
    // Keep the reader's (or host's) unit across new data while it can be converted to.
    if (changed.has('plot') && this.plot && this.factorOf(this.unit) === undefined) this.unit = this.plot.timeUnit;
    // New arrays for new points too, so that the chart re-ranges its scales to show them.
    const before = changed.get('points') as readonly MeasuredPoints[] | undefined;
    const pointsMoved = changed.has('points') && (before?.length !== this.points.length || this.points.some((m, i) => m !== before[i]));
    if (changed.has('plot') || pointsMoved || changed.has('band')) {
      this.panels = this.plot ? panelsOf(this.plot) : [];
      this.extents = undefined;
    }
    if (changed.has('plot') || pointsMoved || changed.has('scale') || changed.has('band')) this.drawn = this.panels.map((panel) => (this.isLog ? logDrawn(panel.data) : panel.data));
  }

  override render() {
    const p = this.plot;
    if (!p) return nothing;
    const choices = this.choices.map((c) => c.unit);
    const log = this.isLog;
    const leftOff = log ? leftOffLog(p, this.points) : [];
    return html`
      <figure>
        ${choices.length > 1 || this.scaleToggle ? html`
          <div class="controls">
            ${this.scaleToggle ? html`<label><input type="checkbox" class="log-toggle" data-field="plotScale" .checked=${log}
              @change=${(e: Event) => this.askScale((e.target as HTMLInputElement).checked ? 'log' : 'linear', e.target as HTMLInputElement)} /> log scale</label>` : nothing}
            ${choices.length > 1 ? html`<label>time in
              <select aria-label="time unit" @change=${(e: Event) => { this.unit = (e.target as HTMLSelectElement).value; }}>
                ${choices.map((u) => html`<option value=${u} ?selected=${u === this.shownUnit}>${u}</option>`)}
              </select>
            </label>` : nothing}
          </div>` : nothing}
        ${leftOff.map((text) => html`<p class="notes log-note">${text} The data table lists every value.</p>`)}
        ${this.panels.map((_, i) => html`<div class="chart" data-panel=${i}></div>`)}
        ${this.points.length || this.band ? html`<ul class="key">${this.points.length ? html`<li>${dot()} measured</li>` : nothing}${this.band ? html`<li class="band-key">${swatch()} 2.5–97.5 percentile band</li>` : nothing}</ul>` : nothing}
        <p class="summary">${this.summary}</p>
        <chart-data .name=${this.summary || 'the chart'} .tables=${() => [...timePlotTables(p, this.panels, this.points, this.factor, this.shownUnit), ...bandTables(this.band, this.factor, this.shownUnit)]}></chart-data>
      </figure>`;
  }

  private get isLog(): boolean {
    return this.scale === 'log';
  }

  /** Asks the host for another scale; the box shows the host's choice until it answers. */
  private askScale(scale: PlotScale, box: HTMLInputElement): void {
    box.checked = this.isLog;
    this.dispatchEvent(new CustomEvent('plot-scale', { detail: { scale }, bubbles: true, composed: true }));
  }

  private specs(): ChartSpec[] {
    const p = this.plot;
    if (!p) return [];
    const targets = this.renderRoot.querySelectorAll<HTMLElement>('.chart');
    return this.panels.map((panel, i) => ({
      target: targets[i],
      key: JSON.stringify([panel.units, panel.states.map((s) => p.states[s].name), this.scale, !!this.band]),
      height: HEIGHT,
      options: () => this.options(i),
      data: this.drawn[i],
      label: this.summary || `${panel.states.map((s) => p.states[s].name).join(', ')} against time`,
    }));
  }

  /** The engine's units for the time axis; the plot's own alone when it offers none. */
  private get choices(): ReadonlyArray<{ readonly unit: string; readonly factor: number }> {
    return this.plot?.timeUnits?.length ? this.plot.timeUnits : this.plot ? [{ unit: this.plot.timeUnit, factor: 1 }] : [];
  }

  /** The engine's factor from the plot's unit to `unit`; undefined when it does not offer that unit. */
  private factorOf(unit: string): number | undefined {
    return this.choices.find((c) => c.unit === unit)?.factor;
  }

  /** Multiply a time in the plot's unit by this to read it in the chosen unit. */
  private get factor(): number {
    return this.factorOf(this.unit) ?? 1;
  }

  private get shownUnit(): string {
    return this.factorOf(this.unit) !== undefined ? this.unit : this.plot?.timeUnit ?? '';
  }

  private options(panelIndex: number): Omit<uPlot.Options, 'width' | 'height'> {
    const p = this.plot!;
    const panel = this.panels[panelIndex];
    const logTicks: Partial<uPlot.Axis> = this.isLog ? {
      values: (_u, splits) => splits.map((v) => (v == null ? '' : formatNumber(v, 3))),
      filter: logSplits, grid: { show: true, stroke: GRID, width: 1, filter: logSplits }, ticks: { stroke: GRID, width: 1, size: 5, filter: logSplits },
    } : {};
    const scaleOf = (s: number) => `y${panel.units.indexOf(p.states[s].unit)}`;
    // a compare cell's curves are named by scenario; its axes name the states they show
    const axisLabel = (u: string) => `${[...new Set(panel.states.filter((s) => p.states[s].unit === u).map((s) => axisNameOf(p, s)))].join(', ')}${u ? ` (${u})` : ''}`; // a state without a unit: its name alone
    return {
      scales: Object.fromEntries([
        ['x', { time: false }],
        ...panel.units.map((unit, j) => [`y${j}`, this.isLog
          ? { distr: 3, log: 10, range: (_u: uPlot, min: number, max: number) => this.stateRange(unit, min, max) }
          : { range: (_u: uPlot, min: number, max: number) => this.stateRange(unit, min, max) }]),
      ]),
      series: [
        { label: 'time', value: (_u, v) => (v == null ? '–' : `${fmt(v * this.factor)} ${this.shownUnit}`) },
        ...panel.states.map((s): uPlot.Series => ({
          label: p.states[s].name,
          scale: scaleOf(s),
          stroke: seriesColour(s),
          width: 2,
          points: { show: false },
          value: (_u, v) => (v == null ? '–' : `${fmt(v)} ${p.states[s].unit}`),
        })),
      ],
      axes: [
        xAxis(() => `time (${this.shownUnit})`, {
          splits: (u, _axis, min, max) => timeSplits(min, max, this.factor, u.bbox.width / ratioOf(u)),
          values: (_u, splits) => tickLabels(splits.map((v) => v * this.factor), splits.length > 1 ? (splits[1] - splits[0]) * this.factor : 1),
        }),
        yAxis('y0', axisLabel(panel.units[0]), 3, logTicks),
        ...(panel.units[1] ? [yAxis('y1', axisLabel(panel.units[1]), 1, this.isLog ? { ...logTicks, grid: { show: false } } : {})] : []),
      ],
      legend: { show: true, live: true },
      cursor: { points: { size: 7 } },
      hooks: { drawAxes: [(u) => this.drawBandOf(u, panelIndex)], draw: [(u) => this.drawExtras(u, panelIndex)] },
    };
  }

  /** A y scale's range: the curves' and also every level and measured point on it, padded. */
  private stateRange(unit: string, min: number | null, max: number | null): uPlot.Range.MinMax {
    // the levels' and points' extremes, found once per data (a chart asks on every redraw)
    const extra = (this.extents ??= extentsByUnit(this.plot!, [...this.points, ...bandEdges(this.band)])).get(unit) ?? NO_EXTENT;
    if (this.isLog) {
      // only what the axis can place; the data arrive with the rest already left out
      const lo = Math.min(onLogAxis(min) ? min : Infinity, extra.logLo);
      const hi = Math.max(onLogAxis(max) ? max : -Infinity, extra.logHi);
      return Number.isFinite(lo) && Number.isFinite(hi) ? uPlot.rangeLog(lo, hi, 10, true) : [1, 10];
    }
    const lo = Math.min(min ?? Infinity, extra.lo, this.floor > 0 ? -this.floor : Infinity);
    const hi = Math.max(max ?? -Infinity, extra.hi, this.floor > 0 ? this.floor : -Infinity);
    return Number.isFinite(lo) && Number.isFinite(hi) ? uPlot.rangeNum(lo, hi, 0.1, true) : [0, 1];
  }

  /** The band, drawn after the axes and before the curves. */
  private drawBandOf(u: uPlot, panelIndex: number): void {
    const p = this.plot;
    if (!p || !this.band) return;
    const panel = this.panels[panelIndex];
    drawBand(u, this.band, panel.states.map((s) => ({ name: p.states[s].name, colour: s, scale: `y${panel.units.indexOf(p.states[s].unit)}` })), this.isLog);
  }

  /** Events, levels, found points and measured points, drawn after the curves (run-extras.ts). */
  private drawExtras(u: uPlot, panelIndex: number): void {
    if (!this.plot) return;
    drawRunExtras(u, { plot: this.plot, panel: this.panels[panelIndex], isLog: this.isLog, points: this.points, factor: this.factor, shownUnit: this.shownUnit });
  }

}

const swatch = () => html`<svg width="16" height="10" aria-hidden="true"><rect x="0" y="1" width="16" height="8" fill="#1b6a8a" fill-opacity="0.2" stroke="#1b6a8a" stroke-opacity="0.45"/></svg>`;

const dot = () => html`<svg width="10" height="10" aria-hidden="true"><circle cx="5" cy="5" r="3.5" fill="#fff" stroke="#1d2630" stroke-width="1.5"/></svg>`;

customElements.define('time-plot', TimePlot);

declare global {
  interface HTMLElementTagNameMap { 'time-plot': TimePlot }
}
