/**
 * Loads the study view's code (the cells' elements, the expression editor, the charts and the
 * part of the engine the page uses) apart from the app's first script, once. The library needs
 * none of it; a study's page asks for it while it reads the study from storage, so the two
 * scripts load, and run, in tasks of their own rather than in one long one.
 */
let loading: Promise<typeof import('./study-view.ts')> | undefined;

export function loadStudyView(): Promise<typeof import('./study-view.ts')> {
  // a failed fetch (offline, before the offline copy was made) is tried again next time
  loading ??= import('./study-view.ts').catch((err: unknown) => { loading = undefined; throw err; });
  return loading;
}
