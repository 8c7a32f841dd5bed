import { html, nothing, css } from 'lit';
import type { CompareScenario } from '../../src/index.ts';
import { cellStyles, footError, showQ, NARROW_PX } from './common.ts';
import { CellElement } from './cell-element.ts';
import '../expr-field.ts';
import '../plots/time-plot.ts';

/**
 * A compare cell: the run to compare and its scenarios, each a name and the values it sets
 * (a parameter or state picked from the study, and its value as an expression); the engine's
 * overlay chart of every scenario's curves, and a table of every question's answer per
 * scenario. Adding or removing a scenario or a value is one edit; typing in a field merges
 * into one undo step.
 */
export class CompareCellElement extends CellElement<'compare'> {
  static override styles = [cellStyles, css`
    fieldset.scenario { border: 1px solid #d5dbe0; border-radius: 6px; margin: 0.4rem 0; padding: 0.3rem 0.6rem; min-width: 0; }
    /* the select keeps the width of its names (shrunk, it showed only its arrow); a long name is cut at 9rem */
    span.set select { flex: none; max-width: 9rem; }
    fieldset.scenario legend { font-size: 0.85rem; color: #3b4650; padding: 0 0.3rem; }
    span.set { display: inline-flex; align-items: center; gap: 0.3rem; flex-wrap: nowrap; max-width: 100%; }
    expr-field.set-value { flex: 0 1 10rem; min-width: 6rem; }
    table.answers { width: auto; }
    /* on a phone the table is stacked (common.ts): a block per question, each answer under its scenario's name */
    @media (max-width: ${NARROW_PX}px) { table.answers th[scope='row'] { display: block; flex-basis: 100%; border: 0; padding: 0; } table.answers td.num { text-align: left; } }
  `];

  /** The study's parameters and states: what a scenario can set. */
  private settable(): string[] {
    const out: string[] = [];
    for (const c of this.doc?.cells ?? []) {
      if (c.kind === 'parameters' && Array.isArray(c.items)) for (const i of c.items) if (typeof i?.name === 'string' && i.name) out.push(i.name);
      if (c.kind === 'rate' && typeof c.state === 'string' && c.state) out.push(c.state);
    }
    return out;
  }

  /** A parameter's value as the study writes it (a state's initial value), for a new entry. */
  private written(name: string): string {
    for (const c of this.doc?.cells ?? []) {
      if (c.kind === 'parameters' && Array.isArray(c.items)) { const i = c.items.find((x) => x?.name === name); if (i) return i.value; }
      if (c.kind === 'rate' && c.state === name) return c.initial;
    }
    return '';
  }

  override render() {
    const c = this.cell;
    const scenarios = Array.isArray(c.scenarios) ? c.scenarios : [];
    const runs = (this.doc?.cells ?? []).filter((x) => x.kind === 'simulate');
    return html`
      <div class="row"><label>Run to compare
        <select data-field="run" aria-label="Run to compare" @change=${(e: Event) => this.edit({ run: (e.target as HTMLSelectElement).value })}>
          ${runs.some((x) => x.id === c.run) ? nothing : html`<option value=${c.run ?? ''} selected>${c.run || '(choose a run)'}</option>`}
          ${runs.map((x) => html`<option value=${x.id} ?selected=${x.id === c.run}>${x.title || x.id}</option>`)}
        </select></label>
        ${footError(this.claims.take('.run'))}
      </div>
      ${scenarios.map((s, j) => this.scenario(scenarios, s, j))}
      <div class="row"><button class="add-scenario" @click=${() => this.addScenario(scenarios)}>Add a scenario</button>
        ${footError(this.claims.take('.scenarios'))}</div>
      ${this.results()}
      ${this.footErrors()}`;
  }

  private scenario(all: readonly CompareScenario[], s: CompareScenario, j: number) {
    const set = s && typeof s.set === 'object' && s.set !== null ? s.set : {};
    const entries = Object.entries(set);
    const label = s?.name || `${j + 1}`;
    const options = this.settable();
    const path = `scenarios[${j}]`;
    return html`<fieldset class="scenario"><legend>Scenario ${j + 1}</legend>
      <div class="row">
        <label>Name <input class="name" type="text" data-field="${path}.name" aria-label="Name of scenario ${j + 1}" .value=${s?.name ?? ''}
          @input=${(e: Event) => this.setScenario(all, j, { ...s, name: (e.target as HTMLInputElement).value }, `${path}.name`)} /></label>
        <button class="quiet remove-scenario" aria-label="Remove scenario ${label}" @click=${() => this.edit({ scenarios: all.filter((_, k) => k !== j) })}>✕ Remove</button>
        ${footError(this.claims.take(`.${path}.name`))}
      </div>
      <div class="row">
        ${entries.length ? nothing : html`<span class="muted">Sets nothing: the run as the study stands.</span>`}
        ${entries.map(([name, value], k) => html`<span class="set" data-entry="${j}/${name}">
          <select data-field="${path}.set" aria-label="Scenario ${label}: value ${k + 1} to set"
            @change=${(e: Event) => this.renameEntry(all, j, name, (e.target as HTMLSelectElement).value)}>
            ${(options.includes(name) ? options : [name, ...options]).filter((o) => o === name || !(o in set)).map((o) => html`<option value=${o} ?selected=${o === name}>${o}</option>`)}
          </select> =
          <expr-field class="set-value" data-field="${path}.set" label="Scenario ${label}: ${name}" .value=${value} .names=${this.names}
            .error=${this.claims.take(`.${path}.set.${name}`)}
            @expr-input=${(e: CustomEvent<{ value: string }>) => this.setScenario(all, j, { ...s, set: { ...set, [name]: e.detail.value } }, `${path}.set.${name}`)}></expr-field>
          <button class="quiet" aria-label="Scenario ${label}: stop setting ${name}" @click=${() => this.setScenario(all, j, { ...s, set: Object.fromEntries(entries.filter(([n]) => n !== name)) })}>✕</button>
        </span>`)}
        ${options.some((o) => !(o in set)) ? html`<button class="add-value" data-field="${path}.set" aria-label="Set a value in scenario ${label}" @click=${() => this.addEntry(all, j, options)}>Set a value</button>` : nothing}
        ${footError(this.claims.take(`.${path}.set`))}
      </div></fieldset>`;
  }

  /** Every question's answer per scenario, and the overlay chart. */
  private results() {
    const r = this.report;
    if (!r?.ok || !r.scenarios) return nothing;
    const questions = r.questions ?? [];
    return html`
      ${questions.length ? html`<div class="scroll"><table class="answers stack">
        <caption class="sr">Each question's answer per scenario</caption>
        <thead><tr><th>Question</th>${r.scenarios.map((s) => html`<th class="num">${s.name}</th>`)}</tr></thead>
        <tbody>${questions.map((q) => html`<tr><th scope="row">${q}</th>${r.scenarios!.map((s) => {
          const a = s.results[q];
          return html`<td class="num result" data-label=${s.name} title=${a && 'notReached' in a ? a.message : ''}>${!a ? '—' : 'notReached' in a ? `not reached by ${showQ(a.end)}` : showQ(a)}</td>`;
        })}</tr>`)}</tbody></table></div>
        <p class="muted">Each answer is defined as question_scenario (${questions[0]}_${r.scenarios[0]?.name ?? ''}, …) for the cells below.</p>` : html`<p class="muted">The run asks no questions: the chart alone compares the scenarios.</p>`}
      ${r.scenarios.filter((s) => !s.ok).map((s) => html`<p class="foot-error" role="alert">Scenario ${s.name}: ${s.message}</p>`)}
      ${r.plot ? html`<time-plot .plot=${r.plot} .summary=${r.summary ?? ''}></time-plot>` : nothing}`;
  }

  private setScenario(all: readonly CompareScenario[], j: number, next: CompareScenario, key?: string): void {
    this.edit({ scenarios: all.map((s, k) => (k === j ? next : s)) }, key);
  }

  /** A new scenario: a name not used yet, setting nothing (the run as it stands) until a value is added; focus goes to its name. */
  private addScenario(all: readonly CompareScenario[]): void {
    let n = all.length + 1;
    while (all.some((s) => s?.name === `scenario_${n}`)) n++;
    this.edit({ scenarios: [...all, { name: `scenario_${n}`, set: {} }] });
    this.focusWhenShown(`input[data-field="scenarios[${all.length}].name"]`);
  }

  /** Sets the first parameter the scenario does not set yet, to the value the study gives it now (so nothing changes until it is edited); focus goes to that value. */
  private addEntry(all: readonly CompareScenario[], j: number, options: readonly string[]): void {
    const s = all[j];
    const name = options.find((o) => !(o in (s.set ?? {})));
    if (name === undefined) return;
    this.setScenario(all, j, { ...s, set: { ...(s.set ?? {}), [name]: this.written(name) } });
    this.focusWhenShown(`span.set[data-entry="${CSS.escape(`${j}/${name}`)}"] expr-field`);
  }

  /** Another name for an entry, keeping its value and its place. */
  private renameEntry(all: readonly CompareScenario[], j: number, from: string, to: string): void {
    const s = all[j];
    if (to === from || to in (s.set ?? {})) return;
    this.setScenario(all, j, { ...s, set: Object.fromEntries(Object.entries(s.set ?? {}).map(([n, v]) => [n === from ? to : n, v])) });
  }
}

customElements.define('compare-cell', CompareCellElement);
