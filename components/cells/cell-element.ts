/**
 * The base of the cell elements: the cell, its report and the whole report as properties, the
 * study's names, the cell's errors by field for each render, and the `cell-edit` event. A
 * cell element extends it and only renders.
 */
import { LitElement, html, type PropertyDeclarations } from 'lit';
import type { Cell, CellKind, ReportOf, Report } from '../../src/index.ts';
import { cellStyles, editEvent, ErrorClaims, namesOf } from './common.ts';
import type { StudyName } from '../expr-field.ts';

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

  /** The cell as this element last asked for it, and the `cell` it was asked on (see `current`). */
  private sent?: { readonly cell: CellDoc<K>; readonly on: CellDoc<K> };

  /**
   * The cell with this element's own edits in it: `cell` until the study hands a new one.
   * Typing waits up to a moment for the engine's answer before the study renders, so a second
   * field edited within it must build on the first field's edit, not on `cell` from before it.
   */
  protected get current(): CellDoc<K> {
    return this.sent && this.sent.on === this.cell ? this.sent.cell : this.cell;
  }

  /** Asks to change fields of the cell; edits with the same `key` in a row are one undo step. */
  protected edit(patch: Partial<CellDoc<K>>, key?: string): void {
    this.replace({ ...this.current, ...patch }, key);
  }

  /** Asks to replace the cell by `cell` (for edits that remove a field). */
  protected replace(cell: CellDoc<K>, key?: string): void {
    this.sent = { cell, on: this.cell };
    this.dispatchEvent(editEvent(cell, key ? `${this.cell.id}:${key}` : undefined));
  }

  /** At the cell's foot: what it waits on, once, and the errors no field took, each with its place in words. */
  protected footErrors() {
    return [
      ...this.claims.waits().map((w) => html`<p class="foot-error waits" role="alert">${w[0].toUpperCase()}${w.slice(1)}.</p>`),
      ...this.claims.rest().map((e) => html`<p class="foot-error" role="alert"><span class="place">${e.place[0].toUpperCase()}${e.place.slice(1)}</span>: ${e.message}</p>`),
    ];
  }
}
