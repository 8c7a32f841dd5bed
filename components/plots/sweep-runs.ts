/**
 * What a sweep chart draws, the same in the app's `<sweep-plot>` and on the printed sheet: each
 * branch in runs of one stability (stable solid, the rest dashed), and each fold as a marked
 * point with a key entry of its own, never as a line. Arranges the report's points; computes
 * nothing.
 */
import { svg, type SVGTemplateResult } from 'lit';
import type { ReportQuantity } from '../../src/index.ts';
import type { Stability } from './equilibrium-dot.ts';
import { FOLD } from './palette.ts';

/** A quantity as the report gives it; the chart reads its value and unit. */
type ShownQuantity = Readonly<Partial<ReportQuantity> & Pick<ReportQuantity, 'value' | 'unit'>>;

/** The phase cell's `sweep`. */
export interface SweepData {
  readonly parameter: string;
  readonly branches: ReadonlyArray<ReadonlyArray<{ readonly parameter: ShownQuantity; readonly value: ShownQuantity; readonly stability: Stability }>>;
  readonly folds: ReadonlyArray<{ readonly parameter: ShownQuantity; readonly value: ShownQuantity; readonly pair?: string }>;
  /** The swept range (start, end), so the axis spans it even where no equilibrium exists. */
  readonly range?: readonly [ShownQuantity, ShownQuantity];
  readonly summary?: string;
  readonly warnings?: readonly string[];
  readonly incomplete?: string;
}

/** A stretch of one branch with one kind of stability, ordered by the parameter. */
export interface Run { readonly branch: number; readonly stable: boolean; readonly x: number[]; readonly y: number[] }

/** The key's words for the runs and for a fold: where two branches, one stable and one not, meet and end. */
export const SWEEP_KEY = { stable: 'stable (attractor)', unstable: 'unstable', fold: 'fold: two equilibria meet and vanish' } as const;

/** A fold's mark, a diamond of half-diagonal `d` centred at (x, y), as SVG (the key, the printed sheet). */
export function foldMark(x: number, y: number, d: number): SVGTemplateResult {
  return svg`<path class="fold" d="M${x} ${y - d}L${x + d} ${y}L${x} ${y + d}L${x - d} ${y}Z" fill=${FOLD} stroke="#fff" stroke-width="1" />`;
}

/**
 * Splits each branch where it changes between stable (attractor) and not (repeller; a
 * semi-stable point goes with the stretch it ends or starts: a branch's end at a fold is
 * semi-stable, and is drawn as a fold's mark, not as a line of its own). The new run begins at
 * the last point of the one before, so the curve stays joined. Runs are ordered by increasing
 * parameter.
 */
export function runsOf(s: SweepData): Run[] {
  const runs: Run[] = [];
  s.branches.forEach((points, branch) => {
    const kinds = points.map((p) => (p.stability === 'semi-stable' ? undefined : p.stability === 'attractor'));
    for (let i = 0; i < kinds.length; i++) kinds[i] ??= i > 0 ? kinds[i - 1] : kinds.find((k) => k !== undefined) ?? false;
    let cur: Run | undefined;
    points.forEach((p, i) => {
      if (!cur || cur.stable !== kinds[i]) {
        const prev = cur;
        cur = { branch, stable: kinds[i]!, x: [], y: [] };
        runs.push(cur);
        if (prev) { cur.x.push(prev.x[prev.x.length - 1]); cur.y.push(prev.y[prev.y.length - 1]); }
      }
      cur.x.push(p.parameter.value);
      cur.y.push(p.value.value);
    });
  });
  for (const r of runs) if (r.x.length > 1 && r.x[0] > r.x[r.x.length - 1]) { r.x.reverse(); r.y.reverse(); }
  return runs;
}
