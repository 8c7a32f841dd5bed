import { LitElement, html, css } from 'lit';
import type { CellReport } from './types.ts';
import type { Cell } from '../../src/index.ts';
import { cellStyles, editEvent, ErrorClaims, showQ } from './common.ts';
import '../plots/time-plot.ts';

type Q = { value: number; unit: string; si: number };

/**
 * A cell whose own editor is not in this version (data, fit, nca): its fields as JSON, kept
 * and checked by the engine, editable as text, with what the engine computed (the table's
 * size, the estimates with their uncertainty, the profile's values) and its warnings.
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
    const r = this.report;
    const values = (r?.values ?? {}) as Record<string, Q>;
    const estimates = (r?.estimates ?? {}) as Record<string, { value: Q; standardError?: Q; ci95?: Q[]; atBound?: boolean }>;
    return html`
      ${r?.computed === false ? html`<p class="muted">${String(r.message ?? '')}</p>` : ''}
      ${r?.ok && this.cell.kind === 'data' ? html`<p class="muted">${r.rowCount} rows${r.note ? `; ${r.note}` : ''}.</p>` : ''}
      ${Object.keys(estimates).length ? html`<table><thead><tr><th>Estimate</th><th>Value</th><th>Standard error</th><th>95% interval</th></tr></thead><tbody>
        ${Object.entries(estimates).map(([name, e]) => html`<tr><td>${name}</td><td class="result">${showQ(e.value)}${e.atBound ? ' (at a bound)' : ''}</td>
          <td class="result">${e.standardError ? showQ(e.standardError) : ''}</td><td class="result">${e.ci95 ? `${showQ(e.ci95[0])} to ${showQ(e.ci95[1])}` : ''}</td></tr>`)}</tbody></table>
        <p class="muted">${r?.converged ? 'Converged' : 'Not converged'} after ${r?.iterations} iterations (${r?.message}); ${r?.n} points, ${r?.dof} degrees of freedom${r?.residualSD ? `, residual SD ${showQ(r.residualSD as Q)}` : ''}.</p>` : ''}
      ${r?.ok && r.plot ? this.fitPlots(r) : ''}
      ${Object.keys(values).length ? html`<table><tbody>${Object.entries(values).map(([name, q]) => html`<tr><td>${name}</td><td class="result">${showQ(q)}</td></tr>`)}</tbody></table>` : ''}
      ${r?.note && this.cell.kind !== 'data' ? html`<p class="muted">${String(r.note)}</p>` : ''}
      ${((r?.warnings ?? []) as string[]).map((w) => html`<p class="foot-error">${w}</p>`)}
      <textarea aria-label="Fields of cell ${this.cell.id}, as JSON" .value=${JSON.stringify(fields, null, 2)} @input=${this.edit}></textarea>
      ${this.problem ? html`<p class="foot-error" role="alert">${this.problem}</p>` : ''}
      ${claims.rest().map((e) => html`<p class="foot-error" role="alert"><span class="path">${e.path}</span>: ${e.message}</p>`)}`;
  }

  /** The fitted curve over the data, and the residuals against time around a zero line. */
  private fitPlots(r: CellReport) {
    const plot = r.plot as { timeUnit: string; t: number[]; states: Array<{ name: string; unit: string }>; points: Array<{ state: string; t: number[]; values: number[] }> };
    const res = (r.residuals ?? []) as Array<{ state: string; time: Q; residual: Q }>;
    const unit = res[0]?.residual.unit ?? '';
    const residualPlot = {
      timeUnit: plot.timeUnit, t: [plot.t[0], plot.t[plot.t.length - 1]],
      states: [{ name: 'residual', unit, values: [0, 0] }], events: [], levels: [], marks: [],
    };
    const residualPoints = [{ state: 'residual', t: res.map((x) => x.time.value), values: res.map((x) => x.residual.value) }];
    return html`<time-plot .plot=${plot} .points=${plot.points} .summary=${String(r.summary ?? '')}></time-plot>
      <time-plot .plot=${residualPlot} .points=${residualPoints} .summary=${`Residuals (measured minus fitted) against time, in ${unit}.`}></time-plot>`;
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
