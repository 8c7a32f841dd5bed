import { LitElement, css, html, nothing } from 'lit';
import * as store from './store.ts';
import { StudyView } from './study-view.ts';
import './study-library.ts';
import { loadSheet } from './sheet/load.ts';
import { StudySaving } from './study-saving.ts';
import { replayJournals } from './journal.ts';
import { listen, type SaveNews } from './save-news.ts';
import { RESTORED, goneWords, whereGone, type Gone } from './study-gone.ts';

/**
 * The app shell: the library of studies (#/) and one open study (#/study/<id>), with export
 * and print. Routing by the address's hash, so a reload comes back to the same place.
 */
export class RatebookApp extends LitElement {
  static override properties = { route: { state: true }, problem: { state: true }, notice: { state: true }, conflict: { state: true }, elsewhere: { state: true }, gone: { state: true }, saveProblem: { state: true }, ready: { state: true } };
  /** False until the journal has been replayed: the library lists studies only after it. */
  ready = false;
  route: { page: 'library' } | { page: 'study'; id: string; sheet: boolean } = { page: 'library' };
  problem?: string;
  /** What saving did that the user should know: edits replayed from the journal, saving working again. */
  notice?: string;
  /** The open study was saved elsewhere: what happened, until the user chooses. */
  conflict?: string;
  /** The open study, with no unsaved changes here, was saved in another tab: said until the user chooses. */
  elsewhere?: string;
  /** The open study was moved to the trash, or removed for good, in another tab: said until the user chooses. */
  gone?: Gone;
  /** Why the open study's last save failed, until a save succeeds. */
  saveProblem?: string;
  private view?: StudyView;
  private saving?: StudySaving;
  private replayed?: Promise<void>;
  private unlisten?: () => void;

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
    .notice { background: #eef4fb; border: 1px solid #b8cde6; border-radius: 5px; padding: 0.4rem 0.7rem; }
    .conflict { background: #fff3df; border: 1px solid #a85d00; border-radius: 5px; padding: 0.4rem 0.8rem 0.7rem; }
    .conflict button, .notice button { font: inherit; font-size: 0.85rem; padding: 0.2rem 0.6rem; margin-right: 0.4rem; border: 1px solid #8795a1; border-radius: 4px; background: #f3f5f7; cursor: pointer; }
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
    window.addEventListener('beforeunload', this.guard);
    document.addEventListener('visibilitychange', this.flush);
    this.unlisten = listen(this.heard);
    void this.navigate();
  }

  /** Asks before the page goes only while an edit is neither stored nor in the journal. */
  private guard = (e: BeforeUnloadEvent) => {
    const c = this.view?.controller;
    if (!c || !this.saving || c.saveState === 'saved' || this.saving.journaled) return;
    e.preventDefault();
    e.returnValue = '';
  };

  /** Replays the journal of pages closed before their edits were stored (once, before the first page opens). */
  private replay(): Promise<void> {
    return (this.replayed ??= replayJournals(store).then(({ restored, problems }) => {
      if (restored.length) this.notice = restored.join(' ');
      if (problems.length) this.problem = problems.join(' ');
    }, (err) => { this.problem = `Could not check for unsaved changes: ${err instanceof Error ? err.message : String(err)}`; })
      .finally(() => { this.ready = true; }));
  }

  /**
   * Another tab changed a study. When it is the open one and its revision is newer than the
   * one this page is based on: with no unsaved changes here, the page says so and offers the
   * newer version (what is shown stays until the user chooses); with unsaved changes, the two
   * choices of a refused save are offered at once (this page's save would be refused). News
   * without a revision (a study moved to the trash or removed), and any news while the study
   * is gone, is checked against the store (`checkGone`).
   */
  private heard = (news: SaveNews) => {
    const saving = this.saving;
    if (this.route.page !== 'study' || news.id !== this.route.id || !saving || !this.view) return;
    if (news.revision === undefined || this.gone) { void this.checkGone(news.id); return; }
    if (news.revision <= saving.base || this.conflict) return;
    if (this.view.controller.saveState === 'saved') {
      this.elsewhere = `This study was changed in another tab (revision ${news.revision} is stored; this page shows revision ${saving.base}).`;
    } else {
      this.elsewhere = undefined;
      this.conflict = `This study was saved in another tab (revision ${news.revision}) while this page has changes not yet saved (made on revision ${saving.base}). Nothing was overwritten.`;
    }
  };

  /**
   * Whether the open study is still in the store and out of the trash: when it is gone, the
   * page says so and offers the choices (nothing else changes); when another tab restored it,
   * the notice goes and this page's unsaved changes are saved.
   */
  private async checkGone(id: string): Promise<void> {
    let where: Gone | undefined;
    try {
      where = await whereGone(id);
    } catch {
      return; // a damaged record: the next save says so
    }
    const view = this.view;
    if (this.route.page !== 'study' || this.route.id !== id || !view) return;
    if (where) {
      this.gone = where;
      this.elsewhere = undefined;
    } else if (this.gone) {
      this.gone = undefined;
      void view.controller.flush();
    }
  }

  /** The first choice while the study is in the trash: take it out, and save what this page has. */
  private restoreGone = async () => {
    if (this.route.page !== 'study') return;
    const id = this.route.id;
    try {
      await store.restoreStudy(id);
    } catch (err) {
      if (err instanceof store.StoreError && err.code === 'not-found') this.gone = 'removed';
      else this.problem = `Could not restore the study: ${err instanceof Error ? err.message : String(err)}`;
      return;
    }
    this.gone = undefined;
    this.notice = RESTORED;
    // what was typed meanwhile is saved now (its notice would replace this one: both are said)
    if ((await this.view?.controller.flush()) === 'saved' && this.notice !== RESTORED) this.notice = `${RESTORED} The changes typed meanwhile are saved.`;
  };

  /** Saves the open study now: the page may be closing or going to the background. */
  private flush = () => {
    void this.view?.controller.flush();
  };

  override disconnectedCallback(): void {
    window.removeEventListener('hashchange', this.navigate);
    window.removeEventListener('pagehide', this.flush);
    window.removeEventListener('beforeunload', this.guard);
    document.removeEventListener('visibilitychange', this.flush);
    this.unlisten?.();
    super.disconnectedCallback();
  }

  /** The navigation under way, if any: the next one waits for it. */
  private navigating: Promise<void> = Promise.resolve();

  /**
   * Follows the address, one navigation at a time. Each reads the address when its turn comes,
   * so a `hashchange` that arrives while the same study is still opening (the address set just
   * before the app was added to the page) finds the view made and makes no second one.
   */
  private navigate = (): Promise<void> => (this.navigating = this.navigating.then(this.follow, this.follow));

  private follow = async () => {
    await this.replay();
    const m = /^#\/study\/([^/]+)(\/sheet)?$/.exec(location.hash);
    const sheet = m?.[2] !== undefined;
    const id = m ? decodeURIComponent(m[1]) : undefined;
    // Between the cells and the sheet of the open study: the same view, another mode.
    if (this.view && this.route.page === 'study' && this.route.id === id) {
      this.view.mode = sheet ? 'sheet' : 'edit';
      this.route = { page: 'study', id, sheet };
      return;
    }
    if (this.view && !this.conflict) await this.view.controller.flush();
    this.conflict = undefined;
    this.elsewhere = undefined;
    this.gone = undefined;
    this.saveProblem = undefined;
    if (!m || id === undefined) {
      this.view = undefined;
      this.route = { page: 'library' };
      return;
    }
    let stored: store.StoredStudy | undefined;
    try {
      stored = await store.loadStudy(id);
    } catch (err) {
      this.view = undefined;
      this.problem = err instanceof Error ? err.message : String(err);
      location.hash = '#/';
      return;
    }
    if (!stored || stored.deleted !== undefined) {
      this.problem = 'That study is not on this device (it may have been deleted).';
      location.hash = '#/';
      return;
    }
    this.problem = undefined;
    const saving = new StudySaving(id, stored.revision, {
      saved: (info, recovered) => {
        view.meta = { revision: info.revision, updated: info.updated };
        this.saveProblem = undefined;
        if (recovered) this.notice = 'Saved: the changes that could not be stored before are stored now.';
      },
      conflict: (message) => { this.conflict = message; this.elsewhere = undefined; },
      gone: (where) => { this.gone = where; this.elsewhere = undefined; },
      failed: (message) => { this.saveProblem = message; },
    });
    const view = StudyView.create({ save: saving.save, journal: saving.journal, retry: saving.retry });
    this.saving = saving;
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
        ${this.notice ? html`<p class="notice" role="status">${this.notice} <button class="dismiss" @click=${() => { this.notice = undefined; }}>OK</button></p>` : nothing}
        ${this.gone ? html`<div class="conflict gone" role="alert"><p>${goneWords(this.gone)} Choose:</p>
          ${this.gone === 'trash' ? html`<button data-choice="restore" @click=${this.restoreGone}>Restore it from the trash and keep editing</button>` : nothing}
          <button data-choice="copy" @click=${() => void this.keepAsNew('(copy)', this.gone === 'trash' ? 'The study in the trash is unchanged.' : '')}>Keep this page's version as a new study</button></div>` : nothing}
        ${this.conflict && !this.gone ? html`<div class="conflict" role="alert"><p>${this.conflict} Choose which version to keep:</p>
          <button data-choice="newer" @click=${this.takeNewer}>Open the newer version (drop the changes made here)</button>
          <button data-choice="copy" @click=${this.keepCopy}>Keep the changes made here as a new study</button></div>` : nothing}
        ${this.elsewhere && !this.conflict && !this.gone ? html`<div class="conflict elsewhere" role="alert"><p>${this.elsewhere} This page still shows the version it opened.</p>
          <button data-choice="newer" @click=${this.takeNewer}>Open the newer version</button>
          <button data-choice="stay" @click=${() => { this.elsewhere = undefined; }}>Keep looking at this one</button></div>` : nothing}
        ${this.route.page === 'study' && this.saveProblem && !this.conflict && !this.gone
          ? html`<p class="problem save-error" role="alert">${this.saveProblem} Your changes are kept on this page${this.saving?.journaled ? ' and on this device' : ''}, and saving is tried again by itself.</p>` : nothing}
        ${this.route.page === 'study' ? this.view : this.ready ? html`<study-library></study-library>` : nothing}
      </main>`;
  }

  /** The conflict's first choice: the stored (newer) study, this page's changes dropped. */
  private takeNewer = () => {
    this.saving?.discard();
    this.view = undefined;
    void this.navigate();
  };

  /** The conflict's second choice: this page's study becomes a new study, and opens. */
  private keepCopy = () => this.keepAsNew('(copy from another tab)', 'The other version is unchanged.');

  /** This page's study, as it stands, becomes a new study titled "<title> <suffix>", and opens. */
  private keepAsNew = async (suffix: string, rest: string) => {
    const study = this.view?.controller.study;
    if (!study) return;
    try {
      const info = await store.createStudy({ ...study, title: `${study.title} ${suffix}` });
      this.saving?.discard();
      this.view = undefined;
      this.notice = `Your version is kept as a new study, "${info.title}".${rest ? ` ${rest}` : ''}`;
      location.hash = `#/study/${encodeURIComponent(info.id)}`;
    } catch (err) {
      this.problem = `Could not keep your changes as a new study: ${err instanceof Error ? err.message : String(err)} Use Export study to keep them as a file.`;
    }
  };

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
