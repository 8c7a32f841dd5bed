/**
 * Which measured points a chart draws: one per device pixel. A point whose position rounds to
 * the pixel of a point already drawn is left out, as its dot would be drawn over the same
 * place; so is a point outside `bounds` (the plot, its centre outside it: the run's chart
 * draws its dots whole over the plot's edge, so only those of points inside). Every other
 * point is drawn. So every distinct place is kept, the extremes
 * of each pixel column among them (a column's highest and lowest point are on pixels of their
 * own), and the drawing differs from drawing every point by less than a pixel. A 10,000-row
 * log on a chart 1,000 pixels wide draws at most one dot per pixel it covers.
 * Pure; cost linear in the points plus one byte per pixel of `bounds`.
 */
export interface PixelBounds { readonly left: number; readonly top: number; readonly right: number; readonly bottom: number }

export function onePerPixel(count: number, xAt: (i: number) => number, yAt: (i: number) => number, bounds: PixelBounds, skip?: (i: number) => boolean): number[] {
  const left = Math.floor(bounds.left);
  const top = Math.floor(bounds.top);
  const width = Math.max(0, Math.ceil(bounds.right) - left + 1);
  const height = Math.max(0, Math.ceil(bounds.bottom) - top + 1);
  const taken = new Uint8Array(width * height);
  const kept: number[] = [];
  for (let i = 0; i < count; i++) {
    if (skip?.(i)) continue;
    const x = Math.round(xAt(i)) - left;
    const y = Math.round(yAt(i)) - top;
    // outside (NaN fails both tests too)
    if (!(x >= 0 && x < width && y >= 0 && y < height)) continue;
    const at = y * width + x;
    if (taken[at]) continue;
    taken[at] = 1;
    kept.push(i);
  }
  return kept;
}
