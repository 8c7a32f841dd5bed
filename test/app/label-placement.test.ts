// Chart labels never overlap (components/plots/label-placement.ts): over random crowded charts,
// every box placed lies inside the plot and shares no area with another label's box. The
// property is geometry (two axis-aligned boxes overlap when both their x and y ranges do);
// fast-check draws the cases from the fixed seed. Below that promise: leaders that cross no
// other leader nor label, labels off the event markers, then off the curves, where there is room.
import { it } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { placeLabel, placeLabels, overlaps, segmentHitsBox, segmentsCross, type Box, type Segment, type Taken } from '../../components/plots/label-placement.ts';

const bounds: Box = { x: 0, y: 0, w: 560, h: 200 };

function placeAll(labels: ReadonlyArray<{ x: number; y: number; w: number; h: number; along?: number[] }>, clear: Box[] = []): Array<Box | null> {
  const taken: Taken = { labels: [], clear };
  return labels.map((l) => placeLabel(l.x, l.y, l.w, l.h, taken, bounds, l.along));
}

function assertNoOverlap(boxes: ReadonlyArray<Box | null>): void {
  assertNoOverlapIn(boxes, bounds);
}

function assertNoOverlapIn(boxes: ReadonlyArray<Box | null>, bounds: Box): void {
  const placed = boxes.filter((b): b is Box => b !== null);
  for (const b of placed) {
    assert.ok(b.x >= bounds.x && b.y >= bounds.y && b.x + b.w <= bounds.x + bounds.w + 1e-9 && b.y + b.h <= bounds.y + bounds.h + 1e-9, `outside: ${JSON.stringify(b)}`);
  }
  for (let i = 0; i < placed.length; i++) for (let j = i + 1; j < placed.length; j++) {
    assert.ok(!overlaps(placed[i], placed[j]), `${JSON.stringify(placed[i])} overlaps ${JSON.stringify(placed[j])}`);
  }
}

it('two labels on one point (a peak and the time of that peak) are placed apart', () => {
  // the case seen on the sheet: peak_last and t_peak_last mark the same point
  const boxes = placeAll([{ x: 540, y: 20, w: 58, h: 12 }, { x: 540, y: 20, w: 70, h: 12 }]);
  assert.ok(boxes.every((b) => b !== null));
  assertNoOverlap(boxes);
});

it('labels never overlap and stay inside the plot, however crowded, even when the curves leave no clear room', () => {
  const label = fc.record({
    x: fc.double({ min: 0, max: 560, noNaN: true }),
    y: fc.double({ min: 0, max: 200, noNaN: true }),
    w: fc.integer({ min: 10, max: 140 }),
    h: fc.integer({ min: 8, max: 16 }),
  });
  const curve = fc.array(fc.record({ x: fc.double({ min: 0, max: 557, noNaN: true }), y: fc.double({ min: 0, max: 197, noNaN: true }) }), { maxLength: 300 })
    .map((pts) => pts.map((p) => ({ x: p.x, y: p.y, w: 3, h: 3 })));
  fc.assert(fc.property(fc.array(label, { minLength: 1, maxLength: 40 }), curve, (labels, clear) => {
    assertNoOverlap(placeAll(labels, clear));
  }), { numRuns: 100 });
});

it('placed as a set (placeLabels, in either order), labels keep the same promise, with event markers and leaders to keep off', () => {
  const label = fc.record({
    x: fc.double({ min: 0, max: 560, noNaN: true }),
    y: fc.double({ min: 0, max: 200, noNaN: true }),
    w: fc.integer({ min: 10, max: 140 }),
    h: fc.integer({ min: 8, max: 16 }),
  });
  const strip = fc.array(fc.record({ x: fc.double({ min: 0, max: 550, noNaN: true }), w: fc.integer({ min: 10, max: 160 }) }), { maxLength: 12 })
    .map((ms) => ms.map((m) => ({ x: m.x, y: 0, w: m.w, h: 24 })));
  fc.assert(fc.property(fc.array(label, { minLength: 1, maxLength: 30 }), strip, (labels, keepOff) => {
    const taken: Taken = { labels: [], clear: [], keepOff, leaders: [] };
    const placed = placeLabels(labels, taken, bounds);
    assertNoOverlap(placed.map((p) => p?.box ?? null));
    assert.equal(taken.labels.length, placed.filter((p) => p).length);
  }), { numRuns: 100 });
});

it('a label with no room left gets no box rather than one on top of another', () => {
  // hand-worked: a 560 × 200 plot holds at most 4 × 5 = 20 labels of 140 × 40 without overlap
  const boxes = placeAll(Array.from({ length: 30 }, () => ({ x: 280, y: 100, w: 140, h: 40 })));
  assertNoOverlap(boxes);
  const placed = boxes.filter((b) => b !== null).length;
  assert.ok(placed >= 4 && placed <= 20, `${placed} placed`); // at least the four corners' worth; greedy packing leaves gaps
  assert.ok(boxes.includes(null));
});

it('keeps clear of the curves while there is room', () => {
  const clear = Array.from({ length: 56 }, (_, i) => ({ x: i * 10, y: 95, w: 10, h: 10 })); // a flat curve across the middle
  const [b] = placeAll([{ x: 300, y: 100, w: 60, h: 12 }], clear);
  assert.ok(b && !clear.some((c) => overlaps(b, c)));
});

/** Every leader of `placed` checked against the others' leaders and boxes: none crosses or passes through. */
function assertTidy(placed: ReadonlyArray<{ box: Box; leader: Segment | null } | null>): void {
  const shown = placed.filter((p): p is { box: Box; leader: Segment | null } => p !== null);
  shown.forEach((a, i) => shown.forEach((b, j) => {
    if (i === j) return;
    if (a.leader) assert.ok(!segmentHitsBox(a.leader, b.box), `leader ${i} passes through label ${j}`);
    if (a.leader && b.leader && i < j) assert.ok(!segmentsCross(a.leader, b.leader), `leaders ${i} and ${j} cross`);
  }));
}

it('segment geometry: a crossing, a shared end, a line through a box and one beside it (hand-worked)', () => {
  assert.equal(segmentsCross([0, 0, 10, 10], [0, 10, 10, 0]), true); // the diagonals of a square meet at (5, 5)
  assert.equal(segmentsCross([0, 0, 10, 10], [0, 0, 10, 0]), false); // two leaders from one point
  assert.equal(segmentsCross([0, 0, 4, 4], [0, 10, 10, 0]), false); // stops short of the other: x + y = 8 < 10
  assert.equal(segmentHitsBox([0, 5, 20, 5], { x: 5, y: 0, w: 5, h: 10 }), true);
  assert.equal(segmentHitsBox([0, 5, 4, 5], { x: 5, y: 0, w: 5, h: 10 }), false);
  assert.equal(segmentHitsBox([0, 0, 10, 0], { x: 2, y: 0, w: 5, h: 10 }), false); // along an edge: touching only
});

it('labels of two equilibria on a phone\'s phase plot: no leader crosses another or passes through a label', () => {
  // The harvested-stock template's rate f(N) = 0.5 N (1 - N/1000) - 100 tonne/year drawn as at
  // 390 px: a plot 231 × 178 px, N from 0 to 1100 tonne, f from 39.4 down to -169.4; the
  // equilibria N = 500 ∓ sqrt(500² - 200 000) = 276.4 and 723.6 tonne (closed form) on the zero
  // line; the labels 128 and 135 px wide, 16 tall, as the app measures them. Placed in turn,
  // the repeller's label took the place below its point, and the attractor's leader ran down
  // through it.
  const W = 231, H = 178;
  const X = (n: number) => (n / 1100) * W;
  const Y = (f: number) => ((39.4 - f) / 208.8) * H;
  const clear: Box[] = [];
  for (let n = 0; n <= 1100; n += 2) clear.push({ x: X(n) - 1.5, y: Y(0.5 * n * (1 - n / 1000) - 100) - 1.5, w: 3, h: 3 });
  const roots = [500 - Math.sqrt(500 ** 2 - 200_000), 500 + Math.sqrt(500 ** 2 - 200_000)];
  for (const n of roots) clear.push({ x: X(n) - 7, y: Y(0) - 7, w: 14, h: 14 });
  const requests = roots.map((n, i) => ({ x: X(n), y: Y(0), w: [128, 135][i], h: 16 }));
  const taken: Taken = { labels: [], clear, leaders: [] };
  const placed = placeLabels(requests, taken, { x: 0, y: 0, w: W, h: H });
  assert.ok(placed.every((p) => p !== null));
  assertNoOverlapIn(placed.map((p) => p!.box), { x: 0, y: 0, w: W, h: H });
  assertTidy(placed);
});

it('keeps a label off the event markers at the top of the plot while there is room elsewhere', () => {
  // a peak 12 px under the top edge, dose markers every 60 px whose heads and shown labels take
  // the top 24 px across the plot; the label goes below the strip, not among the markers
  const keepOff: Box[] = Array.from({ length: 10 }, (_, i) => ({ x: i * 60 - 6, y: 0, w: 60, h: 24 }));
  const taken: Taken = { labels: [], clear: [], keepOff, leaders: [] };
  const [p] = placeLabels([{ x: 400, y: 12, w: 110, h: 16 }], taken, bounds);
  assert.ok(p && !keepOff.some((k) => overlaps(p.box, k)), JSON.stringify(p));
  assert.equal(p.rank, 0);
});

it('keeps off the event markers before it keeps off the curves, and gives both up before overlapping a label', () => {
  const keepOff: Box[] = [{ x: 0, y: 0, w: 560, h: 24 }];
  const curves: Box[] = Array.from({ length: 112 }, (_, i) => ({ x: i * 5, y: 24, w: 5, h: 176 })); // curves fill everything below
  const [p] = placeLabels([{ x: 300, y: 20, w: 80, h: 16 }], { labels: [], clear: curves, keepOff, leaders: [] }, bounds);
  assert.ok(p && !overlaps(p.box, keepOff[0]) && p.rank === 1, JSON.stringify(p));
  const full: Box[] = [{ x: 0, y: 0, w: 560, h: 200 }];
  const [q] = placeLabels([{ x: 300, y: 20, w: 80, h: 16 }], { labels: [], clear: full, keepOff: full, leaders: [] }, bounds);
  assert.ok(q && q.rank === 2);
});
