import { LitElement, html, css, nothing, unsafeCSS } from 'lit';
import { freshId, partsWords, type Cell, type CellReport } from '../src/index.ts';
import { StudyController, type StudyControllerOptions } from './study-controller.ts';
import { LARGE, Progressive } from './progressive.ts';
import { deferEditors } from './expr-editor/deferred.ts';
import { KINDS, ADDABLE } from './cells/registry.ts';
import { NARROW_PX, type CellEditDetail } from './cells/common.ts';
import type { SheetMeta } from './sheet/study-sheet.ts';
import { loadSheet } from './sheet/load.ts';
import { growWith, wrapField, wrapFieldStyles } from './wrap-field.ts';
import { focusFirstField } from './focus-first.ts';
import { focusBefore, keepFocus, keepFocusOnBar } from './keep-focus.ts';
import { keepClear } from './expr-editor/keep-clear.ts';
import { readyUnitsInBackground } from './ready-units.ts';
import { ref } from 'lit/directives/ref.js';
import { guard } from 'lit/directives/guard.js';
import { hasFigures, pendingLine, pendingStyles } from './pending-line.ts';
import { glancePanel, glancePanelStyles } from './glance-panel.ts';

const DESCRIPTION_PLACEHOLDER = 'What this study is about (optional; printed on the sheet)';

/**
 * The open study: its title, cautions, its results at a glance (`glance-panel.ts`), every cell in order with its result, and the tools to
 * add, move, retitle and delete cells, undo and redo. Each change goes through the
 * controller as an engine edit; this element only renders.
 */
export class StudyView extends LitElement {
  static override properties = { studyId: { attribute: 'study-id' }, mode: {}, meta: { attribute: false }, printing: { state: true } };
  studyId?: string;
  /** Editing the cells, or reading the study as its printable sheet. */
  mode: 'edit' | 'sheet' = 'edit';
  /** Revision and save time for the sheet's header. */
  meta: SheetMeta = {};
  /** True while the browser prints: the sheet is rendered (hidden on screen) in edit mode too. */
  printing = false;
  controller!: StudyController;
  /** A long study is rendered in chunks (`progressive.ts`). */
  private readonly chunks = new Progressive<{ r: CellReport | undefined; report: StudyController['report'] }>(this);

  /** A study view with its controller (saving as `options` say). */
  static create(options: StudyControllerOptions = {}): StudyView {
    const view = new StudyView();
    view.controller = new StudyController(view, options);
    return view;
  }

  static override styles = [wrapFieldStyles, pendingStyles, glancePanelStyles, css`
    :host { display: block; }
    .bar { display: flex; flex-wrap: wrap; gap: 0.5rem; align-items: center; margin: 0.4rem 0 1rem; }
    .grow.title { font-size: 1.4rem; font-weight: 650; flex: 1 1 100%; color: #13202b; }
    .status { font-size: 0.85rem; color: #4a5560; min-width: 7rem; }
    .status.busy::before { content: '● '; color: #b07800; }
    button { font: inherit; font-size: 0.9rem; padding: 0.25rem 0.7rem; border: 1px solid #8795a1; border-radius: 4px; background: #f3f5f7; color: #1c2329; cursor: pointer; }
    button:hover:not(:disabled) { background: #e4e9ee; }
    button:disabled { opacity: 0.45; cursor: default; }
    button:focus-visible { outline: 2px solid #1d5fa8; outline-offset: 1px; }
    .name-notes { border-left: 4px solid #5b6670; background: #f3f5f7; padding: 0.3rem 0.9rem; margin: 0 0 0.8rem; color: #2b3640; font-size: 0.9rem; }
    .name-notes p { margin: 0.25rem 0; }
    .caution { border-left: 4px solid #a85d00; background: #fff3df; padding: 0.55rem 0.9rem; margin: 0 0 0.8rem; color: #3d2a00; }
    /* position: a paint layer of its own, so a redraw of one cell repaints that cell, not the page */
    article:focus { outline: 2px solid #1d5fa8; outline-offset: 2px; }
    article { position: relative; border: 1px solid #c9d1d8; border-radius: 6px; background: #fff; margin: 0 0 0.9rem; padding: 0.6rem 0.9rem 0.7rem; break-inside: avoid; contain: layout style; }
    /* a large study: cells far from the view are neither laid out nor painted (each editor made measures the page);
       they count as 11rem tall. Not 'auto 11rem': the remembered sizes cost up to 16 layout passes in one task */
    .large article { content-visibility: auto; contain-intrinsic-size: 11rem; }
    @media print { .large article { content-visibility: visible; } }
    article.failed { border-color: #b3261e; box-shadow: inset 3px 0 0 #b3261e; }
    /* a cell whose figures changed glows for a moment: a ring that fades, its opacity animated by the
       compositor (an animated box-shadow repainted the cell at every frame, through a whole slider drag) */
    article.fresh::after { content: ''; position: absolute; inset: -1px; border-radius: 6px; box-shadow: 0 0 0 3px rgba(29, 95, 168, 0.35);
      opacity: 0; pointer-events: none; animation: flash 0.6s ease-out; }
    @keyframes flash { from { opacity: 1; } to { opacity: 0; } }
    @media print { article.fresh::after { display: none; } }
    header.cell { display: flex; flex-wrap: wrap; align-items: center; gap: 0.4rem; margin-bottom: 0.3rem; }
    header.cell .grow { font-weight: 600; flex: 1 1 10rem; color: #13202b; }
    header.cell .tools { white-space: nowrap; }
    @media (max-width: ${unsafeCSS(NARROW_PX)}px) { header.cell .grow { order: 1; flex-basis: 100%; } header.cell .tools { margin-left: auto; } }
    .kind { font-size: 0.75rem; text-transform: uppercase; letter-spacing: 0.04em; color: #44525e; background: #e8edf1; border-radius: 3px; padding: 0.05rem 0.4rem; }
    .state { font-size: 0.8rem; }
    .state.bad { color: #a3211a; font-weight: 600; }
    .state.idle { color: #6b5200; }
    .tools button { border-color: transparent; background: transparent; padding: 0.1rem 0.45rem; }
    .tools button:hover { background: #e8edf1; }
    .waits { color: #6b5200; font-size: 0.85rem; }
    .add { display: flex; flex-wrap: wrap; gap: 0.4rem; align-items: center; border: 1px dashed #aab5bf; border-radius: 6px; padding: 0.5rem 0.8rem; }
    .problem { color: #a3211a; }
    .empty { color: #4a5560; }
    .for-print { display: none; }
    .sheet-bar { display: flex; flex-wrap: wrap; gap: 0.5rem; align-items: center; margin: 0.4rem 0 1rem; }
    .sheet-bar .hint { font-size: 0.85rem; color: #4a5560; }
    .paper { background: #fff; max-width: 180mm; margin: 0 auto; padding: 14mm 15mm; box-shadow: 0 1px 4px rgba(0, 0, 0, 0.25); }
    /* the description grows with its text (wrap-field.ts's grid: a hidden copy gives the height); line breaks are kept */
    .grow.description { font-size: 0.92rem; color: #2b3640; margin: 0 0 0.4rem; }
    .author { font: inherit; font-size: 0.9rem; border: 1px solid #c9d1d8; border-radius: 4px; padding: 0.2rem 0.4rem; width: 12rem; }
    @media print {
      .sheet-instead, .sheet-bar { display: none !important; }
      .editing .tools, .editing .add, .editing .bar button { display: none; }
      .for-print { display: block; }
      .paper { box-shadow: none; padding: 0; max-width: none; }
    }
  `];

  override connectedCallback(): void {
    super.connectedCallback();
    window.addEventListener('keydown', this.keys);
    this.addEventListener('focusin', this.focusIn);
    this.addEventListener('focusout', this.focusOut);
    this.addEventListener('expr-commit', this.fieldCommitted);
    window.addEventListener('beforeprint', this.beforePrint);
    window.addEventListener('afterprint', this.afterPrint);
    // the sheet's code comes in its own chunk; fetch it now, before anyone prints
    void loadSheet();
    // the unit table and parser, which editors and unit menus need, a part per short task
    readyUnitsInBackground();
  }

  override disconnectedCallback(): void {
    window.removeEventListener('keydown', this.keys);
    this.removeEventListener('focusin', this.focusIn);
    this.removeEventListener('focusout', this.focusOut);
    this.removeEventListener('expr-commit', this.fieldCommitted);
    window.removeEventListener('beforeprint', this.beforePrint);
    window.removeEventListener('afterprint', this.afterPrint);
    this.chunks.stop();
    super.disconnectedCallback();
  }

  // Lit renders in a microtask, which runs before the browser lays the page out for print.
  // Until the sheet's chunk has arrived (the first moment after opening) the editing view prints.
  private beforePrint = () => { this.printing = customElements.get('study-sheet') !== undefined; };
  private afterPrint = () => { this.printing = false; };

  /**
   * Ctrl+Z / Cmd+Z undo the study; Ctrl+Shift+Z, Cmd+Shift+Z and Ctrl+Y redo it. Not a key
   * already handled (an expression field undoing its own typing), nor one typed in a plain
   * text input, which keeps the browser's own undo.
   */
  private keys = (e: KeyboardEvent) => {
    const mod = e.ctrlKey || e.metaKey;
    if (!mod || e.defaultPrevented) return;
    const key = e.key.toLowerCase();
    const target = e.composedPath()[0] as HTMLElement | undefined;
    if (target && (target.tagName === 'INPUT' || target.tagName === 'TEXTAREA') && (target as HTMLInputElement).type !== 'range' && (target as HTMLInputElement).type !== 'checkbox') return;
    if (key === 'z' && !e.shiftKey) { e.preventDefault(); this.step('undo'); }
    else if ((key === 'z' && e.shiftKey) || key === 'y') { e.preventDefault(); this.step('redo'); }
  };

  /**
   * Undoes or redoes a step; when it removes the field with focus, focus goes to its cell; when
   * it leaves the focused Undo (Redo) button disabled, to Redo (Undo) (`keep-focus.ts`).
   */
  private step(which: 'undo' | 'redo'): void {
    const root = this.shadowRoot;
    const before = root ? focusBefore(root, (id) => this.controller.study?.cells.find((x) => x.id === id)?.kind) : undefined;
    const held = root?.activeElement === this.stepButton(which) ? this.stepButton(which) : undefined;
    if (which === 'undo') this.controller.undo(); else this.controller.redo();
    if (root) void keepFocus(root, before, (kind) => this.addButton(kind));
    if (root) void keepFocusOnBar(root, held, () => this.stepButton(which === 'undo' ? 'redo' : 'undo'));
  }

  /** The bar's Undo or Redo button. */
  private stepButton(which: 'undo' | 'redo'): HTMLButtonElement | undefined {
    return this.renderRoot.querySelector<HTMLButtonElement>(`.bar button[data-step="${which}"]`) ?? undefined;
  }

  /** The Add bar's button for cells of `kind`. */
  private addButton(kind: string): HTMLElement | undefined {
    const label = KINDS[kind as Cell['kind']]?.label;
    return [...this.renderRoot.querySelectorAll<HTMLElement>('.add button')].find((b) => b.textContent?.trim() === label);
  }

  // One undo step per stretch of typing: an expression field holds its step open while it has
  // focus (its own undo covers the typing), and a commit or a move of focus ends the step.
  private focusIn = (e: FocusEvent) => {
    this.controller.holdStep(e.composedPath().some((n) => (n as Element).localName === 'expr-field'));
  };
  private focusOut = () => this.controller.holdStep(false);
  private fieldCommitted = () => this.controller.endStep();

  override render() {
    const c = this.controller;
    const study = c?.study;
    if (!study) return html`<p class="empty">No study is open.</p>`;
    const report = c.report;
    const sheet = html`<study-sheet .study=${study} .report=${report} .meta=${this.meta} .pending=${c.pending} .progress=${c.progress}></study-sheet>`;
    if (this.mode === 'sheet') {
      return html`
        <div class="sheet-bar" role="toolbar" aria-label="Sheet">
          <button @click=${() => this.dispatchEvent(new CustomEvent('sheet-mode', { detail: { mode: 'edit' }, bubbles: true, composed: true }))}>Back to editing</button>
          <button @click=${() => void loadSheet().then(() => window.print())}>Print…</button>
          <button @click=${() => void this.exportPdf(study.title)} title="Opens the print dialog: choose Save as PDF as the destination">Export PDF…</button>
          <span class="hint">For a PDF, choose "Save as PDF" as the printer. A4 and US Letter both fit.</span>
        </div>
        <div class="paper">${sheet}</div>`;
    }
    const byId = new Map((report?.cells ?? []).map((r) => [r.id, r] as const));
    // not while printing: the charts and fields of the page must all be there for paper
    deferEditors(!this.printing && study.cells.length > LARGE);
    return html`
      ${this.printing ? html`<div class="for-print">${sheet}</div>` : nothing}
      <div class="editing ${this.printing ? 'sheet-instead' : ''} ${study.cells.length > LARGE ? 'large' : ''}">
      <div class="bar">
        ${wrapField({ cls: 'title', field: 'title', label: 'Study title', value: study.title, onInput: (title) => c.edit({ type: 'retitle', title }, 'title') })}
        <button data-step="undo" ?disabled=${!c.canUndo} @click=${() => this.step('undo')} title="Undo (Ctrl+Z)">Undo</button>
        <button data-step="redo" ?disabled=${!c.canRedo} @click=${() => this.step('redo')} title="Redo (Ctrl+Shift+Z)">Redo</button>
        <input class="author" data-field="author" aria-label="Prepared by" placeholder="Prepared by (name)" .value=${study.author ?? ''}
          @input=${(e: Event) => c.edit({ type: 'author', author: (e.target as HTMLInputElement).value }, 'author')} />
        <button @click=${() => this.dispatchEvent(new CustomEvent('sheet-mode', { detail: { mode: 'sheet' }, bubbles: true, composed: true }))} title="The study as a document to print or save as PDF">Printable sheet</button>
        <span class="status ${c.busy ? 'busy' : ''}" role="status" aria-live="polite">${c.busy ? 'computing…' : saveText(c.saveState)}</span>
      </div>
      <div class="grow description" data-text=${study.description || DESCRIPTION_PLACEHOLDER}><textarea class="description" data-field="description" rows="1" aria-label="What the study is about" placeholder=${DESCRIPTION_PLACEHOLDER} .value=${study.description ?? ''}
        @input=${(e: Event) => { growWith(e); c.edit({ type: 'describe', description: (e.target as HTMLTextAreaElement).value }, 'description'); }}></textarea></div>
      ${(report?.cautions ?? []).map((x) => html`<p class="caution" role="note"><strong>Caution.</strong> ${x.text}</p>`)}
      ${glancePanel(report, study, c)}
      ${report?.warningParts?.length ? html`<section class="name-notes" aria-label="How this study's names are read">
        ${report.warningParts.map((p) => { const w = partsWords(study, p); return html`<p>${w[0].toUpperCase()}${w.slice(1)}.</p>`; })}</section>` : nothing}
      ${c.problem ? html`<p class="problem" role="alert">${c.problem}</p>` : nothing}
      ${study.cells.length === 0 ? html`<p class="empty">This study has no cells yet. Start with parameters or a rate law below.</p>` : nothing}
      ${this.chunks.pick(study.cells, report, (cell) => ({ r: byId.get(cell.id), report })).map(([cell, i, g]) => this.cell(cell, i, g.r, g.report))}
      <div class="add" role="group" aria-label="Add a cell" ${ref(this.addBar)}>
        <span>Add</span>
        ${ADDABLE.map((kind) => html`<button @click=${() => void this.add(kind)}>${KINDS[kind].label}</button>`)}
      </div>
      </div>`;
  }

  private cell(cell: Cell, i: number, r: CellReport | undefined, report: StudyController['report']) {
    const c = this.controller;
    const info = KINDS[cell.kind];
    const failed = r && !r.ok;
    const idle = r?.ok && r.computed === false;
    const fresh = c.changed.includes(cell.id);
    // still computing (a Monte Carlo, or a cell reading one): its previous figures, dimmed, and
    // drawn again only when its cell or its report changes (the controller keeps an unchanged
    // one); errors it shows are worded from the study (other cells' titles and problems), so
    // a cell with errors is drawn again when the study or its report changes too
    const pending = c.pending.includes(cell.id);
    return html`<article data-cell=${cell.id} class="${failed ? 'failed' : ''} ${fresh ? 'fresh' : ''} ${pending ? 'pending' : ''}" aria-label="${cell.title || cell.id} (${info.label})"
        @cell-edit=${(e: CustomEvent<CellEditDetail>) => { e.stopPropagation(); c.edit({ type: 'replace', cell: e.detail.cell }, e.detail.mergeKey); }}>
      <header class="cell">
        <span class="kind">${info.label}</span>
        ${wrapField({ cls: 'cell-title', field: 'title', label: `Title of cell ${cell.id}`, placeholder: cell.id, value: cell.title ?? '',
          onInput: (t) => {
            // the cell as the document has it now (a field typed just before is not drawn yet), and
            // drawn at once with its title, so the cell's element builds its next edit on it
            const { title: _t, ...rest } = c.study?.cells.find((x) => x.id === cell.id) ?? cell;
            c.edit({ type: 'replace', cell: t ? { ...rest, title: t } : rest }, `${cell.id}:title`);
            this.requestUpdate();
          } })}
        <span class="state ${pending ? 'idle' : failed ? 'bad' : idle ? 'idle' : ''}">${pending ? 'updating…' : !r ? '' : failed ? (r.waitsOn ? 'waiting' : 'error') : idle ? 'not computed yet' : c.busy && c.rerun.includes(cell.id) ? 'recomputing…' : ''}</span>
        <span class="tools">
          <button aria-label="Move ${cell.id} up" ?disabled=${i === 0} @click=${() => c.edit({ type: 'move', id: cell.id, to: i - 1 })}>↑</button>
          <button aria-label="Move ${cell.id} down" ?disabled=${i === (c.study?.cells.length ?? 0) - 1} @click=${() => c.edit({ type: 'move', id: cell.id, to: i + 1 })}>↓</button>
          <button aria-label="Delete ${cell.id}" @click=${() => c.edit({ type: 'remove', id: cell.id })}>✕</button>
        </span>
      </header>
      ${pending ? pendingLine(cell.id, c.progress, (id) => { const t = c.study?.cells.find((x) => x.id === id)?.title; return t ? `"${t}"` : `cell ${id}`; }, hasFigures(r)) : nothing}
      ${pending ? guard(r?.ok === false ? [cell, r, report, c.study] : [cell, r], () => info.render(cell, r, report, c.study)) : info.render(cell, r, report, c.study)}
    </article>`;
  }

  /** Prints with the study's title as the document title, which browsers offer as the PDF's file name. */
  private async exportPdf(title: string) {
    await loadSheet();
    const before = document.title;
    document.title = title.replace(/[\\/:*?"<>|]+/g, ' ').trim() || 'Ratebook study';
    window.print();
    document.title = before;
  }

  /** The Add bar, kept clear of the expression fields' completion lists while it is shown. */
  private releaseAddBar?: () => void;
  private addBar = (el?: Element) => {
    this.releaseAddBar?.();
    this.releaseAddBar = el ? keepClear(el) : undefined;
  };

  /** Adds a cell of that kind at the end, and moves focus into its first field. */
  private async add(kind: Cell['kind']) {
    const study = this.controller.study!;
    const id = freshId(study, kind === 'parameters' ? 'inputs' : kind === 'simulate' ? 'run' : kind);
    this.chunks.showAll();
    this.controller.edit({ type: 'insert', index: study.cells.length, cell: { id, kind, ...KINDS[kind].blank(study) } });
    await this.updateComplete;
    const body = this.renderRoot.querySelector(`article[data-cell="${CSS.escape(id)}"] > :last-child`);
    if (body) await focusFirstField(body);
  }
}

function saveText(state: string): string {
  return state === 'saved' ? 'saved' : state === 'saving' ? 'saving…' : state === 'pending' ? 'unsaved changes' : 'could not save';
}

customElements.define('study-view', StudyView);

declare global {
  interface HTMLElementTagNameMap { 'study-view': StudyView }
}
