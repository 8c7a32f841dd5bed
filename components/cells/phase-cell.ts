import { html, nothing } from 'lit';
import { footError, showQ } from './common.ts';
import { CellElement } from './cell-element.ts';
import '../expr-field.ts';
import '../plots/phase-plot.ts';
import '../plots/sweep-plot.ts';

/** A phase cell: where a one-state law settles, and (with a sweep) how that changes with a parameter. */
export class PhaseCellElement extends CellElement<'phase'> {
  override render() {
    const c = this.cell;
    const claims = this.claims;
    const names = this.names;
    const laws = this.laws();
    const eqs = this.report?.equilibria ?? [];
    const law = this.study?.cells.find((x) => x.id === c.rate);
    const state = typeof law?.state === 'string' ? law.state : 'y';
    const sw = c.sweep;
    return html`
      <div class="row">
        <label>Law <select data-field="rate" aria-label="Law of the phase line" .value=${c.rate ?? ''} @change=${(e: Event) => this.edit({ rate: (e.target as HTMLSelectElement).value })}>
          ${laws.some((l) => l.id === c.rate) ? nothing : html`<option value=${c.rate ?? ''} selected>${c.rate || '(choose)'}</option>`}
          ${laws.map(({ id, label }) => html`<option value=${id} ?selected=${id === c.rate}>${label}</option>`)}</select></label>
        <span class="lbl">From</span>
        <expr-field class="w9" data-field="from" label="Lower end of the range" .value=${c.from ?? ''} .names=${names} .error=${claims.take('.from')}
          @expr-input=${(e: CustomEvent<{ value: string }>) => this.edit({ from: e.detail.value }, 'from')}></expr-field>
        <span class="lbl">to</span>
        <expr-field class="w9" data-field="to" label="Upper end of the range" .value=${c.to ?? ''} .names=${names} .error=${claims.take('.to')}
          @expr-input=${(e: CustomEvent<{ value: string }>) => this.edit({ to: e.detail.value }, 'to')}></expr-field>
      </div>
      <div class="row">
        <label><input type="checkbox" .checked=${!!sw} @change=${(e: Event) => this.toggleSweep((e.target as HTMLInputElement).checked)} /> Sweep a parameter</label>
        ${sw ? html`
          <input class="name" type="text" data-field="sweep.name" aria-label="Parameter to sweep" .value=${sw.name ?? ''} @input=${(e: Event) => this.edit({ sweep: { ...sw, name: (e.target as HTMLInputElement).value } }, 'sname')} />
          <span class="lbl">from</span>
          <expr-field class="w8" data-field="sweep.from" label="Sweep start" .value=${sw.from ?? ''} .names=${names} .error=${claims.take('.sweep.from')}
            @expr-input=${(e: CustomEvent<{ value: string }>) => this.edit({ sweep: { ...sw, from: e.detail.value } }, 'sfrom')}></expr-field>
          <span class="lbl">to</span>
          <expr-field class="w8" data-field="sweep.to" label="Sweep end" .value=${sw.to ?? ''} .names=${names} .error=${claims.take('.sweep.to')}
            @expr-input=${(e: CustomEvent<{ value: string }>) => this.edit({ sweep: { ...sw, to: e.detail.value } }, 'sto')}></expr-field>
          <label>steps <input type="number" class="count" data-field="sweep.steps" aria-label="Steps of the sweep" min="2" max="10000" .value=${String(sw.steps ?? '')}
            @input=${(e: Event) => this.setSteps((e.target as HTMLInputElement).value)} /></label>
          ${footError(claims.take('.sweep.steps'))}` : nothing}
      </div>
      ${this.report?.ok && this.report.plot ? html`
        <table><thead><tr><th>Equilibrium</th><th>Stability</th><th>Slope there</th></tr></thead><tbody>
          ${eqs.map((e) => html`<tr><td class="result">${showQ(e)}</td><td>${e.stability}</td><td class="result">${showQ(e.slope)}</td></tr>`)}
          ${eqs.length === 0 ? html`<tr><td colspan="3" class="muted">No equilibrium in the range.</td></tr>` : nothing}
        </tbody></table>
        ${(this.report.notes ?? []).map((n) => html`<p class="muted">${n}</p>`)}
        <phase-plot .state=${state} .plot=${this.report.plot} .equilibria=${eqs} .intervals=${this.report.intervals ?? []} .poles=${this.report.poles ?? []} .summary=${this.report.summary ?? ''}></phase-plot>
        ${this.report.sweep ? html`<sweep-plot .state=${state} .sweep=${this.report.sweep}></sweep-plot>` : nothing}` : nothing}
      ${this.footErrors()}`;
  }

  /** The number of steps as typed: a number is written as it is (the engine says when it is out of range); a blank or partial entry writes nothing. */
  private setSteps(text: string) {
    const sw = this.cell.sweep;
    const n = Number(text);
    if (!sw || text.trim() === '' || !Number.isFinite(n)) return;
    this.edit({ sweep: { ...sw, steps: n } }, 'ssteps');
  }

  private toggleSweep(on: boolean) {
    const { sweep: _s, ...rest } = this.cell;
    this.replace(on ? { ...rest, sweep: { name: '', from: '', to: '', steps: 61 } } : rest);
  }
}

customElements.define('phase-cell', PhaseCellElement);
