/**
 * The spread of one parameter, edited beside its value (inside the parameters cell's "more"):
 * a distribution select and its one or two figures. Choosing a distribution changes only the
 * spread (the value is never touched); each change is one edit. Renders only.
 */
import { html, nothing } from 'lit';
import type { ParameterItem, ParameterSpread } from '../../src/index.ts';
import { footError, type ErrorClaims } from './common.ts';
import type { StudyName } from '../expr-field.ts';
import '../expr-field.ts';

const CHOICES = [['', 'none (a fixed value)'], ['normal', 'normal, with an SD'], ['lognormal', 'log-normal, with a CV'], ['uniform', 'uniform, between two values']] as const;

/** The figures each distribution starts with when chosen: empty, for the user to fill in. */
function fresh(distribution: string, old: ParameterSpread | undefined): ParameterSpread | undefined {
  if (distribution === 'normal') return { distribution, sd: old?.sd ?? '' };
  if (distribution === 'lognormal') return { distribution, cv: old?.cv ?? '' };
  if (distribution === 'uniform') return { distribution, from: old?.from ?? '', to: old?.to ?? '' };
  return undefined;
}

/**
 * The controls of item j's spread. `onChange(spread, key)` asks for the item's new spread
 * (undefined removes it); edits with one key in a row are one undo step.
 */
export function spreadFields(item: ParameterItem, j: number, who: string, claims: ErrorClaims, names: StudyName[],
  onChange: (spread: ParameterSpread | undefined, key: string) => void) {
  const s = item.spread;
  const at = `items[${j}].spread`;
  const figure = (key: 'sd' | 'cv' | 'from' | 'to', label: string) => html`<expr-field class="w7" data-field="${at}.${key}" label=${label}
    .value=${s?.[key] === undefined ? '' : String(s[key])} .names=${names} .error=${claims.take(`.${at}.${key}`)}
    @expr-input=${(e: CustomEvent<{ value: string }>) => onChange({ ...s!, [key]: e.detail.value }, `spread${j}.${key}`)}></expr-field>`;
  return html`<div class="range spread">
      <label>Spread <select data-field="${at}.distribution" aria-label="Spread of ${who}"
        @change=${(e: Event) => onChange(fresh((e.target as HTMLSelectElement).value, s), `spread${j}.kind`)}>
        ${CHOICES.map(([v, l]) => html`<option value=${v} ?selected=${(s?.distribution ?? '') === v}>${l}</option>`)}
        ${s && !CHOICES.some(([v]) => v === s.distribution) ? html`<option selected value=${String(s.distribution)}>${String(s.distribution)}</option>` : nothing}
      </select></label>
      ${s?.distribution === 'normal' ? html`<span class="lbl">SD</span>${figure('sd', `SD of ${who}`)}` : nothing}
      ${s?.distribution === 'lognormal' ? html`<span class="lbl">CV</span>${figure('cv', `CV of ${who} (0.15 or 15%)`)}<span class="muted">the value is the median</span>` : nothing}
      ${s?.distribution === 'uniform' ? html`<span class="lbl">from</span>${figure('from', `Lowest value of ${who}`)}<span class="lbl">to</span>${figure('to', `Highest value of ${who}`)}` : nothing}
    </div>
    ${footError(claims.take(`.${at}.distribution`) ?? claims.take(`.${at}`))}`;
}
