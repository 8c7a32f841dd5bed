import { html, nothing, css } from 'lit';
import { runBand, cellWords, closedFormWords, type ClosedFormReport, type PlotScale, type SimulationPlot } from '../../src/index.ts';
import { cellStyles, plotScaleError, withPlotScale, footError, showQ, NARROW_PX } from './common.ts';
import { CellElement, type CellDoc } from './cell-element.ts';
import { exportSeriesCsv } from '../series-csv.ts';
import '../expr-field.ts';
import '../unit-pick.ts';
import '../plots/time-plot.ts';
import type { PlotScaleEvent } from '../plots/time-plot.ts';
import type { FindQuery as FindDoc, ScheduleEvent as EventDoc } from '../../src/index.ts';
import { eventsTable } from './simulate-events.ts';
import { findsTable } from './simulate-finds.ts';

type SimulateCellDoc = CellDoc<'simulate'>;
type Input = CustomEvent<{ value: string }>;
/** The relative tolerances offered; the blank choice leaves the default (1e-6) to the engine. */
const RELATIVE_TOLERANCES: readonly number[] = [1e-3, 1e-4, 1e-5, 1e-6, 1e-7, 1e-8, 1e-9, 1e-10];
const METHOD_LABELS: Record<string, string> = {
  auto: 'automatic (switches to stiff when needed)', dopri5: 'Dormand–Prince 5(4), adaptive', stiff: 'stiff (implicit, adaptive)',
  rk4: 'Runge–Kutta 4, fixed step', heun: 'Heun, fixed step', euler: 'Euler, fixed step',
  dp853: 'Dormand–Prince 8(5,3), adaptive, for tight tolerances',
  adams: 'Adams, variable order, for smooth laws at tight tolerances',
};

/** A simulate cell: the run's span and method, its schedule, its questions, and the results with their plot. */
export class SimulateCellElement extends CellElement<'simulate'> {
  static override styles = [cellStyles, css`
    .events td, .finds td { padding: 0.15rem 0.25rem; }
    .events expr-field, .finds expr-field { min-width: 4.5rem; }
    .scroll { overflow-x: auto; }
    /* between the phone's stacked rows and a wide screen, the questions' seven columns share the
       width: a long name scrolls in a box of 7rem, as before names grew (its whole text is the box's title) */
    @media (min-width: ${NARROW_PX + 1}px) and (max-width: 1000px) { .finds input.name { max-width: 7rem; } }
    input.count { width: 4rem; }
    .target { display: flex; gap: 0.3rem; align-items: flex-start; margin-bottom: 0.2rem; }
    .repeats { margin-top: 0.2rem; white-space: normal; }
    .finds td.result .muted { white-space: normal; }
    tr.more td { padding-top: 0; border-bottom: 1px solid #e6eaee; }
    tr.more details { margin: 0 0 0.3rem; }
    /* the table may scroll sideways on a narrow screen: keep a question's window on the visible part */
    tr.more .row { max-width: calc(100vw - 3rem); position: sticky; left: 0; }
    tr.more summary, details.solver summary { font-weight: 400; font-size: 0.85rem; color: #3b4650; }
    button.small { font-size: 0.8rem; padding: 0 0.4rem; }
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
    // the band from an uncertainty cell's samples, or why there is none (only while the toggle is on)
    const band = c.band === true && this.doc && this.study ? runBand(this.doc, this.study, c.id) : undefined;
    return html`
      <div class="row">
        <span class="lbl">Laws</span>
        ${laws.map(({ id, label }) => html`<label><input type="checkbox" data-field="rates" .checked=${(c.rates ?? []).includes(id)}
          @change=${(e: Event) => this.setRates(id, (e.target as HTMLInputElement).checked)} /> ${label}</label>`)}
        ${laws.length === 0 ? html`<span class="muted">Add a rate cell first.</span>` : nothing}
        ${footError(claims.take('.rates'))}
      </div>
      <div class="row">
        <span class="lbl">From</span>
        <expr-field class="w8" data-field="from" label="Start of the run" .value=${c.from ?? ''} .names=${names} .error=${claims.take('.from')}
          @expr-input=${(e: Input) => this.edit({ from: e.detail.value }, 'from')}></expr-field>
        <span class="lbl">to</span>
        <expr-field class="w8" data-field="to" label="End of the run" .value=${c.to ?? ''} .names=${names} .error=${claims.take('.to')}
          @expr-input=${(e: Input) => this.edit({ to: e.detail.value }, 'to')}></expr-field>
        <label>Method <select data-field="method" @change=${(e: Event) => this.edit({ method: (e.target as HTMLSelectElement).value as SimulateCellDoc['method'] })}>
          ${Object.entries(METHOD_LABELS).map(([m, l]) => html`<option value=${m} ?selected=${(c.method ?? 'auto') === m}>${l}</option>`)}
        </select></label>
        ${fixed || c.step !== undefined ? html`<span class="lbl">Step</span><expr-field class="w7" data-field="step" label="Fixed step${fixed ? '' : ' (used by the fixed-step methods only)'}" .value=${c.step ?? ''} .names=${names} .error=${claims.take('.step')}
          @expr-input=${(e: Input) => this.setStep(e.detail.value)}></expr-field>` : nothing}
      </div>
      ${this.tolerances()}
      <details ?open=${(c.events ?? []).length > 0}>
        <summary>Schedule (${(c.events ?? []).length} event${(c.events ?? []).length === 1 ? '' : 's'})</summary>
        ${eventsTable({
          events: c.events ?? [], report: this.report, claims, names, firstState: () => this.firstState(),
          setEvent: (i, ev, key) => this.setEvent(i, ev, key), setEvents: (events) => this.edit({ events }), focus: (s) => this.focusWhenShown(s),
        })}
      </details>
      <details open>
        <summary>Questions (${(c.find ?? []).length})</summary>
        ${findsTable({
          finds: c.find ?? [], results, claims, names, firstState: () => this.firstState(),
          setFind: (i, f, key) => this.setFind(i, f, key), setFinds: (find) => this.edit({ find }), focus: (s) => this.focusWhenShown(s),
        })}
      </details>
      ${plotScaleError(claims.take('.plotScale'), (s) => this.setPlotScale(s))}
      ${this.bandToggle(claims.take('.band'))}
      ${this.report?.ok && plot ? html`
        <time-plot .plot=${plot} .points=${plot.points ?? []} .summary=${this.report.summary ?? ''} .scale=${c.plotScale === 'log' ? 'log' : 'linear'} scaleToggle
          .band=${band && 'band' in band ? band.band : undefined}
          @plot-scale=${(e: PlotScaleEvent) => this.setPlotScale(e.detail.scale)}></time-plot>
        ${band ? html`<p class="muted band-note" role="status">${'band' in band ? `${band.band.note} The samples are those of ${cellWords(this.doc!, band.cell)}.` : band.reason}</p>` : nothing}
        <div class="row">${this.report.note ? html`<span class="muted">${this.report.note}</span>` : nothing}
          <span class="muted">${this.report.method}: ${this.report.steps} steps, ${this.report.evaluations} evaluations of the rates</span>
          <button @click=${() => this.downloadCsv(plot)}>Export the series as CSV</button></div>
        ${this.closedForm(this.report.closedForm)}` : nothing}
      ${this.footErrors()}`;
  }

  /** The band toggle: `band: true` on the cell when on, no field when off; one undo step. */
  private bandToggle(error: { message: string } | undefined) {
    const on = this.cell.band === true;
    return html`<div class="row"><label><input type="checkbox" data-field="band" .checked=${on}
      @change=${(e: Event) => this.setBand((e.target as HTMLInputElement).checked)} /> Show the band of 2.5–97.5 percentiles from an uncertainty cell's samples</label>
      ${footError(error)}</div>`;
  }

  private setBand(on: boolean): void {
    const { band: _old, ...rest } = this.cell;
    this.replace(on ? { ...rest, band: true } : rest);
  }

  /** The plot's axis choice, stored in the cell, one undo step. */
  private setPlotScale(scale: PlotScale): void {
    this.replace(withPlotScale(this.cell, scale));
  }

  /** The solver's tolerances, behind a disclosure: a relative tolerance from a list, an absolute one as an expression. */
  private tolerances() {
    const tol = this.cell.tolerance;
    const rel = tol?.relative;
    const listed = RELATIVE_TOLERANCES.includes(rel as number);
    return html`<details class="solver" ?open=${tol !== undefined}><summary>Solver tolerances</summary><div class="row">
      <label>Relative tolerance <select data-field="tolerance.relative" @change=${(e: Event) => this.setTolerance('relative', (e.target as HTMLSelectElement).value)}>
        <option value="" ?selected=${rel === undefined}>the default (1e-6)</option>
        ${rel !== undefined && !listed ? html`<option value=${String(rel)} selected>${String(rel)}</option>` : nothing}
        ${RELATIVE_TOLERANCES.map((r) => html`<option value=${String(r)} ?selected=${rel === r}>${r.toExponential(0)}</option>`)}</select></label>
      ${footError(this.claims.take('.tolerance.relative'))}
      <span class="lbl">Absolute</span>
      <expr-field class="w10" data-field="tolerance.absolute" label="Absolute tolerance, in a state's unit (blank: from each state's scale)" .value=${tol?.absolute ?? ''} .names=${this.names}
        .error=${this.claims.take('.tolerance.absolute')} @expr-input=${(e: Input) => this.setTolerance('absolute', e.detail.value, 'atol')}></expr-field>
    </div></details>`;
  }

  private closedForm(cf: Record<string, ClosedFormReport> | undefined) {
    if (!cf) return nothing;
    return html`${Object.entries(cf).map(([state, e]) => html`<p class="muted closed-form">${closedFormWords(state, e)}</p>`)}`;
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

  /** Sets the fixed step, or removes it when blank and the method does not need it. */
  private setStep(text: string) {
    const { step: _s, ...rest } = this.cell;
    const fixed = this.cell.method === 'rk4' || this.cell.method === 'heun' || this.cell.method === 'euler';
    this.replace(text.trim() === '' && !fixed ? rest : { ...rest, step: text }, 'step');
  }

  /** Sets one tolerance (a relative one from the list, as a number), or removes it when blank; no tolerance left removes the object. */
  private setTolerance(key: 'relative' | 'absolute', text: string, merge?: string) {
    const { tolerance, ...rest } = this.cell;
    const next: Record<string, unknown> = { ...tolerance };
    if (text.trim() === '') delete next[key];
    else next[key] = key === 'relative' ? Number(text) : text;
    this.replace(Object.keys(next).length ? { ...rest, tolerance: next } : rest, merge);
  }

  private setEvent(i: number, ev: EventDoc, key?: string) {
    this.edit({ events: (this.cell.events ?? []).map((x, j) => (j === i ? ev : x)) }, key);
  }

  private setFind(i: number, f: FindDoc, key?: string) {
    this.edit({ find: (this.cell.find ?? []).map((x, j) => (j === i ? f : x)) }, key);
  }

}

customElements.define('simulate-cell', SimulateCellElement);
