// An undo that removes the field holding focus, by keyboard in the study view with the real
// engine: focus goes to the cell that held the field, not to the page's body (the keyboard
// user was thrown back to the top of the page, and the next Tab started from there).
// Likewise Enter on the Undo button for the last step, which leaves that button disabled.
// Common practice (keyboard use of a form: focus is never lost to the document).
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import type { StudyView } from '../../components/study-view.ts';
import type { Cell, Study } from '../../src/index.ts';
import { mountStudy } from './mount-study.ts';
import { deep, until } from './helpers.ts';

/** Newton cooling and a run with one event (invented numbers). */
const STUDY: Study = {
  format: 'ratebook-study', version: 1, title: 'undo focus (invented numbers)', cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.8 / h' }, { name: 'Ta', value: '20 degC' }] },
    { id: 'cool', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '70 degC' },
    { id: 'run', kind: 'simulate', rates: ['cool'], from: '0 h', to: '5 h', events: [{ at: '1 h', add: { T: '5 K' } }] },
  ],
} as Study;

/** The element that has focus, looked for through shadow roots. */
function focused(): Element | null {
  let el: Element | null = document.activeElement;
  while (el?.shadowRoot?.activeElement) el = el.shadowRoot.activeElement;
  return el;
}

/** The cell (its article in the study view) holding `el`, looked for across shadow roots. */
function cellOf(el: Element | null): Element | null {
  while (el) {
    const article = el.closest('article[data-cell]');
    if (article) return article;
    el = (el.getRootNode() as ShadowRoot).host ?? null;
  }
  return null;
}

/** The focused element once it is somewhere a key can act: not the body, not a disabled button. */
function settled(): Element | null {
  const f = focused();
  return f && f !== document.body && !(f as HTMLButtonElement).disabled ? f : null;
}

let view: StudyView;
const run = () => view.controller.study!.cells.find((c) => c.id === 'run') as Extract<Cell, { kind: 'simulate' }>;
const simulate = () => deep(view.shadowRoot!, 'simulate-cell')[0] as HTMLElement;

describe('an undo that removes the focused field', () => {
  beforeEach(async function () {
    this.timeout(30_000);
    view = await mountStudy(STUDY);
  });
  afterEach(() => view.remove());

  it('Ctrl+Z after Add an event leaves focus on the run\'s cell, and Tab goes on inside it', async function () {
    this.timeout(20_000);
    const add = await until(() => [...simulate().shadowRoot!.querySelectorAll('button')].find((b) => b.textContent?.trim() === 'Add an event'), 'the Add an event button');
    add.focus();
    await sendKeys({ press: 'Enter' });
    await until(() => run().events?.length === 2, 'a second event');
    await until(() => ((focused()?.getRootNode() as ShadowRoot | undefined)?.host?.getAttribute('data-field') ?? '') === 'events[1].at', 'focus in the new event\'s time');
    // nothing typed: the field has nothing of its own to undo, so the key undoes the study's step
    await sendKeys({ press: 'Control+z' });
    await until(() => run().events?.length === 1, 'the event taken back by Ctrl+Z');
    const held = await until(() => (focused() !== document.body && focused() ? focused() : null), 'focus somewhere on the page, not the body');
    expect(held.localName).to.equal('article');
    expect(held.getAttribute('data-cell')).to.equal('run');
    // the next Tab goes into the run's own fields, not from the top of the page
    await sendKeys({ press: 'Tab' });
    expect(cellOf(focused())?.getAttribute('data-cell'), 'Tab goes on inside the run').to.equal('run');
  });

  it('an undo that removes the focused field\'s whole cell leaves focus on the Add button for its kind', async function () {
    this.timeout(30_000);
    const add = await until(() => [...view.shadowRoot!.querySelectorAll<HTMLButtonElement>('.add button')].find((b) => b.textContent?.trim() === 'Run'), 'the Add bar\'s Run button');
    add.focus();
    await sendKeys({ press: 'Enter' });
    await until(() => view.controller.study!.cells.length === 4, 'a fourth cell, a second run');
    // a new run's first field is its start, an expression field: with nothing typed, Ctrl+Z there undoes the study's step
    const inside = await until(() => (((focused()?.getRootNode() as ShadowRoot | undefined)?.host?.getAttribute('data-field') ?? '') === 'from' ? focused() : null), 'focus in the new run\'s start');
    await sendKeys({ press: 'Control+z' });
    await until(() => view.controller.study!.cells.length === 3, 'the cell taken back');
    await until(() => focused() !== inside && focused() !== document.body && focused(), 'focus on the page, not the body');
    expect(focused()!.textContent?.trim()).to.equal('Run');
  });

  it('Enter on Undo for the last step leaves focus on Redo, and Enter on Redo for its last step on Undo', async function () {
    this.timeout(20_000);
    view.controller.edit({ type: 'retitle', title: 'retitled (invented)' });
    const button = (which: string) => view.shadowRoot!.querySelector<HTMLButtonElement>(`.bar button[title^="${which}"]`)!;
    await until(() => !button('Undo').disabled, 'Undo enabled after the edit');
    button('Undo').focus();
    await sendKeys({ press: 'Enter' });
    await until(() => view.controller.study!.title === STUDY.title && button('Undo').disabled, 'the last step undone');
    const onRedo = await until(() => settled(), 'focus on the page, not the body nor a disabled button');
    expect(onRedo, 'focus on Redo, which just became enabled').to.equal(button('Redo'));
    // and back: Enter again redoes it, and Redo's last step leaves focus on Undo
    await sendKeys({ press: 'Enter' });
    await until(() => view.controller.study!.title === 'retitled (invented)' && button('Redo').disabled, 'the step redone');
    const onUndo = await until(() => settled(), 'focus on the page, not the body nor a disabled button');
    expect(onUndo, 'focus on Undo').to.equal(button('Undo'));
  });
});
