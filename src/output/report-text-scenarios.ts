/**
 * The terminal table's rows for the cells that set answers side by side: a sensitivity cell's
 * slopes in ranked order, and a compare cell's answers per scenario (as the names it defines).
 * Used by report-text.ts; undefined for the other kinds.
 */
import type { CellReport, ReportQuantity } from '../engine/report.ts';
import { formatNumber } from '../units/quantity.ts';
import { unitAfterNumber } from '../units/units.ts';

const show = (q: ReportQuantity) => `${formatNumber(q.value, 6)}${q.unit ? ` ${unitAfterNumber(q.unit)}` : ''}`;

export function scenarioRows(cell: CellReport): Array<[string, string]> | undefined {
  if (cell.kind === 'sensitivity') {
    if (!cell.results || !cell.ranking) return [];
    const rows: Array<[string, string]> = cell.ranking.map(({ of, parameter }) => {
      const e = cell.results![of][parameter];
      const normalized = e.normalized === null ? 'no normalized value' : `normalized ${formatNumber(e.normalized, 4)}`;
      const value = e.coefficient ? `${show(e.coefficient)}  (${normalized})` : 'no slope';
      return [`d ${of} / d ${parameter}`, `${value}${e.note ? `  ${e.note}` : ''}`];
    });
    rows.push(['what-if runs', String(cell.evaluations ?? 0)]);
    if (cell.accuracyWords) rows.push(['accuracy', cell.accuracyWords]);
    return rows;
  }
  if (cell.kind === 'compare') {
    if (!cell.scenarios) return [];
    const rows: Array<[string, string]> = [];
    for (const s of cell.scenarios) {
      const set = Object.entries(s.set).map(([n, q]) => `${n} = ${show(q)}`).join(', ') || 'as the study stands';
      rows.push([`scenario ${s.name}`, s.ok ? set : `${set}: ${s.message ?? 'failed'}`]);
      for (const q of cell.questions ?? []) {
        const a = s.results[q];
        if (a) rows.push([`${q}_${s.name}`, 'notReached' in a ? a.message : show(a)]);
      }
    }
    return rows;
  }
  return undefined;
}
