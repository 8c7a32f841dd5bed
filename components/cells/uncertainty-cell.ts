import { html, nothing, css, unsafeCSS } from 'lit';
import { MAX_SAMPLES, formatNumber, type UncertaintyResult } from '../../src/index.ts';
import { cellStyles, footError, showQ, NARROW_PX } from './common.ts';
import { CellElement, type CellDoc } from './cell-element.ts';
import { histogramPlot, HISTOGRAM_CSS } from '../plots/histogram-plot.ts';

type UncertaintyDoc = CellDoc<'uncertainty'>;

/**
 * An uncertainty cell: the names to carry the uncertainty to, the method, samples and seed;
 * the engine's results (a table of mean with its Monte Carlo standard error, SD, median and the
 * 2.5–97.5 percentile interval, each Monte Carlo figure as the engine shows it, to the place its
 * own standard error supports (the linear method's to 4 figures); a
 * verdict's probability of yes as the samples support it, with its standard error and Wilson
 * interval; whether the samples were enough for the digits shown; each percentile's interval
 * from order statistics and the SD's standard error, in words;
 * a histogram per result), the uncertain inputs it drew, the samples in which a name had no
 * value, and a warning where a computed value's own spread hides the spreads upstream of it.
 * Renders only.
 */
export class UncertaintyCellElement extends CellElement<'uncertainty'> {
  static override styles = [cellStyles, css`
    input.names { width: 18rem; max-width: 100%; }
    input.count { width: 7rem; }
    table.results td, table.results th { text-align: right; }
    table.results td.name, table.results th.name { text-align: left; }
    .failed { color: #8a4b00; }
    .precision { font-size: 0.85rem; }
    p.hidden-spread { color: var(--stale-color, #5c3400); border-left: 3px solid #a85d00; background: #fff6e8; padding: 0.3rem 0.6rem; }
    p.verdict .precision { color: #4a5560; }
    p.precision { margin: 0.15rem 0; }
    .table-scroll { overflow-x: auto; max-width: 100%; }
    /* the interval may wrap after "to": the table fits a tablet's width */
    td.interval { white-space: normal; min-width: 7rem; }
    /* on a phone the table is stacked (common.ts): one block per result, each figure under its heading */
    @media (max-width: ${NARROW_PX}px) { table.results td { text-align: left; } table.results td.name { font-weight: 600; } }
    ${unsafeCSS(HISTOGRAM_CSS)}
  `];

  override render() {
    const c = this.cell;
    const claims = this.claims;
    const of = Array.isArray(c.of) ? c.of : [];
    const method = c.method ?? 'monte-carlo';
    const ofError = claims.take('.of') ?? of.map((_, i) => claims.take(`.of[${i}]`)).find((e) => e);
    return html`
      <div class="row">
        <label>How sure are <input class="names" type="text" data-field="of" aria-label="Names to carry the uncertainty to, separated by commas"
          .value=${this.ofDraft ?? of.join(', ')} @input=${(e: Event) => this.typeOf((e.target as HTMLInputElement).value)}
          @change=${(e: Event) => this.commitOf((e.target as HTMLInputElement).value)} /></label>
        ${footError(ofError)}
      </div>
      <div class="row">
        <label>Method <select data-field="method" @change=${(e: Event) => this.setMethod((e.target as HTMLSelectElement).value as UncertaintyDoc['method'])}>
          <option value="monte-carlo" ?selected=${method === 'monte-carlo'}>Monte Carlo (samples)</option>
          <option value="linear" ?selected=${method === 'linear'}>linear (first order)</option></select></label>
        ${method === 'monte-carlo' ? html`
          <label>Samples <input class="count" type="number" min="1" max=${MAX_SAMPLES} step="1" data-field="samples" .value=${String(c.samples ?? 2000)}
            @input=${(e: Event) => this.typeNumber('samples', (e.target as HTMLInputElement).value)}
            @change=${(e: Event) => this.setNumber('samples', (e.target as HTMLInputElement).value)} /></label>
          <label>Seed <input class="count" type="number" min="0" step="1" data-field="seed" .value=${String(c.seed ?? 1)}
            @input=${(e: Event) => this.typeNumber('seed', (e.target as HTMLInputElement).value)}
            @change=${(e: Event) => this.setNumber('seed', (e.target as HTMLInputElement).value)} /></label>` : nothing}
        ${footError(claims.take('.samples') ?? claims.take('.seed') ?? claims.take('.method'))}
      </div>
      ${this.results()}
      ${this.footErrors()}`;
  }

  private results() {
    const r = this.report;
    if (!r?.ok || !r.results) return nothing;
    const entries = Object.entries(r.results);
    const quantities = entries.filter(([, x]) => x.mean);
    const verdicts = entries.filter(([, x]) => x.probability !== undefined || x.truth !== undefined);
    const none = entries.filter(([, x]) => !x.mean && x.probability === undefined && x.truth === undefined);
    return html`<div class="figures">
      ${(r.warnings ?? []).map((w) => html`<p class="foot-error hidden-spread" role="note"><strong>Spread not carried.</strong> ${w}</p>`)}
      ${quantities.length ? html`<div class="table-scroll" role="region" tabindex="0" aria-label="How sure each result is"><table class="results stack"><caption class="sr">How sure each result is</caption>
        <thead><tr><th class="name">Result</th><th>mean</th>${r.method === 'monte-carlo' ? html`<th title="Monte Carlo standard error of the mean: SD / √samples">± mean's MC error</th>` : nothing}<th>SD</th><th>median</th><th title="from the 2.5 to the 97.5 percentile of the samples">95% interval</th>${r.method === 'monte-carlo' ? html`<th>no value</th>` : nothing}</tr></thead>
        <tbody>${quantities.map(([name, x]) => html`<tr><td class="name wide">${name}</td><td class="result" data-label="mean">${x.shownFigures?.mean ?? showQ(x.mean)}</td>${r.method === 'monte-carlo' ? html`<td class="result mcse" data-label="± mean's MC error">${x.shownFigures ? `± ${x.shownFigures.meanSE}` : ''}</td>` : nothing}<td class="result" data-label="SD">${x.shownFigures?.sd ?? showQ(x.sd)}</td>
          <td class="result" data-label="median">${x.percentiles?.median.shown ?? showQ(x.median)}</td><td class="result interval" data-label="95% interval">${x.percentiles?.p025.shown ?? showQ(x.p025)} to ${x.percentiles?.p975.shown ?? showQ(x.p975)}</td>
          ${r.method === 'monte-carlo' ? html`<td class=${x.failed ? 'failed' : ''} data-label="no value">${x.failed}</td>` : nothing}</tr>`)}</tbody></table></div>` : nothing}
      ${quantities.filter(([, x]) => x.precision).map(([name, x]) => html`<p class="precision muted">${name}: ${x.precision}</p>`)}
      ${quantities.filter(([, x]) => x.percentilePrecision).map(([name, x]) => html`<p class="precision percentiles muted">${name}: ${x.percentilePrecision}</p>`)}
      ${verdicts.map(([name, x]) => html`<p class="verdict">${this.verdictWords(name, x, r.samples)}</p>`)}
      ${none.map(([name, x]) => html`<p class="foot-error">${name}: no value (${x.reason ?? 'no reason given'}).</p>`)}
      ${r.failed ? html`<p class="failed">${r.failed.toLocaleString('en-US')} of ${r.samples?.toLocaleString('en-US')} samples left a name without a value: ${r.failedReason}.</p>` : nothing}
      ${quantities.filter(([, x]) => x.histogram).map(([name, x]) => histogramPlot(name, x.histogram!, [x.p025, x.p975]))}
      <p class="muted">Uncertain inputs: ${(r.inputs ?? []).map((i) => `${i.name} ${i.text}`).join('; ')}.</p>
      <p class="muted">${r.summary} ${r.evaluations} runs of the study's values. ${(r.notes ?? []).join(' ')}</p></div>`;
  }

  private verdictWords(name: string, x: UncertaintyResult, samples: number | undefined) {
    if (x.probability !== undefined) {
      const counted = (samples ?? 0) - x.failed;
      return html`${name}: yes in <span class="result">${x.shown ?? `${formatNumber(100 * x.probability, 3)}%`}</span> of ${counted.toLocaleString('en-US')} samples${x.failed ? html` <span class="failed">(${x.failed} without a value)</span>` : nothing}${x.precision ? html`, <span class="precision">${x.precision}</span>` : nothing}`;
    }
    return html`${name}: ${x.truth ? 'yes' : 'no'} at the present values (the linear method gives no probability for a yes/no verdict)`;
  }

  /**
   * The names as typed since the box last committed: each keystroke is an edit (so a reload at
   * once keeps it), while the box keeps the text as typed ("a,b" is not rewritten "a, b" under
   * the caret) until it commits.
   */
  private ofDraft?: string;

  private static namesIn(text: string): string[] {
    return text.split(/[,\s]+/).map((s) => s.trim()).filter((s) => s);
  }

  protected override willUpdate(): void {
    super.willUpdate();
    // an undo, or any change from elsewhere, shows the document's names again
    const of = Array.isArray(this.cell.of) ? this.cell.of : [];
    if (this.ofDraft !== undefined && UncertaintyCellElement.namesIn(this.ofDraft).join(',') !== of.join(',')) this.ofDraft = undefined;
  }

  private typeOf(text: string) {
    this.ofDraft = text;
    this.edit({ of: UncertaintyCellElement.namesIn(text) }, 'of');
  }

  private commitOf(text: string) {
    this.ofDraft = undefined;
    this.edit({ of: UncertaintyCellElement.namesIn(text) }, 'of');
    this.requestUpdate();
  }

  private setMethod(method: UncertaintyDoc['method']) {
    this.edit({ method });
  }

  /**
   * A number as it is typed, an edit at each keystroke (one undo step), so a reload at once
   * keeps it; a box still blank, or not yet a number ("1e"), waits for the commit below.
   */
  private typeNumber(key: 'samples' | 'seed', text: string) {
    if (text.trim() === '' || !Number.isFinite(Number(text))) return;
    this.replace({ ...this.cell, [key]: Number(text) } as UncertaintyDoc, key);
  }

  /** A whole number as typed; a blank removes the field (its default applies), anything else is kept for the engine to refuse. */
  private setNumber(key: 'samples' | 'seed', text: string) {
    const { [key]: _old, ...rest } = this.cell;
    if (text.trim() === '') this.replace(rest as UncertaintyDoc);
    else this.replace({ ...rest, [key]: Number(text) } as UncertaintyDoc);
  }
}

customElements.define('uncertainty-cell', UncertaintyCellElement);
