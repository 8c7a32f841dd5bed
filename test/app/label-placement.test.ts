// Chart labels never overlap (components/plots/label-placement.ts): over random crowded charts,
// every box placed lies inside the plot and shares no area with another label's box. The
// property is geometry (two axis-aligned boxes overlap when both their x and y ranges do);
// fast-check draws the cases from the fixed seed.
import { it } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { placeLabel, overlaps, type Box, type Taken } from '../../components/plots/label-placement.ts';

const bounds: Box = { x: 0, y: 0, w: 560, h: 200 };

function placeAll(labels: ReadonlyArray<{ x: number; y: number; w: number; h: number; along?: number[] }>, clear: Box[] = []): Array<Box | null> {
  const taken: Taken = { labels: [], clear };
  return labels.map((l) => placeLabel(l.x, l.y, l.w, l.h, taken, bounds, l.along));
}

function assertNoOverlap(boxes: ReadonlyArray<Box | null>): void {
  const placed = boxes.filter((b): b is Box => b !== null);
  for (const b of placed) {
    assert.ok(b.x >= 0 && b.y >= 0 && b.x + b.w <= bounds.w + 1e-9 && b.y + b.h <= bounds.h + 1e-9, `outside: ${JSON.stringify(b)}`);
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
