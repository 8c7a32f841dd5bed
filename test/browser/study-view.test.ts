// The study view with the real engine worker: renders a template, reflects engine errors on
// the right field, dispatches edits, and undoes them.
import { expect } from 'chai';
import { StudyView } from '../../components/study-view.ts';
import type { ExprField } from '../../components/expr-field.ts';
import { runStudy, type Study } from '../../src/index.ts';
import cooling from '../../examples/cooling-stock-pot.ratebook.json';
import bolus from '../../examples/iv-bolus-repeated.ratebook.json';
import { mountStudy } from './mount-study.ts';
import { deep } from './helpers.ts';

const mount = mountStudy;

function nextAnswer(view: StudyView): Promise<void> {
  return new Promise((resolve) => { const off = view.controller.onAnswer(() => { off(); resolve(); }); });
}

describe('study-view', () => {
  afterEach(() => document.querySelectorAll('study-view').forEach((v) => v.remove()));

  it('renders every cell of a template with its kind and results', async () => {
    const view = await mount(cooling);
    const articles = view.shadowRoot!.querySelectorAll('article');
    expect(articles.length).to.equal(cooling.cells.length);
    expect(deep(view.shadowRoot!, 'parameters-cell').length).to.equal(1);
    expect(deep(view.shadowRoot!, 'simulate-cell').length).to.equal(1);
    const text = view.shadowRoot!.textContent!;
    expect(text).to.contain('Caution.');
  });

  it('says how the study\'s names are read, in words, where the sheet does not print it', async () => {
    // invented numbers: a tank level h read in its law, where it hides the hour
    const view = await mount({ format: 'ratebook-study', version: 1, title: 'tank', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.2 m^0.5 / min' }] },
      { id: 'tank', kind: 'rate', title: 'Tank', state: 'h', unit: 'm', rate: '-k * sqrt(h)', initial: '2 m' },
    ] });
    const notes = view.shadowRoot!.querySelector('.name-notes')!.textContent!.replace(/\s+/g, ' ').trim();
    expect(notes).to.contain('The state "h" of Rate law "Tank" hides the unit h in Rate law "Tank", rate law: there h is the state; for hours write hour.');
    expect(notes).to.not.match(/cells\[/);
  });

  it('an edit of a field re-runs the study and shows the engine\'s new answer', async () => {
    const view = await mount(cooling);
    const field = deep(view.shadowRoot!, 'expr-field').find((f) => (f as ExprField).label === 'Value of T_walkin') as ExprField;
    expect(field, 'the walk-in temperature field').to.exist;
    const answered = nextAnswer(view);
    field.dispatchEvent(new CustomEvent('expr-input', { detail: { value: '1 degC' }, bubbles: true, composed: true }));
    await answered;
    await view.updateComplete;
    const expected = runStudy(view.controller.study);
    expect(expected.ok).to.equal(true);
    const t21 = (expected.ok ? expected.report.cells.find((c) => c.id === 'run')!.results : {}) as Record<string, { value: number }>;
    const shown = (view.controller.report!.cells.find((c) => c.id === 'run')!.results as Record<string, { value: number }>).t_21.value;
    expect(shown).to.equal(t21.t_21.value);
  });

  it('shows an engine error on the field it belongs to', async () => {
    const view = await mount(cooling);
    const field = deep(view.shadowRoot!, 'expr-field').find((f) => (f as ExprField).label === 'Value of k') as ExprField;
    const answered = nextAnswer(view);
    field.dispatchEvent(new CustomEvent('expr-input', { detail: { value: '0.55 / h + kk' }, bubbles: true, composed: true }));
    await answered;
    await view.updateComplete;
    const cell = deep(view.shadowRoot!, 'parameters-cell')[0] as HTMLElement & { updateComplete: Promise<unknown> };
    await cell.updateComplete;
    const again = deep(view.shadowRoot!, 'expr-field').find((f) => (f as ExprField).label === 'Value of k') as ExprField;
    expect(again.error?.message).to.match(/unknown name "kk"/);
    expect(again.error?.span).to.deep.equal([11, 13]);
  });

  it('undoes and redoes an edit', async () => {
    const view = await mount(cooling);
    const before = JSON.stringify(view.controller.study);
    view.controller.edit({ type: 'remove', id: 'about' });
    expect(view.controller.study!.cells.length).to.equal(cooling.cells.length - 1);
    view.controller.undo();
    expect(JSON.stringify(view.controller.study)).to.equal(before);
    view.controller.redo();
    expect(view.controller.study!.cells.length).to.equal(cooling.cells.length - 1);
  });

  it('adds a cell from the add bar', async () => {
    const view = await mount(cooling);
    const button = [...view.shadowRoot!.querySelectorAll('.add button')].find((b) => b.textContent === 'Note') as HTMLButtonElement;
    button.click();
    await view.updateComplete;
    const last = view.controller.study!.cells.at(-1)!;
    expect(last.kind).to.equal('note');
    expect(view.shadowRoot!.querySelectorAll('article').length).to.equal(cooling.cells.length + 1);
  });

  it('shows the dosing caution on a dosing study', async () => {
    const view = await mount(bolus);
    expect(view.shadowRoot!.querySelector('.caution')!.textContent).to.match(/licensed professional/);
  });

  it('shows the whole description, however long, and grows as it is typed', async () => {
    const long = 'A description long enough to wrap over several lines of the page. '.repeat(6);
    const view = await mount({ ...cooling, description: long });
    const box = view.shadowRoot!.querySelector<HTMLTextAreaElement>('textarea.description')!;
    expect(box.value).to.equal(long);
    // every line in view: the box is as tall as its text (no scrolling, nothing cut off)
    expect(box.scrollHeight).to.be.at.most(box.clientHeight + 1);
    const lineHeight = parseFloat(getComputedStyle(box).lineHeight);
    expect(box.clientHeight).to.be.above(2 * lineHeight);
    const before = box.clientHeight;
    box.value = `${long}\nA second paragraph, typed.\nAnd a third.`;
    box.dispatchEvent(new Event('input', { bubbles: true, composed: true }));
    await view.updateComplete;
    expect(view.controller.study!.description).to.equal(box.value, 'line breaks are kept');
    expect(box.clientHeight).to.be.above(before);
    expect(box.scrollHeight).to.be.at.most(box.clientHeight + 1);
  });
});
