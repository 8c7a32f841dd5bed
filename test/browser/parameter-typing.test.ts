// Typing parameters as a new user does, with the keyboard only: a new parameters cell takes
// `k = 0.35 / h` as the name k and its value (the text is not appended to the default name),
// and so does a row added with "Add a parameter", whose name field takes focus. Checked
// against the definition of the hour (SI Brochure, 9th ed., table 8: 1 h = 3600 s), so
// 0.35 / h = 9.7222e-5 / s, and the degree Celsius (table 4: T/K = t/°C + 273.15).
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import type { StudyView } from '../../components/study-view.ts';
import type { Study } from '../../src/index.ts';
import { mountStudy } from './mount-study.ts';
import { until } from './helpers.ts';

const blank: Study = { format: 'ratebook-study', version: 1, title: 'Typing parameters', cells: [] };

type Items = Array<{ name: string; value: string }>;
const itemsOf = (view: StudyView) => (view.controller.study!.cells.find((c) => c.kind === 'parameters') as { items?: Items } | undefined)?.items;
const valueSI = (view: StudyView, name: string) => {
  const cell = view.controller.report?.cells.find((c) => c.kind === 'parameters') as { values?: Record<string, { si?: number }> } | undefined;
  return cell?.values?.[name]?.si;
};

/** The element that has focus, looked for through shadow roots. */
function focused(): Element | null {
  let el: Element | null = document.activeElement;
  while (el?.shadowRoot?.activeElement) el = el.shadowRoot.activeElement;
  return el;
}

describe('typing parameters with the keyboard', () => {
  afterEach(() => document.querySelectorAll('study-view').forEach((v) => v.remove()));

  it('a new parameters cell takes "k = 0.35 / h" as the name k and its value', async function () {
    this.timeout(20000);
    const view = await mountStudy(blank);
    const add = [...view.shadowRoot!.querySelectorAll('.add button')].find((b) => b.textContent === 'Parameters') as HTMLButtonElement;
    add.focus();
    await sendKeys({ press: 'Enter' });
    await until(() => focused()?.getAttribute('aria-label') === 'Name of parameter 1', 'focus in the new name');
    await sendKeys({ type: 'k = 0.35 / h' });
    await sendKeys({ press: 'Enter' });
    await until(() => itemsOf(view)?.[0]?.value === '0.35 / h', 'the value typed after "="');
    expect(itemsOf(view)).to.deep.equal([{ name: 'k', value: '0.35 / h' }]);
    const si = await until(() => valueSI(view, 'k'), 'the engine\'s value of k');
    expect(si).to.be.closeTo(0.35 / 3600, 1e-12);
  });

  it('"Add a parameter" puts focus in the new name, and "T_a = 4 degC" fills the row', async function () {
    this.timeout(20000);
    const view = await mountStudy({ ...blank, cells: [{ id: 'inputs', kind: 'parameters', items: [{ name: 'k', value: '0.35 / h' }] }] });
    const cell = view.shadowRoot!.querySelector('parameters-cell')!;
    const button = [...cell.shadowRoot!.querySelectorAll('button')].find((b) => b.textContent === 'Add a parameter') as HTMLButtonElement;
    button.focus();
    await sendKeys({ press: 'Enter' });
    await until(() => focused()?.getAttribute('aria-label') === 'Name of parameter 2', 'focus in the new row\'s name');
    await sendKeys({ type: 'T_a = 4 degC' });
    await sendKeys({ press: 'Enter' });
    await until(() => itemsOf(view)?.[1]?.value === '4 degC', 'the second row\'s value');
    expect(itemsOf(view)).to.deep.equal([{ name: 'k', value: '0.35 / h' }, { name: 'T_a', value: '4 degC' }]);
    const si = await until(() => valueSI(view, 'T_a'), 'the engine\'s value of T_a');
    expect(si).to.be.closeTo(277.15, 1e-9);
  });

  it('a name and then a value edited before the study renders again both stay', async function () {
    this.timeout(20000);
    const view = await mountStudy({ ...blank, cells: [{ id: 'inputs', kind: 'parameters', items: [{ name: 'k', value: '0.35 / h' }] }] });
    const cell = view.shadowRoot!.querySelector('parameters-cell')!;
    const name = cell.shadowRoot!.querySelector('input.name') as HTMLInputElement;
    const value = cell.shadowRoot!.querySelector('expr-field') as HTMLElement;
    // typing waits a moment for the engine's answer before the study renders: two fields
    // edited within it, as by a fast typist (or a name typed as "kel = ...")
    name.value = 'kel';
    name.dispatchEvent(new Event('input'));
    value.dispatchEvent(new CustomEvent('expr-input', { detail: { value: '0.2 / h' } }));
    await until(() => Math.abs((valueSI(view, 'kel') ?? 0) - 0.2 / 3600) < 1e-12, 'the engine\'s value of kel');
    expect(itemsOf(view)).to.deep.equal([{ name: 'kel', value: '0.2 / h' }]);
    expect(valueSI(view, 'kel')).to.be.closeTo(0.2 / 3600, 1e-12);
  });

  it('a name with no "=" stays a name, and a malformed one is said on the name field', async function () {
    this.timeout(20000);
    const view = await mountStudy({ ...blank, cells: [{ id: 'inputs', kind: 'parameters', items: [{ name: 'k', value: '0.35 / h' }] }] });
    const cell = view.shadowRoot!.querySelector('parameters-cell')!;
    const name = cell.shadowRoot!.querySelector('input.name') as HTMLInputElement;
    name.focus();
    name.select();
    await sendKeys({ type: '2k' });
    await until(() => itemsOf(view)?.[0]?.name === '2k', 'the name typed');
    await until(() => cell.shadowRoot!.querySelector('td.name .foot-error')?.textContent?.includes('not a valid name'), 'the name\'s message');
    expect(itemsOf(view)![0].value, 'the value is kept').to.equal('0.35 / h');
  });
});
