/**
 * The base of the cell elements: the cell, its report and the whole report as properties, the
 * study's names, the cell's errors by field for each render, the `cell-edit` event, and focus
 * moved to what an add button made once it is drawn. A cell element extends it and only renders.
 */
import { LitElement, html, type PropertyDeclarations, type PropertyValues } from 'lit';
import type { Cell, CellKind, ReportOf, Report } from '../../src/index.ts';
import { cellStyles, editEvent, ErrorClaims, namesOf } from './common.ts';
import type { StudyName } from '../expr-field.ts';
import { focusFirstField } from '../focus-first.ts';

/** The document of a cell of kind K. */
export type CellDoc<K extends CellKind> = Extract<Cell, { kind: K }>;

export class CellElement<K extends CellKind> extends LitElement {
  /** Subclasses add their own (Lit merges them with these). */
  static override properties: PropertyDeclarations = { cell: { attribute: false }, report: { attribute: false }, study: { attribute: false }, doc: { attribute: false } };
  static override styles = [cellStyles];
  cell!: CellDoc<K>;
  /** The engine's report of this cell. */
  report?: ReportOf<K>;
  /** The engine's report of the whole study (names, other cells). */
  study?: Report;
  /** The study's document, for messages in words (places named as a person sees them). */
  doc?: { readonly cells: readonly Cell[] };
  /** The cell's errors by field, made afresh for each render: a field takes its own, the rest go to the foot. */
  protected claims = new ErrorClaims(undefined);

  protected override willUpdate(): void {
    this.claims = new ErrorClaims(this.report, this.doc ? { doc: this.doc, report: this.study ?? { cells: [] }, self: this.cell.id } : undefined);
  }

  /** The study's names with their current values, for the expression fields. */
  protected get names(): StudyName[] {
    return namesOf(this.study, this.doc);
  }

  /** Ids of the study's cells of one kind, in order. */
  protected idsOf(kind: CellKind): string[] {
    return this.cellsNow().filter((c) => c.kind === kind).map((c) => c.id);
  }

  /** The study's cells as the document has them now (the report's while no document is given): a cell added or renamed counts at once, and before the first report arrives. */
  private cellsNow(): ReadonlyArray<{ readonly kind: string; readonly id: string; readonly title?: string; readonly state?: unknown }> {
    return this.doc?.cells ?? this.study?.cells ?? [];
  }

  /**
   * The study's rate laws, in order, each with what it describes for a reader: its state and
   * its cell's title (`C (Elimination)`), or the state alone when the cell has no title (the
   * cell's id while it has no state), from the document as it is now.
   */
  protected laws(): Array<{ id: string; label: string }> {
    return this.cellsNow().filter((c) => c.kind === 'rate').map((c) => {
      const state = typeof (c as { state?: unknown }).state === 'string' ? (c as { state: string }).state : '';
      return { id: c.id, label: state ? (c.title ? `${state} (${c.title})` : state) : c.title || c.id };
    });
  }

  /** Asks to change fields of the cell; edits with the same `key` in a row are one undo step. */
  protected edit(patch: Partial<CellDoc<K>>, key?: string): void {
    this.replace({ ...this.cell, ...patch }, key);
  }

  /**
   * Asks to replace the cell by `cell` (for edits that remove a field). The element takes the
   * cell at once: the study view draws a typing edit again only with the engine's answer, and
   * an edit in another field before then must build on this one (built on the cell last drawn,
   * a note typed right after a value wrote the old value back). The view's next drawing gives
   * the document's cell, which holds this edit (or an undo of it).
   */
  protected replace(cell: CellDoc<K>, key?: string): void {
    const mergeKey = key ? `${this.cell.id}:${key}` : undefined;
    this.cell = cell;
    this.dispatchEvent(editEvent(cell, mergeKey));
  }

  /** What to focus once a render shows it, and the time after which it is no longer awaited. */
  private focusNext?: { readonly selector: string; readonly until: number; readonly how: (el: Element) => unknown };

  /**
   * Moves focus, once the cell is drawn with the edit just asked for, into the first field of
   * the element matching `selector` in the cell: after an add button (a scenario, a value, a
   * name), the keyboard goes on in what was added, not on the button below it. Given up after
   * 10 s (an edit that never came back). `how` focuses the element found, when its first field
   * is not the place (a data table's new row, which the table draws itself).
   */
  protected focusWhenShown(selector: string, how: (el: Element) => unknown = focusFirstField): void {
    this.focusNext = { selector, until: performance.now() + 10_000, how };
  }

  protected override updated(changed: PropertyValues): void {
    super.updated(changed);
    const next = this.focusNext;
    if (!next) return;
    const el = this.shadowRoot?.querySelector(next.selector);
    if (el || performance.now() > next.until) this.focusNext = undefined;
    if (el) void next.how(el);
  }

  /** At the cell's foot: what it waits on, once, and the errors no field took, each with its place in words. */
  protected footErrors() {
    return [
      ...this.claims.waits().map((w) => html`<p class="foot-error waits" role="alert">${w[0].toUpperCase()}${w.slice(1)}.</p>`),
      ...this.claims.rest().map((e) => html`<p class="foot-error" role="alert"><span class="place">${e.place[0].toUpperCase()}${e.place.slice(1)}</span>: ${e.message}</p>`),
    ];
  }
}
