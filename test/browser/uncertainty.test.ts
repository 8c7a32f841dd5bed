// A parameter's spread edited beside its value (by keyboard, in the study view with the real
// engine: the value is never touched, each change is one undoable edit), and the uncertainty
// cell's element: its results table, a verdict's probability, a histogram with its data
// table, failed samples, and its edits.
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import { StudyView } from '../../components/study-view.ts';
import '../../components/cells/registry.ts';
import { runStudy, type Cell, type Study, type UncertaintyResult } from '../../src/index.ts';
import { deep, until } from './helpers.ts';
import { mountStudy } from './mount-study.ts';

/** Newton cooling from 70 degC toward 20 degC; the time to 40 degC (invented numbers). */
const COOLING: Study = {
  format: 'ratebook-study', version: 1, title: 'cooling (invented numbers)', cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.8 / h' }, { name: 'Ta', value: '20 degC' }] },
    { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '70 degC' },
    { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '6 h', find: [{ name: 't_40', crossing: 'T', level: '40 degC', direction: 'down' }] },
    { id: 'v', kind: 'parameters', items: [{ name: 'quick', value: 't_40 < 1.2 h' }] },
    { id: 'how', kind: 'uncertainty', of: ['t_40', 'quick'], samples: 300, seed: 4 },
  ],
} as Study;

let view: StudyView;
const cellOf = (kind: string, n = 0) => deep(view.shadowRoot!, `${kind}-cell`)[n] as HTMLElement & { updateComplete: Promise<unknown> };
const items = () => (view.controller.study!.cells[0] as Extract<Cell, { kind: 'parameters' }>).items;
const howReport = () => view.controller.report?.cells.find((c) => c.id === 'how');

describe('a parameter\'s spread, by keyboard', () => {
  beforeEach(async function () {
    this.timeout(30_000); // the engine worker's first answer can be slow under load
    view = await mountStudy(COOLING, 'spread');
  });
  afterEach(() => view.remove());

  it('choosing a distribution and typing its SD then Enter: the spread in the document, the value untouched, the uncertainty cell computes; undo takes each back', async function () {
    this.timeout(30_000);
    const before = JSON.stringify(view.controller.study);
    await until(() => howReport() && !howReport()!.ok, 'the uncertainty cell refusing: no spread yet', 8000);
    const params = cellOf('parameters');
    const summary = params.shadowRoot!.querySelector('details.more summary') as HTMLElement;
    summary.focus();
    await sendKeys({ press: 'Enter' });
    const select = await until(() => params.shadowRoot!.querySelector('[data-field="items[0].spread.distribution"]') as HTMLSelectElement | null, 'the spread select');
    expect(select.getAttribute('aria-label')).to.equal('Spread of k');
    expect(JSON.stringify(view.controller.study), 'opening writes nothing').to.equal(before);
    // the keyboard reaches the select; the choice is the user's
    select.focus();
    expect(params.shadowRoot!.activeElement).to.equal(select);
    select.value = 'normal';
    select.dispatchEvent(new Event('change'));
    await until(() => items()[0].spread?.distribution === 'normal', 'the distribution in the document');
    expect(items()[0].value, 'the value is untouched').to.equal('0.8 / h');
    await params.updateComplete;
    const sd = await until(() => params.shadowRoot!.querySelector('[data-field="items[0].spread.sd"]') as HTMLElement | null, 'the SD field');
    await sendKeys({ press: 'Tab' });
    await sendKeys({ type: '0.1 / h' });
    await sendKeys({ press: 'Enter' });
    await until(() => items()[0].spread?.sd === '0.1 / h', 'the SD in the document', 8000);
    expect(sd.getAttribute('label')).to.equal('SD of k');
    expect(items()[0]).to.deep.equal({ name: 'k', value: '0.8 / h', spread: { distribution: 'normal', sd: '0.1 / h' } });
    await until(() => params.shadowRoot!.querySelector('.spread-text')?.textContent === '0.8 /h ± 0.1 /h', 'the spread as text beside the value', 8000);
    await until(() => howReport()?.ok, 'the uncertainty cell computing', 15000);
    // undo: the SD typed, then the distribution chosen
    view.controller.undo();
    await until(() => items()[0].spread?.sd === '', 'the SD undone');
    view.controller.undo();
    await until(() => items()[0].spread === undefined, 'the spread undone');
    expect(JSON.stringify(view.controller.study)).to.equal(before);
  });
});

describe('the uncertainty cell element', () => {
  type CellEl = HTMLElement & { cell: Cell; report?: unknown; study?: Report; doc?: unknown; updateComplete: Promise<unknown> };
  type Report = import('../../src/index.ts').Report;
  const withSpread = structuredClone(COOLING);
  (withSpread.cells[0] as Extract<Cell, { kind: 'parameters' }>).items[0].spread = { distribution: 'lognormal', cv: 0.2 };
  let el: CellEl;
  const mount = async (doc: Study) => {
    const r = runStudy(doc);
    if (!r.ok) throw new Error(r.error.message);
    el = document.createElement('uncertainty-cell') as CellEl;
    el.cell = doc.cells.find((c) => c.id === 'how')!;
    el.report = r.report.cells.find((c) => c.id === 'how');
    el.study = r.report;
    el.doc = doc;
    document.body.append(el);
    await el.updateComplete;
    return r.report;
  };
  afterEach(() => el?.remove());

  it('shows the results table, the verdict\'s probability, a histogram with its data table, and the inputs drawn', async () => {
    const report = await mount(withSpread);
    const r = report.cells.find((c) => c.id === 'how') as { results: Record<string, UncertaintyResult> };
    const row = el.shadowRoot!.querySelector('table.results tbody tr')!;
    expect(row.querySelector('td.name')!.textContent).to.equal('t_40');
    // each percentile to the place its own uncertainty supports (percentile-precision.test.ts)
    const pc = r.results.t_40.percentiles!;
    expect(row.textContent).to.contain(`${pc.p025.shown} to ${pc.p975.shown}`);
    // the probability to the place of its standard error's first digit, then its SE and Wilson interval
    const quick = r.results.quick;
    const verdict = el.shadowRoot!.querySelector('.verdict')!.textContent!.replace(/\s+/g, ' ');
    expect(verdict).to.contain(`quick: yes in ${quick.shown} of 300 samples, ± `);
    expect(Math.abs(Number(quick.shown!.replace('%', '')) - 100 * quick.probability!)).to.be.below(5);
    expect(verdict).to.contain('percentage points (Monte Carlo standard error); 95% interval');
    expect(verdict).to.match(/would settle the whole percent shown|would settle the .* point shown/);
    // the mean's Monte Carlo error beside the mean
    expect(row.querySelector('td.mcse')!.textContent).to.equal(`± ${r.results.t_40.shownFigures!.meanSE}`);
    expect(row.querySelector('td.mcse')!.textContent).to.match(/^± [\d.]+ h$/);
    expect(el.shadowRoot!.querySelector('p.precision')!.textContent).to.match(/^t_40: Mean [\d.]+ ± [\d.]+ h \(Monte Carlo standard error, SD\/√n\), shown to [\d.]+ h, the place of the standard error's first digit/);
    const svg = el.shadowRoot!.querySelector('svg.histogram-svg')!;
    expect(svg.getAttribute('role')).to.equal('img');
    expect(svg.getAttribute('aria-label')).to.match(/^Histogram of t_40: 300 samples/);
    expect(svg.querySelectorAll('rect.bar').length).to.be.greaterThan(3);
    const data = el.shadowRoot!.querySelector('chart-data') as HTMLElement & { updateComplete: Promise<unknown> };
    await data.updateComplete;
    const toggle = data.shadowRoot!.querySelector('button.data-toggle') as HTMLButtonElement;
    toggle.click();
    await data.updateComplete;
    const rows = data.shadowRoot!.querySelectorAll('tbody tr');
    expect([...rows].reduce((n, tr) => n + Number(tr.lastElementChild!.textContent), 0), 'every sample in a bin').to.equal(300);
    expect(el.shadowRoot!.textContent).to.contain('k 0.8 /h ± 20% (log-normal, median and CV)');
  });

  it('an error on its field when nothing upstream has a spread; the method and samples as edits', async () => {
    await mount(COOLING);
    const names = el.shadowRoot!.querySelector('[data-field="of"]') as HTMLInputElement;
    expect(names.value).to.equal('t_40, quick');
    expect(el.shadowRoot!.textContent).to.contain('no value with a spread');
    const edit2 = new Promise<{ cell: Record<string, unknown> }>((resolve) => el.addEventListener('cell-edit', (e) => resolve((e as CustomEvent).detail), { once: true }));
    const samples = el.shadowRoot!.querySelector('[data-field="samples"]') as HTMLInputElement;
    samples.value = '5000';
    samples.dispatchEvent(new Event('change'));
    expect((await edit2).cell.samples).to.equal(5000);
    // the next edit builds on that one (the element takes its own edit at once)
    const edit = new Promise<{ cell: Record<string, unknown> }>((resolve) => el.addEventListener('cell-edit', (e) => resolve((e as CustomEvent).detail), { once: true }));
    const method = el.shadowRoot!.querySelector('[data-field="method"]') as HTMLSelectElement;
    method.value = 'linear';
    method.dispatchEvent(new Event('change'));
    expect((await edit).cell).to.deep.equal({ ...COOLING.cells[4], samples: 5000, method: 'linear' });
  });
});
