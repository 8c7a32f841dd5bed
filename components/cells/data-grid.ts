import { LitElement, html, nothing, type PropertyDeclarations, type TemplateResult } from 'lit';
import { repeat } from 'lit/directives/repeat.js';

type Entry = number | string | null;

/** Every body row is this tall (CSS in the data cell holds it), so a row's place is its index times this. */
export const ROW_PX = 34;
/** Rows drawn above and below those in view, so Tab and a short scroll find rows already there. */
export const MARGIN_ROWS = 12;
/** Rows taken to be in view before the box has a height (not laid out yet). */
const DEFAULT_VIEW_ROWS = 16;

/** An entry typed into the grid: its row and column (0-based) and the text as typed. */
export interface EntryEdit { readonly row: number; readonly column: number; readonly text: string }

/**
 * The data cell's table of measurements, drawn in part: only the rows in view and a margin
 * are in the page, between two spacers as tall as the rows left out, and the window moves as
 * the box scrolls. The table keeps the whole row count for assistive technology
 * (`aria-rowcount`, `aria-rowindex` on each row drawn). The row holding focus is always drawn,
 * so scrolling away from a half-typed entry loses nothing. Up and Down arrows move to the
 * same column of the row above or below, scrolling it into view.
 *
 * It renders into its parent's shadow root (no shadow root of its own), so the data cell's
 * styles and queries reach its inputs. Events: `entry` (an `EntryEdit`, on change) and
 * `delete-row` (the row's index). Cost: a render is linear in the rows drawn, not in the table.
 */
export class DataGridElement extends LitElement {
  static override properties: PropertyDeclarations = {
    names: { attribute: false }, heads: { attribute: false }, rows: { attribute: false }, flagged: { attribute: false },
    top: { state: true }, focusRow: { state: true }, viewRows: { state: true },
  };
  names: readonly string[] = [];
  /** What each column's heading holds (the data cell's name and unit inputs). */
  heads: readonly unknown[] = [];
  rows: ReadonlyArray<readonly unknown[]> = [];
  /** Rows the engine flags, with its message. */
  flagged: ReadonlyMap<number, string> = new Map();
  /** The first row in view. */
  top = 0;
  /** The row whose entry has focus, drawn wherever the window is. */
  focusRow?: number;
  viewRows = DEFAULT_VIEW_ROWS;

  protected override createRenderRoot() {
    return this;
  }

  /** The rows drawn: the window around `top`, and the focused row. */
  drawnRows(): number[] {
    const n = this.rows.length;
    const from = Math.max(0, Math.min(this.top, n) - MARGIN_ROWS);
    const to = Math.min(n, this.top + this.viewRows + MARGIN_ROWS);
    const drawn: number[] = [];
    for (let r = from; r < to; r++) drawn.push(r);
    const f = this.focusRow;
    if (f !== undefined && f < n && (f < from || f >= to)) {
      if (f < from) drawn.unshift(f);
      else drawn.push(f);
    }
    return drawn;
  }

  override render() {
    const n = this.rows.length;
    const span = this.names.length + 2;
    const items: Array<{ key: string; row?: number; gap?: number }> = [];
    let next = 0;
    for (const r of this.drawnRows()) {
      if (r > next) items.push({ key: `gap${next}`, gap: r - next });
      items.push({ key: `row${r}`, row: r });
      next = r + 1;
    }
    if (n > next) items.push({ key: `gap${next}`, gap: n - next });
    return html`<div class="scroll" @scroll=${this.onScroll}><table class="grid" aria-rowcount=${n + 1}>
      <thead><tr aria-rowindex="1"><th><span class="sr">Row</span></th>${this.names.map((_, j) => html`<th>${this.heads[j] ?? nothing}</th>`)}<th><span class="sr">Delete</span></th></tr></thead>
      <tbody @focusin=${this.onFocusIn} @keydown=${this.onKey}>${repeat(items, (x) => x.key, (x) => (x.gap !== undefined
        ? html`<tr class="gap" aria-hidden="true" data-gap=${x.gap}><td colspan=${span}></td></tr>`
        : this.row(x.row!)))}</tbody>
    </table></div>`;
  }

  /** Spacer heights through the CSSOM: the content security policy refuses style attributes. */
  protected override updated(): void {
    for (const tr of this.querySelectorAll<HTMLElement>('tr.gap')) tr.style.height = `${Number(tr.dataset.gap) * ROW_PX}px`;
  }

  private row(r: number): TemplateResult {
    const row = this.rows[r] ?? [];
    const flag = this.flagged.get(r);
    return html`<tr class=${flag !== undefined ? 'flagged' : ''} title=${flag ?? ''} aria-rowindex=${r + 2}>
      <td class="muted">${r + 1}</td>
      ${this.names.map((name, j) => html`<td><input type="text" inputmode="decimal" data-field="rows" data-row=${r} data-column=${j} aria-label="Row ${r + 1}, ${name}" .value=${show(row[j] as Entry)}
        @change=${(e: Event) => this.emit('entry', { row: r, column: j, text: (e.target as HTMLInputElement).value })} /></td>`)}
      <td><button class="quiet" aria-label="Delete row ${r + 1}" @click=${() => this.emit('delete-row', r)}>✕</button></td>
    </tr>`;
  }

  private emit(type: string, detail: unknown): void {
    this.dispatchEvent(new CustomEvent(type, { detail }));
  }

  /** Scroll events come at most once a frame, so the window moves at once (a render is small). */
  private onScroll = (e: Event) => this.place(e.currentTarget as HTMLElement);

  /** The window from the box's scroll position and height. */
  private place(box: HTMLElement): void {
    const body = box.querySelector('tbody');
    const offset = body ? body.offsetTop : 0;
    this.top = Math.max(0, Math.floor((box.scrollTop - offset) / ROW_PX));
    if (box.clientHeight > 0) this.viewRows = Math.ceil(box.clientHeight / ROW_PX) + 1;
  }

  private onFocusIn = (e: FocusEvent) => {
    const row = (e.target as HTMLElement).closest('tr')?.getAttribute('aria-rowindex');
    if (row) this.focusRow = Number(row) - 2;
  };

  private onKey = async (e: KeyboardEvent) => {
    const input = e.target as HTMLElement;
    if (!(input instanceof HTMLInputElement) || (e.key !== 'ArrowDown' && e.key !== 'ArrowUp') || e.altKey || e.ctrlKey || e.metaKey || e.shiftKey) return;
    const row = Number(input.dataset.row) + (e.key === 'ArrowDown' ? 1 : -1);
    if (row < 0 || row >= this.rows.length) return;
    e.preventDefault();
    await this.focusEntry(row, Number(input.dataset.column));
  };

  /** Moves focus to row `row`'s entry in column `column`, drawing and scrolling it into view first. */
  async focusEntry(row: number, column: number): Promise<void> {
    this.focusRow = row;
    const box = this.querySelector('.scroll') as HTMLElement | null;
    if (row < this.top || row >= this.top + this.viewRows - 1) this.top = Math.max(0, row - (row < this.top ? 0 : this.viewRows - 2));
    await this.updateComplete;
    const input = this.querySelector(`input[data-row="${row}"][data-column="${column}"]`) as HTMLInputElement | null;
    input?.focus();
    input?.closest('tr')?.scrollIntoView({ block: 'nearest' });
    if (box) this.place(box);
  }
}

function show(v: Entry): string {
  return v === null || v === undefined ? '' : String(v);
}

customElements.define('data-grid', DataGridElement);
