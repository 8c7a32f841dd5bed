import { LitElement, html, css, nothing } from 'lit';
import * as store from './store.ts';
import type { DamagedStudy, StudySummary, TrashedStudy } from './store.ts';
import { TEMPLATES } from './templates.ts';
import { listen } from './save-news.ts';
import type { Study } from '../src/index.ts';

/** The home page: the studies kept on this device, new ones (blank or from a template), import, and the trash. */
export class StudyLibrary extends LitElement {
  static override properties = { studies: { state: true }, trash: { state: true }, damaged: { state: true }, problem: { state: true }, imported: { state: true }, filter: { state: true }, notice: { state: true }, loaded: { state: true }, renaming: { state: true } };
  studies: StudySummary[] = [];
  damaged: DamagedStudy[] = [];
  /** False until the first listing answered (so "No studies yet" is never said before it is known). */
  loaded = false;
  trash: TrashedStudy[] = [];
  problem?: string;
  /** What became of the last file imported, said beside the import control (the top of the page may be screens away). */
  imported?: { text: string; problem: boolean; id?: string };
  notice?: { text: string; undo?: () => void };
  filter = '';
  /** The id of the study whose title is being edited in place. */
  renaming?: string;

  static override styles = css`
    :host { display: block; }
    h2 { font-size: 1.1rem; margin: 1.2rem 0 0.5rem; }
    h3 { font-size: 0.95rem; margin: 1rem 0 0.4rem; color: #2c3e50; }
    ul { list-style: none; padding: 0; margin: 0; }
    li { display: flex; flex-wrap: wrap; align-items: center; gap: 0.5rem; padding: 0.45rem 0.6rem; border: 1px solid #d0d7de; border-radius: 5px; background: #fff; margin-bottom: 0.4rem; }
    li .t { flex: 1 1 14rem; min-width: 0; }
    li .t a { color: #12406e; font-weight: 600; text-decoration: none; }
    li .t a:hover { text-decoration: underline; }
    li .t input.rename { font: inherit; font-weight: 600; padding: 0.15rem 0.35rem; border: 1px solid #9aa6b1; border-radius: 4px; width: min(24rem, 100%); box-sizing: border-box; }
    .when { color: #56616b; font-size: 0.85rem; }
    button { font: inherit; font-size: 0.85rem; padding: 0.2rem 0.6rem; border: 1px solid #8795a1; border-radius: 4px; background: #f3f5f7; cursor: pointer; color: #1c2329; }
    button:hover { background: #e4e9ee; }
    button:focus-visible, a:focus-visible, input:focus-visible { outline: 2px solid #1d5fa8; outline-offset: 1px; }
    .templates { display: grid; grid-template-columns: repeat(auto-fill, minmax(15rem, 1fr)); gap: 0.6rem; }
    .template { text-align: left; border: 1px solid #b9c3cc; border-radius: 6px; background: #fff; padding: 0.6rem 0.8rem; cursor: pointer; font: inherit; color: inherit; }
    .template:hover { border-color: #1d5fa8; }
    .template strong { display: block; margin-bottom: 0.2rem; color: #12406e; }
    .template span { font-size: 0.85rem; color: #47525c; }
    .search { font: inherit; padding: 0.3rem 0.5rem; border: 1px solid #9aa6b1; border-radius: 4px; width: min(24rem, 100%); margin-bottom: 0.6rem; }
    .problem { color: #a3211a; }
    .notice { background: #eef4fb; border: 1px solid #b8cde6; border-radius: 5px; padding: 0.4rem 0.7rem; display: flex; gap: 0.6rem; align-items: center; }
    .empty { color: #56616b; }
  `;

  private unlisten?: () => void;

  override connectedCallback(): void {
    super.connectedCallback();
    // a study saved, created or deleted in another tab: the lists are read again at once
    this.unlisten = listen(() => void this.refresh());
    void this.refresh();
  }

  override disconnectedCallback(): void {
    this.unlisten?.();
    super.disconnectedCallback();
  }

  /** Reads the lists again; a storage failure is said on the page, and what could be read is shown. */
  async refresh(): Promise<void> {
    const problems: string[] = [];
    const read = async <T>(what: () => Promise<T>, fallback: T): Promise<T> => {
      try { return await what(); } catch (err) { problems.push(message(err)); return fallback; }
    };
    const studies = await read(store.listStudies, []);
    const trash = await read(store.listTrash, []);
    this.damaged = await read(store.listDamaged, []);
    // a sound metadata record beside a damaged document is listed once, as damaged
    const bad = new Set(this.damaged.map((d) => d.id));
    this.studies = studies.filter((s) => !bad.has(s.id));
    this.trash = trash.filter((s) => !bad.has(s.id));
    this.loaded = true;
    if (problems.length) this.problem = problems.join(' ');
  }

  /** Runs a library action; a failure is said on the page (never silent), and the lists are read again. */
  private async act(work: () => Promise<void>): Promise<void> {
    try {
      await work();
    } catch (err) {
      this.problem = message(err);
    }
    await this.refresh();
  }

  override render() {
    const q = this.filter.trim().toLowerCase();
    const templates = TEMPLATES.filter((t) => !q || `${t.title} ${t.description}`.toLowerCase().includes(q));
    return html`
      ${this.notice ? html`<p class="notice" role="status">${this.notice.text} ${this.notice.undo ? html`<button @click=${this.notice.undo}>Undo</button>` : nothing}</p>` : nothing}
      ${this.problem ? html`<p class="problem" role="alert">${this.problem}</p>` : nothing}
      <h2>Your studies</h2>
      ${this.loaded && this.studies.length === 0 && this.damaged.length === 0 ? html`<p class="empty">No studies yet: start one below.</p>` : nothing}
      <ul>${this.studies.map((s) => html`<li>
        <span class="t">${this.renaming === s.id
          ? html`<input class="rename" type="text" aria-label="New title for ${s.title}" .value=${s.title}
              @keydown=${(e: KeyboardEvent) => this.renameKey(e, s)} @blur=${(e: Event) => void this.finishRename(s, (e.target as HTMLInputElement).value, false)} />`
          : html`<a href="#/study/${s.id}">${s.title}</a>`} <span class="when">${s.cells} cells · changed ${when(s.updated)}</span></span>
        <button data-rename=${s.id} aria-label="Rename ${s.title}" @click=${() => void this.startRename(s)}>Rename</button>
        <button aria-label="Duplicate ${s.title}" @click=${() => this.duplicate(s)}>Duplicate</button>
        <button aria-label="Delete ${s.title}" @click=${() => this.trashStudy(s)}>Delete</button>
      </li>`)}
      ${this.damaged.map((d) => html`<li class="damaged" data-id=${d.id}>
        <span class="t"><strong>Damaged:</strong> ${d.title ?? `study ${d.id}`} <span class="when">${d.problem}.${d.cells !== undefined ? ` Its document has ${d.cells} cells.` : ''} It cannot be opened; export its records to keep what is there.</span></span>
        <button data-action="export-raw" aria-label="Export the damaged study ${d.title ?? d.id} as it is" @click=${() => this.exportRaw(d)}>Export as it is</button>
        <button data-action="remove" aria-label="Delete the damaged study ${d.title ?? d.id} for good" @click=${() => this.removeDamaged(d)}>Delete for good</button>
      </li>`)}</ul>
      <h2>Start a new study</h2>
      <input class="search" type="search" placeholder="Search the templates" aria-label="Search the templates" .value=${this.filter} @input=${(e: Event) => { this.filter = (e.target as HTMLInputElement).value; }} />
      <div class="templates">
        <button class="template" @click=${() => this.create()}><strong>Blank study</strong><span>Start from nothing.</span></button>
      </div>
      ${[...new Set(templates.map((t) => t.group))].map((group) => html`<h3>${group}</h3>
        <div class="templates">${templates.filter((t) => t.group === group).map((t) => html`<button class="template" data-template=${t.key} @click=${() => this.create(t.doc)}><strong>${t.title}</strong><span>${t.description}</span></button>`)}</div>`)}
      ${q && templates.length === 0 ? html`<p class="empty">No template matches "${this.filter}".</p>` : nothing}
      <h2>Import</h2>
      <label>Open a study file (.ratebook.json): <input type="file" accept=".json,application/json" aria-describedby="import-result" @change=${this.importFile} /></label>
      ${this.imported ? html`<p id="import-result" class=${this.imported.problem ? 'problem' : 'notice'} role=${this.imported.problem ? 'alert' : 'status'}>${this.imported.text}${this.imported.id ? html` <a href="#/study/${this.imported.id}">Open it</a>` : nothing}</p>` : nothing}
      ${this.trash.length ? html`<h2>Trash</h2><button class="purge" @click=${this.emptyTrash}>Empty the trash</button><ul>${this.trash.map((s) => html`<li>
        <span class="t">${s.title} <span class="when">deleted ${when(s.deleted)}</span></span>
        <button aria-label="Restore ${s.title}" @click=${() => this.restore(s.id)}>Restore</button></li>`)}</ul>` : nothing}`;
  }

  private open(id: string) {
    location.hash = `#/study/${id}`;
  }

  private async create(doc?: Study) {
    try {
      const info = await store.createStudy(doc ? structuredClone(doc) : undefined);
      this.open(info.id);
    } catch (err) {
      this.problem = `The new study was not created: ${message(err)}`;
    }
  }

  /** Rename in place: the title becomes a text field, its text selected. */
  private async startRename(s: StudySummary) {
    this.renaming = s.id;
    await this.updateComplete;
    const input = this.renderRoot.querySelector<HTMLInputElement>('input.rename');
    input?.focus();
    input?.select();
  }

  /** Enter keeps the new title, Escape keeps the old one. */
  private renameKey(e: KeyboardEvent, s: StudySummary) {
    if (e.key === 'Enter') {
      e.preventDefault();
      void this.finishRename(s, (e.target as HTMLInputElement).value, true);
    } else if (e.key === 'Escape') {
      e.preventDefault();
      void this.finishRename(s, undefined, true);
    }
  }

  /**
   * Ends the rename of `s`: saves `title` when given and changed (leaving the field saves too).
   * After a key, focus returns to the study's Rename button; after a click elsewhere it stays there.
   */
  private async finishRename(s: StudySummary, title: string | undefined, refocus: boolean) {
    if (this.renaming !== s.id) return;
    this.renaming = undefined;
    if (title !== undefined && title !== s.title) await this.act(async () => { await store.renameStudy(s.id, title); });
    await this.updateComplete;
    if (refocus) this.renderRoot.querySelector<HTMLButtonElement>(`button[data-rename="${CSS.escape(s.id)}"]`)?.focus();
  }

  private duplicate(s: StudySummary) {
    void this.act(async () => { await store.duplicateStudy(s.id); });
  }

  private trashStudy(s: StudySummary) {
    void this.act(async () => {
      await store.deleteStudy(s.id);
      this.notice = { text: `"${s.title}" moved to the trash.`, undo: () => void this.restore(s.id) };
    });
  }

  private restore(id: string) {
    void this.act(async () => {
      await store.restoreStudy(id);
      this.notice = { text: 'Study restored.' };
    });
  }

  private emptyTrash = () => {
    if (!confirm(`Delete the ${this.trash.length} studies in the trash for good? This cannot be undone.`)) return;
    void this.act(async () => {
      const gone = await store.purgeTrash(0);
      this.notice = { text: `${gone.length} studies deleted for good.` };
    });
  };

  /** Downloads a damaged study's records as they are stored. */
  private exportRaw(d: DamagedStudy) {
    const a = document.createElement('a');
    a.href = URL.createObjectURL(new Blob([d.raw], { type: 'application/json' }));
    a.download = `damaged-${d.id}.json`;
    a.click();
    setTimeout(() => URL.revokeObjectURL(a.href), 1000);
  }

  private removeDamaged(d: DamagedStudy) {
    if (!confirm(`Delete the damaged study "${d.title ?? d.id}" for good? Export it first to keep what is there.`)) return;
    void this.act(async () => {
      await store.removeStudy(d.id);
      this.notice = { text: 'The damaged study was deleted.' };
    });
  }

  private importFile = async (e: Event) => {
    const input = e.target as HTMLInputElement;
    const file = input.files?.[0];
    if (!file) return;
    this.imported = undefined;
    let r: store.ImportResult;
    try {
      r = await store.importStudy(await file.text());
    } catch (err) {
      input.value = '';
      this.imported = { text: `${file.name} was not imported: ${message(err)}`, problem: true };
      return;
    }
    input.value = '';
    if (!r.ok) {
      this.imported = { text: `${file.name} was not imported${r.path ? ` (at ${r.path})` : ''}: ${r.message}. Your studies are unchanged.`, problem: true };
      return;
    }
    this.imported = { text: `Imported "${r.summary.title}" as a new study.`, problem: false, id: r.summary.id };
    await this.refresh();
  };
}

function message(err: unknown): string {
  return err instanceof Error ? err.message : String(err);
}

function when(ms: number): string {
  return new Date(ms).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' });
}

customElements.define('study-library', StudyLibrary);
