// A study of more than 40 cells: rendered in chunks (components/progressive.ts), its fields
// waiting for their editors until needed (components/expr-editor/deferred.ts). Every cell
// arrives, with the engine's results, and an edit of a cell far below reaches the engine.
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import { StudyView } from '../../components/study-view.ts';
import type { Study } from '../../src/index.ts';
import { LARGE } from '../../components/progressive.ts';
import { mountStudy } from './mount-study.ts';
import { until } from './helpers.ts';

/** LARGE + 20 parameters cells in a chain: p_i = p_(i-1) + 1 (invented). */
function chain(n = LARGE + 20) {
  return {
    format: 'ratebook-study', version: 1, title: 'a long chain',
    cells: Array.from({ length: n }, (_, i) => ({ id: `c${i}`, kind: 'parameters', items: [{ name: `p${i}`, value: i === 0 ? '1' : `p${i - 1} + 1` }] })),
  };
}

const articles = (view: StudyView) => [...view.shadowRoot!.querySelectorAll('article')];
/** The value a parameters cell shows for its parameter (the "Now" column). */
const shownValue = (article: Element) => (article.querySelector('parameters-cell')?.shadowRoot?.querySelector('td.result, .result')?.textContent ?? '').trim();

afterEach(() => {
  for (const el of document.querySelectorAll('study-view')) el.remove();
});

describe('a large study', () => {
  it('renders a screenful at once and the rest in later tasks, each with its result', async function () {
    this.timeout(45000);
    const view = StudyView.create();
    document.body.append(view);
    view.controller.open('large', chain() as unknown as Study);
    await view.updateComplete;
    const first = articles(view).length;
    expect(first, 'not every cell at once').to.be.below(LARGE + 20);
    expect(first, 'a screenful at once').to.be.at.least(6);
    await until(() => articles(view).length === LARGE + 20, 'every cell rendered', 20000);
    // hand-worked: p_i = i + 1, so the last is LARGE + 20
    await until(() => shownValue(articles(view).at(-1)!).startsWith(String(LARGE + 20)), 'the last cell shows its value', 25000);
  });

  it('a field far below waits for its editor as a labelled text box, and becomes the editor on focus', async function () {
    this.timeout(45000);
    const view = await mountStudy(chain());
    await until(() => articles(view).length === LARGE + 20, 'every cell rendered', 20000);
    const last = articles(view).at(-1)!.querySelector('parameters-cell')!.shadowRoot!.querySelector('expr-field')!;
    await last.updateComplete;
    const box = await until(() => last.shadowRoot!.querySelector<HTMLElement>('.waiting'), 'the waiting box');
    expect(box.getAttribute('role')).to.equal('textbox');
    expect(box.getAttribute('aria-label')).to.equal(`Value of p${LARGE + 19}`);
    expect(box.textContent).to.equal(`p${LARGE + 18} + 1`);
    box.focus();
    const content = last.shadowRoot!.querySelector<HTMLElement>('.cm-content');
    expect(content, 'the editor is made on focus').to.not.equal(null);
    expect(last.shadowRoot!.activeElement).to.equal(content);
    expect(last.shadowRoot!.querySelector('.waiting')).to.equal(null);
  });

  it('typing in a field while the other cells are still appearing edits the study, and later chunks and reports keep it', async function () {
    this.timeout(60000);
    const n = 200;
    const view = StudyView.create();
    document.body.append(view);
    view.controller.open('large', chain(n) as unknown as Study);
    await view.updateComplete;
    const field = articles(view)[0].querySelector('parameters-cell')!.shadowRoot!.querySelector('expr-field')!;
    await field.updateComplete;
    // the field in view: its editor, or its waiting box, which makes the editor on focus
    const target = await until(() => field.shadowRoot!.querySelector<HTMLElement>('.cm-content, .waiting'), 'the first field');
    target.focus();
    const content = await until(() => field.shadowRoot!.querySelector<HTMLElement>('.cm-content'), 'the editor of the first field');
    expect(field.shadowRoot!.activeElement, 'the editor has the focus').to.equal(content);
    const before = articles(view).length;
    expect(before, 'cells still appearing while typing').to.be.below(n);
    await sendKeys({ press: 'End' });
    await sendKeys({ type: '0' });
    expect(content.textContent, 'what was typed shows at once').to.equal('10');
    await sendKeys({ press: 'Enter' });
    const items = (view.controller.study!.cells[0] as { items: Array<{ value: string }> }).items;
    expect(items[0].value, 'the edit reached the study').to.equal('10');
    await until(() => articles(view).length === n, 'every cell rendered', 40000);
    // hand-worked: p_i = p_0 + i = 10 + i, so the last is 10 + 199 = 209
    await until(() => shownValue(articles(view).at(-1)!).startsWith('209'), 'the last cell shows the value from the typed one', 40000);
    expect(field.shadowRoot!.querySelector('.cm-content')?.textContent, 'nothing put the old text back').to.equal('10');
    expect((view.controller.study!.cells[0] as { items: Array<{ value: string }> }).items[0].value).to.equal('10');
  });

  it('an editor without focus gets the report\'s error on its field (its update put off to a later task)', async function () {
    this.timeout(45000);
    const doc = chain();
    doc.cells[1].items[0].value = 'p0 + q_missing';
    const view = await mountStudy(doc);
    const field = articles(view)[1].querySelector('parameters-cell')!.shadowRoot!.querySelector('expr-field')!;
    await until(() => field.shadowRoot!.querySelector('.cm-content'), 'the editor of a field in view', 20000);
    // the engine's error (unknown name) reaches the editor as an underline on the unknown name
    const mark = await until(() => field.shadowRoot!.querySelector('.cm-x-error'), 'the error underlined in the editor', 20000);
    expect(mark.textContent).to.equal('q_missing');
  });

  it('a new report reaches every cell', async function () {
    this.timeout(45000);
    const view = await mountStudy(chain());
    await until(() => articles(view).length === LARGE + 20, 'every cell rendered', 20000);
    view.controller.edit({ type: 'replace', cell: { id: 'c0', kind: 'parameters', items: [{ name: 'p0', value: '101' }] } });
    // hand-worked: p_i = i + 101 now, so the last is LARGE + 120
    await until(() => shownValue(articles(view).at(-1)!).startsWith(String(LARGE + 120)), 'the last cell shows its new value', 15000);
  });
});
