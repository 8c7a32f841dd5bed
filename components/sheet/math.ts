/**
 * Typesets TeX (made by the engine from the expression tree, see src/output/sheet-tex.ts) with KaTeX
 * as MathML, which Chromium and Firefox draw with their own math fonts: nothing to download,
 * so the sheet prints the same offline. Results are kept by their TeX.
 */
import katex from 'katex';
import { html, type TemplateResult } from 'lit';
import { unsafeHTML } from 'lit/directives/unsafe-html.js';

const made = new Map<string, string>();

/** The typeset formula, or its TeX as code when KaTeX cannot read it. */
export function math(tex: string, display = false): TemplateResult {
  const key = `${display ? 'D' : 'I'}${tex}`;
  let out = made.get(key);
  if (out === undefined) {
    try {
      // the TeX is built from a checked tree: names are [A-Za-z0-9_] and units come from a fixed list
      out = katex.renderToString(tex, { output: 'mathml', displayMode: display, throwOnError: true, trust: false });
    } catch {
      out = '';
    }
    if (made.size > 2000) made.clear();
    made.set(key, out);
  }
  return out ? html`${unsafeHTML(out)}` : html`<code>${tex}</code>`;
}
