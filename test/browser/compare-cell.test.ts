// The compare and sensitivity cells in the study view with the real engine, by keyboard: a
// compare cell added from the Add bar, a scenario added, a value set and edited (Enter
// commits), the answers per scenario shown, and Ctrl+Z undoing the edit; a sensitivity cell's
// ranking shown, its list of parameters edited. After an add button, focus is in what it added.
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import type { StudyView } from '../../components/study-view.ts';
import type { TimePlot } from '../../components/plots/time-plot.ts';
import type { Study, CompareCell } from '../../src/index.ts';
import { mountStudy } from './mount-study.ts';
import { deep, until } from './helpers.ts';

/** A 2,000 L tank flushed at Q (invented numbers); t_1pct = V/Q ln 100 (closed form of the washout). */
const STUDY: Study = {
  format: 'ratebook-study', version: 1, title: 'Flush (invented numbers)',
  cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'Q', value: '100 L / min' }, { name: 'V', value: '2000 L' }, { name: 'C0', value: '40 mg / L' }] },
    { id: 'tank', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-(Q / V) * C', initial: 'C0' },
    { id: 'run', kind: 'simulate', rates: ['tank'], from: '0 min', to: '300 min', find: [{ name: 't_1pct', crossing: 'C', level: '0.01 * C0', direction: 'down' }] },
  ],
} as Study;

/** The element that has focus, looked for through shadow roots. */
function focused(): Element | null {
  let el: Element | null = document.activeElement;
  while (el?.shadowRoot?.activeElement) el = el.shadowRoot.activeElement;
  return el;
}

const compareDoc = (view: StudyView) => view.controller.study!.cells.find((c) => c.kind === 'compare') as CompareCell | undefined;
const compareText = (view: StudyView) => (deep(view.shadowRoot!, 'compare-cell')[0]?.shadowRoot?.textContent ?? '').replace(/\s+/g, ' ');

/** Presses Tab (Shift+Tab with `back`) until `match` holds for the focused element (at most 60 presses). */
async function tabTo(match: (el: Element) => boolean, what: string, back = false): Promise<Element> {
  for (let i = 0; i < 60; i++) {
    const el = focused();
    if (el && match(el)) return el;
    await sendKeys({ press: back ? 'Shift+Tab' : 'Tab' });
  }
  throw new Error(`Tab never reached ${what}`);
}

describe('compare cell: by keyboard, with the engine', () => {
  let view: StudyView;
  beforeEach(async function () {
    this.timeout(30_000);
    view = await mountStudy(STUDY);
  });
  afterEach(() => view.remove());

  it('adds a compare cell, adds a scenario, sets a value, edits it with Enter, and undoes the edit', async function () {
    this.timeout(60_000);
    const add = [...view.shadowRoot!.querySelectorAll('.add button')].find((b) => b.textContent === 'Scenarios') as HTMLButtonElement;
    add.focus();
    await sendKeys({ press: 'Enter' });
    await until(() => compareDoc(view), 'a compare cell');
    expect(compareDoc(view)!.run).to.equal('run');
    await until(() => focused()?.getAttribute('aria-label') === 'Name of scenario 1', 'focus in the new cell\'s first field');

    await tabTo((el) => el.textContent?.trim() === 'Add a scenario', 'the Add a scenario button');
    await sendKeys({ press: 'Enter' });
    await until(() => compareDoc(view)!.scenarios.length === 2, 'a second scenario');
    expect(compareDoc(view)!.scenarios[1]).to.deep.equal({ name: 'scenario_2', set: {} });
    // the keyboard goes on in what was added (it stayed on the button below it, after the new fields)
    await until(() => focused()?.getAttribute('aria-label') === 'Name of scenario 2', 'focus in the new scenario\'s name');

    await tabTo((el) => el.getAttribute('aria-label') === 'Set a value in scenario scenario_2', 'the second scenario\'s Set a value button');
    await sendKeys({ press: 'Enter' });
    // the first parameter, at the value the study gives it now: nothing changes until it is edited
    await until(() => compareDoc(view)!.scenarios[1].set.Q === '100 L / min', 'Q set to its present value');
    const inQ = () => ((focused()?.getRootNode() as ShadowRoot | undefined)?.host?.getAttribute('label') ?? '') === 'Scenario scenario_2: Q';
    await until(inQ, 'focus in the value just set (it stayed on the button, and Tab went on to the next scenario)');
    await sendKeys({ press: 'Control+a' });
    await sendKeys({ type: '200 L / min' });
    await sendKeys({ press: 'Enter' });
    await until(() => compareDoc(view)!.scenarios[1].set.Q === '200 L / min', 'the new value committed');
    // closed form: t = V/Q ln 100 = 2000/200 × 4.605 = 46.05 min; the present flow's 92.1 min beside it
    await until(() => /46\.05 min/.test(compareText(view)) && /92\.1 min/.test(compareText(view)), 'each scenario\'s answer in the table', 20_000);
    // the overlay names its curves by scenario and its axis by the state they show
    const plot = deep(view.shadowRoot!, 'compare-cell')[0].shadowRoot!.querySelector('time-plot') as TimePlot;
    await until(() => plot.charts?.[0]?.series.length === 3, 'the overlay chart with both scenarios');
    expect(plot.charts[0].series.slice(1).map((s) => s.label)).to.deep.equal(compareDoc(view)!.scenarios.map((s) => s.name));
    expect(plot.charts[0].axes[1].label).to.equal('C (mg / L)');

    await sendKeys({ press: 'Tab' });
    await sendKeys({ press: 'Control+z' });
    await until(() => compareDoc(view)!.scenarios[1].set.Q === '100 L / min', 'the edit undone by Ctrl+Z');
    await until(() => !/46\.05 min/.test(compareText(view)), 'the table after undo', 20_000);
  });
});

describe('compare cell: bad input on its field', () => {
  let view: StudyView;
  afterEach(() => view.remove());

  it('a value of the wrong dimension is said on that value\'s field, and nothing else is lost', async function () {
    this.timeout(30_000);
    const cell = { id: 'cmp', kind: 'compare', run: 'run', scenarios: [{ name: 'wet', set: { Q: '5 L' } }] };
    view = await mountStudy({ ...STUDY, cells: [...STUDY.cells, cell] });
    const field = await until(() => deep(view.shadowRoot!, 'compare-cell')[0]?.shadowRoot?.querySelector('expr-field[label="Scenario wet: Q"]') as (Element & { error?: { message: string } }) | null, 'the value field');
    await until(() => field.error?.message, 'the error on the field', 20_000);
    expect(field.error!.message).to.match(/Q is volume per time .*5 L is volume/);
    expect(compareDoc(view)!.scenarios[0].set.Q).to.equal('5 L');
  });
});

describe('compare cell: what a value sets is readable', () => {
  let view: StudyView;
  afterEach(() => view.remove());

  it('the select of what a scenario sets is as wide as its names (squeezed, it showed only its arrow)', async function () {
    this.timeout(30_000);
    const study = { ...STUDY, cells: [{ id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }] },
      { id: 'law', kind: 'rate', state: 'y', unit: 'mg / L', rate: '-k * y', initial: '10 mg / L' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '12 h', find: [] },
      { id: 'cmp', kind: 'compare', run: 'run', scenarios: [{ name: 'slow', set: { k: '0.2 / h' } }] }] } as Study;
    view = await mountStudy(study);
    const root = await until(() => deep(view.shadowRoot!, 'compare-cell')[0]?.shadowRoot, 'the compare cell');
    const select = await until(() => root.querySelector('span.set select') as HTMLSelectElement | null, 'the select of what scenario slow sets');
    expect(select.value).to.equal('k');
    // the same select on its own, outside the row: the width its names need
    const alone = select.cloneNode(true) as HTMLSelectElement;
    root.append(alone);
    const need = alone.getBoundingClientRect().width;
    alone.remove();
    expect(select.getBoundingClientRect().width).to.be.at.least(need - 0.5);
  });
});

describe('sensitivity cell: ranking and lists, with the engine', () => {
  let view: StudyView;
  afterEach(() => view.remove());

  it('shows the ranking as bars and a table, and edits its list of parameters as one step each', async function () {
    this.timeout(40_000);
    view = await mountStudy({ ...STUDY, cells: [...STUDY.cells, { id: 's', kind: 'sensitivity', of: ['t_1pct'], parameters: ['Q', 'V'] }] });
    const text = () => (deep(view.shadowRoot!, 'sensitivity-cell')[0]?.shadowRoot?.textContent ?? '').replace(/\s+/g, ' ');
    // closed form: t ∝ V/Q, so the normalized slopes are -1 for Q and +1 for V
    await until(() => /t_1pct moves most with/.test(text()), 'the summary', 20_000);
    const el = deep(view.shadowRoot!, 'sensitivity-cell')[0];
    expect(el.shadowRoot!.querySelectorAll('svg.ranking rect').length).to.equal(2);
    expect(el.shadowRoot!.querySelector('svg.ranking')!.getAttribute('role')).to.equal('img');
    const add = [...el.shadowRoot!.querySelectorAll('button')].find((b) => b.textContent === 'Vary another parameter') as HTMLButtonElement;
    add.focus();
    await sendKeys({ press: 'Enter' });
    await until(() => (view.controller.study!.cells[3] as { parameters: string[] }).parameters.join(',') === 'Q,V,C0', 'C0 added');
    await until(() => focused()?.getAttribute('aria-label') === 'Parameter to vary 3', 'focus in the name just added');
    expect((focused() as HTMLInputElement).value).to.equal('C0');
    await until(() => el.shadowRoot!.querySelectorAll('svg.ranking rect').length === 3, 'three bars', 20_000);
    // a plain text box keeps the browser's own undo: the study's undo from the button
    add.focus();
    await sendKeys({ press: 'Control+z' });
    await until(() => (view.controller.study!.cells[3] as { parameters: string[] }).parameters.join(',') === 'Q,V', 'undone');
  });
});
