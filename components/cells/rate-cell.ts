import { html } from 'lit';
import { showQ } from './common.ts';
import { fieldReadsStates } from '../../src/index.ts';
import { CellElement } from './cell-element.ts';
import '../unit-pick.ts';
import type { UnitPickDetail } from '../unit-pick.ts';
import '../expr-field.ts';

/** A rate cell: d(state)/dt = rate, with the state's unit and initial value. */
export class RateCellElement extends CellElement<'rate'> {
  override render() {
    const claims = this.claims;
    const names = this.names;
    const c = this.cell;
    const rate = this.report?.rateAtStart;
    const stateError = claims.take('.state');
    return html`
      <div class="row">
        <span class="lbl">Rate of</span>
        <input class="name" type="text" data-field="state" aria-label="State name" .value=${c.state ?? ''} @input=${(e: Event) => this.edit({ state: (e.target as HTMLInputElement).value }, 'state')} />
        <span aria-hidden="true">per time =</span>
        <expr-field data-field="rate" label="Rate law: the rate of change of ${c.state}" .value=${c.rate ?? ''} .names=${names} .readsStates=${fieldReadsStates('rate', '.rate')} .error=${claims.take('.rate')}
          @expr-input=${(e: CustomEvent<{ value: string }>) => this.edit({ rate: e.detail.value }, 'rate')}></expr-field>
      </div>
      ${stateError ? html`<p class="foot-error" role="alert">${stateError.message}</p>` : ''}
      <div class="row">
        <span class="lbl">Unit</span>
        <expr-field class="w9" data-field="unit" label="Unit of ${c.state}" .value=${c.unit ?? ''} .error=${claims.take('.unit')}
          @expr-input=${(e: CustomEvent<{ value: string }>) => this.edit({ unit: e.detail.value }, 'unit')}></expr-field>
        <unit-pick data-field="unit" .unit=${c.unit ?? ''} .original=${this.report?.originalUnit} label="Show ${c.state} in another unit"
          @unit-pick=${(e: CustomEvent<UnitPickDetail>) => { if (e.detail.unit) this.edit({ unit: e.detail.unit }, 'unit-pick'); }}></unit-pick>
        <span class="lbl">Starts at</span>
        <expr-field data-field="initial" label="Initial value of ${c.state}" .value=${c.initial ?? ''} .names=${names} .error=${claims.take('.initial')}
          @expr-input=${(e: CustomEvent<{ value: string }>) => this.edit({ initial: e.detail.value }, 'initial')}></expr-field>
      </div>
      ${rate ? html`<p class="muted">At the start: ${c.state} changes by <span class="result">${showQ(rate)}</span></p>` : ''}
      ${this.footErrors()}`;
  }
}

customElements.define('rate-cell', RateCellElement);
