import { html, nothing, css } from 'lit';
import type { ClosedFormReport, FindResult, SimulationPlot } from '../../src/index.ts';
import { cellStyles, footError, showQ, type ErrorClaims } from './common.ts';
import type { StudyName } from '../expr-field.ts';
import { CellElement, type CellDoc } from './cell-element.ts';
import { exportSeriesCsv } from '../series-csv.ts';
import '../expr-field.ts';
import '../unit-pick.ts';
import type { UnitPickDetail } from '../unit-pick.ts';
import '../plots/time-plot.ts';
import {
  FIND_KINDS, findKindOf, needsLevel as usesLevel, switchFind, withFindState, withFindUnit, freshFindName,
  EVENT_ACTIONS, eventActionOf, eventTarget, withTarget, switchAction, withEventField,
  type EventAction, type FindKind, type FindQuery as FindDoc, type ScheduleEvent as EventDoc,
} from '../../src/index.ts';

type SimulateCellDoc = CellDoc<'simulate'>;
const FIND_LABELS: Record<string, string> = {
  crossing: 'time it crosses', maximum: 'largest value', minimum: 'smallest value', timeOfMaximum: 'time of largest',
  timeOfMinimum: 'time of smallest', valueOf: 'value at', integralOf: 'area under', timeAbove: 'time above', timeBelow: 'time below',
};
const METHOD_LABELS: Record<string, string> = {
  auto: 'automatic (switches to stiff when needed)', dopri5: 'Dormand–Prince 5(4), adaptive', stiff: 'stiff (implicit, adaptive)',
  rk4: 'Runge–Kutta 4, fixed step', heun: 'Heun, fixed step', euler: 'Euler, fixed step',
  dp853: 'Dormand–Prince 8(5,3), adaptive, for tight tolerances',
};

/** A simulate cell: the run's span and method, its schedule, its questions, and the results with their plot. */
export class SimulateCellElement extends CellElement<'simulate'> {
  static override styles = [cellStyles, css`
    .events td, .finds td { padding: 0.15rem 0.25rem; }
    .events expr-field, .finds expr-field { min-width: 4.5rem; }
    .scroll { overflow-x: auto; }
    input.count { width: 4rem; }
    details { margin: 0.4rem 0; }
    summary { cursor: pointer; font-weight: 600; font-size: 0.9rem; color: #2b3640; }
  `];

  override render() {
    const c = this.cell;
    const claims = this.claims;
    const names = this.names;
    const laws = this.laws();
    const fixed = c.method === 'rk4' || c.method === 'heun' || c.method === 'euler';
    const results = this.report?.results ?? {};
    const plot = this.report?.plot;
    return html`
      <div class="row">
        <span class="lbl">Laws</span>
        ${laws.map(({ id, label }) => html`<label><input type="checkbox" .checked=${(c.rates ?? []).includes(id)}
          @change=${(e: Event) => this.setRates(id, (e.target as HTMLInputElement).checked)} /> ${label}</label>`)}
        ${laws.length === 0 ? html`<span class="muted">Add a rate cell first.</span>` : nothing}
      </div>
      <div class="row">
        <span class="lbl">From</span>
        <expr-field style="flex: 0 1 8rem" label="Start of the run" .value=${c.from ?? ''} .names=${names} .error=${claims.take('.from')}
          @expr-input=${(e: CustomEvent<{ value: string }>) => this.edit({ from: e.detail.value }, 'from')}></expr-field>
        <span class="lbl">to</span>
        <expr-field style="flex: 0 1 8rem" label="End of the run" .value=${c.to ?? ''} .names=${names} .error=${claims.take('.to')}
          @expr-input=${(e: CustomEvent<{ value: string }>) => this.edit({ to: e.detail.value }, 'to')}></expr-field>
        <label>Method <select .value=${c.method ?? 'auto'} @change=${(e: Event) => this.edit({ method: (e.target as HTMLSelectElement).value as SimulateCellDoc['method'] }, 'method')}>
          ${Object.entries(METHOD_LABELS).map(([m, l]) => html`<option value=${m} ?selected=${(c.method ?? 'auto') === m}>${l}</option>`)}
        </select></label>
        ${fixed || c.step !== undefined ? html`<span class="lbl">Step</span><expr-field style="flex: 0 1 7rem" label="Fixed step" .value=${c.step ?? ''} .error=${claims.take('.step')}
          @expr-input=${(e: CustomEvent<{ value: string }>) => this.edit({ step: e.detail.value }, 'step')}></expr-field>` : nothing}
      </div>
      <details ?open=${(c.events ?? []).length > 0}>
        <summary>Schedule (${(c.events ?? []).length} event${(c.events ?? []).length === 1 ? '' : 's'})</summary>
        ${this.eventsTable(claims, names)}
      </details>
      <details open>
        <summary>Questions (${(c.find ?? []).length})</summary>
        ${this.findTable(claims, names, results)}
      </details>
      ${this.report?.ok && plot ? html`
        <time-plot .plot=${plot} .points=${plot.points ?? []} .summary=${this.report.summary ?? ''}></time-plot>
        <div class="row">${this.report.note ? html`<span class="muted">${this.report.note}</span>` : nothing}
          <span class="muted">${this.report.method}: ${this.report.steps} steps, ${this.report.evaluations} evaluations of the rates</span>
          <button @click=${() => this.downloadCsv(plot)}>Export the series as CSV</button></div>
        ${this.closedForm(this.report.closedForm)}` : nothing}
      ${this.footErrors()}`;
  }

  private eventsTable(claims: ErrorClaims, names: StudyName[]) {
    const events = this.cell.events ?? [];
    return html`<div class="scroll"><table class="events stack">
      ${events.length ? html`<thead><tr><th>At</th><th>Every</th><th>Times</th><th>Action</th><th>On</th><th>Amount</th><th>For</th><th></th></tr></thead>` : nothing}
      <tbody>${events.map((ev, i) => {
        const kind = eventActionOf(ev);
        const [target, amount] = eventTarget(ev);
        const p = `.events[${i}]`;
        return html`<tr>
          <td data-label="At"><expr-field label="Event ${i + 1} time" .value=${ev.at ?? ''} .names=${names} .error=${claims.take(`${p}.at`)} @expr-input=${(e: CustomEvent<{ value: string }>) => this.setEvent(i, { ...ev, at: e.detail.value }, `at${i}`)}></expr-field></td>
          <td data-label="Every"><expr-field label="Event ${i + 1} repeats every" .value=${ev.every ?? ''} .names=${names} .error=${claims.take(`${p}.every`)} @expr-input=${(e: CustomEvent<{ value: string }>) => this.setEvent(i, withEventField(ev, 'every', e.detail.value), `every${i}`)}></expr-field></td>
          <td data-label="Times"><input class="count" type="number" min="1" aria-label="Event ${i + 1} count" .value=${ev.count === undefined ? '' : String(ev.count)} @input=${(e: Event) => { const v = (e.target as HTMLInputElement).value; this.setEvent(i, withEventField(ev, 'count', v === '' ? '' : Math.max(1, Math.trunc(Number(v)))), `count${i}`); }} /></td>
          <td data-label="Action"><select aria-label="Event ${i + 1} action" @change=${(e: Event) => this.setEvent(i, switchAction(ev, (e.target as HTMLSelectElement).value as EventAction))}>
            ${EVENT_ACTIONS.map((k) => html`<option value=${k} ?selected=${k === kind}>${k === 'add' ? 'add (dose)' : k === 'set' ? 'set a parameter' : 'infuse (rate)'}</option>`)}</select></td>
          <td data-label="On"><input class="name" type="text" aria-label="Event ${i + 1} target name" .value=${target} @input=${(e: Event) => this.setEvent(i, withTarget(ev, (e.target as HTMLInputElement).value, amount), `target${i}`)} /></td>
          <td data-label="Amount"><expr-field label="Event ${i + 1} amount" .value=${amount} .names=${names} .error=${claims.take(`${p}.${kind}.${target}`) ?? claims.take(`${p}.${kind}`)} @expr-input=${(e: CustomEvent<{ value: string }>) => this.setEvent(i, withTarget(ev, target, e.detail.value), `amount${i}`)}></expr-field></td>
          <td data-label=${kind === 'infuse' ? 'For' : nothing}>${kind === 'infuse' ? html`<expr-field label="Event ${i + 1} infusion duration" .value=${ev.for ?? ''} .names=${names} .error=${claims.take(`${p}.for`)} @expr-input=${(e: CustomEvent<{ value: string }>) => this.setEvent(i, { ...ev, for: e.detail.value }, `for${i}`)}></expr-field>` : nothing}</td>
          <td class="remove"><button class="quiet" aria-label="Remove event ${i + 1}" @click=${() => this.edit({ events: events.filter((_, j) => j !== i) })}>✕</button></td>
        </tr>`;
      })}</tbody></table></div>
      <div class="row"><button @click=${() => this.edit({ events: [...events, { at: '0 h', add: { [this.firstState()]: '1' } }] })}>Add an event</button></div>`;
  }

  private findTable(claims: ErrorClaims, names: StudyName[], results: Record<string, FindResult>) {
    const finds = this.cell.find ?? [];
    return html`<div class="scroll"><table class="finds stack">
      ${finds.length ? html`<thead><tr><th>Name</th><th>Question</th><th>Of</th><th>Level or time</th><th>Answer</th><th></th></tr></thead>` : nothing}
      <tbody>${finds.map((f, i) => {
        const kind = findKindOf(f);
        const needsLevel = usesLevel(kind);
        const r = results[f.name];
        const p = `.find[${i}]`;
        return html`<tr>
          <td data-label="Name"><input class="name" type="text" aria-label="Question ${i + 1} name" .value=${f.name ?? ''} @input=${(e: Event) => this.setFind(i, { ...f, name: (e.target as HTMLInputElement).value }, `fname${i}`)} /></td>
          <td data-label="Question"><select aria-label="Question ${i + 1} kind" @change=${(e: Event) => this.setFind(i, switchFind(f, (e.target as HTMLSelectElement).value as FindKind))}>
            ${FIND_KINDS.map((k) => html`<option value=${k} ?selected=${k === kind}>${FIND_LABELS[k]}</option>`)}</select>
            ${kind === 'crossing' ? html`<select aria-label="Question ${i + 1} direction" @change=${(e: Event) => this.setFind(i, { ...f, direction: (e.target as HTMLSelectElement).value as 'up' | 'down' | 'either' })}>
              ${(['either', 'down', 'up'] as const).map((d) => html`<option value=${d} ?selected=${(f.direction ?? 'either') === d}>${d === 'either' ? 'either way' : d === 'down' ? 'falling' : 'rising'}</option>`)}</select>` : nothing}</td>
          <td data-label="Of"><input class="name" type="text" aria-label="Question ${i + 1} state" .value=${String(f[kind] ?? '')} @input=${(e: Event) => this.setFind(i, withFindState(f, (e.target as HTMLInputElement).value), `fstate${i}`)} /></td>
          <td data-label=${needsLevel ? 'Level' : kind === 'valueOf' ? 'Time' : nothing}>${needsLevel || kind === 'valueOf' ? html`<expr-field label="Question ${i + 1} ${needsLevel ? 'level' : 'time'}" .value=${(needsLevel ? f.level : f.at) ?? ''} .names=${names}
            .error=${claims.take(`${p}.${needsLevel ? 'level' : 'at'}`)} @expr-input=${(e: CustomEvent<{ value: string }>) => this.setFind(i, { ...f, [needsLevel ? 'level' : 'at']: e.detail.value }, `flevel${i}`)}></expr-field>` : nothing}</td>
          <td class="result" data-label="Answer">${!r ? '' : 'notReached' in r ? html`<span class="muted">${r.message}</span>` : showQ(r)}${r && !('notReached' in r) ? html`<unit-pick .unit=${r.unit} .picked=${f.unit} label="Show ${f.name} in another unit"
              @unit-pick=${(e: CustomEvent<UnitPickDetail>) => this.setFind(i, withFindUnit(f, e.detail.unit))}></unit-pick>` : nothing}
            ${footError(claims.take(p) ?? claims.take(`${p}.unit`))}</td>
          <td class="remove"><button class="quiet" aria-label="Remove question ${i + 1}" @click=${() => this.edit({ find: finds.filter((_, j) => j !== i) })}>✕</button></td>
        </tr>`;
      })}</tbody></table></div>
      <div class="row"><button @click=${() => this.edit({ find: [...finds, { name: freshFindName(finds), maximum: this.firstState() } as FindDoc] })}>Ask a question</button></div>`;
  }

  private closedForm(cf: Record<string, ClosedFormReport> | undefined) {
    if (!cf) return nothing;
    return html`${Object.entries(cf).map(([state, e]) => html`<p class="muted">Exact solution (${state} linear in itself):
      time constant ${showQ(e.timeConstant)}, ${e.halfLife ? html`half-life ${showQ(e.halfLife)}` : html`doubling time ${showQ(e.doublingTime)}`},
      settles toward ${showQ(e.equilibrium)} with the starting values; this run differs from it by at most ${showQ(e.maxError, 2)}.</p>`)}`;
  }

  private firstState(): string {
    const id = this.cell.rates?.[0];
    const rc = this.study?.cells.find((x) => x.id === id);
    return typeof rc?.state === 'string' ? rc.state : 'y';
  }

  private downloadCsv(plot: SimulationPlot) {
    const data = { t: plot.t, ...Object.fromEntries(plot.states.map((s) => [s.name, s.values])) };
    const text = exportSeriesCsv(data, [{ key: 't', label: `t (${plot.timeUnit})` }, ...plot.states.map((s) => ({ key: s.name, label: `${s.name} (${s.unit})` }))]);
    const a = document.createElement('a');
    a.href = URL.createObjectURL(new Blob([text], { type: 'text/csv' }));
    a.download = `${this.cell.id}.csv`;
    a.click();
    setTimeout(() => URL.revokeObjectURL(a.href), 1000);
  }

  private setRates(id: string, on: boolean) {
    const rates = (this.cell.rates ?? []).filter((r) => r !== id);
    this.edit({ rates: on ? [...rates, id] : rates });
  }

  private setEvent(i: number, ev: EventDoc, key?: string) {
    this.edit({ events: (this.cell.events ?? []).map((x, j) => (j === i ? ev : x)) }, key);
  }

  private setFind(i: number, f: FindDoc, key?: string) {
    this.edit({ find: (this.cell.find ?? []).map((x, j) => (j === i ? f : x)) }, key);
  }

}

customElements.define('simulate-cell', SimulateCellElement);
