/**
 * A pending cell's report as the page holds it (a Monte Carlo still computing keeps its previous
 * figures): each answer of the engine brings the cell's report again, copied afresh by the
 * message. While the cell stays pending and its report reads the same, the page keeps the
 * object it already had, so the study view can leave the cell's element as it is drawn instead
 * of drawing its histograms again at every position of a dragged slider. Compares only (as
 * their JSON would, without writing it: `sameContent`); the engine computes every figure.
 */
import { sameContent, type CellReport, type Report } from '../src/index.ts';

/** `next` with the reports of cells pending in both answers, and unchanged, taken from `prev` (the same objects). */
export function keepPendingReports(prev: Report | undefined, prevPending: readonly string[], next: Report, pending: readonly string[]): Report {
  if (!prev || !pending.length || !prevPending.length) return next;
  let cells: CellReport[] | undefined;
  next.cells.forEach((c, i) => {
    if (!pending.includes(c.id) || !prevPending.includes(c.id)) return;
    const old = prev.cells.find((x) => x.id === c.id);
    if (!old || old === c || !sameContent(old, c)) return;
    cells ??= [...next.cells];
    cells[i] = old;
  });
  return cells ? { ...next, cells } : next;
}
