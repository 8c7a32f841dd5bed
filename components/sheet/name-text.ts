import { html, type TemplateResult } from 'lit';

/**
 * A study name for the sheet's narrow name columns: a line may break after each underscore
 * (`t_half_` / `cambridge`), so that a long name wraps at its own joints instead of in the
 * middle of a word (the column's `overflow-wrap: anywhere` is left for a part longer than the
 * column). The text is the name, whole: copied, it reads the same.
 */
export function nameText(name: string): TemplateResult {
  const parts = name.split(/(?<=_)/);
  return html`${parts.map((p, i) => (i === 0 ? p : html`<wbr />${p}`))}`;
}
