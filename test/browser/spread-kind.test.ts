// Changing a parameter's spread from one distribution to another by keyboard, in the study
// view with the real engine. In Chromium a closed select chooses each option its arrow keys
// pass, so arrowing from normal to uniform and back chooses log-normal and uniform on the
// way: the SD typed for normal must come back, not be lost, and never be turned into another
// distribution's figure (an SD is not a CV). What was set aside is said under the select.
// (Common practice: nothing typed is lost or changed without the user choosing it.)
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import { StudyView } from '../../components/study-view.ts';
import '../../components/cells/registry.ts';
import type { Cell, Study } from '../../src/index.ts';
import { deep, until } from './helpers.ts';
import { mountStudy } from './mount-study.ts';

/** Newton cooling; k has a normal spread whose SD the user typed (invented numbers). */
const STUDY: Study = {
  format: 'ratebook-study', version: 1, title: 'spread kinds (invented numbers)', cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.8 / h', spread: { distribution: 'normal', sd: '0.1 / h' } }, { name: 'Ta', value: '20 degC' }] },
  ],
} as Study;

let view: StudyView;
const params = () => deep(view.shadowRoot!, 'parameters-cell')[0] as HTMLElement & { updateComplete: Promise<unknown> };
const k = () => (view.controller.study!.cells[0] as Extract<Cell, { kind: 'parameters' }>).items[0];
const select = () => params().shadowRoot!.querySelector('[data-field="items[0].spread.distribution"]') as HTMLSelectElement;
const note = () => params().shadowRoot!.querySelector('.set-aside')?.textContent?.trim() ?? '';

/** Presses `key` on the focused select and waits until k's spread has `distribution` (none: no spread). */
async function press(key: string, distribution: string | undefined) {
  await sendKeys({ press: key });
  await until(() => k().spread?.distribution === distribution, `k's spread ${distribution ?? 'removed'} after ${key}`);
  await params().updateComplete;
}

describe('changing the distribution of a spread', () => {
  beforeEach(async function () {
    this.timeout(30_000); // the engine worker's first answer can be slow under load
    view = await mountStudy(STUDY, 'spread-kind');
    await until(() => select(), 'the spread select (its "more" is open: k has a spread)');
  });
  afterEach(() => view.remove());

  it('arrowing through the distributions and back gives the SD back; the note says what is set aside; one undo restores the study', async function () {
    this.timeout(30_000);
    const before = JSON.stringify(view.controller.study);
    select().focus();
    await press('ArrowDown', 'lognormal');
    expect(k().spread).to.deep.equal({ distribution: 'lognormal', cv: '' });
    expect(note()).to.contain('normal, SD 0.1 / h');
    await press('ArrowDown', 'uniform');
    expect(k().spread).to.deep.equal({ distribution: 'uniform', from: '', to: '' });
    await press('ArrowUp', 'lognormal');
    await press('ArrowUp', 'normal');
    expect(k().spread, 'the SD typed comes back').to.deep.equal({ distribution: 'normal', sd: '0.1 / h' });
    expect(note(), 'nothing is set aside once it is back').to.equal('');
    expect(k().value, 'the value is never touched').to.equal('0.8 / h');
    // one step of undo for the run of choices made with the arrows
    view.controller.undo();
    await until(() => JSON.stringify(view.controller.study) === before, 'one undo back to the study as it was');
  });

  it('Add a parameter by keyboard puts focus in its name, ready to type (it stayed on the button)', async function () {
    this.timeout(30_000);
    const add = [...params().shadowRoot!.querySelectorAll('button')].find((b) => b.textContent === 'Add a parameter') as HTMLButtonElement;
    add.focus();
    await sendKeys({ press: 'Enter' });
    await until(() => (view.controller.study!.cells[0] as Extract<Cell, { kind: 'parameters' }>).items.length === 3, 'a third parameter');
    await until(() => params().shadowRoot!.activeElement?.getAttribute('data-field') === 'items[2].name', 'focus in the new parameter\'s name');
  });

  it('a CV typed for log-normal and a range for uniform come back too; choosing none keeps them aside, said under the select', async function () {
    this.timeout(30_000);
    select().focus();
    await press('ArrowDown', 'lognormal');
    await until(() => params().shadowRoot!.querySelector('[data-field="items[0].spread.cv"]'), 'the CV field');
    await sendKeys({ press: 'Tab' });
    await sendKeys({ type: '15%' });
    await sendKeys({ press: 'Enter' });
    await until(() => k().spread?.cv === '15%', 'the CV in the study');
    select().focus();
    await press('ArrowDown', 'uniform');
    expect(note()).to.contain('normal, SD 0.1 / h').and.to.contain('log-normal, CV 15%');
    await press('ArrowUp', 'lognormal');
    expect(k().spread).to.deep.equal({ distribution: 'lognormal', cv: '15%' });
    await press('ArrowUp', 'normal');
    await press('ArrowUp', undefined);
    expect(k()).to.deep.equal({ name: 'k', value: '0.8 / h' });
    expect(note(), 'removed, and said where it went').to.contain('normal, SD 0.1 / h');
    await press('ArrowDown', 'normal');
    expect(k().spread).to.deep.equal({ distribution: 'normal', sd: '0.1 / h' });
  });
});
