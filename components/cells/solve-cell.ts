import { html, nothing, css } from 'lit';
import { solutionEdit, shownSolution } from '../../src/index.ts';
import { cellStyles, footError, showQ } from './common.ts';
import { CellElement, type CellDoc } from './cell-element.ts';
import '../expr-field.ts';

type SolveDoc = CellDoc<'solve'>;
type Vary = SolveDoc['vary'];

/**
 * A solve cell: which value to vary (over a range or among choices) and the target it must
 * meet; the engine's answer, what it achieves, the runs it took, every solution, the table of
 * choices, and a button that writes the answer into the study as one ordinary, undoable edit.
 */
export class SolveCellElement extends CellElement<'solve'> {
  static override styles = [cellStyles, css`
    .answer { margin: 0.5rem 0 0.2rem; font-size: 0.95rem; }
    .answer .result { font-weight: 600; }
    .choices { width: auto; }
    /* classes, not style attributes: the content security policy refuses those */
    span.choice { display: inline-flex; align-items: center; gap: 0.2rem; }
    expr-field.choice-field { min-width: 6rem; }
    tr.chosen td { background: #eaf2fb; font-weight: 600; }
    details summary { font-size: 0.85rem; color: #3b4650; cursor: pointer; }
  `];

  override render() {
    const c = this.cell;
    const v: Partial<Vary> = c.vary ?? {};
    const t: Partial<SolveDoc['target']> = c.target ?? {};
    const claims = this.claims;
    const names = this.names;
    const byChoices = Array.isArray(v.choices);
    const expr = (path: string, label: string, value: string | undefined, onValue: (s: string) => void, cls = '') => html`<expr-field class=${cls} data-field=${path} label=${label}
      .value=${value ?? ''} .names=${names} .error=${claims.take(`.${path}`)} @expr-input=${(e: CustomEvent<{ value: string }>) => onValue(e.detail.value)}></expr-field>`;
    const name = (path: 'parameter' | 'as', label: string) => html`<input class="name" type="text" data-field="vary.${path}" aria-label=${label} .value=${v[path] ?? ''}
      @input=${(e: Event) => this.setVary({ [path]: (e.target as HTMLInputElement).value }, path)} />`;
    const more = v.roundTo !== undefined || v.guess !== undefined;
    return html`
      <div class="row">
        <span class="lbl">Vary</span>${name('parameter', 'Parameter or state to vary')}
        <label>call the answer ${name('as', 'Name of the answer')}</label>
        ${footError(claims.take('.vary.parameter') ?? claims.take('.vary.as'))}
      </div>
      <div class="row" role="radiogroup" aria-label="Where to look">
        <label><input type="radio" name="mode" aria-label="Look over a range" .checked=${!byChoices} @change=${() => this.toRange()} /> over a range</label>
        <label><input type="radio" name="mode" aria-label="Try a list of choices" .checked=${byChoices} @change=${() => this.toChoices()} /> among choices</label>
      </div>
      ${byChoices ? this.choiceFields(v.choices ?? []) : html`
        <div class="row">
          <span class="lbl">From</span>${expr('vary.min', 'Lowest value to try', v.min, (s) => this.setVary({ min: s }, 'min'), 'w10')}
          <span class="lbl">to</span>${expr('vary.max', 'Highest value to try', v.max, (s) => this.setVary({ max: s }, 'max'), 'w10')}
        </div>
        <details ?open=${more}><summary>Rounding, guess</summary><div class="row">
          <span class="lbl">Round to</span>${expr('vary.roundTo', 'Round the answer to a multiple of', v.roundTo, (s) => this.setVary({ roundTo: s || undefined }, 'roundTo'), 'w9')}
          <span class="lbl">Guess</span>${expr('vary.guess', 'With several answers, use the one nearest', v.guess, (s) => this.setVary({ guess: s || undefined }, 'guess'), 'w9')}
        </div></details>`}
      <div class="row">
        <span class="lbl">So that</span>${expr('target.value', 'Target', t.value, (s) => this.setTarget({ value: s }, 'value'))}
        <span class="lbl">equals</span>${expr('target.equals', 'Wanted value of the target', t.equals, (s) => this.setTarget({ equals: s }, 'equals'), 'w10')}
      </div>
      ${this.answer()}
      ${this.footErrors()}`;
  }

  private choiceFields(choices: readonly string[]) {
    return html`<div class="row"><span class="lbl">Choices</span>
      ${choices.map((x, i) => html`<span class="choice">
        <expr-field class="w7 choice-field" data-field="vary.choices" data-index=${i} label="Choice ${i + 1}" .value=${x} .names=${this.names} .error=${this.claims.take(`.vary.choices[${i}]`)}
          @expr-input=${(e: CustomEvent<{ value: string }>) => this.setVary({ choices: choices.map((y, j) => (j === i ? e.detail.value : y)) }, `choice${i}`)}></expr-field>
        <button class="quiet" aria-label="Remove choice ${i + 1}" ?disabled=${choices.length < 2} @click=${() => this.setVary({ choices: choices.filter((_, j) => j !== i) })}>✕</button></span>`)}
      <button @click=${() => { this.setVary({ choices: [...choices, choices[choices.length - 1] ?? ''] }); this.focusWhenShown(`expr-field.choice-field[data-index="${choices.length}"]`); }}>Add a choice</button>
      ${footError(this.claims.take('.vary.choices'))}</div>`;
  }

  /** What the engine found: the answer, what it gives, the runs, every solution, the choices. */
  private answer() {
    const r = this.report;
    if (!r?.ok || !r.solution || !r.achieved) return nothing;
    const v = this.cell.vary;
    const target = this.cell.target?.value ?? 'the target';
    const use = this.doc ? solutionEdit(this.doc.cells, this.cell, r) : undefined;
    return html`
      <p class="answer">${v.parameter} = <span class="result">${shownSolution(r.solution, r)}</span> gives ${target} = <span class="result">${showQ(r.achieved)}</span>
        ${r.rounded ? html`<br />Rounded: ${v.parameter} = <span class="result">${showQ(r.rounded)}</span> gives ${target} = <span class="result">${r.achievedRounded ? showQ(r.achievedRounded) : 'no value'}</span>` : nothing}</p>
      ${r.solutions && r.solutions.length > 1 ? html`<p class="muted">${r.solutions.length} values meet the target: ${r.solutions.map((q) => showQ(q)).join(', ')}; ${v.guess ? 'the one nearest the guess' : 'the smallest'} is used.</p>` : nothing}
      ${r.choices ? html`<table class="choices"><caption class="sr">The target at each choice</caption>
        <thead><tr><th>${v.parameter}</th><th>${target}</th></tr></thead>
        <tbody>${r.choices.map((x) => html`<tr class=${x.chosen ? 'chosen' : ''}><td class="num">${showQ(x.value)}${x.chosen ? html` <span class="sr">(nearest)</span>` : nothing}</td>
          <td class="num">${x.achieved ? showQ(x.achieved) : html`<span class="muted">${x.reason}</span>`}</td></tr>`)}</tbody></table>` : nothing}
      ${r.undefinedIn?.length ? html`<p class="muted">No value of ${target} for ${r.undefinedIn.map((g) => `${showQ(g.from)} to ${showQ(g.to)}`).join(', ')}: ${r.undefinedIn[0].reason}.</p>` : nothing}
      <p class="muted">${r.evaluations} runs of the study's values${r.targetRange ? `; over the range ${target} goes from ${showQ(r.targetRange.low)} to ${showQ(r.targetRange.high)}` : ''}.${r.digits !== undefined ? ` The answer is shown to the ${r.digits} significant digits that the runs' tolerance and the search support.` : ''}</p>
      ${use ? html`<div class="row"><button class="use" data-use @click=${() => this.replaceOther(use.cell)}>Set ${use.name} to ${use.text}</button></div>
        ${!r.rounded && !r.choices ? html`<p class="muted use-note">This writes the answer as shown. For a value that can be measured out (a vial, a tablet, a setting), give "Round to" under Rounding: the button then writes the rounded value.</p>` : nothing}` : nothing}`;
  }

  /** Writes another cell (the varied parameter's) as one edit of its own. */
  private replaceOther(cell: unknown): void {
    this.dispatchEvent(new CustomEvent('cell-edit', { detail: { cell }, bubbles: true, composed: true }));
  }

  private setVary(patch: Partial<Vary>, key?: string): void {
    const vary = { ...(this.cell.vary ?? {}), ...patch } as Record<string, unknown>;
    for (const k of Object.keys(vary)) if (vary[k] === undefined) delete vary[k];
    this.edit({ vary: vary as unknown as Vary }, key ? `vary.${key}` : undefined);
  }

  private setTarget(patch: Partial<SolveDoc['target']>, key: string): void {
    this.edit({ target: { ...(this.cell.target ?? {}), ...patch } as SolveDoc['target'] }, `target.${key}`);
  }

  /** Choices in place of the range: the range's ends become the first choices, nothing typed is dropped but the rounding. */
  private toChoices(): void {
    const { min, max, roundTo: _r, choices: _c, ...rest } = this.cell.vary ?? ({} as Vary);
    const choices = [min, max].filter((x): x is string => typeof x === 'string' && x.trim() !== '');
    this.edit({ vary: { ...rest, choices: choices.length ? choices : [''] } as Vary });
  }

  /** A range in place of the choices: from the first choice to the last. */
  private toRange(): void {
    const { choices = [], min: _min, max: _max, ...rest } = this.cell.vary ?? ({} as Vary);
    const filled = choices.filter((x) => x.trim() !== '');
    this.edit({ vary: { ...rest, min: filled[0] ?? '', max: filled[filled.length - 1] ?? '' } as Vary });
  }
}

customElements.define('solve-cell', SolveCellElement);
