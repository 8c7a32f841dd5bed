// A study view on the page with the real engine worker, resolved once the engine has answered
// and the view has rendered that answer.
import { StudyView } from '../../components/study-view.ts';
import type { Study } from '../../src/index.ts';

export async function mountStudy(doc: unknown, id = 'test'): Promise<StudyView> {
  const view = StudyView.create();
  document.body.append(view);
  const answered = new Promise<void>((resolve) => { const off = view.controller.onAnswer(() => { off(); resolve(); }); });
  view.controller.open(id, structuredClone(doc) as Study);
  await answered;
  await view.updateComplete;
  return view;
}
