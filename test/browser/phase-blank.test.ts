// "Where it settles" added to a study whose law is a temperature: its range is in the law's
// unit, so it works at once and finds where Newton cooling settles, T = T_a (dT/dt =
// -k (T - T_a) is zero there and only there; an attractor, since the slope -k is negative).
import { expect } from 'chai';
import type { StudyView } from '../../components/study-view.ts';
import type { Study } from '../../src/index.ts';
import { mountStudy } from './mount-study.ts';
import { until } from './helpers.ts';

const cooling: Study = {
  format: 'ratebook-study', version: 1, title: 'Cooling',
  cells: [
    { id: 'inputs', kind: 'parameters', items: [{ name: 'k', value: '0.35 / h' }, { name: 'T_a', value: '4 degC' }] },
    { id: 'cooling', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - T_a)', initial: '74 degC' },
  ],
} as Study;

const phaseReport = (view: StudyView, id: string) =>
  view.controller.report?.cells.find((c) => c.id === id) as { ok: boolean; error?: { message: string }; equilibria?: Array<{ si: number; stability: string }> } | undefined;

describe('adding "Where it settles"', () => {
  afterEach(() => document.querySelectorAll('study-view').forEach((v) => v.remove()));

  it('takes its range in the law\'s unit and finds T = T_a, an attractor', async function () {
    this.timeout(20000);
    const view = await mountStudy(cooling);
    const add = [...view.shadowRoot!.querySelectorAll('.add button')].find((b) => b.textContent === 'Where it settles') as HTMLButtonElement;
    add.click();
    const cell = view.controller.study!.cells.at(-1)! as { id: string; kind: string; from: string; to: string };
    expect(cell.kind).to.equal('phase');
    expect([cell.from, cell.to]).to.deep.equal(['0 degC', '20 degC']);
    const r = await until(() => phaseReport(view, cell.id), 'the phase cell\'s report', 10000);
    expect(r.ok, r.error?.message).to.equal(true);
    expect(r.equilibria!.length).to.equal(1);
    expect(r.equilibria![0].si).to.be.closeTo(277.15, 1e-6);
    expect(r.equilibria![0].stability).to.equal('attractor');
  });
});
