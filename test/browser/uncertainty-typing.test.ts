// The uncertainty cell's boxes by keyboard, in the study view with the real engine: what is
// typed in the names, samples and seed boxes is an edit at each keystroke (the controller
// journals every edit at once, so a reload right after typing keeps it; before, it waited for
// the box to lose focus and a reload lost it), one undo step per box, and the names box keeps
// the text as typed until it commits. (Common practice: nothing typed is lost.)
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import { StudyView } from '../../components/study-view.ts';
import '../../components/cells/registry.ts';
import type { Cell, Study } from '../../src/index.ts';
import { deep, until } from './helpers.ts';
import { mountStudy } from './mount-study.ts';

/** Newton cooling with an uncertain k; the time to 40 degC and a verdict on it (invented numbers). */
const STUDY: Study = {
  format: 'ratebook-study', version: 1, title: 'typing (invented numbers)', cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.8 / h', spread: { distribution: 'normal', sd: '0.1 / h' } }, { name: 'Ta', value: '20 degC' }] },
    { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '70 degC' },
    { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '6 h', find: [{ name: 't_40', crossing: 'T', level: '40 degC', direction: 'down' }] },
    { id: 'v', kind: 'parameters', items: [{ name: 'quick', value: 't_40 < 1.2 h' }] },
    { id: 'how', kind: 'uncertainty', of: ['t_40'], samples: 200, seed: 4 },
  ],
} as Study;

let view: StudyView;
const how = () => view.controller.study!.cells.find((c) => c.id === 'how') as Extract<Cell, { kind: 'uncertainty' }>;
const box = (field: string) => deep(view.shadowRoot!, 'uncertainty-cell')[0].shadowRoot!.querySelector(`input[data-field="${field}"]`) as HTMLInputElement;

describe('the uncertainty cell\'s boxes, typed', () => {
  beforeEach(async function () {
    this.timeout(30_000); // the engine worker's first answer can be slow under load
    view = await mountStudy(STUDY, 'typing');
    await until(() => box('of'), 'the names box');
  });
  afterEach(() => view.remove());

  it('samples and seed typed are in the study before the box loses focus; each box\'s typing is one undo step', async function () {
    this.timeout(30_000);
    box('samples').focus();
    box('samples').select();
    await sendKeys({ type: '350' });
    await until(() => how().samples === 350, 'the samples typed, in the study while the box has focus');
    expect(box('samples').value).to.equal('350');
    box('seed').focus();
    box('seed').select();
    await sendKeys({ type: '17' });
    await until(() => how().seed === 17, 'the seed typed, in the study while the box has focus');
    view.controller.undo();
    await until(() => how().seed === 4, 'the seed\'s typing undone in one step');
    expect(how().samples).to.equal(350);
    view.controller.undo();
    await until(() => how().samples === 200, 'the samples\' typing undone in one step');
  });

  it('a blank box waits for its commit (the default is not put under the caret), then removes the field', async function () {
    this.timeout(30_000);
    box('samples').focus();
    box('samples').select();
    await sendKeys({ press: 'Backspace' });
    await new Promise((r) => setTimeout(r, 300));
    expect(box('samples').value, 'the box stays blank while typed in').to.equal('');
    expect(how().samples).to.equal(200);
    await sendKeys({ press: 'Tab' });
    await until(() => how().samples === undefined, 'a blank box committed removes the field (its default applies)');
  });

  it('names typed are in the study at once, the box keeps the text as typed until it commits', async function () {
    this.timeout(30_000);
    box('of').focus();
    box('of').setSelectionRange(box('of').value.length, box('of').value.length);
    await sendKeys({ type: ',quick' });
    await until(() => how().of.join() === 't_40,quick', 'both names in the study while the box has focus');
    expect(box('of').value, 'as typed, not rewritten under the caret').to.equal('t_40,quick');
    await sendKeys({ press: 'Tab' });
    await until(() => box('of').value === 't_40, quick', 'the names as the cell writes them once committed');
    view.controller.undo();
    await until(() => how().of.join() === 't_40' && box('of').value === 't_40', 'one undo: the names as they were, in the box too');
  });
});
