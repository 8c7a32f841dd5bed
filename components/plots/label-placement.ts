/**
 * Where to put a text label beside a point so that it stays inside the plot and never
 * overlaps a label placed before it. Greedy, in the order the labels come: good enough for
 * the handful of found points, levels and equilibria a chart carries. Pure; sizes and
 * positions in CSS pixels (the sheet's SVG charts use their own user units the same way).
 *
 * The promise, which the tests check over the boxes: every box returned lies inside `bounds`
 * and overlaps no box in `taken.labels`. Regions to keep clear (`taken.clear`: the points, the
 * curves) are avoided when possible and given up before the promise is. A label that finds no
 * room at all gets no box (null): the caller lists it elsewhere instead of drawing it on top
 * of another.
 */

export interface Box { readonly x: number; readonly y: number; readonly w: number; readonly h: number }

/** What a new label must not cover: labels already placed (never) and regions to keep clear (if it can). */
export interface Taken {
  readonly labels: Box[];
  readonly clear: readonly Box[];
}

/** Gap between a point and its label. */
const GAP = 6;
/** How far a label may be pushed along its column, in label heights, before the wider search. */
const MAX_STEPS = 8;
/** The wider search's grid, as fractions of the label's size. */
const GRID = 0.5;

/** True when two boxes share area (touching edges do not). */
export const overlaps = (a: Box, b: Box) => a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;
const inside = (a: Box, bounds: Box) => a.x >= bounds.x && a.y >= bounds.y && a.x + a.w <= bounds.x + bounds.w && a.y + a.h <= bounds.y + bounds.h;

/**
 * The box for a `w`×`h` label that belongs to the point (`px`, `py`), appended to
 * `taken.labels`; null when no room is left. Tried in order: right above the point, right
 * below, left above, left below, centred above or below; the same beside each of `along`
 * (other x positions on the point's horizontal line: a level can be labelled anywhere along
 * it); pushed down, then up, its column. First among those clear of everything; else the
 * nearest place on a grid over `bounds` clear of everything; else the first of all these clear
 * of labels only. Cost: a few hundred candidates per label times the boxes taken.
 */
export function placeLabel(px: number, py: number, w: number, h: number, taken: Taken, bounds: Box, along: readonly number[] = []): Box | null {
  const close = (x: number): Box[] => [
    { x: x + GAP, y: py - GAP - h, w, h },
    { x: x + GAP, y: py + GAP, w, h },
    { x: x - GAP - w, y: py - GAP - h, w, h },
    { x: x - GAP - w, y: py + GAP, w, h },
    { x: x - w / 2, y: py - GAP - h, w, h },
    { x: x - w / 2, y: py + GAP, w, h },
  ];
  const near: Box[] = [px, ...along].flatMap(close);
  for (let step = 1; step <= MAX_STEPS; step++) {
    for (const dir of [1, -1]) {
      near.push({ x: px + GAP, y: py - GAP - h + dir * step * (h + 2), w, h });
      near.push({ x: px - GAP - w, y: py - GAP - h + dir * step * (h + 2), w, h });
    }
  }
  const fits = (c: Box) => inside(c, bounds) && !taken.labels.some((t) => overlaps(c, t));
  const clear = (c: Box) => !taken.clear.some((t) => overlaps(c, t));
  const chosen = near.find((c) => fits(c) && clear(c))
    ?? nearestOnGrid(px, py, w, h, bounds, (c) => fits(c) && clear(c))
    ?? near.find(fits)
    ?? nearestOnGrid(px, py, w, h, bounds, fits);
  if (chosen) taken.labels.push(chosen);
  return chosen ?? null;
}

/** The grid position in `bounds` nearest to the point that passes `ok`, if any. */
function nearestOnGrid(px: number, py: number, w: number, h: number, bounds: Box, ok: (b: Box) => boolean): Box | undefined {
  if (w > bounds.w || h > bounds.h) return undefined;
  const dx = Math.max(1, w * GRID);
  const dy = Math.max(1, h * GRID);
  let best: Box | undefined;
  let bestD = Infinity;
  for (let y = bounds.y; y + h <= bounds.y + bounds.h; y += dy) {
    for (let x = bounds.x; x + w <= bounds.x + bounds.w; x += dx) {
      const d = Math.hypot(x + w / 2 - px, y + h / 2 - py);
      if (d >= bestD) continue;
      const c = { x, y, w, h };
      if (ok(c)) { best = c; bestD = d; }
    }
  }
  return best;
}
