// Measured points drawn one per device pixel (components/plots/one-per-pixel.ts): a point is
// left out only when a point already drawn rounds to its pixel, so every pixel that any point
// covers is drawn, each pixel column's highest and lowest point among them. Checked against a
// brute-force reference (the set of rounded positions), over random point clouds from the
// fixed seed, and on hand-worked cases.
import { it } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { onePerPixel } from '../../components/plots/one-per-pixel.ts';

const pixel = (x: number, y: number) => `${Math.round(x)},${Math.round(y)}`;

it('hand-worked: repeats on a pixel are left out, neighbours and a later return are kept', () => {
  const xs = [10, 10.2, 10.4, 11, 10.1, 10, 10];
  const ys = [5, 5.3, 4.8, 5, 5.2, 6, 4];
  // pixels: (10,5) (10,5) (10,5) (11,5) (10,5) (10,6) (10,4): the 1st, 4th, 6th and 7th are drawn
  assert.deepEqual(onePerPixel(xs.length, (i) => xs[i], (i) => ys[i]), [0, 3, 5, 6]);
});

it('hand-worked: skipped points and points with no place are not drawn', () => {
  const ys = [1, NaN, 3, 4];
  assert.deepEqual(onePerPixel(4, (i) => i, (i) => ys[i], (i) => i === 3), [0, 2]);
});

it('covers exactly the pixels all the points cover, one point each, every column\'s extremes among them', () => {
  fc.assert(fc.property(fc.array(fc.tuple(fc.double({ min: -50, max: 1050, noNaN: true }), fc.double({ min: -20, max: 320, noNaN: true })), { maxLength: 400 }), (pts) => {
    const kept = onePerPixel(pts.length, (i) => pts[i][0], (i) => pts[i][1]);
    const all = new Set(pts.map(([x, y]) => pixel(x, y)));
    const drawn = kept.map((i) => pixel(pts[i][0], pts[i][1]));
    assert.equal(new Set(drawn).size, drawn.length, 'one point per pixel');
    assert.deepEqual(new Set(drawn), all, 'every covered pixel drawn');
    // each column's extremes (by rounded y) are drawn
    const columns = new Map<number, number[]>();
    for (const [x, y] of pts) columns.set(Math.round(x), [...(columns.get(Math.round(x)) ?? []), Math.round(y)]);
    for (const [x, ys] of columns) {
      assert.ok(drawn.includes(`${x},${Math.min(...ys)}`) && drawn.includes(`${x},${Math.max(...ys)}`));
    }
    // kept in the order given, the first of each pixel
    assert.deepEqual(kept, [...kept].sort((a, b) => a - b));
  }));
});
