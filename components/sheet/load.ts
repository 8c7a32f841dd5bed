/**
 * Loads the printed sheet's code (KaTeX among it) apart from the app's first page, once: the
 * study view asks for it as soon as it opens, so it is there before anyone prints.
 */
let loading: Promise<unknown> | undefined;

export function loadSheet(): Promise<unknown> {
  loading ??= import('./study-sheet.ts');
  return loading;
}
