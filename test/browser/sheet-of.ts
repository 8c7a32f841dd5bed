// A printed sheet of a study on the page, computed by the engine in the page (runStudy), with
// the cells marked as still computing and their progress, as the study view would hand them.
import '../../components/sheet/study-sheet.ts';
import type { StudySheet } from '../../components/sheet/study-sheet.ts';
import { runStudy, type Report, type Study } from '../../src/index.ts';

export type SheetProgress = { cell: string; done: number; total: number; unit: string };

/** Renders `doc`'s sheet with `pending` cells (and `progress`); the caller removes `sheet`. */
export async function sheetOf(doc: Study, pending: string[] = [], progress?: SheetProgress): Promise<{ sheet: StudySheet; report: Report }> {
  const r = runStudy(doc);
  if (!r.ok) throw new Error(r.error.message);
  const sheet = document.createElement('study-sheet');
  sheet.study = doc;
  sheet.report = r.report;
  sheet.pending = pending;
  if (progress) sheet.progress = progress;
  document.body.append(sheet);
  await sheet.updateComplete;
  return { sheet, report: r.report };
}
