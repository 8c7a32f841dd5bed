// Names a fit defines are names like any other in the app: coloured as study names in
// expression fields, offered by completion with their value, suggested for a near miss; and a
// fit through as many points as estimates shows zero residuals on an axis that does not magnify
// round-off.
import { expect } from 'chai';
import { completionStatus, currentCompletions } from '@codemirror/autocomplete';
import { StudyView } from '../../components/study-view.ts';
import type { ExprField } from '../../components/expr-field.ts';
import type { TimePlot } from '../../components/plots/time-plot.ts';
import type { Study } from '../../src/index.ts';
import plasma from '../../examples/plasma-levels.ratebook.json';
import { mountStudy } from './mount-study.ts';
import { deep, until } from './helpers.ts';
import { viewOf } from './expr-field-helpers.ts';

const mount = mountStudy;

const fieldOf = (view: StudyView, label: string) => deep(view.shadowRoot!, 'expr-field').find((f) => (f as ExprField).label === label) as ExprField;

/** The text of the spans coloured as study names in a field. */
const namesShown = (f: ExprField) => [...f.shadowRoot!.querySelectorAll('.cm-x-name')].map((s) => s.textContent);

describe('names a fit defines', () => {
  afterEach(() => document.querySelectorAll('study-view').forEach((v) => v.remove()));

  it('are coloured like other study names in expression fields', async function () {
    this.timeout(20000);
    const view = await mount(plasma);
    // plasma-levels: V_fit = dose / C0_fit (a parameter and a fit's estimate)
    const f = fieldOf(view, 'Value of V_fit');
    await until(() => namesShown(f).length === 2, 'both names coloured');
    expect(namesShown(f)).to.deep.equal(['dose', 'C0_fit']);
    expect(namesShown(fieldOf(view, 'Value of t_half_fit'))).to.deep.equal(['k_fit']);
  });

  it('are offered by completion with their value', async function () {
    this.timeout(20000);
    const view = await mount(plasma);
    const f = fieldOf(view, 'Value of CL_fit');
    const cm = viewOf(f);
    cm.focus();
    cm.dispatch({ changes: { from: 0, to: cm.state.doc.length, insert: 'k_f' }, selection: { anchor: 3 }, userEvent: 'input.type' });
    await until(() => completionStatus(cm.state) === 'active', 'the completion list');
    const option = currentCompletions(cm.state).find((c) => c.label === 'k_fit');
    expect(option, 'k_fit is offered').to.exist;
    expect(option!.detail).to.match(/^0\.15\d+ \/h \(fitted\)$/);
  });

  it('offer each estimate\'s standard error and 95% bounds by completion, as names', async function () {
    this.timeout(20000);
    const view = await mount(plasma);
    const f = fieldOf(view, 'Value of CL_fit');
    const cm = viewOf(f);
    cm.focus();
    cm.dispatch({ changes: { from: 0, to: cm.state.doc.length, insert: 'k_fit_' }, selection: { anchor: 6 }, userEvent: 'input.type' });
    await until(() => completionStatus(cm.state) === 'active', 'the completion list');
    const options = currentCompletions(cm.state).filter((c) => c.label.startsWith('k_fit_'));
    expect(options.map((o) => o.label).sort()).to.deep.equal(['k_fit_hi', 'k_fit_lo', 'k_fit_se']);
    expect(options.find((o) => o.label === 'k_fit_se')!.detail).to.match(/ \/h \(standard error of k_fit\)$/);
  });

  it('are suggested for a near miss, on the field that has it', async function () {
    this.timeout(20000);
    const view = await mount(plasma);
    const answered = new Promise<void>((resolve) => { const off = view.controller.onAnswer(() => { off(); resolve(); }); });
    fieldOf(view, 'Value of V_fit').dispatchEvent(new CustomEvent('expr-input', { detail: { value: 'dose / C0_fti' }, bubbles: true, composed: true }));
    await answered;
    await until(() => fieldOf(view, 'Value of V_fit').error, 'the error on the field');
    expect(fieldOf(view, 'Value of V_fit').error!.message).to.equal('unknown name "C0_fti" (did you mean "C0_fit"?)');
  });
});

describe('the residuals of a fit through as many points as estimates', () => {
  afterEach(() => document.querySelectorAll('study-view').forEach((v) => v.remove()));

  it('are drawn at zero on an axis at least the residual floor high, not magnified round-off', async function () {
    this.timeout(20000);
    // two invented points: C' = -k C meets both exactly (k = ln(8/3)/3 per hour)
    const view = await mount({ format: 'ratebook-study', version: 1, title: 'two points', cells: [
      { id: 'd', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: [[1, 8], [4, 3]] },
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.1 / h' }] },
      { id: 'plasma', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '10 mg / L' },
      { id: 'f', kind: 'fit', rates: ['plasma'], data: 'd', time: 't', observe: { C: 'C' },
        estimate: [{ parameter: 'k', as: 'k_fit', guess: '0.2 / h' }, { parameter: 'C', as: 'C0_fit', guess: '10 mg / L' }] },
    ] });
    const fit = deep(view.shadowRoot!, 'fit-cell')[0];
    const plots = await until(() => { const p = [...fit.shadowRoot!.querySelectorAll('time-plot')] as TimePlot[]; return p.length === 2 && p[1].charts.length ? p : undefined; }, 'the residual plot');
    const residual = plots[1];
    expect(residual.points[0].values, 'the residuals are exactly zero').to.deep.equal([0, 0]);
    // the floor: a millionth of the data's scale, 10 mg/L (src/output/residuals.ts)
    expect(residual.floor).to.be.closeTo(1e-5, 1e-12);
    const y = residual.charts[0].scales.y0;
    expect(y.min!, 'the axis reaches below -floor').to.be.at.most(-1e-5);
    expect(y.max!, 'the axis reaches above the floor').to.be.at.least(1e-5);
  });
});
