/**
 * How sure a result at a glance is, where an uncertainty cell follows it (its `of` names it):
 * a verdict's probability of yes with its Monte Carlo standard error, a quantity's 95% interval
 * (the 2.5 and 97.5 percentiles of the samples, or the linear method's interval), each as the
 * uncertainty cell shows it; or why there is none. Nothing is computed again here: the figures
 * and their shown digits are the uncertainty cell's report's; only the standard error in
 * percentage points is written by the cell's own rule (`uncertaintyText`, as its summary does).
 */
import type { Cell, UncertaintyMethod } from '../study/types.ts';
import type { CellReport, UncertaintyResult } from '../engine/report.ts';
import { formatNumber } from '../units/quantity.ts';
import { unitAfterNumber } from '../units/units.ts';
import { uncertaintyText } from '../numerics/sampling/mc-precision.ts';

/** A quantity as the report gives it. */
type Shown = { readonly value: number; readonly unit: string; readonly si: number };

/** A quantity's 95% interval: its ends as quantities and as the uncertainty cell shows them. */
export interface GlanceInterval {
  readonly low: Shown;
  readonly high: Shown;
  /** "3.9 mg / L": a Monte Carlo percentile to the place of its own uncertainty; the linear method's to 4 figures. */
  readonly lowShown: string;
  readonly highShown: string;
}

/** How sure an uncertainty cell is of one result at a glance (a Ratebook addition to the glance). */
export interface GlanceSure {
  /** The id of the uncertainty cell whose `of` names the result. */
  readonly cell: string;
  /** Its method; absent while the cell has no figures. */
  readonly method?: UncertaintyMethod;
  /** A verdict under Monte Carlo: the share of yes among the samples in which it had a value (full value). */
  readonly probability?: number;
  /** That share as the cell shows it, to the place of its standard error's first digit ("54%"). */
  readonly shown?: string;
  /** Its Monte Carlo standard error in percentage points, as the cell's summary writes it ("1.1"). */
  readonly pointsSE?: string;
  /** Monte Carlo: the samples the figure is counted over (those in which the result had a value). */
  readonly samples?: number;
  /** A quantity: its 95% interval. */
  readonly interval?: GlanceInterval;
  /** The figures in words: "yes in 54% of 2,000 samples (± 1.1 points, Monte Carlo)". */
  readonly words?: string;
  /** Why there are no figures: the cell failed or waits, has not computed yet, had no value, or is linear for a verdict. */
  readonly unavailable?: string;
  /** With `unavailable`: the cells the uncertainty cell waits on (ids). */
  readonly waitsOn?: readonly string[];
}

const count = (n: number) => n.toLocaleString('en-US');
const shownQ = (q: Shown) => (q.unit ? `${formatNumber(q.value)} ${unitAfterNumber(q.unit)}` : formatNumber(q.value));

/**
 * Per name, the uncertainty cells whose `of` names it, in document order: for a verdict the
 * first Monte Carlo cell is taken (the linear method gives no probability of one), else the first.
 */
export function uncertaintyCellsByName(cells: readonly Cell[]): Map<string, Cell[]> {
  const by = new Map<string, Cell[]>();
  for (const c of cells) {
    if (c.kind !== 'uncertainty' || !Array.isArray(c.of)) continue;
    for (const name of c.of) {
      if (typeof name !== 'string') continue;
      const list = by.get(name);
      if (!list) by.set(name, [c]);
      else if (!list.includes(c)) list.push(c);
    }
  }
  return by;
}

/** The cell a result of that kind is followed by, among those naming it. */
export function followingCell(list: readonly Cell[], verdict: boolean): Cell {
  return (verdict && list.find((c) => c.kind === 'uncertainty' && (c.method ?? 'monte-carlo') === 'monte-carlo')) || list[0];
}

/** How sure the uncertainty cell `r` is of `name`, a verdict or not, from its report. Cost: constant. */
export function sureOf(name: string, verdict: boolean, cell: string, r: CellReport | undefined): GlanceSure {
  if (!r) return { cell, unavailable: 'not computed' };
  if (!r.ok) {
    return r.waitsOn ? { cell, unavailable: `not computed: the uncertainty cell waits on ${r.waitsOn.join(', ')}`, waitsOn: [...r.waitsOn] }
      : { cell, unavailable: `not computed: ${r.error?.message ?? 'the uncertainty cell has a problem'}` };
  }
  const results = r.results as Record<string, UncertaintyResult> | undefined;
  const x = results?.[name];
  const method = r.method as UncertaintyMethod | undefined;
  if (r.computed === false || !x || !method) return { cell, unavailable: r.message ?? 'not computed yet' };
  const samples = typeof r.samples === 'number' ? r.samples - x.failed : undefined;
  if (x.probability !== undefined) {
    const shown = x.shown ?? `${formatNumber(100 * x.probability, 3)}%`;
    const pointsSE = x.probabilitySE !== undefined ? uncertaintyText(100 * x.probabilitySE) : undefined;
    const of = samples !== undefined ? ` of ${count(samples)} samples${x.failed ? ' with a value' : ''}` : '';
    return { cell, method, probability: x.probability, shown, ...(pointsSE !== undefined ? { pointsSE } : {}), ...(samples !== undefined ? { samples } : {}),
      words: `yes in ${shown}${of} (${pointsSE !== undefined ? `± ${pointsSE} points, ` : ''}Monte Carlo)` };
  }
  if (x.truth !== undefined) return { cell, method, unavailable: 'no probability: the linear method gives none for a yes/no verdict (Monte Carlo does)' };
  if (!verdict && x.p025 && x.p975) {
    const mc = method === 'monte-carlo';
    const interval: GlanceInterval = { low: x.p025, high: x.p975,
      lowShown: x.percentiles?.p025.shown ?? shownQ(x.p025), highShown: x.percentiles?.p975.shown ?? shownQ(x.p975) };
    const how = mc ? `2.5 to 97.5 percentile of ${samples !== undefined ? count(samples) : 'the'} Monte Carlo samples`
      : 'linear method: point value ∓ 1.96 SD';
    return { cell, method, interval, ...(mc && samples !== undefined ? { samples } : {}),
      words: `95% interval ${interval.lowShown} to ${interval.highShown} (${how})` };
  }
  if (method === 'linear') return { cell, method, unavailable: `no value${x.reason ? ` (${x.reason})` : ''}` };
  return { cell, method, unavailable: `no value in any sample${x.reason ? ` (${x.reason})` : ''}` };
}
