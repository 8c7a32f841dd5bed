/**
 * The spread of one parameter, edited beside its value (inside the parameters cell's "more"):
 * a distribution select and its one or two figures. Choosing a distribution changes only the
 * spread (the value is never touched); each change is one edit. The figures typed for the
 * distribution left are set aside (`switchSpread`, in the engine's study rules), said under
 * the select, and given back when it is chosen again: arrowing through the select's options
 * by keyboard, which chooses each one on its way, loses nothing. Renders only.
 */
import { html, nothing } from 'lit';
import { setAsideWords, switchSpread, type ParameterItem, type ParameterSpread, type SpreadSetAside } from '../../src/index.ts';
import { footError, type ErrorClaims } from './common.ts';
import type { StudyName } from '../expr-field.ts';
import '../expr-field.ts';

const CHOICES = [['', 'none (a fixed value)'], ['normal', 'normal, with an SD'], ['lognormal', 'log-normal, with a CV'], ['uniform', 'uniform, between two values']] as const;

/**
 * The controls of item j's spread. `aside` is what is set aside for this parameter;
 * `onChange(spread, key, aside)` asks for the item's new spread (undefined removes it) and
 * gives what is set aside after it; edits with one key in a row are one undo step.
 */
export function spreadFields(item: ParameterItem, j: number, who: string, claims: ErrorClaims, names: StudyName[], aside: SpreadSetAside,
  onChange: (spread: ParameterSpread | undefined, key: string, aside: SpreadSetAside) => void) {
  const s = item.spread;
  const at = `items[${j}].spread`;
  const figure = (key: 'sd' | 'cv' | 'from' | 'to', label: string) => html`<expr-field class="w7" data-field="${at}.${key}" label=${label}
    .value=${s?.[key] === undefined ? '' : String(s[key])} .names=${names} .error=${claims.take(`.${at}.${key}`)}
    @expr-input=${(e: CustomEvent<{ value: string }>) => onChange({ ...s!, [key]: e.detail.value }, `spread${j}.${key}`, aside)}></expr-field>`;
  const kept = setAsideWords(aside, s?.distribution);
  return html`<div class="range spread">
      <label>Spread <select data-field="${at}.distribution" aria-label="Spread of ${who}"
        @change=${(e: Event) => { const next = switchSpread(s, (e.target as HTMLSelectElement).value, aside); onChange(next.spread, `spread${j}.kind`, next.aside); }}>
        ${CHOICES.map(([v, l]) => html`<option value=${v} ?selected=${(s?.distribution ?? '') === v}>${l}</option>`)}
        ${s && !CHOICES.some(([v]) => v === s.distribution) ? html`<option selected value=${String(s.distribution)}>${String(s.distribution)}</option>` : nothing}
      </select></label>
      ${s?.distribution === 'normal' ? html`<span class="figure"><span class="lbl">SD</span>${figure('sd', `SD of ${who}`)}</span>` : nothing}
      ${s?.distribution === 'lognormal' ? html`<span class="figure"><span class="lbl">CV</span>${figure('cv', `CV of ${who} (0.15 or 15%)`)}</span><span class="muted">the value is the median</span>` : nothing}
      ${s?.distribution === 'uniform' ? html`<span class="figure"><span class="lbl">from</span>${figure('from', `Lowest value of ${who}`)}</span><span class="figure"><span class="lbl">to</span>${figure('to', `Highest value of ${who}`)}</span>` : nothing}
    </div>
    ${kept ? html`<div class="muted set-aside" role="note">${kept}</div>` : nothing}
    ${footError(claims.take(`.${at}.distribution`) ?? claims.take(`.${at}`))}`;
}
