/**
 * The printed sheet's sections of a sensitivity cell (the ranking as bars and a table of every
 * slope) and of a compare cell (what each scenario sets, every question's answer per
 * scenario, and the overlay chart). Layout only: every number is the report's.
 */
import { html, nothing, type TemplateResult } from 'lit';
import type { Cell, ReportOf, SimulationPlot } from '../../src/index.ts';
import { formatNumber } from '../../src/index.ts';
import { showQ, nameBreaks } from '../cells/common.ts';
import { rankingBars } from '../plots/ranking-bars.ts';

type Of<K extends Cell['kind']> = Extract<Cell, { kind: K }>;

export function sensitivitySheet(cell: Of<'sensitivity'>, r: ReportOf<'sensitivity'>): TemplateResult {
  const results = r.results ?? {};
  const ranking = r.ranking ?? [];
  return html`<p class="lead">How much ${(cell.of ?? []).join(', ')} move${(cell.of ?? []).length === 1 ? 's' : ''} with ${(cell.parameters ?? []).join(', ')}: each slope from runs of the study with one value moved a little either way.</p>
    <figure>${rankingBars({ ranking, results, summary: r.summary ?? '' })}</figure>
    <table class="slopes"><thead><tr><th>Result</th><th>Parameter</th><th>Slope</th><th>Normalized (% per 1%)</th><th>Note</th></tr></thead>
    <tbody>${ranking.map(({ of, parameter }) => {
      const e = results[of][parameter];
      return html`<tr><td class="name">${nameBreaks(of)}</td><td class="name">${nameBreaks(parameter)}</td><td class="num">${e.coefficient ? showQ(e.coefficient) : '—'}</td>
        <td class="num">${e.normalized === null ? '—' : formatNumber(e.normalized, 4)}</td><td>${e.note ?? ''}</td></tr>`;
    })}</tbody></table>
    ${typeof r.summary === 'string' ? html`<p class="summary">${r.summary}</p>` : nothing}
    <p class="check">${r.evaluations} runs of the study; ${r.accuracyWords}.</p>`;
}

/** `chart` draws a run's plot as the sheet draws a run's (sections.ts); the run is named by its title, else by its id. */
export function compareSheet(cell: Of<'compare'>, r: ReportOf<'compare'>, chart: (plot: SimulationPlot, summary: unknown) => TemplateResult, runTitle?: string): TemplateResult {
  const scenarios = r.scenarios ?? [];
  const questions = r.questions ?? [];
  return html`<p class="lead">The run <strong>${runTitle || cell.run}</strong> under ${scenarios.length} scenario${scenarios.length === 1 ? '' : 's'}; each answer is named question_scenario.</p>
    <table><thead><tr><th>Scenario</th><th>Sets</th></tr></thead>
    <tbody>${scenarios.map((s) => html`<tr><td class="name">${nameBreaks(s.name)}</td><td>${Object.entries(s.set).map(([n, q]) => `${n} = ${showQ(q)}`).join(', ') || 'nothing: the run as the study stands'}${s.ok ? '' : ` (${s.message})`}</td></tr>`)}</tbody></table>
    ${questions.length ? html`<table class="per-scenario follows"><thead><tr><th>Question</th>${scenarios.map((s) => html`<th>${s.name}</th>`)}</tr></thead>
      <tbody>${questions.map((q) => html`<tr><td class="name">${nameBreaks(q)}</td>${scenarios.map((s) => {
        const a = s.results[q];
        return html`<td class="num answer">${!a ? '—' : 'notReached' in a ? `not reached by ${showQ(a.end)}` : showQ(a)}</td>`;
      })}</tr>`)}</tbody></table>` : nothing}
    <div class="keep follows">${r.plot ? chart(r.plot, r.summary) : nothing}
    ${typeof r.summary === 'string' ? html`<p class="summary">${r.summary}</p>` : nothing}</div>`;
}
