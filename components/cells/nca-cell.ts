import { html, nothing } from 'lit';
import { showQ } from './common.ts';
import { CellElement, type CellDoc } from './cell-element.ts';
import '../unit-pick.ts';
import type { UnitPickDetail } from '../unit-pick.ts';
import '../expr-field.ts';

type NcaDoc = CellDoc<'nca'>;
const ROUTES = [['iv-bolus', 'IV bolus'], ['infusion', 'infusion'], ['extravascular', 'extravascular (oral, …)']] as const;

/** A profile summary (non-compartmental analysis): which data, the dose and route, and the results. */
export class NcaCellElement extends CellElement<'nca'> {
  override render() {
    const c = this.cell;
    const claims = this.claims;
    const dataCells = this.idsOf('data');
    const columns = (this.study?.cells.find((d) => d.id === c.data)?.columns ?? []).map((x) => x.name);
    const values = this.report?.values ?? {};
    // the last 3 to 12 points, and the study's own number when it is another
    const terminals = Array.from({ length: 10 }, (_, i) => i + 3);
    if (typeof c.terminal === 'number' && !terminals.includes(c.terminal)) terminals.push(c.terminal);
    const select = (label: string, value: string, options: readonly string[], key: keyof NcaDoc) => html`<label>${label}
      <select data-field=${key} .value=${value} @change=${(e: Event) => this.edit({ [key]: (e.target as HTMLSelectElement).value } as Partial<NcaDoc>)}>
        ${options.includes(value) ? nothing : html`<option value=${value} selected>${value || '(choose)'}</option>`}
        ${options.map((o) => html`<option value=${o} ?selected=${o === value}>${o}</option>`)}</select></label>`;
    return html`
      <div class="row">
        ${select('Data', c.data, dataCells, 'data')}
        ${select('Time column', c.time, columns, 'time')}
        ${select('Concentration column', c.concentration, columns, 'concentration')}
      </div>
      <div class="row">
        <span class="lbl">Dose</span>
        <expr-field class="w9" data-field="dose" label="Dose" .value=${c.dose ?? ''} .names=${this.names} .error=${claims.take('.dose')}
          @expr-input=${(e: CustomEvent<{ value: string }>) => this.edit({ dose: e.detail.value }, 'dose')}></expr-field>
        <label>Route <select data-field="route" @change=${(e: Event) => this.edit({ route: (e.target as HTMLSelectElement).value as NcaDoc['route'] })}>
          ${ROUTES.map(([v, l]) => html`<option value=${v} ?selected=${v === c.route}>${l}</option>`)}</select></label>
        ${c.route === 'infusion' || c.duration !== undefined ? html`<span class="lbl">for</span><expr-field class="w7" data-field="duration" label="Infusion duration" .value=${c.duration ?? ''} .error=${claims.take('.duration')}
          @expr-input=${(e: CustomEvent<{ value: string }>) => this.edit({ duration: e.detail.value }, 'duration')}></expr-field>` : nothing}
        <label>Areas <select data-field="auc" @change=${(e: Event) => this.edit({ auc: (e.target as HTMLSelectElement).value as NcaDoc['auc'] })}>
          <option value="linear-up-log-down" ?selected=${(c.auc ?? 'linear-up-log-down') === 'linear-up-log-down'}>linear up, log down</option>
          <option value="linear" ?selected=${c.auc === 'linear'}>linear trapezoid</option></select></label>
        <label>Terminal phase <select data-field="terminal" @change=${(e: Event) => { const v = (e.target as HTMLSelectElement).value; this.edit({ terminal: v === 'auto' ? 'auto' : Number(v) }); }}>
          <option value="auto" ?selected=${(c.terminal ?? 'auto') === 'auto'}>chosen by adjusted R²</option>
          ${terminals.map((n) => html`<option value=${n} ?selected=${c.terminal === n}>last ${n} points</option>`)}</select></label>
        <label>Prefix <input class="name" type="text" data-field="prefix" .value=${c.prefix ?? ''} @input=${(e: Event) => this.edit({ prefix: (e.target as HTMLInputElement).value }, 'prefix')} /></label>
      </div>
      ${Object.keys(values).length ? html`<table><tbody>${Object.entries(values).map(([name, q]) => html`<tr><td>${name}</td><td class="result">${name.endsWith('AUCextrap') ? `${showQ(q)} %` : showQ(q)}<unit-pick data-field="units" .unit=${q.unit} .picked=${c.units?.[this.bare(name)]} label="Show ${name} in another unit"
        @unit-pick=${(e: CustomEvent<UnitPickDetail>) => this.pickUnit(this.bare(name), e.detail.unit)}></unit-pick></td></tr>`)}</tbody></table>` : nothing}
      ${this.report?.pointsUsed ? html`<p class="muted">Terminal phase from ${this.report.pointsUsed.count} points.</p>` : nothing}
      ${this.report?.note ? html`<p class="muted">${this.report.note}</p>` : nothing}
      ${(this.report?.warnings ?? []).map((w) => html`<p class="foot-error">${w}</p>`)}
      ${this.footErrors()}`;
  }

  /** A result's name without the cell's prefix (the key of `units`). */
  private bare(name: string): string {
    const prefix = this.cell.prefix ?? '';
    return prefix && name.startsWith(prefix) ? name.slice(prefix.length) : name;
  }

  private pickUnit(name: string, unit: string | undefined) {
    const { [name]: _old, ...rest } = this.cell.units ?? {};
    const units = unit === undefined ? rest : { ...rest, [name]: unit };
    const { units: _u, ...cell } = this.cell;
    this.replace(Object.keys(units).length ? { ...cell, units } : cell);
  }
}

customElements.define('nca-cell', NcaCellElement);
