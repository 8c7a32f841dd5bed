/**
 * The printed sheet's section of an uncertainty cell: the spread of every uncertain input, the
 * result table with its intervals and each mean's Monte Carlo error (the mean, the SD and each
 * percentile to the place its own standard error supports, and the percentiles' order-statistic
 * intervals in words), each verdict's probability
 * with its standard error and Wilson interval, whether the samples were enough for the digits
 * shown, a histogram per result, and where a computed value's own spread hides those upstream.
 * Layout only: every number is the report's.
 */
import { html, nothing, type TemplateResult } from 'lit';
import type { Cell, ReportOf } from '../../src/index.ts';
import { formatNumber } from '../../src/index.ts';
import { showQ, nameBreaks } from '../cells/common.ts';
import { histogramPlot } from '../plots/histogram-plot.ts';

type Of<K extends Cell['kind']> = Extract<Cell, { kind: K }>;

export function uncertaintySheet(cell: Of<'uncertainty'>, r: ReportOf<'uncertainty'>): TemplateResult {
  const results = Object.entries(r.results ?? {});
  const mc = r.method === 'monte-carlo';
  return html`<p class="lead">How sure ${(cell.of ?? []).join(', ')} ${(cell.of ?? []).length === 1 ? 'is' : 'are'}: ${mc ? `${r.samples?.toLocaleString('en-US')} Monte Carlo samples (seed ${r.seed})` : 'first-order propagation (linear)'} over these inputs.</p>
    ${(r.warnings ?? []).map((w) => html`<p class="check lead"><strong>Spread not carried.</strong> ${w}</p>`)}
    <table class="inputs lead"><thead><tr><th>Input</th><th>Spread</th></tr></thead>
    <tbody>${(r.inputs ?? []).map((i) => html`<tr><td class="name">${nameBreaks(i.name)}</td><td>${i.text}</td></tr>`)}</tbody></table>
    <table class="how-sure"><thead><tr><th>Result</th><th>Mean</th>${mc ? html`<th>± Mean's MC error</th>` : nothing}<th>SD</th><th>Median</th><th>95% interval</th>${mc ? html`<th>No value</th>` : nothing}</tr></thead>
    <tbody>${results.map(([name, x]) => html`<tr><td class="name">${nameBreaks(name)}</td>${x.mean
      ? html`<td class="num">${x.shownFigures?.mean ?? showQ(x.mean)}</td>${mc ? html`<td class="num">${x.shownFigures ? `± ${x.shownFigures.meanSE}` : ''}</td>` : nothing}<td class="num">${x.shownFigures?.sd ?? showQ(x.sd)}</td><td class="num">${x.percentiles?.median.shown ?? showQ(x.median)}</td><td class="num">${x.percentiles?.p025.shown ?? showQ(x.p025)} to ${x.percentiles?.p975.shown ?? showQ(x.p975)}</td>`
      : html`<td colspan=${mc ? 5 : 4}>${x.probability !== undefined ? `yes in ${x.shown ?? `${formatNumber(100 * x.probability, 3)}%`} of samples${x.precision ? `, ${x.precision}` : ''}` : x.truth !== undefined ? `${x.truth ? 'yes' : 'no'} at the present values` : `no value: ${x.reason ?? ''}`}</td>`}
      ${mc ? html`<td class="num">${x.failed}</td>` : nothing}</tr>`)}</tbody></table>
    ${results.filter(([, x]) => x.mean && x.precision).map(([name, x]) => html`<p class="check">${name}: ${x.precision}</p>`)}
    ${results.filter(([, x]) => x.mean && x.percentilePrecision).map(([name, x]) => html`<p class="check percentiles">${name}: ${x.percentilePrecision}</p>`)}
    ${r.failed ? html`<p class="check">${r.failed} samples left a name without a value: ${r.failedReason}.</p>` : nothing}
    ${results.filter(([, x]) => x.histogram).map(([name, x]) => html`<div class="keep">${histogramPlot(name, x.histogram!, [x.p025, x.p975], false)}</div>`)}
    ${typeof r.summary === 'string' ? html`<p class="summary">${r.summary}</p>` : nothing}
    ${(r.notes ?? []).map((n) => html`<p class="check">${n}</p>`)}`;
}
