// The solve cell in the study view with the real engine: its answer is written into the varied
// parameter by its button, as one ordinary edit, and undone, by mouse and by keyboard.
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import type { StudyView } from '../../components/study-view.ts';
import type { Study } from '../../src/index.ts';
import { mountStudy } from './mount-study.ts';
import { deep, until } from './helpers.ts';

/** Invented numbers: 1 g every 12 h, 8 doses; the dose for a trough of 12.5 mg/L, rounded to 250 mg. */
const STUDY: Study = {
  format: 'ratebook-study', version: 1, title: 'Dose for a trough (invented numbers)',
  cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'dose', value: '1000 mg' }, { name: 'V', value: '50 L' }, { name: 'k', value: '0.1 / h' }] },
    { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
    { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '96 h', events: [{ at: '0 h', every: '12 h', count: 8, add: { C: 'dose / V' } }],
      find: [{ name: 'trough', valueOf: 'C', at: '96 h' }] },
    { id: 's', kind: 'solve', vary: { parameter: 'dose', as: 'dose_new', min: '100 mg', max: '5000 mg', roundTo: '250 mg' }, target: { value: 'trough', equals: '12.5 mg / L' } },
  ],
} as Study;

const doseText = (view: StudyView) => (view.controller.study!.cells[0] as { items: Array<{ value: string }> }).items[0].value;
const useButton = (view: StudyView) => deep(view.shadowRoot!, 'button[data-use]')[0] as HTMLButtonElement | undefined;

describe('solve cell: use the answer, and undo', () => {
  let view: StudyView;
  beforeEach(async function () {
    this.timeout(30_000);
    view = await mountStudy(STUDY);
    // closed form: trough per mg × dose = 12.5 mg/L at 1450 mg, rounded to 1500 mg (test/engine/solve.test.ts)
    await until(() => useButton(view), 'the answer and its button', 20_000);
  });
  afterEach(() => view.remove());

  it('by mouse: the button sets the dose to the rounded answer; the Undo button puts it back', async function () {
    this.timeout(30_000);
    const button = useButton(view)!;
    expect(button.textContent!.trim()).to.equal('Set dose to 1500 mg');
    // closed form 1450.171 mg: shown to the 5 digits the run's tolerance supports (test/engine/solve-digits.test.ts)
    expect(deep(view.shadowRoot!, 'solve-cell')[0].shadowRoot!.textContent!.replace(/\s+/g, ' ')).to.match(/dose = 1450\.2 mg gives trough = 12\.5 mg \/ L/);
    button.click();
    expect(doseText(view)).to.equal('1500 mg');
    // the run follows: its trough is the one at the rounded dose
    await until(() => view.controller.report?.cells[0].values?.dose.value === 1500, 'the engine\'s answer with the new dose', 20_000);
    const undo = [...view.shadowRoot!.querySelectorAll('button')].find((b) => b.textContent!.trim() === 'Undo')!;
    undo.click();
    expect(doseText(view)).to.equal('1000 mg');
    await until(() => view.controller.report?.cells[0].values?.dose.value === 1000, 'the engine\'s answer after undo', 20_000);
  });

  it('by keyboard: Enter on the focused button sets the dose; Ctrl+Z undoes it', async function () {
    this.timeout(30_000);
    useButton(view)!.focus();
    await sendKeys({ press: 'Enter' });
    await until(() => doseText(view) === '1500 mg', 'the dose set by Enter');
    await sendKeys({ press: 'Control+z' });
    await until(() => doseText(view) === '1000 mg', 'the dose put back by Ctrl+Z');
    await sendKeys({ press: 'Control+y' });
    await until(() => doseText(view) === '1500 mg', 'the dose set again by Ctrl+Y');
  });
});

/** The same study without rounding: the answer is written as the cell shows it. */
const UNROUNDED: Study = structuredClone(STUDY);
delete (UNROUNDED.cells[3] as { vary: { roundTo?: string } }).vary.roundTo;

describe('solve cell: use an answer that is not rounded', () => {
  let view: StudyView;
  beforeEach(async function () {
    this.timeout(30_000);
    view = await mountStudy(UNROUNDED);
    await until(() => useButton(view), 'the answer and its button', 20_000);
  });
  afterEach(() => view.remove());

  it('shows the answer to the digits it is good to, and the button writes exactly that text', async function () {
    this.timeout(30_000);
    const cell = deep(view.shadowRoot!, 'solve-cell')[0].shadowRoot!;
    const shown = cell.querySelector('p.answer .result')!.textContent!.trim();
    // closed form (one-compartment boluses, superposition): 1450.171 mg; the run's tolerance 1e-6, 10 units, supports 5 digits
    expect(shown).to.equal('1450.2 mg');
    const button = useButton(view)!;
    expect(button.textContent!.trim()).to.equal(`Set dose to ${shown}`);
    expect(cell.textContent!.replace(/\s+/g, ' ')).to.contain('shown to the 5 significant digits');
    expect(cell.textContent!.replace(/\s+/g, ' ')).to.contain('give "Round to"');
    button.click();
    expect(doseText(view)).to.equal(shown);
  });
});

