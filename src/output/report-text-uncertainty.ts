/** The terminal table's rows of an uncertainty cell: per result its figures on one line (Monte Carlo: each as the report shows it, to its own standard error, with that error; linear: 4 figures), the inputs drawn, the failed samples. */
import type { CellReport, UncertaintyFields } from '../engine/report.ts';
import type { ReportQuantity } from '../units/quantity.ts';
import { formatNumber } from '../units/quantity.ts';
import { unitAfterNumber } from '../units/units.ts';

const show = (q: ReportQuantity | undefined, digits = 4): string => (q ? `${formatNumber(q.value, digits)}${q.unit ? ` ${unitAfterNumber(q.unit)}` : ''}` : '—');

/** Rows for an uncertainty cell's report; undefined for another kind (or a cell with no results). */
export function uncertaintyRows(cell: CellReport): Array<[string, string]> | undefined {
  if (cell.kind !== 'uncertainty' || !cell.results) return undefined;
  const r = cell as Partial<UncertaintyFields>;
  const rows: Array<[string, string]> = [['method', r.method === 'linear' ? 'linear (first order)' : `Monte Carlo, ${r.samples} samples, seed ${r.seed}`]];
  for (const [name, x] of Object.entries(r.results ?? {})) {
    const failed = x.failed ? `; no value in ${x.failed} (${x.reason})` : '';
    if (x.probability !== undefined) rows.push([name, `yes in ${x.shown ?? `${formatNumber(100 * x.probability, 3)}%`} of samples${failed}${x.precision ? `, ${x.precision}` : ''}`]);
    else if (x.truth !== undefined) rows.push([name, `${x.truth ? 'yes' : 'no'} at the present values (no probability by the linear method)`]);
    else if (x.mean) {
      const pc = x.percentiles;
      const f = x.shownFigures;
      const mean = f ? `${f.mean} (± ${f.meanSE} Monte Carlo)` : show(x.mean);
      const sd = f ? `${f.sd} (± ${f.sdSE} Monte Carlo)` : show(x.sd);
      rows.push([name, `mean ${mean}, SD ${sd}, median ${pc?.median.shown ?? show(x.median)}, 95% ${pc?.p025.shown ?? show(x.p025)} to ${pc?.p975.shown ?? show(x.p975)}${failed}`]);
      if (x.precision) rows.push([`${name} precision`, x.precision]);
      if (x.percentilePrecision) rows.push([`${name} percentiles`, x.percentilePrecision]);
    }
    else rows.push([name, `no value${failed}`]);
  }
  for (const i of r.inputs ?? []) rows.push([`input ${i.name}`, i.text]);
  for (const w of r.warnings ?? []) rows.push(['spread not carried', w]);
  if (r.failed) rows.push(['failed samples', `${r.failed} (${r.failedReason})`]);
  rows.push(['evaluations', String(r.evaluations)]);
  for (const n of r.notes ?? []) rows.push(['note', n]);
  return rows;
}
