// A fit's estimate switched to another parameter from the keyboard: its result name and
// guess follow while they are still what the fit gave the previous one (a new fit estimates
// the state T as T0_fit from 74 degC), and stay as typed otherwise. The data are Newton's
// cooling law in closed form, T = T_a + (T0 - T_a) e^(-k t) with k = 0.35 / h (the exact
// solution of dT/dt = -k (T - T_a)), so the fit must find k = 0.35 / h.
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import type { StudyView } from '../../components/study-view.ts';
import type { Study } from '../../src/index.ts';
import { mountStudy } from './mount-study.ts';
import { until } from './helpers.ts';

const K = 0.35; // per hour
const times = [0, 0.25, 0.5, 1, 1.5, 2, 3];
const study = (estimate: unknown[]): Study => ({
  format: 'ratebook-study', version: 1, title: 'Fit k to a cooling curve',
  cells: [
    { id: 'inputs', kind: 'parameters', items: [{ name: 'T_a', value: '4 degC' }, { name: 'k', value: '0.5 / h' }] },
    { id: 'cooling', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - T_a)', initial: '74 degC' },
    { id: 'log', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'T', unit: 'degC' }], rows: times.map((t) => [t, 4 + 70 * Math.exp(-K * t)]) },
    { id: 'fit', kind: 'fit', rates: ['cooling'], data: 'log', time: 't', observe: { T: 'T' }, estimate },
  ],
} as Study);

type Estimate = { parameter: string; as: string; guess: string };
const estimates = (view: StudyView) => (view.controller.study!.cells.find((c) => c.id === 'fit') as unknown as { estimate: Estimate[] }).estimate;
const fitted = (view: StudyView, as: string) => {
  const r = view.controller.report?.cells.find((c) => c.id === 'fit') as { estimates?: Record<string, { value: { si: number } }> } | undefined;
  return r?.estimates?.[as]?.value.si;
};

async function typeParameter(view: StudyView, text: string) {
  const cell = view.shadowRoot!.querySelector('fit-cell')!;
  const input = cell.shadowRoot!.querySelector('input[aria-label="Estimate 1: parameter or state"]') as HTMLInputElement;
  input.focus();
  input.select();
  await sendKeys({ type: text });
}

describe('changing the parameter of a fit estimate', () => {
  afterEach(() => document.querySelectorAll('study-view').forEach((v) => v.remove()));

  it('a new fit\'s T0_fit from 74 degC becomes k_fit from k\'s value, and the fit finds k', async function () {
    this.timeout(20000);
    const view = await mountStudy(study([{ parameter: 'T', as: 'T0_fit', guess: '74 degC' }]));
    await typeParameter(view, 'k');
    await until(() => estimates(view)[0].parameter === 'k', 'the parameter typed');
    expect(estimates(view)[0]).to.deep.equal({ parameter: 'k', as: 'k_fit', guess: '0.5 / h' });
    const si = await until(() => fitted(view, 'k_fit'), 'the fit of k', 10000);
    expect(si * 3600).to.be.closeTo(K, 1e-6);
  });

  it('keeps a result name and a guess the user typed', async function () {
    this.timeout(20000);
    const view = await mountStudy(study([{ parameter: 'T', as: 'k_walkin', guess: '0.2 / h' }]));
    await typeParameter(view, 'k');
    await until(() => estimates(view)[0].parameter === 'k', 'the parameter typed');
    expect(estimates(view)[0]).to.deep.equal({ parameter: 'k', as: 'k_walkin', guess: '0.2 / h' });
    const si = await until(() => fitted(view, 'k_walkin'), 'the fit of k', 10000);
    expect(si * 3600).to.be.closeTo(K, 1e-6);
  });
});
