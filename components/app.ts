import { LitElement, css, html, nothing } from 'lit';
import { runStudy, type Report } from '../src/index.ts';
import './report-view.ts';

const examples = import.meta.glob('../examples/*.ratebook.json', { eager: true, import: 'default' }) as Record<string, unknown>;

/**
 * The app shell of this version: open a study file or an example and read its evaluated
 * report. The editable study view replaces the body in the next version.
 */
export class RatebookApp extends LitElement {
  static override properties = { report: { state: true }, problem: { state: true } };
  report?: Report;
  problem?: string;

  static override styles = css`
    :host { display: block; font-family: system-ui, sans-serif; color: #1c2329; background: #f4f6f8; min-height: 100vh; }
    header { padding: 1rem 1.5rem; background: #21415c; color: #fff; }
    header h1 { margin: 0; font-size: 1.4rem; }
    header p { margin: 0.2rem 0 0; font-size: 0.9rem; opacity: 0.9; }
    main { max-width: 60rem; margin: 0 auto; padding: 1rem 1.5rem; }
    .open { display: flex; flex-wrap: wrap; gap: 1rem; align-items: center; margin-bottom: 1rem; }
    .caution { border-left: 4px solid #b36b00; background: #fff4e0; padding: 0.5rem 0.9rem; margin-bottom: 1rem; }
    .problem { color: #b3261e; }
    label { font-weight: 600; }
    select, input { font: inherit; }
  `;

  override render() {
    return html`
      <header><h1>Ratebook</h1><p>First-order rate laws with real units</p></header>
      <main>
        <p class="caution" role="note">An analysis aid: results that concern doses are not a dosing instruction and must be checked by a licensed professional against local protocols.</p>
        <div class="open">
          <label for="example">Example</label>
          <select id="example" @change=${this.pickExample}>
            <option value="">choose…</option>
            ${Object.keys(examples).map((k) => html`<option value=${k}>${title(examples[k], k)}</option>`)}
          </select>
          <label for="file">Study file</label>
          <input id="file" type="file" accept=".json,application/json" @change=${this.openFile} />
        </div>
        ${this.problem ? html`<p class="problem" role="alert">${this.problem}</p>` : nothing}
        ${this.report ? html`<h2>${this.report.title}</h2><report-view .report=${this.report}></report-view>` : nothing}
      </main>`;
  }

  private show(input: unknown, from: string) {
    const r = runStudy(input);
    if (r.ok) {
      this.report = r.report;
      this.problem = undefined;
    } else {
      this.problem = `${from} is not a readable study${r.error.path ? ` (at ${r.error.path})` : ''}: ${r.error.message}`;
    }
  }

  private pickExample(e: Event) {
    const key = (e.target as HTMLSelectElement).value;
    if (key) this.show(examples[key], key.split('/').pop()!);
  }

  private async openFile(e: Event) {
    const file = (e.target as HTMLInputElement).files?.[0];
    if (file) this.show(await file.text(), file.name);
  }
}

function title(doc: unknown, key: string): string {
  const t = (doc as { title?: unknown })?.title;
  return typeof t === 'string' ? t : key.split('/').pop()!;
}

customElements.define('ratebook-app', RatebookApp);

declare global {
  interface HTMLElementTagNameMap { 'ratebook-app': RatebookApp }
}
