/**
 * `<time-plot>`: a simulation's states against time, as the engine sampled them (see
 * src/simulate/plot-data.ts). Draws one y axis per distinct unit (two per chart; a third unit
 * starts another chart below), event times as vertical markers whose labels show on hover and
 * focus, levels as dashed lines, and the points the run found as labelled dots. A switch
 * relabels the time axis in another of the units the engine offers (`plot.timeUnits`, each with
 * its factor); the data are never converted. Optional measured
 * points are drawn as open dots over the state they measure.
 */
import { LitElement, html, nothing, type PropertyValues } from 'lit';
import uPlot from 'uplot';
import { formatNumber, type SimulationPlot } from '../../src/index.ts';
import { ChartController, type ChartSpec } from './chart-controller.ts';
import { chartStyles } from './chart-styles.ts';
import { xAxis, yAxis, ratioOf, tickLabels } from './axes.ts';
import { drawOverlay, around, curveBoxes, type PointLabel, type EventMarker } from './overlay.ts';
import { EVENT_LINE, seriesColour } from './palette.ts';

/** Measured values of one state, times in the plot's time unit and values in the state's unit. */
export interface MeasuredPoints {
  readonly state: string;
  readonly t: readonly number[];
  readonly values: readonly number[];
}

/** States that share a chart: at most two units, one y axis each. */
interface Panel {
  readonly units: string[];
  /** Indices into plot.states. */
  readonly states: number[];
  readonly data: uPlot.AlignedData;
}

const HEIGHT = 300;
/** Tick steps offered to the time axis, in the unit it is shown in. */
const NICE_STEPS = [-6, -5, -4, -3, -2, -1, 0, 1, 2, 3, 4, 5, 6, 7, 8, 9].flatMap((e) => [1, 2, 2.5, 5].map((m) => m * 10 ** e));
const fmt = (v: number) => formatNumber(v, 6);
/** Least distance between time ticks, CSS pixels. */
const TICK_SPACE = 60;

export class TimePlot extends LitElement {
  static override properties = {
    plot: { attribute: false },
    summary: {},
    points: { attribute: false },
    unit: {},
    floor: { type: Number },
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
  /**
   * The least half-height of the y axes around zero, in the states' unit (a fit's
   * `residualFloor`): values smaller than it are drawn flat, not magnified. 0 for none.
   */
  floor = 0;

  private panels: Panel[] = [];
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
    if (changed.has('plot') || pointsMoved) this.panels = this.plot ? panelsOf(this.plot) : [];
  }

  override render() {
    const p = this.plot;
    if (!p) return nothing;
    const choices = this.choices.map((c) => c.unit);
    return html`
      <figure>
        ${choices.length > 1 ? html`
          <div class="controls">
            <label>time in
              <select aria-label="time unit" @change=${(e: Event) => { this.unit = (e.target as HTMLSelectElement).value; }}>
                ${choices.map((u) => html`<option value=${u} ?selected=${u === this.shownUnit}>${u}</option>`)}
              </select>
            </label>
          </div>` : nothing}
        ${this.panels.map((_, i) => html`<div class="chart" data-panel=${i}></div>`)}
        ${this.points.length ? html`<ul class="key"><li>${dot()} measured</li></ul>` : nothing}
        <p class="summary">${this.summary}</p>
      </figure>`;
  }

  private specs(): ChartSpec[] {
    const p = this.plot;
    if (!p) return [];
    const targets = this.renderRoot.querySelectorAll<HTMLElement>('.chart');
    return this.panels.map((panel, i) => ({
      target: targets[i],
      key: JSON.stringify([panel.units, panel.states.map((s) => p.states[s].name)]),
      height: HEIGHT,
      options: () => this.options(i),
      data: panel.data,
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
    const scaleOf = (s: number) => `y${panel.units.indexOf(p.states[s].unit)}`;
    const axisLabel = (u: string) => `${panel.states.filter((s) => p.states[s].unit === u).map((s) => p.states[s].name).join(', ')} (${u})`;
    return {
      scales: Object.fromEntries([
        ['x', { time: false }],
        ...panel.units.map((unit, j) => [`y${j}`, { range: (_u: uPlot, min: number, max: number) => this.stateRange(unit, min, max) }]),
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
        yAxis('y0', axisLabel(panel.units[0]), 3),
        ...(panel.units[1] ? [yAxis('y1', axisLabel(panel.units[1]), 1)] : []),
      ],
      legend: { show: true, live: true },
      cursor: { points: { size: 7 } },
      hooks: { draw: [(u) => this.drawExtras(u, panelIndex)] },
    };
  }

  /** A y scale's range: the curves' and also every level and measured point on it, padded. */
  private stateRange(unit: string, min: number | null, max: number | null): uPlot.Range.MinMax {
    const p = this.plot!;
    const mine = (state: string) => p.states.find((s) => s.name === state)?.unit === unit;
    const extra = [...p.levels.filter((l) => mine(l.state)).map((l) => l.value), ...this.points.filter((m) => mine(m.state)).flatMap((m) => m.values)];
    const lo = Math.min(min ?? Infinity, ...extra, ...(this.floor > 0 ? [-this.floor] : []));
    const hi = Math.max(max ?? -Infinity, ...extra, ...(this.floor > 0 ? [this.floor] : []));
    return Number.isFinite(lo) && Number.isFinite(hi) ? uPlot.rangeNum(lo, hi, 0.1, true) : [0, 1];
  }

  /** Events, levels, found points and measured points, drawn after the curves. */
  private drawExtras(u: uPlot, panelIndex: number): void {
    const p = this.plot;
    if (!p) return;
    const panel = this.panels[panelIndex];
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
    for (const l of p.levels.filter((l) => inPanel(l.state))) {
      const y = u.valToPos(l.value, scaleOf(l.state), true);
      ctx.strokeStyle = seriesColour(stateIndex(l.state));
      ctx.beginPath();
      ctx.moveTo(left, y);
      ctx.lineTo(left + width, y);
      ctx.stroke();
    }
    ctx.setLineDash([]);

    for (const m of this.points.filter((m) => inPanel(m.state))) {
      ctx.strokeStyle = seriesColour(stateIndex(m.state));
      ctx.fillStyle = '#fff';
      ctx.lineWidth = 1.5 * r;
      m.t.forEach((t, i) => {
        ctx.beginPath();
        ctx.arc(u.valToPos(t, 'x', true), u.valToPos(m.values[i], scaleOf(m.state), true), 3.5 * r, 0, 2 * Math.PI);
        ctx.fill();
        ctx.stroke();
      });
    }

    const marks = p.marks.filter((m) => inPanel(m.state));
    for (const m of marks) {
      ctx.beginPath();
      ctx.arc(u.valToPos(m.time, 'x', true), u.valToPos(m.value, scaleOf(m.state), true), 4.5 * r, 0, 2 * Math.PI);
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
    const clear = [];
    for (const m of marks) {
      const x = u.valToPos(m.time, 'x');
      const y = u.valToPos(m.value, scaleOf(m.state));
      if (!inside(x, y)) continue;
      labels.push({ x, y, text: m.label, kind: 'mark' });
      clear.push(around(x, y));
    }
    for (const m of this.points.filter((m) => inPanel(m.state))) {
      m.t.forEach((t, i) => clear.push(around(u.valToPos(t, 'x'), u.valToPos(m.values[i], scaleOf(m.state)), 4)));
    }
    for (const l of p.levels.filter((l) => inPanel(l.state))) {
      const y = u.valToPos(l.value, scaleOf(l.state));
      if (inside(cssW, y)) labels.push({ x: cssW - 2, y, text: l.label, kind: 'level', along: [0.75, 0.5, 0.25].map((f) => f * cssW) });
    }
    const events: EventMarker[] = times
      .map((ev) => ({ x: u.valToPos(ev.time, 'x'), text: `${ev.labels.join('; ')} at ${fmt(ev.time * this.factor)} ${this.shownUnit}` }))
      .filter((ev) => ev.x >= 0 && ev.x <= cssW);
    drawOverlay(u, labels, events, [...clear, ...curveBoxes(u, panel.states.map((_, j) => j + 1))]);
  }
}

/**
 * Ticks for the time axis at round numbers of the unit it is shown in (`factor` of them per
 * data unit), at least TICK_SPACE pixels apart over `width` pixels; returned in data units.
 */
function timeSplits(min: number, max: number, factor: number, width: number): number[] {
  const lo = min * factor;
  const hi = max * factor;
  if (!(hi > lo) || !(width > 0)) return [min];
  const step = NICE_STEPS.find((s) => (s / (hi - lo)) * width >= TICK_SPACE) ?? hi - lo;
  const first = Math.ceil(lo / step - 1e-9);
  const out: number[] = [];
  for (let i = first; i * step <= hi + 1e-9 * step; i++) out.push((i * step) / factor);
  return out;
}

/** Events grouped by time (two actions at one time get one marker). */
function eventTimes(p: SimulationPlot): Array<{ time: number; labels: string[] }> {
  const out: Array<{ time: number; labels: string[] }> = [];
  for (const e of p.events) {
    const same = out.find((o) => o.time === e.time);
    if (same) {
      if (!same.labels.includes(e.label)) same.labels.push(e.label);
    } else out.push({ time: e.time, labels: [e.label] });
  }
  return out;
}

/** Groups the states by unit, two units to a chart, in the order the states come. */
function panelsOf(p: SimulationPlot): Panel[] {
  const units = [...new Set(p.states.map((s) => s.unit))];
  const panels: Panel[] = [];
  for (let i = 0; i < units.length; i += 2) {
    const mine = units.slice(i, i + 2);
    const states = p.states.flatMap((s, j) => (mine.includes(s.unit) ? [j] : []));
    panels.push({ units: mine, states, data: [p.t, ...states.map((s) => p.states[s].values)] as uPlot.AlignedData });
  }
  return panels;
}

const dot = () => html`<svg width="10" height="10" aria-hidden="true"><circle cx="5" cy="5" r="3.5" fill="#fff" stroke="#1d2630" stroke-width="1.5"/></svg>`;

customElements.define('time-plot', TimePlot);

declare global {
  interface HTMLElementTagNameMap { 'time-plot': TimePlot }
}
