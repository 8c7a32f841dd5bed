/**
 * Which measured points a chart draws: one per device pixel. A point whose position rounds to
 * the pixel of a point already drawn is left out, as its dot would be drawn over the same
 * place; every other point is drawn. So every distinct place is kept, the extremes of each
 * pixel column among them (a column's highest and lowest point are on pixels of their own),
 * and the drawing differs from drawing every point by less than a pixel. A 10,000-row log on a
 * chart 1,000 pixels wide draws at most one dot per pixel it covers, not 10,000 arcs.
 * Pure; cost linear in the points.
 */
export function onePerPixel(count: number, xAt: (i: number) => number, yAt: (i: number) => number, skip?: (i: number) => boolean): number[] {
  const taken = new Set<number>();
  const kept: number[] = [];
  for (let i = 0; i < count; i++) {
    if (skip?.(i)) continue;
    const x = clamp(Math.round(xAt(i)));
    const y = clamp(Math.round(yAt(i)));
    if (Number.isNaN(x) || Number.isNaN(y)) continue;
    // a key per pixel without collisions (positions that far off the plot are clipped anyway)
    const key = (x + 1_048_576) * 2_097_152 + (y + 1_048_576);
    if (taken.has(key)) continue;
    taken.add(key);
    kept.push(i);
  }
  return kept;
}

const FAR = 1_048_575;
const clamp = (v: number) => (v > FAR ? FAR : v < -FAR ? -FAR : v);
