import { html, nothing, css, unsafeCSS } from 'lit';
import { formatNumber, type SensitivityEntry } from '../../src/index.ts';
import { cellStyles, showQ } from './common.ts';
import { CellElement } from './cell-element.ts';
import { nameList } from './name-list.ts';
import { rankingBars, RANKING_CSS } from '../plots/ranking-bars.ts';

/**
 * A sensitivity cell: the results to follow and the parameters to vary, each a list of names;
 * the engine's ranking as a bar chart of the normalized slopes (largest effect first) and a
 * table of every slope with its note.
 */
export class SensitivityCellElement extends CellElement<'sensitivity'> {
  static override styles = [cellStyles, css`
    span.entry { display: inline-flex; align-items: center; gap: 0.15rem; flex-wrap: wrap; }
    ${unsafeCSS(RANKING_CSS)}
    td.note { font-size: 0.85rem; color: #4a5560; }
  `];

  override render() {
    const c = this.cell;
    const of = Array.isArray(c.of) ? c.of : [];
    const parameters = Array.isArray(c.parameters) ? c.parameters : [];
    const answers = (this.doc?.cells ?? []).flatMap((x) => (x.kind === 'simulate' && Array.isArray(x.find) ? x.find.map((f) => f?.name) : []));
    const params = (this.doc?.cells ?? []).flatMap((x) => (x.kind === 'parameters' && Array.isArray(x.items) ? x.items.map((i) => i?.name) : []));
    const firstNot = (list: Array<string | undefined>, taken: readonly string[]) => list.find((n): n is string => typeof n === 'string' && !taken.includes(n)) ?? '';
    return html`
      <div class="row"><span class="lbl">Follow</span>
        ${nameList({ field: 'of', what: 'Result to follow', names: of, claims: this.claims, add: 'Follow another result', next: firstNot(answers, of), set: (names, key) => this.edit({ of: names }, key), focus: (s) => this.focusWhenShown(s) })}
      </div>
      <div class="row"><span class="lbl">Vary</span>
        ${nameList({ field: 'parameters', what: 'Parameter to vary', names: parameters, claims: this.claims, add: 'Vary another parameter', next: firstNot(params, parameters), set: (names, key) => this.edit({ parameters: names }, key), focus: (s) => this.focusWhenShown(s) })}
      </div>
      ${this.results()}
      ${this.footErrors()}`;
  }

  private results() {
    const r = this.report;
    if (!r?.ok || !r.results || !r.ranking) return nothing;
    const entry = (of: string, p: string): SensitivityEntry => r.results![of][p];
    return html`
      ${rankingBars({ ranking: r.ranking, results: r.results, summary: r.summary ?? '' })}
      <p class="summary">${r.summary}</p>
      <table class="stack">
        <caption class="sr">Every slope, largest normalized first</caption>
        <thead><tr><th>Result</th><th>Parameter</th><th>Per unit of the parameter</th><th>Per 1% (normalized)</th><th>Note</th></tr></thead>
        <tbody>${r.ranking.map(({ of, parameter }) => {
          const e = entry(of, parameter);
          return html`<tr><td data-label="Result">${of}</td><td data-label="Parameter">${parameter}</td>
            <td class="num result" data-label="Per unit of the parameter">${e.coefficient ? showQ(e.coefficient) : '—'}</td>
            <td class="num result" data-label="Per 1% (normalized)">${e.normalized === null ? '—' : formatNumber(e.normalized, 4)}</td>
            <td class="note wide" data-label="Note">${e.note ?? ''}</td></tr>`;
        })}</tbody>
      </table>
      <p class="muted">${r.evaluations} runs of the study's values; ${r.accuracyWords}.</p>`;
  }
}

customElements.define('sensitivity-cell', SensitivityCellElement);
