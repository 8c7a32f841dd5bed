/**
 * The printed sheet's part of a fit with an error model: for a Bayesian (MAP) estimate, per
 * estimate the prior, the estimate and how far the data moved it, then the data it combined
 * (the measured points) and the error model. Lays out the engine's report; computes nothing.
 */
import { html, nothing, type TemplateResult } from 'lit';
import { formatNumber, type ReportOf } from '../../src/index.ts';
import { showQ, nameBreaks } from '../cells/common.ts';

/** At most this many measured points are listed in words; more are in the data cell's own section. */
const LISTED_POINTS = 12;

/** Prior, data and estimate of a fit under an error model; nothing for an ordinary fit. */
export function fitPriorPart(r: ReportOf<'fit'>): TemplateResult | typeof nothing {
  if (!r.errorModel) return nothing;
  const est = Object.entries(r.estimates ?? {});
  const plot = r.plot;
  const points = (plot?.points ?? []).flatMap((p) => p.t.map((t, i) => `${formatNumber(p.values[i])} ${plot!.states.find((s) => s.name === p.state)?.unit ?? ''} at ${formatNumber(t)} ${plot!.timeUnit}`));
  const em = r.errorModel;
  return html`${r.bayesian ? html`<p class="follows"><strong>Bayesian (MAP) estimate</strong>: each estimate with a prior combines the data with that prior; standard errors and intervals come from the curvature of the objective (the posterior's normal approximation, on the log scale for an estimate with a prior).</p>` : nothing}
    ${r.bayesian ? html`<table class="results follows"><thead><tr><th>Estimate</th><th>Prior median</th><th>omega</th><th>Estimate</th><th>Estimate ÷ median</th><th>Shift (omegas)</th></tr></thead>
      <tbody>${est.map(([name, e]) => html`<tr><td class="name">${nameBreaks(name)}</td>${e.prior
        ? html`<td class="num">${showQ(e.prior.median)}</td><td class="num">${e.prior.omega}</td><td class="num answer">${showQ(e.value)}</td><td class="num">${e.prior.ratio.toPrecision(3)}</td><td class="num">${e.prior.shift.toFixed(2)}</td>`
        : html`<td colspan="2">no prior</td><td class="num answer">${showQ(e.value)}</td><td></td><td></td>`}</tr>`)}</tbody></table>` : nothing}
    <p class="check follows">Data: ${r.n} point${r.n === 1 ? '' : 's'}${points.length && points.length <= LISTED_POINTS ? html` (${points.join('; ')})` : nothing}. Error model: SD² = additive² + (proportional × predicted)², additive ${em.additive ? showQ(em.additive) : '0'}, proportional ${em.proportional}${r.objective !== undefined ? html`; objective at the estimate ${formatNumber(r.objective, 4)}` : nothing}.</p>`;
}
