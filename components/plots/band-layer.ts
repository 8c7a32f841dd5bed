/**
 * The band around a run's curves on `<time-plot>`: the area between each state's 2.5 and 97.5
 * percentile curves (an uncertainty cell's `bands`, engine/report.ts), shaded in the state's
 * colour behind its curve. Draws what it is given; on a log axis a stretch where a percentile is
 * at or below zero is left out.
 */
import type uPlot from 'uplot';
import { formatNumber, type UncertaintyBand } from '../../src/index.ts';
import type { DataTable } from './data-table.ts';
import { ratioOf } from './axes.ts';
import { seriesColour } from './palette.ts';
import type { MeasuredPoints } from './time-plot-parts.ts';

/** A band's curves as the plot reads them. */
export type PlotBand = Pick<Required<UncertaintyBand>, 't' | 'states'>;

/** The band's edges as point sets, so the y ranges take them in as they take measured points. */
export function bandEdges(band: PlotBand | undefined): MeasuredPoints[] {
  return (band?.states ?? []).flatMap((s) => [{ state: s.name, t: band!.t, values: s.p025 }, { state: s.name, t: band!.t, values: s.p975 }]);
}

/**
 * Shades the band of each state drawn on this chart (`states`: its name, its series colour
 * index, its y scale), inside the plot area, before the curves are drawn.
 */
export function drawBand(u: uPlot, band: PlotBand, states: ReadonlyArray<{ name: string; colour: number; scale: string }>, log: boolean): void {
  const { left, top, width, height } = u.bbox;
  const ctx = u.ctx;
  ctx.save();
  ctx.beginPath();
  ctx.rect(left, top, width, height);
  ctx.clip();
  const placeable = (v: number) => Number.isFinite(v) && (!log || v > 0);
  for (const s of states) {
    const b = band.states.find((x) => x.name === s.name);
    if (!b) continue;
    ctx.fillStyle = seriesColour(s.colour);
    ctx.globalAlpha = 0.2;
    ctx.strokeStyle = seriesColour(s.colour);
    // one closed shape per stretch the axis can place: along the lower edge, back along the upper
    let from = 0;
    while (from < band.t.length) {
      while (from < band.t.length && !(placeable(b.p025[from]) && placeable(b.p975[from]))) from++;
      let to = from;
      while (to < band.t.length && placeable(b.p025[to]) && placeable(b.p975[to])) to++;
      if (to - from > 1) {
        ctx.beginPath();
        for (let i = from; i < to; i++) ctx.lineTo(u.valToPos(band.t[i], 'x', true), u.valToPos(b.p025[i], s.scale, true));
        for (let i = to - 1; i >= from; i--) ctx.lineTo(u.valToPos(band.t[i], 'x', true), u.valToPos(b.p975[i], s.scale, true));
        ctx.closePath();
        ctx.fill();
        ctx.globalAlpha = 0.45;
        ctx.lineWidth = ratioOf(u);
        ctx.stroke();
        ctx.globalAlpha = 0.2;
      }
      from = to;
    }
  }
  ctx.restore();
}

/** The band as tables for the chart's "Data table": per state, time and its three percentile curves. */
export function bandTables(band: PlotBand | undefined, factor: number, unit: string): DataTable[] {
  if (!band) return [];
  const fmt = (v: number) => (Number.isFinite(v) ? formatNumber(v, 6) : '–');
  return band.states.map((s) => ({
    caption: `${s.name}: 2.5th percentile, median and 97.5th percentile of the samples`,
    columns: [`time (${unit})`, `2.5% (${s.unit})`, `median (${s.unit})`, `97.5% (${s.unit})`],
    rows: band.t.map((t, i) => [fmt(t * factor), fmt(s.p025[i]), fmt(s.median[i]), fmt(s.p975[i])]),
  }));
}
