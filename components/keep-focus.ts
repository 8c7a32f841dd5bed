/**
 * Focus kept on the page through a change that may remove the field holding it (an undo that
 * takes back the row just added): a keyboard user is not thrown to the top of the page. The
 * study view takes `focusBefore` before the change and calls `keepFocus` after it.
 */

/** Where focus was in the study view: the cell holding it, and that cell's kind. */
export interface FocusPlace {
  readonly cell: string;
  readonly kind: string;
}

/** The cell that holds focus in the view's shadow root `root`, if any. */
export function focusBefore(root: ShadowRoot, kindOf: (id: string) => string | undefined): FocusPlace | undefined {
  const cell = root.activeElement?.closest('article[data-cell]')?.getAttribute('data-cell');
  const kind = cell ? kindOf(cell) : undefined;
  return cell && kind ? { cell, kind } : undefined;
}

/**
 * Once the cells have drawn the change (their renders are microtasks, done before a timer),
 * and only when focus has left the view (its field was removed): focuses the cell that held
 * it (the next Tab goes into its first field), or when that cell is gone, the Add button
 * `addButton` gives for its kind. Resolves with the element focused, or undefined.
 */
export async function keepFocus(root: ShadowRoot, before: FocusPlace | undefined, addButton: (kind: string) => HTMLElement | undefined): Promise<HTMLElement | undefined> {
  if (!before) return undefined;
  await new Promise((resolve) => setTimeout(resolve, 0));
  if (root.activeElement) return undefined;
  const article = root.querySelector<HTMLElement>(`article[data-cell="${CSS.escape(before.cell)}"]`);
  const target = article ?? addButton(before.kind);
  if (!target) return undefined;
  if (target === article) article.tabIndex = -1;
  target.focus();
  return target;
}

/**
 * After a step taken from the Undo or Redo button `held`: once the view has drawn the step,
 * when it left `held` disabled (nothing more to undo, or to redo) and focus with it, focus goes
 * to `other`, the button that takes the step back (a keyboard user pressing Enter again stays
 * on the bar, not at the top of the page). Resolves with the element focused, or undefined.
 */
export async function keepFocusOnBar(root: ShadowRoot, held: HTMLButtonElement | undefined, other: () => HTMLButtonElement | undefined): Promise<HTMLElement | undefined> {
  if (!held) return undefined;
  await new Promise((resolve) => setTimeout(resolve, 0));
  if (!held.disabled || (root.activeElement && root.activeElement !== held)) return undefined;
  const target = other();
  if (!target || target.disabled) return undefined;
  target.focus();
  return target;
}
