/**
 * A simulate cell's questions as a table: each question's name, kind, direction (crossings),
 * state, level or time, and answer with its unit; under it, behind "more", its window (`from`,
 * `to`), its occurrence (crossings) and whether it is listed at a glance. Renders and sends
 * edits only: what an edit does to a question is the engine's rule (`src/study/find-rules.ts`).
 */
import { html, nothing } from 'lit';
import {
  FIND_KINDS, findKindOf, needsLevel, switchFind, withFindState, withFindUnit, withFindField, freshFindName,
  type FindKind, type FindQuery as FindDoc, type FindResult,
} from '../../src/index.ts';
import { footError, showQ, type ErrorClaims } from './common.ts';
import type { StudyName } from '../expr-field.ts';
import type { UnitPickDetail } from '../unit-pick.ts';

type Input = CustomEvent<{ value: string }>;

/** What the table needs from its cell element. */
export interface FindsHost {
  readonly finds: readonly FindDoc[];
  readonly results: Record<string, FindResult>;
  readonly claims: ErrorClaims;
  readonly names: StudyName[];
  setFind(i: number, f: FindDoc, key?: string): void;
  setFinds(finds: FindDoc[]): void;
  /** The state a new question asks about. */
  firstState(): string;
  /** Asks the cell to focus, once drawn, the element the selector finds: what was just added. */
  focus(selector: string): void;
}

const FIND_LABELS: Record<FindKind, string> = {
  crossing: 'time it crosses', maximum: 'largest value', minimum: 'smallest value', timeOfMaximum: 'time of largest',
  timeOfMinimum: 'time of smallest', valueOf: 'value at', integralOf: 'area under', timeAbove: 'time above', timeBelow: 'time below',
};
const DIRECTIONS = [['either', 'either way'], ['down', 'falling'], ['up', 'rising']] as const;

/** An occurrence as the document keeps it: blank removes it, a whole number is a number, other text is kept for the engine to flag. */
function occurrenceOf(text: string): number | string {
  const t = text.trim();
  return /^\d{1,7}$/.test(t) ? Number(t) : t;
}

export function findsTable(h: FindsHost) {
  const { finds, claims, names, results } = h;
  return html`<div class="scroll"><table class="finds stack">
    ${finds.length ? html`<thead><tr><th>Name</th><th>Question</th><th>Of</th><th>Level or time</th><th>Answer</th><th><span class="sr">Remove</span></th></tr></thead>` : nothing}
    <tbody>${finds.map((f, i) => {
      const kind = findKindOf(f);
      const r = results[f.name];
      const p = `.find[${i}]`;
      const set = <K extends Parameters<typeof withFindField>[1]>(key: K, value: Parameters<typeof withFindField<K>>[2], merge?: string) => h.setFind(i, withFindField(f, key, value), merge);
      const hasMore = f.from !== undefined || f.to !== undefined || f.occurrence !== undefined || f.glance !== undefined;
      const who = f.name || `question ${i + 1}`;
      return html`<tr>
        <td data-label="Name"><input class="name" type="text" data-field="find[${i}].name" aria-label="Question ${i + 1} name" title=${f.name ?? ''} .value=${f.name ?? ''}
          @input=${(e: Event) => h.setFind(i, { ...f, name: (e.target as HTMLInputElement).value }, `fname${i}`)} />
          ${footError(claims.take(`${p}.name`))}</td>
        <td data-label="Question"><select aria-label="Question ${i + 1} kind" @change=${(e: Event) => h.setFind(i, switchFind(f, (e.target as HTMLSelectElement).value as FindKind))}>
          ${FIND_KINDS.map((k) => html`<option value=${k} ?selected=${k === kind}>${FIND_LABELS[k]}</option>`)}</select>
          ${kind === 'crossing' || f.direction !== undefined ? html`<select data-field="find[${i}].direction" aria-label="Question ${i + 1} direction" @change=${(e: Event) => set('direction', (e.target as HTMLSelectElement).value as FindDoc['direction'])}>
            ${DIRECTIONS.map(([d, l]) => html`<option value=${d} ?selected=${(f.direction ?? 'either') === d}>${l}</option>`)}</select>` : nothing}</td>
        <td data-label="Of"><input class="name" type="text" data-field="find[${i}].${kind}" aria-label="Question ${i + 1} state" .value=${String(f[kind] ?? '')}
          @input=${(e: Event) => h.setFind(i, withFindState(f, (e.target as HTMLInputElement).value), `fstate${i}`)} />
          ${footError(claims.take(`${p}.${kind}`))}</td>
        <td data-label=${needsLevel(kind) || f.level !== undefined ? 'Level' : kind === 'valueOf' || f.at !== undefined ? 'Time' : nothing}>${needsLevel(kind) || f.level !== undefined ? html`<expr-field data-field="find[${i}].level" label="Question ${i + 1} level" .value=${f.level ?? ''} .names=${names}
            .error=${claims.take(`${p}.level`)} @expr-input=${(e: Input) => h.setFind(i, { ...f, level: e.detail.value }, `flevel${i}`)}></expr-field>` : nothing}
          ${kind === 'valueOf' || f.at !== undefined ? html`<expr-field data-field="find[${i}].at" label="Question ${i + 1} time" .value=${f.at ?? ''} .names=${names}
            .error=${claims.take(`${p}.at`)} @expr-input=${(e: Input) => h.setFind(i, { ...f, at: e.detail.value }, `fat${i}`)}></expr-field>` : nothing}</td>
        <td class="result" data-label="Answer">${!r ? '' : 'notReached' in r ? html`<span class="muted">${r.message}</span>` : showQ(r)}${r && !('notReached' in r) ? html`<unit-pick data-field="find[${i}].unit" .unit=${r.unit} .picked=${f.unit} label="Show ${f.name} in another unit"
            @unit-pick=${(e: CustomEvent<UnitPickDetail>) => h.setFind(i, withFindUnit(f, e.detail.unit))}></unit-pick>` : nothing}
          ${footError(claims.take(p) ?? claims.take(`${p}.unit`))}</td>
        <td class="remove"><button class="quiet" aria-label="Remove question ${i + 1}" @click=${() => h.setFinds(finds.filter((_, j) => j !== i))}>✕</button></td>
      </tr>
      <tr class="more"><td class="wide" colspan="6"><details ?open=${hasMore}><summary>Window${kind === 'crossing' ? ', occurrence' : ''}, at a glance</summary>
        <div class="row">
          <span class="lbl">Window from</span>
          <expr-field class="w8" data-field="find[${i}].from" label="Question ${i + 1} window from (blank: the start of the run)" .value=${f.from ?? ''} .names=${names}
            .error=${claims.take(`${p}.from`)} @expr-input=${(e: Input) => set('from', e.detail.value.trim() === '' ? '' : e.detail.value, `ffrom${i}`)}></expr-field>
          <span class="lbl">to</span>
          <expr-field class="w8" data-field="find[${i}].to" label="Question ${i + 1} window to (blank: the end of the run)" .value=${f.to ?? ''} .names=${names}
            .error=${claims.take(`${p}.to`)} @expr-input=${(e: Input) => set('to', e.detail.value.trim() === '' ? '' : e.detail.value, `fto${i}`)}></expr-field>
          ${f.from === undefined && f.to === undefined ? html`<span class="muted">blank: over the whole run</span>` : nothing}
          ${kind === 'crossing' || f.occurrence !== undefined ? html`<label>Occurrence <input type="text" inputmode="numeric" class="count" data-field="find[${i}].occurrence"
            aria-label="Question ${i + 1} occurrence (blank: the first)" .value=${f.occurrence === undefined ? '' : String(f.occurrence)}
            @input=${(e: Event) => set('occurrence', occurrenceOf((e.target as HTMLInputElement).value) as number, `focc${i}`)} /></label>
            ${footError(claims.take(`${p}.occurrence`))}` : nothing}
          <label><input type="checkbox" data-field="find[${i}].glance" .checked=${f.glance === true}
            @change=${(e: Event) => set('glance', (e.target as HTMLInputElement).checked)} /> List ${who} among the results at a glance</label>
          ${footError(claims.take(`${p}.glance`))}
        </div></details></td></tr>`;
    })}</tbody></table></div>
    <div class="row"><button @click=${() => { h.setFinds([...finds, { name: freshFindName(finds), maximum: h.firstState() } as FindDoc]); h.focus(`input[data-field="find[${finds.length}].name"]`); }}>Ask a question</button></div>`;
}
