import { LitElement, css, html, nothing } from 'lit';
import * as store from './store.ts';
import { StudyView } from './study-view.ts';
import './study-library.ts';
import { loadSheet } from './sheet/load.ts';

/**
 * The app shell: the library of studies (#/) and one open study (#/study/<id>), with export
 * and print. Routing by the address's hash, so a reload comes back to the same place.
 */
export class RatebookApp extends LitElement {
  static override properties = { route: { state: true }, problem: { state: true } };
  route: { page: 'library' } | { page: 'study'; id: string; sheet: boolean } = { page: 'library' };
  problem?: string;
  private view?: StudyView;

  static override styles = css`
    :host { display: block; font-family: system-ui, -apple-system, 'Segoe UI', sans-serif; color: #1c2329; background: #f2f4f6; min-height: 100vh; }
    header.top { display: flex; flex-wrap: wrap; align-items: baseline; gap: 0.3rem 1rem; padding: 0.7rem 1.2rem; background: #1f3b53; color: #fff; }
    header.top h1 { margin: 0; font-size: 1.25rem; }
    header.top a { color: #fff; text-decoration: none; font-weight: 700; }
    header.top .tag { opacity: 0.85; font-size: 0.9rem; flex: 1 1 auto; }
    header.top button { font: inherit; font-size: 0.85rem; padding: 0.2rem 0.7rem; border: 1px solid #9cb3c7; border-radius: 4px; background: #2b4d6a; color: #fff; cursor: pointer; }
    header.top button:hover { background: #386187; }
    header.top button:focus-visible, header.top a:focus-visible { outline: 2px solid #ffd27a; outline-offset: 2px; }
    main { max-width: 64rem; margin: 0 auto; padding: 0.8rem 1.2rem 2rem; }
    .problem { color: #a3211a; }
    @media print {
      :host { background: #fff; }
      header.top { display: none; }
      main { max-width: none; padding: 0; }
    }
  `;

  override connectedCallback(): void {
    super.connectedCallback();
    window.addEventListener('hashchange', this.navigate);
    window.addEventListener('pagehide', this.flush);
    document.addEventListener('visibilitychange', this.flush);
    void this.navigate();
  }

  /** Saves the open study now: the page may be closing or going to the background. */
  private flush = () => {
    void this.view?.controller.flush();
  };

  override disconnectedCallback(): void {
    window.removeEventListener('hashchange', this.navigate);
    window.removeEventListener('pagehide', this.flush);
    document.removeEventListener('visibilitychange', this.flush);
    super.disconnectedCallback();
  }

  private navigate = async () => {
    const m = /^#\/study\/([^/]+)(\/sheet)?$/.exec(location.hash);
    const sheet = m?.[2] !== undefined;
    const id = m ? decodeURIComponent(m[1]) : undefined;
    // Between the cells and the sheet of the open study: the same view, another mode.
    if (this.view && this.route.page === 'study' && this.route.id === id) {
      this.view.mode = sheet ? 'sheet' : 'edit';
      this.route = { page: 'study', id, sheet };
      return;
    }
    if (this.view) await this.view.controller.flush();
    if (!m || id === undefined) {
      this.view = undefined;
      this.route = { page: 'library' };
      return;
    }
    const stored = await store.loadStudy(id);
    if (!stored || stored.deleted !== undefined) {
      this.problem = 'That study is not on this device (it may have been deleted).';
      location.hash = '#/';
      return;
    }
    this.problem = undefined;
    const view = StudyView.create({
      save: async (sid, doc) => {
        const info = await store.saveStudy(sid, doc);
        view.meta = { revision: info.revision, updated: info.updated };
      },
    });
    view.meta = { revision: stored.revision, updated: stored.updated };
    view.mode = sheet ? 'sheet' : 'edit';
    view.addEventListener('sheet-mode', (e) => {
      location.hash = `#/study/${encodeURIComponent(id)}${(e as CustomEvent<{ mode: string }>).detail.mode === 'sheet' ? '/sheet' : ''}`;
    });
    view.controller.open(id, stored.doc);
    this.view = view;
    this.route = { page: 'study', id, sheet };
  };

  override render() {
    return html`
      <header class="top">
        <h1><a href="#/">Ratebook</a></h1>
        <span class="tag">first-order rate laws with real units</span>
        ${this.route.page === 'study' ? html`
          <button @click=${this.exportStudy}>Export study</button>
          <button @click=${() => void loadSheet().then(() => window.print())}>Print</button>` : nothing}
      </header>
      <main>
        ${this.problem ? html`<p class="problem" role="alert">${this.problem}</p>` : nothing}
        ${this.route.page === 'study' ? this.view : html`<study-library></study-library>`}
      </main>`;
  }

  private exportStudy = () => {
    const study = this.view?.controller.study;
    if (!study) return;
    const file = store.exportStudy(study);
    const a = document.createElement('a');
    a.href = URL.createObjectURL(file.blob);
    a.download = file.fileName;
    a.click();
    setTimeout(() => URL.revokeObjectURL(a.href), 1000);
  };
}

customElements.define('ratebook-app', RatebookApp);

declare global {
  interface HTMLElementTagNameMap { 'ratebook-app': RatebookApp }
}
