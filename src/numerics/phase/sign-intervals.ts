/**
 * The sign of f on each piece of [from, to] between the features the search found
 * (equilibria, poles, jumps, gaps, zero intervals).
 */
import { signOf, tryAt, type Ctx } from './search.ts';
import type { Equilibrium, SignInterval, Span } from './types.ts';

/** The sign of f on (a, b): from grid samples inside, else by evaluating, else from a neighbour's side. */
function signBetween(c: Ctx, Y: readonly number[], F: readonly number[], a: number, b: number, equilibria: readonly Equilibrium[]): '+' | '-' | '0' {
  let pos = 0, neg = 0;
  let lo = 0, hi = Y.length;
  while (lo < hi) { const m = (lo + hi) >> 1; if (Y[m] <= a) lo = m + 1; else hi = m; }
  for (let k = lo; k < Y.length && Y[k] < b; k++) {
    if (!Number.isFinite(F[k]) || Math.abs(F[k]) <= c.noiseAt(Y[k])) continue;
    if (F[k] > 0) pos++; else neg++;
  }
  if (pos && neg) c.warnings.push(`f has both signs on the grid between ${a} and ${b}; a feature there may be missed`);
  if (pos || neg) return pos >= neg ? '+' : '-';
  for (const t of [0.5, 0.25, 0.75]) {
    const x = a + t * (b - a);
    const sg = signOf(c, tryAt(c, x), c.noiseAt(x));
    if (sg === '+' || sg === '-') return sg;
  }
  const eqLeft = equilibria.find((q) => q.value === a), eqRight = equilibria.find((q) => q.value === b);
  const side = eqLeft?.right ?? eqRight?.left;
  return side === '+' || side === '-' ? side : '0';
}

/** Intervals covering [from, to] in order, split at every point and span (see `PhaseAnalysis.intervals`). */
export function signIntervals(
  c: Ctx, Y: readonly number[], F: readonly number[], points: readonly number[], gaps: readonly Span[],
  zeroIntervals: readonly Span[], equilibria: readonly Equilibrium[],
): SignInterval[] {
  type Mark = { from: number; to: number; sign: SignInterval['sign'] | null };
  const marks: Mark[] = [
    ...points.map((p) => ({ from: p, to: p, sign: null })),
    ...gaps.map((g) => ({ from: g.from, to: g.to, sign: 'none' as const })),
    ...zeroIntervals.map((z) => ({ from: z.from, to: z.to, sign: '0' as const })),
  ].sort((a, b) => a.from - b.from || a.to - b.to);
  const out: SignInterval[] = [];
  let cursor = c.from, atEdge = true;
  const end = (y: number, edge: boolean) => (edge ? null : y);
  for (const m of marks) {
    if (m.from > cursor) out.push({ from: end(cursor, atEdge), to: m.from, sign: signBetween(c, Y, F, cursor, m.from, equilibria) });
    if (m.sign !== null && m.to > Math.max(m.from, cursor)) {
      const startsAtEdge = m.from <= c.from;
      const endsAtEdge = m.to >= c.to;
      out.push({ from: end(Math.max(m.from, cursor), startsAtEdge && atEdge), to: end(m.to, endsAtEdge), sign: m.sign });
      atEdge = endsAtEdge;
    } else {
      atEdge = false;
    }
    cursor = Math.max(cursor, m.to);
  }
  if (cursor < c.to) out.push({ from: end(cursor, atEdge), to: null, sign: signBetween(c, Y, F, cursor, c.to, equilibria) });
  return out;
}
