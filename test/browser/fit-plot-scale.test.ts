// The fit cell's fitted-curve plot has the same log-axis toggle as a simulate cell's, stored as
// the fit's `plotScale` (docs/study-format.md, "Fit: how this version answers"); the residual
// plot beside it stays linear (residuals are signed). Driven by keys: Space on the focused
// checkbox stores the choice as one edit, and the study's undo takes it away.
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import { StudyView } from '../../components/study-view.ts';
import type { TimePlot } from '../../components/plots/time-plot.ts';
import type { Study } from '../../src/index.ts';
import { deep, until } from './helpers.ts';

/**
 * Invented numbers: a first-order decay x(t) = 10 mg/L · exp(-0.3/h · t), sampled and rounded
 * to two decimals (closed form of x' = -k x), fitted for k.
 */
const study = {
  format: 'ratebook-study', version: 1, title: 'Fit on a log axis (invented numbers)', cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.2 / h' }] },
    { id: 'decay', kind: 'rate', state: 'x', unit: 'mg / L', rate: '-k * x', initial: '10 mg / L' },
    { id: 'levels', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'x', unit: 'mg / L' }],
      rows: [[1, 7.41], [2, 5.49], [4, 3.01], [8, 0.91]] },
    { id: 'fit', kind: 'fit', rates: ['decay'], data: 'levels', time: 't', observe: { x: 'x' },
      estimate: [{ parameter: 'k', as: 'k_hat', guess: '0.2 / h' }] },
  ],
} as unknown as Study;

describe('fit cell: log axis on the fitted curve', () => {
  it('Space on the fitted curve\'s toggle stores plotScale "log", the residual plot stays linear, and undo restores the cell', async () => {
    const view = StudyView.create();
    document.body.append(view);
    const answered = new Promise<void>((resolve) => { const off = view.controller.onAnswer(() => { off(); resolve(); }); });
    view.controller.open('fit-log', structuredClone(study));
    await answered;
    const fitPlots = () => {
      const fit = deep(view.shadowRoot!, 'fit-cell')[0] as HTMLElement | undefined;
      return fit ? [...fit.shadowRoot!.querySelectorAll('time-plot')] as TimePlot[] : [];
    };
    const [curve, residuals] = await until(() => (fitPlots().length === 2 ? fitPlots() : undefined), 'the fit\'s two plots', 8000);
    await curve.updateComplete;
    await residuals.updateComplete;
    expect(residuals.shadowRoot!.querySelector('input.log-toggle'), 'no log toggle on the residuals').to.equal(null);
    const box = curve.shadowRoot!.querySelector('input.log-toggle') as HTMLInputElement;
    expect(box.checked).to.equal(false);
    const before = structuredClone(view.controller.study!.cells.find((c) => c.id === 'fit'));
    box.focus();
    await sendKeys({ press: 'Space' });
    const cellOf = () => view.controller.study!.cells.find((c) => c.id === 'fit') as { plotScale?: string };
    expect(cellOf().plotScale).to.equal('log');
    await until(() => (fitPlots()[0]?.scale === 'log' ? true : undefined), 'the fitted curve drawn on a log axis', 8000);
    expect(fitPlots()[1].scale, 'the residual plot stays linear').to.equal('linear');
    view.controller.undo();
    expect(cellOf()).to.deep.equal(before);
    expect('plotScale' in cellOf(), 'undo takes the field away again').to.equal(false);
    await until(() => (fitPlots()[0]?.scale === 'linear' ? true : undefined), 'the fitted curve back on a linear axis', 8000);
    view.remove();
  });
});
