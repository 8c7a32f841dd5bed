// Two fields of one cell typed in a row, before the engine answers the first: the second edit
// must build on the first. The study view draws a typing edit again only with the engine's
// answer, and a cell element built its next edit from the cell it was last drawn with, so a
// note typed right after a value wrote the old value back (k's value silently became "0"),
// and a spread's "to" typed right after its "from" put back the "from" of the last drawing.
// Events here are dispatched in one task, so no answer can arrive between them (an answer is
// a message from the engine's worker, a task of its own). (Common practice: nothing typed is
// lost, and no control changes a value the user did not choose.)
import { expect } from 'chai';
import { StudyView } from '../../components/study-view.ts';
import '../../components/cells/registry.ts';
import type { Cell, Study } from '../../src/index.ts';
import { deep, until } from './helpers.ts';
import { mountStudy } from './mount-study.ts';

/** Newton cooling, k with a uniform spread (invented numbers). */
const STUDY: Study = {
  format: 'ratebook-study', version: 1, title: 'edits in a row (invented numbers)', cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.8 / h', spread: { distribution: 'uniform', from: '0.7 / h', to: '0.9 / h' } }, { name: 'Ta', value: '20 degC' }] },
    { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '70 degC' },
  ],
} as Study;

let view: StudyView;
const params = () => deep(view.shadowRoot!, 'parameters-cell')[0] as HTMLElement & { updateComplete: Promise<unknown> };
const k = () => (view.controller.study!.cells[0] as Extract<Cell, { kind: 'parameters' }>).items[0];
const field = (path: string) => params().shadowRoot!.querySelector(`[data-field="${path}"]`) as HTMLElement;
/** What an expression field sends as it is typed in. */
const typeIn = (el: Element, value: string) => el.dispatchEvent(new CustomEvent('expr-input', { detail: { value }, bubbles: true, composed: true }));
/** A plain text box typed in. */
function typeBox(el: HTMLInputElement | HTMLTextAreaElement, value: string) {
  el.value = value;
  el.dispatchEvent(new Event('input', { bubbles: true, composed: true }));
}
/** The microtasks after an event (Lit draws an element in one), but no task: no answer from the engine. */
const microtasks = async () => { for (let i = 0; i < 5; i++) await Promise.resolve(); };

describe('edits in a row, before the engine answers', () => {
  beforeEach(async function () {
    this.timeout(30_000); // the engine worker's first answer can be slow under load
    view = await mountStudy(STUDY, 'in-a-row');
    await until(() => field('items[0].spread.to'), 'the spread fields');
  });
  afterEach(() => view.remove());

  it('a value typed, then its note: both kept', async () => {
    typeIn(field('items[0].value'), '0.4 / h');
    await microtasks();
    typeBox(field('items[0].note') as HTMLTextAreaElement, 'n');
    await microtasks();
    expect(k().value, 'the value typed first').to.equal('0.4 / h');
    expect(k().note).to.equal('n');
  });

  it('a spread\'s lower end typed, then its upper end: both kept', async () => {
    typeIn(field('items[0].spread.from'), '0.6 / h');
    await microtasks();
    typeIn(field('items[0].spread.to'), '1 / h');
    await microtasks();
    expect(k().spread).to.deep.equal({ distribution: 'uniform', from: '0.6 / h', to: '1 / h' });
  });

  it('a cell\'s title typed, then a field of it, and the other way round: both kept', async () => {
    const title = view.shadowRoot!.querySelector('article[data-cell="p"] textarea.cell-title, article[data-cell="p"] .cell-title textarea') as HTMLTextAreaElement;
    expect(title, 'the title box').to.exist;
    typeBox(title, 'Inputs');
    await microtasks();
    typeIn(field('items[0].value'), '0.5 / h');
    await microtasks();
    expect(view.controller.study!.cells[0].title).to.equal('Inputs');
    expect(k().value).to.equal('0.5 / h');
    typeIn(field('items[0].value'), '0.6 / h');
    await microtasks();
    typeBox(title, 'Inputs 2');
    await microtasks();
    expect(k().value, 'the value typed before the title').to.equal('0.6 / h');
    expect(view.controller.study!.cells[0].title).to.equal('Inputs 2');
  });
});
