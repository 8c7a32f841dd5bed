// Measured points drawn one per device pixel (components/plots/one-per-pixel.ts): a point is
// left out only when a point already drawn rounds to its pixel, or when it lies outside the
// plot's bounds (clipped away), so every pixel inside that any point covers is drawn, each
// pixel column's highest and lowest point among them. Checked against a brute-force reference
// (the set of rounded positions inside the bounds), over random point clouds from the fixed
// seed, and on hand-worked cases.
import { it } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { onePerPixel } from '../../components/plots/one-per-pixel.ts';

const bounds = { left: 0, top: 0, right: 1000, bottom: 300 };
const pixel = (x: number, y: number) => `${Math.round(x)},${Math.round(y)}`;
const inside = (x: number, y: number) => Math.round(x) >= 0 && Math.round(x) <= 1000 && Math.round(y) >= 0 && Math.round(y) <= 300;

it('hand-worked: repeats on a pixel are left out, neighbours and a later return are kept', () => {
  const xs = [10, 10.2, 10.4, 11, 10.1, 10, 10];
  const ys = [5, 5.3, 4.8, 5, 5.2, 6, 4];
  // pixels: (10,5) (10,5) (10,5) (11,5) (10,5) (10,6) (10,4): the 1st, 4th, 6th and 7th are drawn
  assert.deepEqual(onePerPixel(xs.length, (i) => xs[i], (i) => ys[i], bounds), [0, 3, 5, 6]);
});

it('hand-worked: skipped points, points with no place and points outside the bounds are not drawn', () => {
  const xs = [1, 2, 3, 4, -3, 1001.4, 1001.6];
  const ys = [1, NaN, 3, 4, 5, 6, 7];
  // -3 and 1001.6 (rounds to 1002) lie outside [0, 1001]; 1001.4 rounds to 1001, the last column in
  assert.deepEqual(onePerPixel(7, (i) => xs[i], (i) => ys[i], { ...bounds, right: 1001 }, (i) => i === 3), [0, 2, 5]);
});

it('covers exactly the pixels inside that the points cover, one point each, every column\'s extremes among them', () => {
  fc.assert(fc.property(fc.array(fc.tuple(fc.double({ min: -50, max: 1050, noNaN: true }), fc.double({ min: -20, max: 320, noNaN: true })), { maxLength: 400 }), (pts) => {
    const kept = onePerPixel(pts.length, (i) => pts[i][0], (i) => pts[i][1], bounds);
    const within = pts.filter(([x, y]) => inside(x, y));
    const all = new Set(within.map(([x, y]) => pixel(x, y)));
    const drawn = kept.map((i) => pixel(pts[i][0], pts[i][1]));
    assert.equal(new Set(drawn).size, drawn.length, 'one point per pixel');
    assert.deepEqual(new Set(drawn), all, 'every covered pixel drawn');
    const columns = new Map<number, number[]>();
    for (const [x, y] of within) columns.set(Math.round(x), [...(columns.get(Math.round(x)) ?? []), Math.round(y)]);
    for (const [x, ys] of columns) {
      assert.ok(drawn.includes(`${x},${Math.min(...ys)}`) && drawn.includes(`${x},${Math.max(...ys)}`));
    }
    assert.deepEqual(kept, [...kept].sort((a, b) => a - b), 'in the order given, the first of each pixel');
  }));
});
