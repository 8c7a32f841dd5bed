/**
 * The text report's results at a glance, under the title and cautions: the report's `glance`
 * list in its order, each result's name, its value in the same words as the study view and the
 * printed sheet (`glanceWords`: where an uncertainty cell follows it, a verdict's probability of
 * yes over its point verdict, a quantity's point value over its 95% interval), and the cell it
 * comes from. The command line's report is evaluated to its end, so nothing is still computing.
 */
import type { Report } from '../engine/report.ts';
import { glanceWords } from './glance-words.ts';

export const GLANCE_HEADING = 'Results at a glance';

/** The block's lines, with no blank line inside; none when the report lists no result at a glance. Cost: linear in the entries. */
export function glanceLines(report: Report): string[] {
  const list = report.glance ?? [];
  if (!list.length) return [];
  const width = Math.min(24, Math.max(...list.map((g) => g.name.length)));
  const indent = ' '.repeat(4 + width + 2);
  const out = [GLANCE_HEADING, '-'.repeat(GLANCE_HEADING.length)];
  for (const g of list) {
    const w = glanceWords(g, report);
    const lines = w.sure === undefined ? [w.point] : w.sureFirst ? [w.sure, w.point] : [w.point, w.sure];
    const cell = report.cells.find((c) => c.id === g.cell);
    lines.push(`from ${cell?.title || g.cell}`);
    out.push(`    ${g.name.padEnd(width)}  ${lines[0]}`, ...lines.slice(1).map((l) => `${indent}${l}`));
  }
  return out;
}
