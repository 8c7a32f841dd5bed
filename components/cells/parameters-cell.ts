import { html, nothing, css, unsafeCSS } from 'lit';
import { splitAssignment, type ParameterValue, SpreadSetAside } from '../../src/index.ts';
import type { ExprField } from '../expr-field.ts';
import { cellStyles, footError, NARROW_PX, showQ, showValue } from './common.ts';
import { CellElement } from './cell-element.ts';
import '../expr-field.ts';
import { wrapField, wrapFieldStyles } from '../wrap-field.ts';
import '../unit-pick.ts';
import type { UnitPickDetail } from '../unit-pick.ts';
import { spreadFields } from './spread-fields.ts';

/** What a name box adds to its text's width: the field's padding and border, the cell's padding. */
const NAME_BOX_EXTRA = '1.6rem + 2px';

/** A parameters cell: one row per name, with its value field, its current value and, given a range, a slider. */
export class ParametersCellElement extends CellElement<'parameters'> {
  // fixed column widths: a value that changes length while a slider moves must not re-lay out
  // the table (and every editor in it); a value longer than its column wraps, never cut. On a
  // phone each parameter is a block: name, value, what it is now, note (the shared stack).
  // The name column is as wide as the longest name (`--name-chars`, set by the element; a
  // name is in monospace, one `ch` a character, so the column's own font is monospace too),
  // at least 8.5rem and at most 17rem; a longer name scrolls in its box and is its title.
  static override styles = [cellStyles, wrapFieldStyles, css`
    table { table-layout: fixed; }
    col.name { font-family: ui-monospace, monospace; width: clamp(8.5rem, calc((var(--name-chars, 0) + 1) * 1ch + ${unsafeCSS(NAME_BOX_EXTRA)}), 17rem); }
    col.now { width: 9rem; } col.note { width: 11rem; } col.remove { width: 2.5rem; }
    td.result { white-space: normal; overflow-wrap: break-word; }
    input.name { width: 100%; box-sizing: border-box; }
    td input[type='text']:not(.name) { width: 100%; box-sizing: border-box; }
    @media ${unsafeCSS(`(max-width: ${NARROW_PX}px)`)} {
      table.stack tr { display: grid; grid-template-columns: minmax(0, auto) minmax(0, 1fr) auto; grid-template-areas: 'name now remove' 'value value value' 'note note note'; align-items: center; }
      table.stack tr { padding-right: 0; }
      table.stack td.name { grid-area: name; } table.stack td.remove { grid-area: remove; position: static; }
      table.stack td.value { grid-area: value; } table.stack td.note { grid-area: note; }
      table.stack td.result { grid-area: now; }
      table.stack td.result .now::before { content: '= '; }
      table.stack td.name input.name { width: clamp(7.5rem, calc((var(--name-chars, 0) + 1) * 1ch + 0.8rem + 2px), 100%); }
    }
    details.more { margin-top: 0.2rem; }
    details.more summary { cursor: pointer; font-size: 0.8rem; color: #3b4650; }
    .range { display: flex; gap: 0.3rem; align-items: center; margin: 0.25rem 0; }
    .range expr-field { min-width: 5rem; }
    .range.spread { flex-wrap: wrap; align-items: flex-start; }
    .range.spread > label { padding-top: 0.3rem; }
    .spread-note { font-size: 0.8rem; color: #5c3400; border-left: 3px solid #a85d00; background: #fff6e8; padding: 0.15rem 0.4rem; margin-top: 0.2rem; max-width: 22rem; }
    .range.spread select { max-width: 100%; }
    /* each figure keeps its label beside it (the row wraps between figures); the label on the field's first line when an error grows it */
    .range.spread .lbl { min-width: 0; }
    .range.spread .figure { display: inline-flex; gap: 0.3rem; align-items: baseline; }
    .range.spread .figure .lbl { padding-top: 0.55rem; align-self: flex-start; flex: none; }
    .set-aside { font-size: 0.8rem; max-width: 26rem; }
  `];

  protected override willUpdate(): void {
    super.willUpdate();
    const items = Array.isArray(this.cell?.items) ? this.cell.items : [];
    this.nameChars(Math.max(0, ...items.map((it) => (typeof it?.name === 'string' ? it.name.length : 0))));
  }

  /** The name column's width in characters (a CSS property on the host, through the CSSOM: no style attribute). */
  private nameChars(n: number): void {
    if (this.style.getPropertyValue('--name-chars') !== String(n)) this.style.setProperty('--name-chars', String(n));
  }

  /** A name typed: the column grows at once (the view is drawn again only with the engine's answer). */
  private growNames(j: number, name: string): void {
    const others = this.cell.items.filter((_, i) => i !== j).map((it) => (typeof it?.name === 'string' ? it.name.length : 0));
    this.nameChars(Math.max(name.length, ...others));
  }

  /**
   * Each parameter's spread figures set aside when another distribution was chosen, by the
   * parameter's name (a renamed parameter starts afresh): the page's memory, not the study's.
   */
  private setAside = new Map<string, SpreadSetAside>();

  override render() {
    const claims = this.claims;
    const values = this.report?.values ?? {};
    const names = this.names;
    const items = Array.isArray(this.cell.items) ? this.cell.items : [];
    return html`
      <table class="stack">
        <colgroup><col class="name" /><col class="value" /><col class="now" /><col class="note" /><col class="remove" /></colgroup>
        <thead><tr><th>Name</th><th>Value</th><th>Now</th><th>Note</th><th><span class="sr">Remove</span></th></tr></thead>
        <tbody>
          ${items.map((item, j) => {
            const entry = values[item.name];
            // no message on `k =` while the value is still to come
            const taken = claims.take(`.items[${j}].name`);
            const nameError = splitAssignment(item.name ?? '')?.value === '' ? undefined : taken;
            const who = item.name || `parameter ${j + 1}`;
            return html`<tr class="item">
              <td class="name"><input class="name" type="text" data-field="items[${j}].name" aria-label="Name of parameter ${j + 1}" title=${item.name ?? ''} .value=${item.name ?? ''}
                @input=${(e: Event) => this.nameInput(j, e.target as HTMLInputElement)} @change=${(e: Event) => this.nameLeft(j, e.target as HTMLInputElement)} />
                ${nameError ? html`<div class="foot-error" role="alert">${nameError.message}</div>` : nothing}</td>
              <td class="value"><expr-field data-field="items[${j}].value" label="Value of ${who}" .value=${item.value ?? ''} .names=${names}
                .error=${claims.take(`.items[${j}].value`)}
                @expr-input=${(e: CustomEvent<{ value: string }>) => this.change(j, { value: e.detail.value }, `value${j}`)}></expr-field>
                ${entry?.range ? this.slider(j, entry) : nothing}
                ${this.more(j)}</td>
              <td class="result">${entry ? html`<span class="now">${showValue(entry)}</span>` : ''}${entry?.spread ? html`<div class="spread-text muted">${entry.spread.text}</div>` : nothing}${entry?.spread?.note ? html`<div class="spread-note" role="note">${entry.spread.note}</div>` : nothing}${entry && entry.truth === undefined ? html`<unit-pick data-field="items[${j}].unit" .unit=${entry.unit} .original=${entry.originalUnit} .picked=${item.unit} label="Show ${item.name} in another unit"
                @unit-pick=${(e: CustomEvent<UnitPickDetail>) => this.change(j, { unit: e.detail.unit }, `unit${j}`)}></unit-pick>` : nothing}
                ${footError(claims.take(`.items[${j}].unit`))}</td>
              <td class="note">${wrapField({ cls: 'note boxed', field: `items[${j}].note`, label: `Note on ${who}`, placeholder: 'Note', value: item.note ?? '',
                onInput: (note) => this.change(j, { note: note || undefined }, `note${j}`) })}</td>
              <td class="remove"><button class="quiet" aria-label="Remove ${item.name || `parameter ${j + 1}`}" @click=${() => this.removeItem(j)}>✕</button></td>
            </tr>`;
          })}
        </tbody>
      </table>
      <div class="row"><button @click=${this.add}>Add a parameter</button></div>
      ${this.footErrors()}`;
  }

  /**
   * Under a value, behind "more": the slider's range (two expressions, low and high; both
   * blank removes it), the spread, and whether the value is listed at a glance. Open when one
   * is set, or once the user opened it.
   */
  private more(j: number) {
    const item = this.cell.items[j];
    const who = item.name || `parameter ${j + 1}`;
    const [lo, hi] = Array.isArray(item.range) ? item.range : ['', ''];
    const claims = this.claims;
    // open when one is set, and kept open once opened: removing the spread from its select (the
    // keyboard's arrows choose "none" on their way) must not close it on the focused select
    const open = item.range !== undefined || item.glance !== undefined || item.spread !== undefined || this.opened.has(item.name);
    return html`<details class="more" ?open=${open} @toggle=${(e: Event) => this.noteOpen(item.name, (e.target as HTMLDetailsElement).open)}><summary>Slider range, spread, at a glance</summary>
      <div class="range">
        <expr-field data-field="items[${j}].range" label="Slider range of ${who}: low end" .value=${lo ?? ''} .names=${this.names}
          .error=${claims.take(`.items[${j}].range[0]`) ?? claims.take(`.items[${j}].range`)} @expr-input=${(e: CustomEvent<{ value: string }>) => this.setRange(j, 0, e.detail.value)}></expr-field>
        <span aria-hidden="true">to</span>
        <expr-field data-field="items[${j}].range" label="Slider range of ${who}: high end" .value=${hi ?? ''} .names=${this.names}
          .error=${claims.take(`.items[${j}].range[1]`)} @expr-input=${(e: CustomEvent<{ value: string }>) => this.setRange(j, 1, e.detail.value)}></expr-field>
      </div>
      ${item.range === undefined ? html`<div class="muted">No range: no slider. Give both ends to drag the value between them.</div>` : nothing}
      ${spreadFields(item, j, who, claims, this.names, this.setAside.get(item.name) ?? {}, (spread, key, aside) => {
        this.setAside.set(item.name, aside);
        this.change(j, { spread }, key);
      })}
      <label><input type="checkbox" data-field="items[${j}].glance" .checked=${item.glance === true}
        @change=${(e: Event) => this.change(j, { glance: (e.target as HTMLInputElement).checked || undefined }, `glance${j}`)} /> List ${who} among the results at a glance</label>
      ${footError(claims.take(`.items[${j}].glance`))}
    </details>`;
  }

  /** Which parameters' "more" is open on the page, by name. */
  private opened = new Set<string>();

  private noteOpen(name: string, open: boolean) {
    if (open) this.opened.add(name);
    else this.opened.delete(name);
  }

  /** Sets one end of the slider's range; with both ends blank the range is removed. */
  private setRange(j: number, end: 0 | 1, text: string) {
    const item = this.cell.items[j];
    const range: [string, string] = Array.isArray(item.range) ? [item.range[0] ?? '', item.range[1] ?? ''] : ['', ''];
    range[end] = text;
    this.change(j, { range: range.every((r) => r.trim() === '') ? undefined : range }, `range${j}.${end}`);
  }

  /** A slider over the range; its position is written back as the value in the value's own unit. */
  private slider(j: number, entry: ParameterValue) {
    const [lo, hi] = entry.range!;
    const step = (hi.value - lo.value) / 200;
    return html`<input type="range" class="slider" aria-label="Drag ${this.cell.items[j].name} from ${showQ(lo)} to ${showQ(hi)}"
      min=${lo.value} max=${hi.value} step=${step} .value=${String(entry.value)}
      @input=${(e: Event) => {
        const v = Number((e.target as HTMLInputElement).value);
        const text = `${Number(v.toPrecision(4))}${entry.unit ? ` ${entry.unit}` : ''}`;
        this.change(j, { value: text }, `slide${j}`);
      }} />`;
  }

  /**
   * The name as typed; `k = 0.35 / h` typed or pasted there is the name `k` and its value,
   * and typing goes on in the value's field, at its end (`splitAssignment`).
   */
  private nameInput(j: number, input: HTMLInputElement) {
    const split = splitAssignment(input.value);
    this.growNames(j, split && split.value !== '' ? split.name : input.value);
    // `k =` so far stays the name as typed, until the value starts (a space typed next is not part of it)
    if (!split || split.value === '') {
      this.change(j, { name: input.value }, `name${j}`);
      return;
    }
    input.value = split.name;
    this.change(j, { name: split.name, value: split.value }, `name${j}`);
    // the field is given its text here, before it takes focus: keys typed before the study's
    // answer arrives go after the value, never into the value it had
    const field = this.renderRoot.querySelector(`expr-field[data-field="items[${j}].value"]`) as ExprField | null;
    if (!field) return;
    field.value = split.value;
    void field.updateComplete.then(() => field.focusAtEnd());
  }

  /** Leaving the name with `k =` in it and no value after: the name is k, the value as it was (the message of `k =` was held back). */
  private nameLeft(j: number, input: HTMLInputElement) {
    const split = splitAssignment(input.value);
    if (split?.value !== '') return;
    input.value = split.name;
    this.growNames(j, split.name);
    this.change(j, { name: split.name }, `name${j}`);
  }

  private change(j: number, patch: Record<string, unknown>, key: string) {
    const items = this.cell.items.map((it, i) => (i === j ? { ...it, ...patch } : it));
    for (const it of items) for (const k of ['note', 'unit', 'range', 'glance', 'spread'] as const) if (it[k] === undefined) delete it[k];
    this.edit({ items }, key);
  }

  private add = () => {
    const items = this.cell.items;
    const used = new Set(items.map((i) => i.name));
    let n = items.length + 1;
    while (used.has(`p${n}`)) n++;
    this.edit({ items: [...items, { name: `p${n}`, value: '1' }] });
    // the new row's name, selected: typing names it (or gives `name = value`)
    const row = items.length;
    void this.updateComplete.then(() => this.focusNewName(row, 0));
  };

  /** Focuses the name field of row `j` once it is drawn (the study's answer comes a moment later), its text selected. */
  private focusNewName(j: number, tries: number) {
    const input = this.renderRoot.querySelector(`input.name[data-field="items[${j}].name"]`) as HTMLInputElement | null;
    if (input) {
      input.focus();
      input.select();
    } else if (tries < 20) requestAnimationFrame(() => this.focusNewName(j, tries + 1));
  }

  private removeItem(j: number) {
    this.edit({ items: this.cell.items.filter((_, i) => i !== j) });
  }
}

customElements.define('parameters-cell', ParametersCellElement);
