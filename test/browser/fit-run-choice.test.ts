// The fit cell's model choice: the laws ticked (from t = 0, no events) or a run with its whole
// schedule (`run`, docs/study-format.md). Chosen by keyboard on the select: the fit then goes
// through the run (its estimates shown, the laws' row gone), going back ticks the run's laws,
// and the study's undo restores each step.
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import { StudyView } from '../../components/study-view.ts';
import type { Study } from '../../src/index.ts';
import { deep, until } from './helpers.ts';

/** Invented numbers: doses of 1000 mg every 12 h, levels made with CL 5 L/h and V 50 L by superposition, rounded. */
const study = {
  format: 'ratebook-study', version: 1, title: 'Fit through a regimen (invented numbers)', cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'CL', value: '5 L/h' }, { name: 'V', value: '50 L' }, { name: 'dose', value: '1000 mg' }] },
    { id: 'elim', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-CL / V * C', initial: '0 mg / L' },
    { id: 'regimen', kind: 'simulate', title: 'Regimen', rates: ['elim'], from: '0 h', to: '48 h', events: [{ at: '0 h', every: '12 h', count: 4, add: { C: 'dose / V' } }] },
    { id: 'levels', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: [[37, 25.68], [42, 15.58], [47, 9.45]] },
    { id: 'fit', kind: 'fit', rates: ['elim'], data: 'levels', time: 't', observe: { C: 'C' },
      estimate: [{ parameter: 'CL', as: 'CL_i', guess: '3 L/h' }, { parameter: 'V', as: 'V_i', guess: '30 L' }] },
  ],
} as unknown as Study;

describe('fit cell: the model, laws or a run', () => {
  it('a run chosen by keyboard fits through its schedule; laws again tick the run\'s laws; undo restores each step', async function () {
    this.timeout(30_000);
    const view = StudyView.create();
    document.body.append(view);
    const answered = new Promise<void>((resolve) => { const off = view.controller.onAnswer(() => { off(); resolve(); }); });
    view.controller.open('fit-run', structuredClone(study));
    await answered;
    const fitEl = () => deep(view.shadowRoot!, 'fit-cell')[0] as HTMLElement & { updateComplete: Promise<unknown> };
    const select = () => fitEl().shadowRoot!.querySelector('select[data-field="run"]') as HTMLSelectElement;
    const cellOf = () => view.controller.study!.cells.find((c) => c.id === 'fit') as { run?: string; rates?: string[] };
    await until(() => select() ?? undefined, 'the model select');
    expect(select().closest('label')!.textContent).to.match(/Model/);
    expect(select().value).to.equal('');
    await until(() => (fitEl().shadowRoot!.querySelectorAll('[data-field="rates"]').length > 0 ? true : undefined), 'the laws to tick');

    select().focus();
    await sendKeys({ press: 'ArrowDown' });
    await until(() => (cellOf().run === 'regimen' ? true : undefined), 'the fit goes through the run');
    expect(cellOf().rates, 'the laws go with the run').to.equal(undefined);
    await fitEl().updateComplete;
    expect(fitEl().shadowRoot!.querySelectorAll('[data-field="rates"]').length, 'no laws to tick').to.equal(0);
    // the estimates through the run, from the engine: CL 5 L/h within the rounding of the levels
    const shown = await until(() => {
      const r = view.controller.report?.cells.find((c) => c.id === 'fit') as { ok: boolean; estimates?: Record<string, { value: { value: number } }> } | undefined;
      return r?.ok && r.estimates && Math.abs(r.estimates.CL_i.value.value - 5) < 0.05 ? r : undefined;
    }, 'the fit through the run', 15_000);
    expect(Math.abs(shown.estimates!.V_i.value.value - 50)).to.be.lessThan(0.5);

    select().focus();
    await sendKeys({ press: 'ArrowUp' });
    await until(() => (cellOf().run === undefined ? true : undefined), 'back to laws');
    expect(cellOf().rates).to.deep.equal(['elim']);

    view.controller.undo();
    expect(cellOf().run).to.equal('regimen');
    view.controller.undo();
    expect(cellOf()).to.deep.include({ rates: ['elim'] });
    expect(cellOf().run).to.equal(undefined);
    view.remove();
  });
});
