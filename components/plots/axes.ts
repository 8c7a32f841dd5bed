/**
 * Axis settings the plots share: our font and colours, and y axes as wide as their widest tick
 * label (uPlot's fixed default cuts long numbers such as 12 500 or 0.000 25).
 */
import uPlot from 'uplot';
import { AXIS_FONT, AXIS_LABEL_FONT, GRID, INK } from './palette.ts';

const TICK = 5;

/** Width for a y axis (or height for an x axis) that fits its tick labels. */
export function fitAxis(u: uPlot, values: string[] | null, axisIdx: number, cycleNum: number): number {
  const axis = u.axes[axisIdx];
  if (axis.side === 0 || axis.side === 2) return 20 + TICK;
  // After two layout passes keep the size, so that uPlot's convergence loop ends.
  if (cycleNum > 1) return (axis as unknown as { _size: number })._size;
  let widest = 0;
  u.ctx.save();
  u.ctx.font = AXIS_FONT;
  for (const v of values ?? []) widest = Math.max(widest, u.ctx.measureText(v).width);
  u.ctx.restore();
  return Math.ceil(widest + TICK + 10);
}

/**
 * Tick labels rounded to as many decimals as the tick step needs (0.25 → two), so that
 * neighbouring ticks never print alike and float noise never shows; very large or small
 * magnitudes in exponent form.
 */
export function tickLabels(splits: number[], step: number): string[] {
  const biggest = Math.max(0, ...splits.map((v) => Math.abs(v ?? 0)));
  if (biggest >= 1e7 || (biggest < 1e-3 && biggest > 0)) {
    // Exponent form, with the fewest mantissa digits that still tell the ticks apart.
    let d = 0;
    while (d < 6 && splits.some((v) => v != null && Math.abs(Number(v.toExponential(d)) - v) > 1e-6 * Math.abs(step))) d++;
    return splits.map((v) => (v == null ? '' : Math.abs(v) < step * 1e-9 ? '0' : v.toExponential(d)));
  }
  let decimals = 0;
  while (decimals < 12 && Math.abs(Math.round(step * 10 ** decimals) - step * 10 ** decimals) > 1e-6 * 10 ** decimals * Math.abs(step)) decimals++;
  // Trailing zeros dropped: 0.5, 1, 1.5 rather than 0.5, 1.0, 1.5.
  return splits.map((v) => (v == null ? '' : String(Number((Math.abs(v) < step * 1e-9 ? 0 : v).toFixed(decimals)))));
}

const values: uPlot.Axis.Values = (_u, splits, _axis, _space, step) => tickLabels(splits, step);

/** A bottom axis with a label. */
export function xAxis(label: uPlot.Axis.Label, extra: Partial<uPlot.Axis> = {}): uPlot.Axis {
  return {
    label, font: AXIS_FONT, labelFont: AXIS_LABEL_FONT, stroke: INK, size: fitAxis, labelSize: 22, space: 60, values,
    grid: { stroke: GRID, width: 1 }, ticks: { stroke: GRID, width: 1, size: TICK }, ...extra,
  };
}

/** A y axis on the left (side 3) or right (side 1), with a label, on `scale`. */
export function yAxis(scale: string, label: string, side: 1 | 3 = 3, extra: Partial<uPlot.Axis> = {}): uPlot.Axis {
  return {
    scale, side, label, font: AXIS_FONT, labelFont: AXIS_LABEL_FONT, stroke: INK, size: fitAxis, labelSize: 22, values,
    grid: { show: side === 3, stroke: GRID, width: 1 }, ticks: { stroke: GRID, width: 1, size: TICK }, ...extra,
  };
}

/**
 * Canvas pixels per CSS pixel: uPlot's own ratio (the device's), which it applies to every
 * chart; read from uPlot rather than the canvas, whose size is not yet set while the first
 * layout runs.
 */
export const ratioOf = (_u: uPlot): number => uPlot.pxRatio || devicePixelRatio || 1;
