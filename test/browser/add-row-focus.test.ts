// Every Add button that adds a row to a cell, pressed by keyboard in the study view with the
// real engine: focus goes into the first field of what it added, so the next key types there
// and the next Tab goes on from the new row (it stayed on the button, and Tab went past the
// row). Common practice (keyboard use of a form: focus follows what an action creates).
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import type { StudyView } from '../../components/study-view.ts';
import type { Cell, Study } from '../../src/index.ts';
import { mountStudy } from './mount-study.ts';
import { deep, until } from './helpers.ts';

/** Newton cooling with a probe log, a run, a fit and a solve (invented numbers). */
const STUDY: Study = {
  format: 'ratebook-study', version: 1, title: 'add rows (invented numbers)', cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.8 / h' }, { name: 'Ta', value: '20 degC' }] },
    { id: 'cool', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '70 degC' },
    { id: 'run', kind: 'simulate', rates: ['cool'], from: '0 h', to: '5 h', events: [{ at: '1 h', add: { T: '5 K' } }], find: [{ name: 'T_end', valueOf: 'T', at: '5 h' }] },
    { id: 'log', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'T', unit: 'degC' }], rows: [[0, 70], [1, 42], [2, 30]] },
    { id: 'fit', kind: 'fit', rates: ['cool'], data: 'log', time: 't', observe: { T: 'T' }, estimate: [{ parameter: 'k', as: 'k_fit', guess: '1 / h' }] },
    { id: 'when', kind: 'solve', vary: { parameter: 'k', as: 'k_for', choices: ['0.5 / h', '1 / h'] }, target: { value: 'T_end', equals: '25 degC' } },
  ],
} as Study;

/** The element that has focus, looked for through shadow roots. */
function focused(): Element | null {
  let el: Element | null = document.activeElement;
  while (el?.shadowRoot?.activeElement) el = el.shadowRoot.activeElement;
  return el;
}

/** The expr-field (or other host) whose shadow root holds the focused element. */
const focusedHost = () => (focused()?.getRootNode() as ShadowRoot | undefined)?.host ?? null;

let view: StudyView;
const cellEl = (tag: string) => deep(view.shadowRoot!, tag)[0] as HTMLElement & { updateComplete: Promise<unknown> };
const doc = <K extends Cell['kind']>(id: string) => view.controller.study!.cells.find((c) => c.id === id) as Extract<Cell, { kind: K }>;

/** Focuses the button of `tag`'s cell whose text (or aria-label) is `text` and presses Enter. */
async function press(tag: string, text: string): Promise<void> {
  const button = await until(() => [...cellEl(tag).shadowRoot!.querySelectorAll('button')].find((b) => b.textContent?.trim() === text || b.getAttribute('aria-label') === text), `the ${text} button`);
  button.focus();
  await sendKeys({ press: 'Enter' });
}

describe('an Add button puts focus in the first field of the row it added', () => {
  beforeEach(async function () {
    this.timeout(30_000);
    view = await mountStudy(STUDY);
  });
  afterEach(() => view.remove());

  it('Ask a question: focus in the new question\'s name, and what is typed goes there', async function () {
    this.timeout(20_000);
    await press('simulate-cell', 'Ask a question');
    await until(() => doc<'simulate'>('run').find?.length === 2, 'a second question');
    await until(() => focused()?.getAttribute('data-field') === 'find[1].name', 'focus in the new question\'s name (it stayed on the button)');
    await sendKeys({ press: 'End' });
    await sendKeys({ type: '_x' });
    await until(() => doc<'simulate'>('run').find![1].name.endsWith('_x'), 'the name typed into the new question');
  });

  it('Add an event: focus in the new event\'s time', async function () {
    this.timeout(20_000);
    await press('simulate-cell', 'Add an event');
    await until(() => doc<'simulate'>('run').events?.length === 2, 'a second event');
    await until(() => focusedHost()?.getAttribute('data-field') === 'events[1].at', 'focus in the new event\'s time (it stayed on the button)');
  });

  it('+ target: focus in the new target\'s name', async function () {
    this.timeout(20_000);
    await press('simulate-cell', 'Event 1: add another target');
    await until(() => focused()?.getAttribute('aria-label') === 'Event 1 target 2 name', 'focus in the new target\'s name (it stayed on the button)');
  });

  it('Estimate another parameter: focus in the new estimate\'s parameter', async function () {
    this.timeout(20_000);
    await press('fit-cell', 'Estimate another parameter');
    await until(() => doc<'fit'>('fit').estimate.length === 2, 'a second estimate');
    await until(() => focused()?.getAttribute('data-field') === 'estimate[1].parameter', 'focus in the new estimate (it stayed on the button)');
  });

  it('Add a row and Add a column: focus in the new row\'s first entry, then in the new column\'s name', async function () {
    this.timeout(20_000);
    await press('data-cell', 'Add a row');
    await until(() => doc<'data'>('log').rows?.length === 4, 'a fourth row');
    await until(() => focused()?.getAttribute('aria-label') === 'Row 4, t', 'focus in the new row\'s first entry (it stayed on the button)');
    await sendKeys({ type: '3' });
    await sendKeys({ press: 'Tab' }); // an entry is committed when focus leaves it
    await until(() => doc<'data'>('log').rows![3][0] === 3, 'the time typed into the new row');
    await press('data-cell', 'Add a column');
    await until(() => doc<'data'>('log').columns.length === 3, 'a third column');
    await until(() => focused()?.getAttribute('data-field') === 'columns[2].name', 'focus in the new column\'s name');
  });

  it('Add a choice: focus in the new choice', async function () {
    this.timeout(20_000);
    await press('solve-cell', 'Add a choice');
    await until(() => doc<'solve'>('when').vary.choices?.length === 3, 'a third choice');
    await until(() => focusedHost()?.getAttribute('label') === 'Choice 3', 'focus in the new choice (it stayed on the button)');
    expect(doc<'solve'>('when').vary.choices![2]).to.equal('1 / h');
  });
});
