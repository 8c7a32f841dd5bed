/**
 * What each equilibrium is: roots merged and ordered, the sign of f just beside a point
 * (probed at an offset scaled to the grid and to the room before the next feature), stability
 * from those signs, and the slope f'(y*) as a cross-check.
 */
import { DIFF_STEP, signOf, tolAt, tryAt, type Ctx, type Grid } from './search.ts';
import type { Equilibrium, FSign, Span, Stability } from './types.ts';

/** Side-sign probing: first offset as a fraction of the local spacing, growth factor, tries. */
const SIDE_FRACTION = 0.25;
const SIDE_GROWTH = 4;
const SIDE_TRIES = 4;
/** Beside a zero, an odd part of f below this fraction of the even part means a touching zero. */
const EVEN_DOMINATES = 0.1;

/** Roots sorted, with near-duplicates merged and those inside a zero interval dropped. */
export function dedupe(c: Ctx, roots: Array<{ y: number; converged: boolean }>, zeroIntervals: readonly Span[]): Array<{ y: number; converged: boolean }> {
  const sorted = roots.filter((r) => !zeroIntervals.some((z) => r.y >= z.from - 2 * tolAt(c, z.from) && r.y <= z.to + 2 * tolAt(c, z.to)))
    .sort((a, b) => a.y - b.y);
  const out: Array<{ y: number; converged: boolean }> = [];
  for (const r of sorted) {
    const last = out[out.length - 1];
    if (last && r.y - last.y <= 4 * tolAt(c, r.y)) { if (!last.converged && r.converged) out[out.length - 1] = r; continue; }
    out.push(r);
  }
  return out;
}

/** Points sorted, with near-duplicates merged. */
export function uniquePoints(c: Ctx, ys: number[]): number[] {
  const out: number[] = [];
  for (const y of ys.sort((a, b) => a - b)) if (!out.length || y - out[out.length - 1] > 4 * tolAt(c, y)) out.push(y);
  return out;
}

/** Distance from y to the nearest other feature in direction dir (Infinity when none). */
function roomOnSide(c: Ctx, y: number, dir: 1 | -1, points: readonly number[], spans: readonly Span[]): number {
  let room = Infinity;
  const tiny = 4 * tolAt(c, y);
  for (const p of points) { const d = dir * (p - y); if (d > tiny) room = Math.min(room, d); }
  for (const sp of spans) for (const p of [sp.from, sp.to]) { const d = dir * (p - y); if (d > tiny) room = Math.min(room, d); }
  return room;
}

/** The grid spacing at y (the width of the sample cell around it). */
function spacingAt(Y: readonly number[], y: number): number {
  let lo = 0, hi = Y.length - 1;
  while (hi - lo > 1) { const m = (lo + hi) >> 1; if (Y[m] <= y) lo = m; else hi = m; }
  let w = Y[hi] - Y[lo];
  if (lo > 0) w = Math.min(w, Y[lo] - Y[lo - 1] || w);
  if (hi < Y.length - 1) w = Math.min(w, Y[hi + 1] - Y[hi] || w);
  return w > 0 ? w : Y[Y.length - 1] - Y[0];
}

/**
 * The sign of f just beside y in direction dir: first at a quarter of the local spacing (or
 * of the room to the nearest feature on either side), then further out while f there is
 * within rounding of zero. Past the budget, the nearest grid sample on that side decides.
 */
export function probeSide(c: Ctx, y: number, dir: 1 | -1, grid: Grid, points: readonly number[], spans: readonly Span[]): FSign | null {
  const room = roomOnSide(c, y, dir, points, spans);
  const near = Math.min(room, roomOnSide(c, y, dir === 1 ? -1 : 1, points, spans));
  let d = Math.max(SIDE_FRACTION * Math.min(spacingAt(grid.Y, y), near), 2 * tolAt(c, y));
  let result: FSign | null = null;
  for (let k = 0; k < SIDE_TRIES; k++) {
    if (k > 0 && d > 0.5 * room) break;
    if (c.ev.left <= 0) { c.exhausted = true; return result ?? gridSide(c, y, dir, grid, room); }
    const v = c.ev.at(y + dir * d);
    const sg = signOf(c, v, c.noiseAt(y));
    if (sg === null) { if (k === 0) return null; break; }
    result = sg;
    if (sg !== '0') return sg;
    d *= SIDE_GROWTH;
  }
  return result;
}

/** The sign of the nearest grid sample beside y in direction dir that lies before the next feature. */
function gridSide(c: Ctx, y: number, dir: 1 | -1, grid: Grid, room: number): FSign | null {
  const { Y, F } = grid;
  let lo = 0, hi = Y.length;
  while (lo < hi) { const m = (lo + hi) >> 1; if (Y[m] < y) lo = m + 1; else hi = m; }
  for (let k = dir === 1 ? lo : lo - 1; k >= 0 && k < Y.length; k += dir) {
    const d = dir * (Y[k] - y);
    if (d <= 0) continue;
    if (d >= room) break;
    const sg = signOf(c, F[k], c.noiseAt(Y[k]));
    if (sg === '+' || sg === '-') return sg;
  }
  return null;
}

/** Stability from the side signs; the slope decides only where both sides are unknown. */
function stabilityFrom(left: FSign | null, right: FSign | null, slope: number): Stability {
  const known = (s: FSign | null) => s === '+' || s === '-';
  if (known(left) && known(right)) {
    if (left === '+' && right === '-') return 'attractor';
    if (left === '-' && right === '+') return 'repeller';
    return 'semi-stable';
  }
  if (known(left)) return left === '+' ? 'attractor' : 'repeller';
  if (known(right)) return right === '-' ? 'attractor' : 'repeller';
  return slope < 0 ? 'attractor' : slope > 0 ? 'repeller' : 'semi-stable';
}

/** The equilibrium at y: side signs, stability, slope (caller's derivative or a central difference) and their agreement. */
export function classify(c: Ctx, y: number, converged: boolean, grid: Grid, points: readonly number[], spans: readonly Span[]): Equilibrium {
  const residual = tryAt(c, y);
  const left = probeSide(c, y, -1, grid, points, spans), right = probeSide(c, y, 1, grid, points, spans);
  // central difference, kept clear of neighbouring features; one-sided where f is undefined
  const room = Math.min(roomOnSide(c, y, -1, points, spans), roomOnSide(c, y, 1, points, spans));
  const h = Math.min(DIFF_STEP * Math.max(Math.abs(y), c.width), 0.5 * room);
  const fp = tryAt(c, y + h), fm = tryAt(c, y - h);
  let slopeDifference = (fp - fm) / (2 * h);
  if (!Number.isFinite(slopeDifference)) {
    slopeDifference = Number.isFinite(fp) ? (fp - residual) / h : Number.isFinite(fm) ? (residual - fm) / h : NaN;
  }
  let slope = slopeDifference, slopeSource: Equilibrium['slopeSource'] = 'difference';
  if (c.derivative) {
    let d = NaN;
    try { d = c.derivative(y); } catch { /* fall back to the difference */ }
    if (Number.isFinite(d)) { slope = d; slopeSource = 'derivative'; }
  }
  const stability = stabilityFrom(left, right, slope);
  // the slope counts as zero when tiny against the size of f per width of the range, or when
  // the odd part of f about y (what a slope makes) is small beside the even part (a touching
  // zero, where the difference quotient is all truncation error)
  const flat = 1e-6 * c.localScale(y) / c.width;
  const odd = Math.abs(fp - fm), even = Math.abs(fp + fm - 2 * residual);
  const slopeSign = !Number.isFinite(slope) || Math.abs(slope) <= flat || odd <= EVEN_DOMINATES * even ? 0 : Math.sign(slope);
  const consistent = slopeSign === 0 || (slopeSign < 0 ? stability === 'attractor' : stability === 'repeller');
  if (!consistent) {
    c.warnings.push(`at ${y} the slope ${slope} disagrees with the sign of f on each side (${left ?? 'undefined'} / ${right ?? 'undefined'}); stability is taken from the signs`);
  }
  return { value: y, stability, slope, slopeSource, slopeDifference, left, right, residual, consistent, converged };
}
