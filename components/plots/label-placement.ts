/**
 * Where to put a text label beside a point so that it stays inside the plot and never
 * overlaps a label placed before it. Greedy, in the order the labels come: good enough for
 * the handful of found points, levels and equilibria a chart carries. Pure; sizes and
 * positions in CSS pixels (the sheet's SVG charts use their own user units the same way).
 *
 * The promise, which the tests check over the boxes: every box returned lies inside `bounds`
 * and overlaps no box in `taken.labels`. Below the promise, what a label keeps to, given up
 * last first: its leader (the line from a label pushed away back to its point) crosses no
 * other leader and passes through no other label, and its box covers no leader
 * (`taken.leaders`); it keeps off `taken.keepOff` (the event markers and their labels); it keeps
 * off `taken.clear` (the points, the curves). A label that finds no room at all gets no box
 * (null): the caller lists it elsewhere instead of drawing it on top of another. `placeLabels`
 * places a whole set, in a second order too when the first leaves a label short of the best.
 */

export interface Box { readonly x: number; readonly y: number; readonly w: number; readonly h: number }
/** A line from (x1, y1), the point, to (x2, y2), on its label's edge. */
export type Segment = readonly [number, number, number, number];

/** What a new label must not cover: labels already placed (never), and, where it can, the rest. */
export interface Taken {
  readonly labels: Box[];
  /** Regions to keep clear when there is room: the points, the curves. */
  readonly clear: readonly Box[];
  /** Regions kept clear before `clear` is: the event markers at the top of a run's plot and their labels. */
  readonly keepOff?: readonly Box[];
  /** The leaders of the labels placed so far; each placed label's leader is added. */
  readonly leaders?: Segment[];
}

/** Gap between a point and its label. */
const GAP = 6;
/** How far a label may be pushed along its column, in label heights, before the wider search. */
const MAX_STEPS = 8;
/** The wider search's grid, as fractions of the label's size, and at most `GRID_MOST` units apart across. */
const GRID = 0.5;
const GRID_MOST = 8;
/** How far the grid is searched, in label heights and gaps from the point, for a place that only the curves kept the label from near it. */
const FAR = 5;
/** Distance from a point to its label beyond which a leader line joins them (CSS pixels, or the sheet's units). */
export const LEADER_FROM = 14;
/**
 * How well a place keeps to the rules, best first: clear of everything; on a curve; on an
 * event marker too; its leader crossing another (or passing through a label). Past the last, no fit.
 */
const RANKS = 4;

/** True when two boxes share area (touching edges do not). */
export const overlaps = (a: Box, b: Box) => a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;
const inside = (a: Box, bounds: Box) => a.x >= bounds.x && a.y >= bounds.y && a.x + a.w <= bounds.x + bounds.w && a.y + a.h <= bounds.y + bounds.h;
const clamp = (v: number, lo: number, hi: number) => Math.min(Math.max(v, lo), hi);

/**
 * The leader from the point (`px`, `py`) to its label's `box`, or null when the label is close
 * enough to need none. A level's label (`level`: one that may go anywhere along its line) is
 * joined to the place on its line nearest the box.
 */
export function leaderOf(px: number, py: number, box: Box, level = false): Segment | null {
  const ax = level ? clamp(px, box.x, box.x + box.w) : px;
  const nx = clamp(ax, box.x, box.x + box.w);
  const ny = clamp(py, box.y, box.y + box.h);
  return Math.hypot(nx - ax, ny - py) > LEADER_FROM ? [ax, py, nx, ny] : null;
}

/** True when the segment passes through the box's inside (touching its edge does not count). */
export function segmentHitsBox(s: Segment, b: Box): boolean {
  return hitsBox(s[0], s[1], s[2], s[3], b);
}

/** `segmentHitsBox` on plain numbers: it runs per candidate place and leader, so it makes no arrays or closures. */
function hitsBox(x1: number, y1: number, x2: number, y2: number, b: Box): boolean {
  return hitsRect(x1, y1, x2, y2, b.x, b.y, b.w, b.h);
}

function hitsRect(x1: number, y1: number, x2: number, y2: number, bx: number, by: number, bw: number, bh: number): boolean {
  // most boxes are nowhere near: their extents do not meet the segment's
  if (Math.max(x1, x2) <= bx || Math.min(x1, x2) >= bx + bw || Math.max(y1, y2) <= by || Math.min(y1, y2) >= by + bh) return false;
  // Liang–Barsky: the part of the segment inside the box is t in [t0, t1]
  const dx = x2 - x1, dy = y2 - y1;
  let t0 = 0, t1 = 1;
  if (dx === 0) { if (x1 <= bx || x1 >= bx + bw) return false; } else {
    const ta = (bx - x1) / dx, tb = (bx + bw - x1) / dx;
    t0 = Math.max(t0, Math.min(ta, tb)); t1 = Math.min(t1, Math.max(ta, tb));
  }
  if (dy === 0) { if (y1 <= by || y1 >= by + bh) return false; } else {
    const ta = (by - y1) / dy, tb = (by + bh - y1) / dy;
    t0 = Math.max(t0, Math.min(ta, tb)); t1 = Math.min(t1, Math.max(ta, tb));
  }
  return (t1 - t0) * Math.hypot(dx, dy) > 1e-9;
}

/** True when two segments cross (a shared end, as two labels of one point have, does not count). */
export function segmentsCross(a: Segment, b: Segment): boolean {
  return crosses(a[0], a[1], a[2], a[3], b);
}

const sideOf = (x1: number, y1: number, x2: number, y2: number, x: number, y: number) => Math.sign((x2 - x1) * (y - y1) - (y2 - y1) * (x - x1));
const sameEnd = (x: number, y: number, u: number, v: number) => Math.abs(x - u) < 1e-9 && Math.abs(y - v) < 1e-9;

function crosses(x1: number, y1: number, x2: number, y2: number, b: Segment): boolean {
  if (sameEnd(x1, y1, b[0], b[1]) || sameEnd(x1, y1, b[2], b[3]) || sameEnd(x2, y2, b[0], b[1]) || sameEnd(x2, y2, b[2], b[3])) return false;
  return sideOf(x1, y1, x2, y2, b[0], b[1]) * sideOf(x1, y1, x2, y2, b[2], b[3]) < 0
    && sideOf(b[0], b[1], b[2], b[3], x1, y1) * sideOf(b[0], b[1], b[2], b[3], x2, y2) < 0;
}

const NONE: readonly never[] = [];
const overlapsAt = (x: number, y: number, w: number, h: number, b: Box) => x < b.x + b.w && b.x < x + w && y < b.y + b.h && b.y < y + h;

/**
 * How well the `w`×`h` box at (`x`, `y`) for the point (`px`, `py`) keeps to the rules (0 best,
 * `RANKS - 1` its leader untidy), or `RANKS` when it breaks the promise. On plain numbers, with
 * loops: it runs for every candidate and grid place.
 */
function rankAt(x: number, y: number, w: number, h: number, px: number, py: number, level: boolean, taken: Taken, bounds: Box): number {
  if (x < bounds.x || y < bounds.y || x + w > bounds.x + bounds.w || y + h > bounds.y + bounds.h) return RANKS;
  const labels = taken.labels;
  for (let i = 0; i < labels.length; i++) if (overlapsAt(x, y, w, h, labels[i])) return RANKS;
  const leaders = taken.leaders ?? NONE;
  for (let i = 0; i < leaders.length; i++) if (hitsRect(leaders[i][0], leaders[i][1], leaders[i][2], leaders[i][3], x, y, w, h)) return 3;
  // its own leader (as leaderOf draws it)
  const ax = level ? clamp(px, x, x + w) : px;
  const nx = clamp(ax, x, x + w);
  const ny = clamp(py, y, y + h);
  if (Math.hypot(nx - ax, ny - py) > LEADER_FROM) {
    for (let i = 0; i < labels.length; i++) if (hitsBox(ax, py, nx, ny, labels[i])) return 3;
    for (let i = 0; i < leaders.length; i++) if (crosses(ax, py, nx, ny, leaders[i])) return 3;
  }
  const keepOff = taken.keepOff ?? NONE;
  for (let i = 0; i < keepOff.length; i++) if (overlapsAt(x, y, w, h, keepOff[i])) return 2;
  return indexOf(taken.clear).hits(x, y, w, h) ? 1 : 0;
}

/** Width of the index's columns: a label's box meets the boxes of the few columns it spans. */
const COLUMN = 16;

/** The regions to keep clear, by column of `COLUMN` units, so that a box meets only its neighbours'. */
class ColumnIndex {
  private readonly columns = new Map<number, Box[]>();
  readonly size: number;
  constructor(boxes: readonly Box[]) {
    this.size = boxes.length;
    for (const b of boxes) {
      for (let k = Math.floor(b.x / COLUMN); k <= Math.floor((b.x + b.w) / COLUMN); k++) {
        const col = this.columns.get(k);
        if (col) col.push(b); else this.columns.set(k, [b]);
      }
    }
  }

  /** True when the `w`×`h` box at (`x`, `y`) overlaps a box of the index. */
  hits(x: number, y: number, w: number, h: number): boolean {
    for (let k = Math.floor(x / COLUMN); k <= Math.floor((x + w) / COLUMN); k++) {
      const col = this.columns.get(k);
      if (col) for (let i = 0; i < col.length; i++) if (overlapsAt(x, y, w, h, col[i])) return true;
    }
    return false;
  }
}

/** One index per list of regions (the list a chart's draw hands to every label), made again if the list grew. */
const indexes = new WeakMap<readonly Box[], ColumnIndex>();
function indexOf(boxes: readonly Box[]): ColumnIndex {
  let ix = indexes.get(boxes);
  if (!ix || ix.size !== boxes.length) indexes.set(boxes, (ix = new ColumnIndex(boxes)));
  return ix;
}

/** A placed label: its box, the rank of its place (0 best) and its leader, if it needs one. */
export interface Placed { readonly box: Box; readonly rank: number; readonly leader: Segment | null }

/**
 * The place for a `w`×`h` label that belongs to the point (`px`, `py`), appended to
 * `taken.labels` (and its leader to `taken.leaders`); null when no room is left. Tried in
 * order: right above the point, right below, left above, left below, centred above or below;
 * the same beside each of `along` (other x positions on the point's horizontal line: a level
 * can be labelled anywhere along it); pushed down, then up, its column; else the nearest place
 * on a grid over `bounds` (within `FAR` label heights where only the curves are in the way).
 * The first of these at the best rank wins, the close places before the grid's. Cost: a few hundred candidates per label times the boxes taken.
 */
export function placeLabelRanked(px: number, py: number, w: number, h: number, taken: Taken, bounds: Box, along: readonly number[] = []): Placed | null {
  const level = along.length > 0;
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
  let best: Box | undefined;
  let bestRank = RANKS;
  for (const c of near) {
    const r = rankAt(c.x, c.y, w, h, px, py, level, taken, bounds);
    if (r < bestRank) { best = c; bestRank = r; }
    if (r === 0) break;
  }
  if (bestRank > 0) {
    // for a place off the curves alone, no further than FAR: a label beside its point over a
    // curve reads better than one across the chart at the end of a long leader
    const far = bestRank === 1 ? FAR * (h + GAP) : Infinity;
    const g = nearestOnGrid(px, py, w, h, bounds, (x, y) => rankAt(x, y, w, h, px, py, level, taken, bounds), bestRank, far);
    if (g) { best = g.box; bestRank = g.rank; }
  }
  if (!best) return null;
  taken.labels.push(best);
  const leader = leaderOf(px, py, best, level);
  if (leader) taken.leaders?.push(leader);
  return { box: best, rank: bestRank, leader };
}

/** `placeLabelRanked`'s box alone. */
export function placeLabel(px: number, py: number, w: number, h: number, taken: Taken, bounds: Box, along: readonly number[] = []): Box | null {
  return placeLabelRanked(px, py, w, h, taken, bounds, along)?.box ?? null;
}

/** The grid position in `bounds`, within `far` of the point, nearest to it among those of the best rank below `below`, if any. */
function nearestOnGrid(px: number, py: number, w: number, h: number, bounds: Box, rank: (x: number, y: number) => number, below: number, far = Infinity): { box: Box; rank: number } | undefined {
  if (w > bounds.w || h > bounds.h) return undefined;
  const dx = Math.max(1, Math.min(w * GRID, GRID_MOST));
  const dy = Math.max(1, h * GRID);
  let bx = 0, by = 0;
  let bestRank = below;
  let bestD = Infinity;
  for (let y = bounds.y; y + h <= bounds.y + bounds.h; y += dy) {
    for (let x = bounds.x; x + w <= bounds.x + bounds.w; x += dx) {
      const d = Math.hypot(x + w / 2 - px, y + h / 2 - py);
      if (d > far || (bestRank === 0 && d >= bestD)) continue;
      const r = rank(x, y);
      if (r < bestRank || (r === bestRank && r < below && d < bestD)) { bx = x; by = y; bestRank = r; bestD = d; }
    }
  }
  return bestRank < below ? { box: { x: bx, y: by, w, h }, rank: bestRank } : undefined;
}

/** A label to place: its point, its size, and for a level the other places along its line. */
export interface LabelRequest { readonly x: number; readonly y: number; readonly w: number; readonly h: number; readonly along?: readonly number[] }

/**
 * Places a set of labels in turn (each as `placeLabelRanked`; the order is the callers'
 * priority), and when one of them found no place where its leader is tidy, places them again
 * in the reverse order and keeps the better of the two: fewer left out, then the worse ranks
 * fewer (a crossed leader counts above everything a label can cover), then the shorter
 * leaders. The chosen boxes and leaders are added to `taken`. Cost: twice `placeLabelRanked`
 * per label at most.
 */
export function placeLabels(requests: readonly LabelRequest[], taken: Taken, bounds: Box): Array<Placed | null> {
  const attempt = (order: readonly number[]) => {
    const t: Taken = { labels: [...taken.labels], clear: taken.clear, keepOff: taken.keepOff, leaders: [...(taken.leaders ?? [])] };
    const out: Array<Placed | null> = requests.map(() => null);
    for (const i of order) {
      const q = requests[i];
      out[i] = placeLabelRanked(q.x, q.y, q.w, q.h, t, bounds, q.along);
    }
    return out;
  };
  const forward = requests.map((_, i) => i);
  let result = attempt(forward);
  if (result.some((p) => p && p.rank === RANKS - 1)) {
    const backward = attempt([...forward].reverse());
    if (score(backward) < score(result)) result = backward;
  }
  for (const p of result) {
    if (!p) continue;
    taken.labels.push(p.box);
    if (p.leader) taken.leaders?.push(p.leader);
  }
  return result;
}

/** Lower is better: each label left out, then each rank given up weighs more than all the ones below it; leader lengths break ties. */
function score(placed: ReadonlyArray<Placed | null>): number {
  const weight = [0, 1, 1e2, 1e4];
  let s = 0;
  for (const p of placed) {
    if (!p) { s += 1e6; continue; }
    s += weight[p.rank];
    if (p.leader) s += 1e-6 * Math.hypot(p.leader[2] - p.leader[0], p.leader[3] - p.leader[1]);
  }
  return s;
}
