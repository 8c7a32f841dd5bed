import { LitElement, html, css } from 'lit';
import type { CellReport } from './types.ts';
import type { Cell } from '../../src/index.ts';
import { cellStyles, editEvent, ErrorClaims } from './common.ts';

/**
 * A cell whose own editor is not in this version (data, fit, nca): its fields as JSON, kept
 * and checked by the engine, editable as text; what the engine says about it is shown.
 */
export class OtherCellElement extends LitElement {
  static override properties = { cell: { attribute: false }, report: { attribute: false }, problem: { state: true } };
  cell!: Cell;
  report?: CellReport;
  problem?: string;
  static override styles = [cellStyles, css`textarea { width: 100%; min-height: 8rem; box-sizing: border-box; font-family: ui-monospace, monospace; font-size: 0.85rem; }`];

  override render() {
    const claims = new ErrorClaims(this.report);
    const { id: _id, kind: _kind, title: _title, ...fields } = this.cell as unknown as Record<string, unknown>;
    return html`
      ${this.report?.computed === false ? html`<p class="muted">${String(this.report.message ?? '')}</p>` : ''}
      <textarea aria-label="Fields of cell ${this.cell.id}, as JSON" .value=${JSON.stringify(fields, null, 2)} @input=${this.edit}></textarea>
      ${this.problem ? html`<p class="foot-error" role="alert">${this.problem}</p>` : ''}
      ${claims.rest().map((e) => html`<p class="foot-error" role="alert"><span class="path">${e.path}</span>: ${e.message}</p>`)}`;
  }

  private edit = (e: Event) => {
    let fields: unknown;
    try {
      fields = JSON.parse((e.target as HTMLTextAreaElement).value);
    } catch (err) {
      this.problem = `not valid JSON yet: ${(err as Error).message}`;
      return;
    }
    if (!fields || typeof fields !== 'object' || Array.isArray(fields)) {
      this.problem = 'the fields must be a JSON object';
      return;
    }
    this.problem = undefined;
    const { id, kind, title } = this.cell;
    this.dispatchEvent(editEvent({ ...(fields as object), id, kind, ...(title !== undefined ? { title } : {}) }, `${id}:json`));
  };
}

customElements.define('other-cell', OtherCellElement);
