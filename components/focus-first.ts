/**
 * Moves focus into a part of the page that has just appeared: its first field, found in
 * document order through shadow roots once each element there has rendered.
 */

/** Where a person types: text inputs, number boxes, text areas, expression editors (and a field waiting for its editor, which makes it on focus). */
const TYPING = 'input:not([type]), input[type="text"], input[type="number"], input[type="search"], textarea, [contenteditable="true"], [role="textbox"][tabindex="0"]';
/** Any other control, taken when there is nowhere to type. */
const CONTROL = 'input:not([type="hidden"]), select, button, [tabindex="0"]';

/**
 * Focuses the first field under `root` that takes typing (a text box's text selected), else
 * its first control, and scrolls it into view; skips what is disabled or not displayed. Resolves with the element focused, or
 * undefined. Cost: one walk.
 */
export async function focusFirstField(root: Element): Promise<HTMLElement | undefined> {
  const usable: HTMLElement[] = [];
  await collect(root, usable);
  const shown = usable.filter((el) => !(el as HTMLInputElement).disabled && el.getClientRects().length > 0);
  const target = shown.find((el) => el.matches(TYPING)) ?? shown.find((el) => el.matches(CONTROL));
  target?.focus();
  // a new cell's default text (a name such as `k`) is selected, so that typing replaces it
  if (target instanceof HTMLInputElement && target.matches(TYPING)) target.select();
  // an editor's content may take focus without scrolling to it: bring it into view
  target?.scrollIntoView({ block: 'nearest' });
  return target;
}

async function collect(el: Element, out: HTMLElement[]): Promise<void> {
  const lit = el as Element & { updateComplete?: Promise<unknown> };
  if (lit.updateComplete) await lit.updateComplete;
  if (el instanceof HTMLElement && (el.matches(TYPING) || el.matches(CONTROL))) out.push(el);
  for (const child of el.shadowRoot ? el.shadowRoot.children : []) await collect(child, out);
  for (const child of el.children) await collect(child, out);
}
