/**
 * Where to put a text label beside a point so that it stays inside the plot and overlaps no
 * label placed before it. Greedy, in the order the labels come: good enough for the handful of
 * found points, levels and equilibria a chart carries. Pure; sizes and positions in CSS pixels.
 */

export interface Box { readonly x: number; readonly y: number; readonly w: number; readonly h: number }

/** Gap between a point and its label. */
const GAP = 6;
/** How far a label may be pushed along its column, in label heights, before giving up. */
const MAX_STEPS = 8;

const overlaps = (a: Box, b: Box) => a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;
const inside = (a: Box, bounds: Box) => a.x >= bounds.x && a.y >= bounds.y && a.x + a.w <= bounds.x + bounds.w && a.y + a.h <= bounds.y + bounds.h;

/**
 * The top-left corner for a `w`×`h` label that belongs to the point (`px`, `py`): right above it,
 * else right below, left above, left below, centred above or below; then the same beside each
 * of `along` (other x positions on the point's horizontal line: a level can be labelled
 * anywhere along it); else pushed down, then up, its column until it is free. `taken` are boxes
 * already used (labels, and any region to keep clear); the chosen box is appended to it. When
 * nothing is free, the first choice clamped into `bounds`.
 */
export function placeLabel(px: number, py: number, w: number, h: number, taken: Box[], bounds: Box, along: readonly number[] = []): Box {
  const close = (x: number): Box[] => [
    { x: x + GAP, y: py - GAP - h, w, h },
    { x: x + GAP, y: py + GAP, w, h },
    { x: x - GAP - w, y: py - GAP - h, w, h },
    { x: x - GAP - w, y: py + GAP, w, h },
    { x: x - w / 2, y: py - GAP - h, w, h },
    { x: x - w / 2, y: py + GAP, w, h },
  ];
  const candidates: Box[] = [px, ...along].flatMap(close);
  for (let step = 1; step <= MAX_STEPS; step++) {
    for (const dir of [1, -1]) {
      candidates.push({ x: px + GAP, y: py - GAP - h + dir * step * (h + 2), w, h });
      candidates.push({ x: px - GAP - w, y: py - GAP - h + dir * step * (h + 2), w, h });
    }
  }
  const free = candidates.find((c) => inside(c, bounds) && !taken.some((t) => overlaps(c, t)));
  const chosen = free ?? clamp(candidates[0], bounds);
  taken.push(chosen);
  return chosen;
}

function clamp(b: Box, bounds: Box): Box {
  const x = Math.min(Math.max(b.x, bounds.x), bounds.x + bounds.w - b.w);
  const y = Math.min(Math.max(b.y, bounds.y), bounds.y + bounds.h - b.h);
  return { ...b, x, y };
}
