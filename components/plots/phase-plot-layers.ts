/**
 * The two drawings of `<phase-plot>` that are not uPlot series: the phase line under the rate
 * chart (the state's range with arrows showing which way the state moves on each interval,
 * poles dashed, equilibria marked by stability) and the direction field behind the solutions
 * (slope marks taken from the sampled rate).
 */
import type uPlot from 'uplot';
import { ratioOf } from './axes.ts';
import { FIELD_MARK, INK, MUTED, STABLE, UNSTABLE } from './palette.ts';
import { drawEquilibriumDot } from './equilibrium-dot.ts';
import type { PhaseEquilibrium, PhaseInterval, PhasePlotData, ShownQuantity } from './phase-plot.ts';

/** What the phase line shows. */
export interface PhaseLineView {
  readonly state: string;
  readonly intervals: readonly PhaseInterval[];
  readonly poles: readonly ShownQuantity[];
  readonly equilibria: readonly PhaseEquilibrium[];
}

const STRIP_HEIGHT = 44;
/** Spacing of the direction field's slope marks, CSS pixels. */
const FIELD_STEP_X = 34;
const FIELD_STEP_Y = 24;
/** Half the length of a slope mark, CSS pixels. */
const FIELD_HALF = 7;
/** Space between arrows on a long interval of the phase line, CSS pixels. */
const ARROW_EVERY = 160;

/** The phase line, drawn under the rate chart with the same horizontal scale. */
export function drawPhaseLine(u: uPlot, line: PhaseLineView): void {
  // Inside the chart's own root, right under the plot and above the legend; goes with the chart.
  let canvas = u.root.querySelector<HTMLCanvasElement>('canvas.strip');
  if (!canvas) {
    canvas = document.createElement('canvas');
    canvas.className = 'strip';
    canvas.setAttribute('aria-hidden', 'true');
    u.root.querySelector('.u-wrap')!.after(canvas);
  }
  const r = ratioOf(u);
  canvas.style.width = `${u.width}px`;
  canvas.style.height = `${STRIP_HEIGHT}px`;
  canvas.width = Math.round(u.width * r);
  canvas.height = Math.round(STRIP_HEIGHT * r);
  const ctx = canvas.getContext('2d')!;
  ctx.clearRect(0, 0, canvas.width, canvas.height);
  const left = u.bbox.left;
  const right = u.bbox.left + u.bbox.width;
  const x = (v: number) => left + u.valToPos(v, 'x', true) - u.bbox.left;
  const mid = Math.round(STRIP_HEIGHT * r * 0.45);
  const xs = u.scales.x;
  const lo = xs.min ?? 0;
  const hi = xs.max ?? 1;

  ctx.strokeStyle = INK;
  ctx.fillStyle = INK;
  ctx.lineWidth = 1.5 * r;
  ctx.beginPath();
  ctx.moveTo(left, mid);
  ctx.lineTo(right, mid);
  ctx.stroke();
  for (const iv of line.intervals) {
    const a = Math.max(x(iv.from?.value ?? lo), left);
    const b = Math.min(x(iv.to?.value ?? hi), right);
    if (iv.sign === 'none') {
      ctx.save();
      ctx.strokeStyle = '#fff';
      ctx.lineWidth = 4 * r;
      ctx.beginPath(); ctx.moveTo(a, mid); ctx.lineTo(b, mid); ctx.stroke();
      ctx.strokeStyle = MUTED;
      ctx.lineWidth = 1.5 * r;
      ctx.setLineDash([2 * r, 3 * r]);
      ctx.beginPath(); ctx.moveTo(a, mid); ctx.lineTo(b, mid); ctx.stroke();
      ctx.restore();
      continue;
    }
    if (iv.sign === '0') {
      ctx.save();
      ctx.lineWidth = 5 * r;
      ctx.strokeStyle = STABLE;
      ctx.beginPath(); ctx.moveTo(a, mid); ctx.lineTo(b, mid); ctx.stroke();
      ctx.restore();
      continue;
    }
    const dir = iv.sign === '+' ? 1 : iv.sign === '-' ? -1 : 0;
    const span = b - a;
    if (!dir || span < 16 * r) continue;
    const n = Math.max(1, Math.floor(span / (ARROW_EVERY * r)));
    for (let k = 0; k < n; k++) arrowHead(ctx, Math.round(a + (span * (k + 0.5)) / n), mid, dir, r);
  }
  ctx.strokeStyle = MUTED;
  ctx.lineWidth = 1.25 * r;
  ctx.setLineDash([3 * r, 2 * r]);
  for (const pole of line.poles) {
    const px = x(pole.value);
    ctx.beginPath(); ctx.moveTo(px, mid - 10 * r); ctx.lineTo(px, mid + 10 * r); ctx.stroke();
  }
  ctx.setLineDash([]);
  for (const e of line.equilibria) drawEquilibriumDot(ctx, x(e.value), mid, 5.5 * r, r, e.stability, e.attractsFrom);
  ctx.fillStyle = MUTED;
  ctx.font = `${11 * r}px system-ui, sans-serif`;
  ctx.textBaseline = 'top';
  ctx.textAlign = 'left';
  ctx.fillText(`phase line of ${line.state}`, left, mid + 9 * r);
}

/**
 * Slope marks on a grid: at each row the rate is the sampled f nearest that state value (the
 * same along the row, since the law does not change with time); the mark points along
 * (1, f) in data units, scaled to pixels. Equilibria are drawn as the constant solutions.
 */
export function drawDirectionField(u: uPlot, p: PhasePlotData, equilibria: readonly PhaseEquilibrium[]): void {
  const r = ratioOf(u);
  const { left, top, width, height } = u.bbox;
  const ctx = u.ctx;
  const pxPerT = u.valToPos(1, 'x', true) - u.valToPos(0, 'x', true);
  const pxPerY = u.valToPos(0, 'y', true) - u.valToPos(1, 'y', true);
  ctx.save();
  ctx.beginPath();
  ctx.rect(left, top, width, height);
  ctx.clip();
  ctx.lineWidth = 1.25 * r;
  for (const e of equilibria) {
    const y = u.valToPos(e.value, 'y', true);
    ctx.strokeStyle = e.stability === 'attractor' ? STABLE : UNSTABLE;
    ctx.setLineDash(e.stability === 'attractor' ? [] : [6 * r, 4 * r]);
    ctx.globalAlpha = 0.6;
    ctx.beginPath(); ctx.moveTo(left, y); ctx.lineTo(left + width, y); ctx.stroke();
  }
  ctx.globalAlpha = 1;
  ctx.setLineDash([]);
  ctx.strokeStyle = FIELD_MARK;
  ctx.lineWidth = 1.2 * r;
  ctx.lineCap = 'round';
  const half = FIELD_HALF * r;
  const cols = Math.max(1, Math.floor(width / (FIELD_STEP_X * r)));
  const rows = Math.max(1, Math.floor(height / (FIELD_STEP_Y * r)));
  ctx.beginPath();
  for (let j = 0; j < rows; j++) {
    const cy = top + (height * (j + 0.5)) / rows;
    const f = nearestRate(p, u.posToVal(cy, 'y', true));
    if (f === null) continue;
    const vx = pxPerT;
    const vy = -f * pxPerY;
    const len = Math.hypot(vx, vy);
    if (!(len > 0) || !Number.isFinite(len)) continue;
    const dx = (vx / len) * half;
    const dy = (vy / len) * half;
    for (let i = 0; i < cols; i++) {
      const cx = left + (width * (i + 0.5)) / cols;
      ctx.moveTo(cx - dx, cy - dy);
      ctx.lineTo(cx + dx, cy + dy);
    }
  }
  ctx.stroke();
  ctx.restore();
}

/** The sampled rate at the sample nearest `y` (null where the rate is undefined). */
function nearestRate(p: PhasePlotData, y: number): number | null {
  let best = -1;
  let gap = Infinity;
  p.y.forEach((v, i) => {
    if (v !== null && Math.abs(v - y) < gap) { gap = Math.abs(v - y); best = i; }
  });
  return best < 0 ? null : p.f[best];
}

function arrowHead(ctx: CanvasRenderingContext2D, x: number, y: number, dir: number, r: number): void {
  ctx.beginPath();
  ctx.moveTo(x + dir * 6 * r, y);
  ctx.lineTo(x - dir * 5 * r, y - 5.5 * r);
  ctx.lineTo(x - dir * 2 * r, y);
  ctx.lineTo(x - dir * 5 * r, y + 5.5 * r);
  ctx.closePath();
  ctx.fill();
}
