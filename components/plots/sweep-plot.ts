/**
 * `<sweep-plot>`: the equilibria of a phase cell's sweep against the swept parameter. Each
 * branch is split into runs where its stability changes: attractors solid, the rest dashed;
 * the folds, where two equilibria meet and vanish, are marked and labelled. A "Data table"
 * disclosure lists every equilibrium and fold (`<chart-data>`).
 */
import { LitElement, html, nothing, type PropertyValues } from 'lit';
import uPlot from 'uplot';
import { formatNumber, unitAfterNumber } from '../../src/index.ts';
import { ChartController, type ChartSpec } from './chart-controller.ts';
import { chartStyles } from './chart-styles.ts';
import { xAxis, yAxis, ratioOf } from './axes.ts';
import { drawOverlay, around, curveBoxes, type PointLabel } from './overlay.ts';
import { FOLD, STABLE, UNSTABLE } from './palette.ts';
import { foldMark, runsOf, SWEEP_KEY, type Run, type SweepData } from './sweep-runs.ts';
import { sweepTables } from './plot-tables.ts';
import './data-table.ts';

const HEIGHT = 300;
const fmt = (v: number) => formatNumber(v, 4);

export class SweepPlot extends LitElement {
  static override properties = { sweep: { attribute: false }, state: {} };
  static override styles = chartStyles;

  /** The phase cell's `sweep`. */
  sweep?: SweepData;
  /** The state's name, for the axis label (the sweep does not carry it). */
  state = 'equilibrium';

  private runs: Run[] = [];
  private data: uPlot.AlignedData = [[]];
  private readonly chart = new ChartController(this, () => this.specs());

  /** The uPlot chart (for tests and tools). */
  get charts(): readonly uPlot[] {
    return this.chart.charts;
  }

  override willUpdate(changed: PropertyValues<this>): void {
    if (changed.has('sweep')) {
      this.runs = this.sweep ? runsOf(this.sweep) : [];
      this.data = this.runs.length ? uPlot.join(this.runs.map((r) => [r.x, r.y])) : [[]];
    }
  }

  override render() {
    const s = this.sweep;
    if (!s) return nothing;
    return html`
      <figure>
        <div class="chart"></div>
        <ul class="key" aria-hidden="true">
          <li><svg width="26" height="8"><line x1="1" y1="4" x2="25" y2="4" stroke=${STABLE} stroke-width="2.5"/></svg>${SWEEP_KEY.stable}</li>
          <li><svg width="26" height="8"><line x1="1" y1="4" x2="25" y2="4" stroke=${UNSTABLE} stroke-width="2.5" stroke-dasharray="7 4"/></svg>${SWEEP_KEY.unstable}</li>
          ${s.folds.length ? html`<li class="fold"><svg width="12" height="12">${foldMark(6, 6, 5)}</svg>${SWEEP_KEY.fold}</li>` : nothing}
        </ul>
        <p class="summary">${s.summary ?? ''}</p>
        <chart-data .name=${s.summary || `the equilibria of ${this.state}`} .tables=${() => sweepTables(s, this.state)}></chart-data>
        ${[...(s.warnings ?? []), ...(s.incomplete ? [s.incomplete] : [])].map((w) => html`<p class="notes">${w}</p>`)}
      </figure>`;
  }

  private specs(): ChartSpec[] {
    const s = this.sweep;
    if (!s || !this.runs.length) return [];
    return [{
      target: this.renderRoot.querySelector<HTMLElement>('.chart')!,
      key: JSON.stringify([this.runs.map((r) => `${r.branch}${r.stable}`), s.parameter, this.units(), this.state]),
      height: HEIGHT,
      options: () => this.options(),
      data: this.data,
      label: s.summary || `equilibria of ${this.state} against ${s.parameter}`,
    }];
  }

  private units(): [string, string] {
    const first = this.sweep?.branches.find((b) => b.length)?.[0];
    return [first?.parameter.unit ?? '', first?.value.unit ?? ''];
  }

  private options(): Omit<uPlot.Options, 'width' | 'height'> {
    const s = this.sweep!;
    const [pUnit, yUnit] = this.units();
    return {
      scales: {
        x: {
          time: false,
          range: (_u, min, max) => (s.range
            ? [Math.min(s.range[0].value, s.range[1].value), Math.max(s.range[0].value, s.range[1].value)]
            : [min, max]),
        },
        y: {},
      },
      series: [
        { label: s.parameter, value: (_u, v) => (v == null ? '–' : `${fmt(v)} ${pUnit}`) },
        ...this.runs.map((r): uPlot.Series => ({
          label: `branch ${r.branch + 1}, ${r.stable ? 'stable' : 'unstable'}`,
          stroke: r.stable ? STABLE : UNSTABLE,
          width: 2.25,
          dash: r.stable ? undefined : [8, 5],
          points: { show: false },
          value: (_u, v) => (v == null ? '–' : `${fmt(v)} ${yUnit}`),
        })),
      ],
      axes: [xAxis(`${s.parameter} (${pUnit})`), yAxis('y', `${this.state} (${yUnit})`)],
      legend: { show: false },
      cursor: { points: { show: false }, drag: { x: false, y: false } },
      hooks: { draw: [(u) => this.drawFolds(u)] },
    };
  }

  private drawFolds(u: uPlot): void {
    const s = this.sweep;
    if (!s) return;
    const r = ratioOf(u);
    const ctx = u.ctx;
    const labels: PointLabel[] = [];
    const clear = [];
    ctx.save();
    ctx.fillStyle = FOLD;
    ctx.strokeStyle = '#fff';
    ctx.lineWidth = 1.5 * r;
    const d = 6 * r;
    for (const f of s.folds) {
      const x = u.valToPos(f.parameter.value, 'x', true);
      const y = u.valToPos(f.value.value, 'y', true);
      ctx.beginPath();
      ctx.moveTo(x, y - d); ctx.lineTo(x + d, y); ctx.lineTo(x, y + d); ctx.lineTo(x - d, y);
      ctx.closePath();
      ctx.fill();
      ctx.stroke();
      const cx = u.valToPos(f.parameter.value, 'x');
      const cy = u.valToPos(f.value.value, 'y');
      labels.push({ x: cx, y: cy, text: `fold: ${s.parameter} = ${fmt(f.parameter.value)} ${unitAfterNumber(f.parameter.unit)}`, kind: 'fold' });
      clear.push(around(cx, cy, 7));
    }
    ctx.restore();
    // a label keeps off the other folds before it keeps off the branches
    drawOverlay(u, labels, [], curveBoxes(u, this.runs.map((_, i) => i + 1)), clear);
  }
}

customElements.define('sweep-plot', SweepPlot);

declare global {
  interface HTMLElementTagNameMap { 'sweep-plot': SweepPlot }
}
