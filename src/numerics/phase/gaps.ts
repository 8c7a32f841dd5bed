/**
 * Where f is not a finite number: the ends of each gap located by bisection, a gap that
 * shrinks to a point across which |f| grows recorded as a pole, and f tending to zero at a
 * gap's edge recorded as an equilibrium there.
 */
import { POLE_GROWTH, ROOT_DROP, tolAt, type Ctx, type Found } from './search.ts';
import type { Span } from './types.ts';

/**
 * Bisection for the edge between a point where f is finite and one where it is not, to the
 * location tolerance. Returns the last finite point found and f there.
 */
export function finiteEdge(c: Ctx, yFinite: number, fFinite: number, yBad: number): { y: number; f: number } {
  let g = yFinite, fg = fFinite, b = yBad;
  while (Math.abs(b - g) > tolAt(c, g)) {
    const m = 0.5 * (g + b);
    if (m === g || m === b) break;
    const fm = c.ev.at(m);
    if (Number.isFinite(fm)) { g = m; fg = fm; } else b = m;
  }
  return { y: g, f: fg };
}

/**
 * Gaps: each run of non-finite samples becomes a span whose ends are located by bisection;
 * the last finite points found are added to the samples (so runs start at the gap's edge).
 * A gap that shrinks to a point across which |f| grows is a pole instead. A root where f
 * tends to zero at a gap's edge (f = sqrt(y) at 0) is recorded as an equilibrium there.
 */
export function locateGaps(c: Ctx, Y: number[], F: number[], gaps: Span[], found: Found[]): void {
  const extra: Array<[number, number]> = [];
  for (let i = 0; i < Y.length; i++) {
    if (Number.isFinite(F[i])) continue;
    let j = i;
    while (j + 1 < Y.length && !Number.isFinite(F[j + 1])) j++;
    const left = i > 0 ? finiteEdge(c, Y[i - 1], F[i - 1], Y[i]) : undefined;
    const right = j + 1 < Y.length ? finiteEdge(c, Y[j + 1], F[j + 1], Y[j]) : undefined;
    const from = left ? left.y : c.from, to = right ? right.y : c.to;
    if (left) extra.push([left.y, left.f]);
    if (right) extra.push([right.y, right.f]);
    const point = left && right && to - from <= 4 * (tolAt(c, from) + tolAt(c, to));
    const grew = (e: { f: number }, k: number) => Math.abs(e.f) >= POLE_GROWTH * Math.abs(F[k]);
    if (point && grew(left, i - 1) && grew(right, j + 1)) found.push({ kind: 'pole', y: 0.5 * (from + to) });
    else gaps.push({ from, to });
    // f tending to zero at the edge of its domain
    for (const [e, k] of [[left, i - 1], [right, j + 1]] as const) {
      if (!e || point) continue;
      const fe = Math.abs(e.f);
      if (fe <= c.zeroAt(e.y) || (fe <= ROOT_DROP * Math.abs(F[k]) && Math.sign(e.f) === Math.sign(F[k]))) {
        found.push({ kind: 'root', y: e.y, converged: true });
      }
    }
    i = j;
  }
  if (extra.length === 0) return;
  const all = Y.map((y, k) => [y, F[k]] as [number, number]).concat(extra).sort((a, b) => a[0] - b[0]);
  Y.length = 0; F.length = 0;
  for (const [y, v] of all) {
    if (Y.length && y === Y[Y.length - 1]) continue;
    Y.push(y); F.push(v);
  }
}
