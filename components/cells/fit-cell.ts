import { html, nothing, css } from 'lit';
import { formatNumber, withEstimateParameter, type FitErrorModel, type FitPrior, type PlotScale, type ReportOf, type ResidualColumns, type SimulationPlot } from '../../src/index.ts';
import { cellStyles, plotScaleError, withPlotScale, showQ } from './common.ts';
import { CellElement, type CellDoc } from './cell-element.ts';
import '../expr-field.ts';
import '../unit-pick.ts';
import type { UnitPickDetail } from '../unit-pick.ts';
import '../plots/time-plot.ts';
import type { MeasuredPoints, PlotScaleEvent } from '../plots/time-plot.ts';
import { errorModelRow, movedWords, priorRow, type PriorHost } from './fit-prior-fields.ts';

type FitDoc = CellDoc<'fit'>;
type Estimate = FitDoc['estimate'][number];

/** A fit: which laws and data, what is observed and estimated, and the estimates with their uncertainty and plots. */
export class FitCellElement extends CellElement<'fit'> {
  static override styles = [cellStyles, css`
    .est expr-field { min-width: 6rem; }
    .scroll { overflow-x: auto; }
    tr.more td { padding-top: 0; border-bottom: 1px solid #e6eaee; }
    tr.more details, details.error-model { margin: 0 0 0.3rem; }
    tr.more summary, details.error-model summary { font-weight: 400; font-size: 0.85rem; color: #3b4650; cursor: pointer; }
    .moved { font-size: 0.8rem; white-space: normal; }
    .bayes { font-weight: 600; }
    input.count { width: 5rem; }
    select[data-field="run"] { max-width: 100%; }
  `];

  override render() {
    const c = this.cell;
    const claims = this.claims;
    const names = this.names;
    const cells = this.study?.cells ?? [];
    const rates = cells.filter((x) => x.kind === 'rate');
    const dataCells = cells.filter((x) => x.kind === 'data');
    const columns = (dataCells.find((d) => d.id === c.data)?.columns ?? []).map((x) => x.name);
    const runs = cells.filter((x) => x.kind === 'simulate');
    const run = runs.find((x) => x.id === c.run);
    // the laws of the model: those the run integrates (from the document), or those ticked
    const modelLaws = c.run !== undefined ? this.runLaws(c.run) : (c.rates ?? []);
    const states = rates.filter((r) => modelLaws.includes(r.id)).map((r) => String(r.state));
    const r = this.report;
    const estimates = r?.estimates ?? {};
    const host = this.priorHost();
    const anyPrior = (c.estimate ?? []).some((e) => e?.prior !== undefined);
    return html`
      ${r?.bayesian ? html`<p class="bayes">Bayesian (MAP) estimate: the data combined with the priors below.</p>` : nothing}
      <div class="row">
        <label>Model <select data-field="run" @change=${(e: Event) => this.setRun((e.target as HTMLSelectElement).value)}>
          <option value="" ?selected=${c.run === undefined}>laws only, from t = 0</option>
          ${c.run !== undefined && !run ? html`<option selected value=${c.run}>"${c.run}" (not a run)</option>` : nothing}
          ${runs.map((x) => html`<option value=${x.id} ?selected=${x.id === c.run}>run ${x.title || x.id}, whole schedule</option>`)}</select></label>
        ${claims.take('.run') ? html`<div class="foot-error">${claims.take('.run')!.message}</div>` : nothing}
      </div>
      ${c.run === undefined ? html`<div class="row"><span class="lbl">Laws</span>
        ${this.laws().map((x) => html`<label><input type="checkbox" data-field="rates" .checked=${(c.rates ?? []).includes(x.id)} @change=${(e: Event) => this.setRate(x.id, (e.target as HTMLInputElement).checked)} /> ${x.label}</label>`)}</div>`
        : html`<p class="muted">The model is the run's start, laws and every event of its schedule; the data's times are times on the run's clock.</p>`}
      <div class="row">
        <label>Data <select data-field="data" @change=${(e: Event) => this.edit({ data: (e.target as HTMLSelectElement).value })}>
          ${dataCells.some((d) => d.id === c.data) ? nothing : html`<option selected>${c.data || '(choose)'}</option>`}
          ${dataCells.map((d) => html`<option value=${d.id} ?selected=${d.id === c.data}>${d.id}</option>`)}</select></label>
        <label>Time column <select data-field="time" @change=${(e: Event) => this.edit({ time: (e.target as HTMLSelectElement).value })}>
          ${columns.includes(c.time) ? nothing : html`<option selected>${c.time}</option>`}
          ${columns.map((n) => html`<option value=${n} ?selected=${n === c.time}>${n}</option>`)}</select></label>
        ${states.map((s) => html`<label>${s} is observed in <select data-field="observe" @change=${(e: Event) => this.observe(s, (e.target as HTMLSelectElement).value)}>
          <option value="" ?selected=${!c.observe?.[s]}>(not observed)</option>
          ${columns.map((n) => html`<option value=${n} ?selected=${c.observe?.[s] === n}>${n}</option>`)}</select></label>`)}
        <label>Weighting <select data-field="weighting" @change=${(e: Event) => this.edit({ weighting: (e.target as HTMLSelectElement).value as FitDoc['weighting'] })}>
          ${([['none', 'none'], ['relative', 'relative (1/y²)'], ['proportional', 'proportional (1/y)']] as const).map(([v, l]) => html`<option value=${v} ?selected=${(c.weighting ?? 'none') === v}>${l}</option>`)}</select></label>
      </div>
      <div class="scroll"><table class="est stack-always">
        <thead><tr><th>Estimate</th><th>as</th><th>Guess</th><th>At least</th><th>At most</th><th>Value</th><th>Standard error</th><th>95% interval</th><th><span class="sr">Remove</span></th></tr></thead>
        <tbody>${(c.estimate ?? []).map((e, i) => {
          const res = estimates[e.as];
          const p = `.estimate[${i}]`;
          return html`<tr>
            <td data-label="Estimate"><input class="name" type="text" data-field="estimate[${i}].parameter" aria-label="Estimate ${i + 1}: parameter or state" .value=${e.parameter ?? ''} @input=${(ev: Event) => this.setParameter(i, (ev.target as HTMLInputElement).value)} />
              ${claims.take(`${p}.parameter`) ? html`<div class="foot-error">${claims.take(`${p}.parameter`)!.message}</div>` : nothing}</td>
            <td data-label="as"><input class="name" type="text" data-field="estimate[${i}].as" aria-label="Estimate ${i + 1}: name of the result" .value=${e.as ?? ''} @input=${(ev: Event) => this.setEstimate(i, { as: (ev.target as HTMLInputElement).value }, `as${i}`)} /></td>
            <td data-label="Guess"><expr-field data-field="estimate[${i}].guess" label="Estimate ${i + 1} guess" .value=${e.guess ?? ''} .names=${names} .error=${claims.take(`${p}.guess`)} @expr-input=${(ev: CustomEvent<{ value: string }>) => this.setEstimate(i, { guess: ev.detail.value }, `g${i}`)}></expr-field></td>
            <td data-label="At least"><expr-field data-field="estimate[${i}].min" label="Estimate ${i + 1} lower bound" .value=${e.min ?? ''} .names=${names} .error=${claims.take(`${p}.min`)} @expr-input=${(ev: CustomEvent<{ value: string }>) => this.setEstimate(i, { min: ev.detail.value || undefined }, `min${i}`)}></expr-field></td>
            <td data-label="At most"><expr-field data-field="estimate[${i}].max" label="Estimate ${i + 1} upper bound" .value=${e.max ?? ''} .names=${names} .error=${claims.take(`${p}.max`) ?? claims.take(`${p}`)} @expr-input=${(ev: CustomEvent<{ value: string }>) => this.setEstimate(i, { max: ev.detail.value || undefined }, `max${i}`)}></expr-field></td>
            <td class="result" data-label="Value">${res ? `${showQ(res.value)}${res.atBound ? ' (at a bound)' : ''}` : ''}${movedWords(res)}${res ? html`<unit-pick data-field="estimate[${i}].unit" .unit=${res.value.unit} .picked=${e.unit} label="Show ${e.as} in another unit"
              @unit-pick=${(ev: CustomEvent<UnitPickDetail>) => this.setEstimate(i, { unit: ev.detail.unit }, `unit${i}`)}></unit-pick>` : nothing}
              ${claims.take(`${p}.unit`) ? html`<div class="foot-error">${claims.take(`${p}.unit`)!.message}</div>` : nothing}</td>
            <td class="result" data-label="Standard error">${res?.standardError ? showQ(res.standardError) : ''}</td>
            <td class="result" data-label="95% interval">${res?.ci95 ? `${showQ(res.ci95[0])} to ${showQ(res.ci95[1])}` : ''}</td>
            <td class="remove"><button class="quiet" aria-label="Remove estimate ${i + 1}" @click=${() => this.edit({ estimate: c.estimate.filter((_, j) => j !== i) })}>✕</button></td>
          </tr>${priorRow(host, i, e.prior, 9)}`;
        })}</tbody></table></div>
      <div class="row"><button @click=${this.addEstimate}>Estimate another parameter</button></div>
      ${errorModelRow(host, c.error, anyPrior)}
      ${r?.ok && r.estimates ? html`<p class="muted">${r.converged ? 'Converged' : 'Not converged'} after ${r.iterations} iterations (${r.message}); ${r.n} points${r.bayesian ? '' : `, ${r.dof} degrees of freedom`}${r.residualSD ? `, residual SD ${showQ(r.residualSD)}` : ''}${r.objective !== undefined ? `; objective ${formatNumber(r.objective, 4)}` : ''}.${r.digits !== undefined ? ` Computed to ${r.digits} significant digits (the arithmetic, not the data: the standard errors say how sure the estimates are).` : ''}${r.errorModel ? ` Standard errors and 95% intervals come from the curvature of the objective (the posterior's normal approximation${r.bayesian ? ', on the log scale for an estimate with a prior' : ''}).` : ''}</p>` : nothing}
      ${this.correlation()}
      ${(r?.warnings ?? []).map((w) => html`<p class="foot-error">${w}</p>`)}
      ${plotScaleError(claims.take('.plotScale'), (s) => this.setPlotScale(s))}
      ${r?.ok && r.plot ? this.plots(r.plot, r) : nothing}
      ${this.footErrors()}`;
  }

  private correlation() {
    const cor = this.report?.correlation;
    if (!cor || cor.names.length < 2) return nothing;
    return html`<table class="fit-width"><caption class="muted start">Correlation of the estimates</caption>
      <thead><tr><th><span class="sr">Estimate</span></th>${cor.names.map((n) => html`<th>${n}</th>`)}</tr></thead>
      <tbody>${cor.names.map((n, i) => html`<tr><th>${n}</th>${cor.matrix[i].map((v) => html`<td class="num">${v.toFixed(3)}</td>`)}</tr>`)}</tbody></table>`;
  }

  /** The plot's axis choice, stored in the cell, one undo step. */
  private setPlotScale(scale: PlotScale): void {
    this.replace(withPlotScale(this.cell, scale));
  }

  /** The fitted curve over the data (linear or log, the cell's choice), and the residuals against time around a zero line (always linear: residuals are signed). */
  private plots(plot: NonNullable<ReportOf<'fit'>['plot']>, r: ReportOf<'fit'>) {
    const { residualPlot, residualPoints, unit } = residualView(plot, r);
    return html`<time-plot .plot=${plot} .points=${plot.points ?? []} .summary=${r.summary ?? ''} .scale=${this.cell.plotScale === 'log' ? 'log' : 'linear'} scaleToggle
        @plot-scale=${(e: PlotScaleEvent) => this.setPlotScale(e.detail.scale)}></time-plot>
      <time-plot .plot=${residualPlot} .points=${residualPoints} .floor=${r.residualFloor?.value ?? 0} .summary=${`Residuals (measured minus fitted) against time, in ${unit}.`}></time-plot>`;
  }

  /**
   * The model: through a run (its laws come with it), or the laws ticked; going back to laws
   * ticks the ones the run integrated, so the laws fitted stay the same.
   */
  private setRun(id: string) {
    const { run: was, rates: _rates, ...rest } = this.cell;
    if (id) {
      this.replace({ ...rest, run: id });
      return;
    }
    this.replace({ ...rest, rates: was === undefined ? [] : this.runLaws(was) });
  }

  /** The rate cells a run names, from the study's document. */
  private runLaws(id: string): string[] {
    const runCell = (this.doc?.cells ?? []).find((x) => x.id === id);
    const rates = runCell?.kind === 'simulate' ? runCell.rates : undefined;
    return Array.isArray(rates) ? rates.filter((x): x is string => typeof x === 'string') : [];
  }

  private setRate(id: string, on: boolean) {
    const rates = (this.cell.rates ?? []).filter((x) => x !== id);
    this.edit({ rates: on ? [...rates, id] : rates });
  }

  private observe(state: string, column: string) {
    const observe = { ...(this.cell.observe ?? {}) };
    if (column) observe[state] = column;
    else delete observe[state];
    this.edit({ observe });
  }

  /** The estimate's parameter; its result name and guess follow while they are the defaults of the one before (`withEstimateParameter`). */
  private setParameter(i: number, parameter: string) {
    const e = this.cell.estimate[i];
    const next = withEstimateParameter(this.doc ?? { cells: [] }, e, parameter);
    this.setEstimate(i, { parameter, as: next.as, guess: next.guess }, `p${i}`);
  }

  private setEstimate(i: number, patch: Partial<Estimate>, key: string) {
    const estimate = this.cell.estimate.map((e, j) => {
      if (j !== i) return e;
      const next = { ...e, ...patch } as Record<string, unknown>;
      for (const k of ['min', 'max', 'unit', 'prior']) if (next[k] === undefined) delete next[k];
      return next as unknown as Estimate;
    });
    this.edit({ estimate }, key);
  }

  /** The prior and error-model controls' view of this cell (components/cells/fit-prior-fields.ts). */
  private priorHost(): PriorHost {
    return {
      claims: this.claims, names: this.names,
      setPrior: (i, prior, key) => this.setEstimate(i, { prior: prior as FitPrior | undefined }, key),
      setError: (error: FitErrorModel | undefined, key) => {
        const next = { ...this.cell } as Record<string, unknown>;
        if (error) next.error = error; else delete next.error;
        this.replace(next as unknown as FitDoc, key);
      },
    };
  }

  private addEstimate = () => {
    const n = (this.cell.estimate ?? []).length + 1;
    this.edit({ estimate: [...(this.cell.estimate ?? []), { parameter: 'k', as: `est${n}`, guess: '1' }] });
    this.focusWhenShown(`input[data-field="estimate[${n - 1}].parameter"]`);
  };
}

/** The residual plot's data, made once per report (a chart given the same objects draws nothing again). */
const residualViews = new WeakMap<object, { residualPlot: SimulationPlot; residualPoints: MeasuredPoints[]; unit: string }>();

/**
 * The residuals against time as a plot of points about a zero line, from the report's columns
 * when the engine's worker sent them so (`residualColumns`), else from its `residuals`.
 */
function residualView(plot: SimulationPlot, r: ReportOf<'fit'>) {
  const known = residualViews.get(r);
  if (known) return known;
  const columns = (r as { residualColumns?: ResidualColumns }).residualColumns;
  const res = columns ? undefined : r.residuals ?? [];
  const unit = columns ? (columns.row.length ? columns.texts[columns.unit[0]] : '') : res![0]?.residual.unit ?? '';
  const residualPlot: SimulationPlot = {
    timeUnit: plot.timeUnit, timeUnits: plot.timeUnits, t: [plot.t[0], plot.t[plot.t.length - 1]],
    states: [{ name: 'residual', unit, values: [0, 0] }], events: [], levels: [], marks: [],
  };
  const residualPoints = [columns
    ? { state: 'residual', t: plain(columns.time), values: plain(columns.value) }
    : { state: 'residual', t: res!.map((x) => x.time.value), values: res!.map((x) => x.residual.value) }];
  const view = { residualPlot, residualPoints, unit };
  residualViews.set(r, view);
  return view;
}

/** A typed array's numbers as a list (a loop: `Array.from` on 10,000 took milliseconds). */
function plain(a: Float64Array): number[] {
  const out = new Array<number>(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i];
  return out;
}

customElements.define('fit-cell', FitCellElement);
