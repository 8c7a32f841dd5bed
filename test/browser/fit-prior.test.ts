// The fit cell's prior and error model, typed by keys as a new user would, in the study view
// with the real engine: opening a disclosure writes nothing; a prior without an error model is
// refused on the error model's row and nothing typed is lost; with an additive SD the fit
// becomes a Bayesian (MAP) estimate, labelled so, with the prior median beside the estimate;
// the study's undo takes the steps back.
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import type { Study } from '../../src/index.ts';
import { deep, until } from './helpers.ts';
import { mountStudy } from './mount-study.ts';
import { viewOf } from './expr-field-helpers.ts';
import type { ExprField } from '../../components/expr-field.ts';
import type { StudyView } from '../../components/study-view.ts';

/** Two invented levels after one dose: C' = -k C from 8 mg/L. */
const TWO_LEVELS = {
  format: 'ratebook-study', version: 1, title: 'Two levels (invented numbers)', cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.2 / h' }] },
    { id: 'decay', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '8 mg / L' },
    { id: 'levels', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: [[2, 5.9], [10, 1.3]] },
    { id: 'fit', kind: 'fit', rates: ['decay'], data: 'levels', time: 't', observe: { C: 'C' },
      estimate: [{ parameter: 'k', as: 'k_i', guess: '0.2 / h' }] },
  ],
} as unknown as Study;

let view: StudyView;
const fitEl = () => deep(view.shadowRoot!, 'fit-cell')[0] as HTMLElement & { updateComplete: Promise<unknown> };
const fitDoc = () => view.controller.study!.cells.find((c) => c.id === 'fit') as Extract<Study['cells'][number], { kind: 'fit' }>;
const fitReport = () => view.controller.report?.cells.find((c) => c.id === 'fit') as { ok: boolean; bayesian?: true; error?: { path: string; message: string } } | undefined;
const text = () => fitEl().shadowRoot!.textContent ?? '';

async function openWithKeys(summary: HTMLElement) {
  summary.focus();
  await sendKeys({ press: 'Enter' });
  await until(() => (summary.parentElement as HTMLDetailsElement).open, 'the disclosure open');
}

describe('fit cell: a prior and an error model by keys', () => {
  beforeEach(async function () {
    this.timeout(30_000); // the engine worker's first answer can be slow under load
    view = await mountStudy(TWO_LEVELS);
  });
  afterEach(() => view.remove());

  it('typing a prior, then an additive SD, makes a Bayesian estimate shown beside its prior; undo takes it back', async function () {
    this.timeout(30_000);
    const before = JSON.stringify(view.controller.study);
    const summary = fitEl().shadowRoot!.querySelector('tr.more summary') as HTMLElement;
    await openWithKeys(summary);
    expect(JSON.stringify(view.controller.study), 'opening writes nothing').to.equal(before);
    await sendKeys({ press: 'Tab' });
    await sendKeys({ type: '0.1 / h' });
    await sendKeys({ press: 'Enter' });
    await until(() => fitDoc().estimate[0].prior?.median === '0.1 / h', 'the median in the document', 8000);
    (fitEl().shadowRoot!.querySelector('[data-field="estimate[0].prior.omega"]') as HTMLInputElement).focus();
    await sendKeys({ type: '0.3' });
    await until(() => fitDoc().estimate[0].prior?.omega === 0.3, 'omega stored as a number', 8000);
    // no error model yet: refused on its row, and the prior stays as typed
    await until(() => (fitReport()?.error?.path === 'cells[3].error' ? true : undefined), 'the refusal on the error model', 8000);
    await until(() => (/needs an error model/.test(text()) ? true : undefined), 'the refusal shown on the cell', 8000);
    expect(fitDoc().estimate[0].prior).to.deep.equal({ median: '0.1 / h', omega: 0.3 });
    // the error model's disclosure is open since a prior is set
    const additive = fitEl().shadowRoot!.querySelector('[data-field="error.additive"]') as ExprField;
    expect((additive.closest('details') as HTMLDetailsElement).open).to.equal(true);
    viewOf(additive).focus();
    await sendKeys({ type: '0.3 mg / L' });
    await sendKeys({ press: 'Enter' });
    await until(() => fitDoc().error?.additive === '0.3 mg / L', 'the additive SD in the document', 8000);
    await until(() => (fitReport()?.bayesian ? true : undefined), 'a Bayesian estimate', 10_000);
    await until(() => (/Bayesian \(MAP\) estimate/.test(text()) ? true : undefined), 'the Bayesian label on the cell', 8000);
    expect(text()).to.match(/prior median 0\.1 \/h; the data moved it ×[0-9.]+ \([+−][0-9.]+ omega\)/);
    // undo, step by step, back to the study as it was
    for (let i = 0; i < 6 && JSON.stringify(view.controller.study) !== before; i++) view.controller.undo();
    expect(JSON.stringify(view.controller.study)).to.equal(before);
  });

  it('a proportional SD that is not a number is kept as typed and refused on its field', async function () {
    this.timeout(30_000);
    const summary = fitEl().shadowRoot!.querySelector('details.error-model summary') as HTMLElement;
    await openWithKeys(summary);
    await sendKeys({ press: 'Tab' });
    await sendKeys({ press: 'Tab' });
    await sendKeys({ type: 'ten' });
    await until(() => fitDoc().error?.proportional === 'ten', 'the text kept in the document', 8000);
    await until(() => (fitReport()?.ok === false ? true : undefined), 'the fit refused', 8000);
    // the cell shows the refusal once the view has passed the new report down
    await until(() => (/ten/.test(text()) ? true : undefined), 'the refusal shown on the cell', 8000);
    const input = fitEl().shadowRoot!.querySelector('[data-field="error.proportional"]') as HTMLInputElement;
    expect(input.value).to.equal('ten');
    expect(fitReport()?.error?.path).to.equal('cells[3].error.proportional');
    expect(text()).to.match(/ten/);
  });
});
