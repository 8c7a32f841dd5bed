// The editor reaches every field of the study format: a study holding every field of every
// cell kind (src/study/format-fields.ts, checked against the types at compile time) is opened
// in the study view with the real engine, and each field found in a cell's document must have a
// control in that cell, marked `data-field` with its path, with an accessible name. So a field
// added to the format without a control fails here.
import { expect } from 'chai';
import { StudyView } from '../../components/study-view.ts';
import { FORMAT_FIELDS, FIXED_FIELDS, STUDY_FIELDS, FIXED_STUDY_FIELDS, fieldPathOf, fieldsIn } from '../../src/study/format-fields.ts';
import type { Study } from '../../src/index.ts';
import { deep, until } from './helpers.ts';
import { mountStudy } from './mount-study.ts';

/** Every field of every kind at least once (invented numbers, for the editor only). */
export const EVERY_FIELD: Study = {
  format: 'ratebook-study', version: 1, title: 'Every field (invented numbers)', description: 'For the editor only.', author: 'A. Tester', cells: [
    { id: 'p', kind: 'parameters', title: 'Inputs', items: [
      { name: 'k', value: '0.1 / h', range: ['0.05 / h', '0.2 / h'], note: 'invented', unit: '1 / d', glance: true },
      { name: 'kb', value: '0.3 / h', spread: { distribution: 'normal', sd: '0.03 / h' } }, { name: 'V', value: '40 L', spread: { distribution: 'lognormal', cv: 0.2 } },
      { name: 'dose', value: '400 mg', spread: { distribution: 'uniform', from: '380 mg', to: '420 mg' } },
      { name: 'tau', value: '12 h' }, { name: 'n_doses', value: '6' }, { name: 'MIC', value: '2 mg / L' },
    ] },
    { id: 'c', kind: 'rate', title: 'Central', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
    { id: 'cb', kind: 'rate', title: 'Second', state: 'Cb', unit: 'mg / L', rate: '-kb * Cb', initial: '10 mg / L' },
    { id: 'ph', kind: 'phase', title: 'Settles', rate: 'c', from: '-1 mg / L', to: '20 mg / L', sweep: { name: 'k', from: '0.05 / h', to: '0.2 / h', steps: 5 } },
    { id: 'run', kind: 'simulate', title: 'Regimen', rates: ['c'], from: '0 h', to: '72 h', method: 'rk4', step: '0.1 h',
      tolerance: { relative: 1e-6, absolute: '1e-6 mg / L' },
      events: [
        { at: '0 h', every: 'tau', count: 'n_doses', add: { C: 'dose / V' } },
        { at: '30 h', set: { k: '0.12 / h' } },
        { at: '0 h', every: '24 h', count: 2, for: '1 h', infuse: { C: '1 mg / L / h' } },
      ],
      find: [
        { name: 't_mic', crossing: 'C', level: 'MIC', direction: 'down', occurrence: 2, from: '0 h', to: '72 h' },
        { name: 'peak', maximum: 'C', unit: 'ug / mL' },
        { name: 'trough_last', minimum: 'C', from: '60 h', to: '72 h', glance: true },
        { name: 't_peak', timeOfMaximum: 'C' },
        { name: 't_trough', timeOfMinimum: 'C' },
        { name: 'C6', valueOf: 'C', at: '6 h' },
        { name: 'auc_last', integralOf: 'C', from: '60 h', to: '72 h' },
        { name: 't_above', timeAbove: 'C', level: 'MIC' },
        { name: 't_below', timeBelow: 'C', level: 'MIC' },
      ],
      plotScale: 'log', band: true },
    { id: 'd', kind: 'data', title: 'Levels', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: [[1, 7.4], [2, 5.5], [4, 3.0], [8, 0.9]] },
    { id: 'd2', kind: 'data', title: 'Pasted', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], csv: 't,C\n1,7.4\n2,5.5\n4,3.0\n' },
    { id: 'f', kind: 'fit', title: 'Fit', rates: ['cb'], data: 'd', time: 't', observe: { Cb: 'C' },
      estimate: [{ parameter: 'kb', as: 'kb_hat', guess: '0.2 / h', min: '0.01 / h', max: '1 / h', unit: '1 / d' }], weighting: 'relative', plotScale: 'log' },
    { id: 'fm', kind: 'fit', title: 'Bayesian fit', rates: ['cb'], data: 'd', time: 't', observe: { Cb: 'C' },
      estimate: [{ parameter: 'kb', as: 'kb_map', guess: '0.2 / h', prior: { median: '0.25 / h', omega: 0.3 } }],
      error: { additive: '0.2 mg / L', proportional: 0.1 } },
    { id: 'f2', kind: 'fit', title: 'Through the regimen', run: 'run', data: 'd', time: 't', observe: { C: 'C' },
      estimate: [{ parameter: 'V', as: 'V_hat', guess: '30 L' }] },
    { id: 'n', kind: 'nca', title: 'Profile', data: 'd', time: 't', concentration: 'C', dose: '500 mg', route: 'infusion', duration: '0.5 h',
      auc: 'linear', terminal: 3, prefix: 'p_', units: { CL: 'mL / min' } },
    { id: 'sv', kind: 'solve', title: 'Dose for a trough', vary: { parameter: 'dose', as: 'dose_new', min: '100 mg', max: '2000 mg', roundTo: '50 mg', guess: '400 mg' },
      target: { value: 'trough_last', equals: '1 mg / L' } },
    { id: 'sc', kind: 'solve', title: 'Interval', vary: { parameter: 'tau', as: 'tau_new', choices: ['8 h', '12 h', '24 h'] }, target: { value: 'trough_last', equals: '1 mg / L' } },
    { id: 'u', kind: 'uncertainty', title: 'How sure', of: ['trough_last'], method: 'monte-carlo', samples: 50, seed: 3 },
    { id: 'sens', kind: 'sensitivity', title: 'What matters', of: ['trough_last'], parameters: ['k', 'V'] },
    { id: 'cmp', kind: 'compare', title: 'Intervals', run: 'run', scenarios: [{ name: 'q12', set: {} }, { name: 'q8', set: { tau: '8 h' } }] },
    { id: 'm', kind: 'note', title: 'About', text: 'Every field once, with invented numbers.' },
  ],
} as Study;

async function mount(doc: Study): Promise<StudyView> {
  const view = await mountStudy(doc, 'fields');
  return view;
}

/** The accessible name of a control, as a screen reader would find it (the cases the cells use). */
function nameOf(el: Element): string {
  const own = el.getAttribute('aria-label') ?? (el as { label?: string }).label ?? '';
  if (own.trim()) return own.trim();
  const byFor = el.id ? (el.getRootNode() as ParentNode).querySelector(`label[for="${el.id}"]`) : null;
  if (byFor?.textContent?.trim()) return byFor.textContent.trim();
  const wrap = el.closest('label');
  if (wrap?.textContent?.trim()) return wrap.textContent.trim();
  if (el.tagName === 'BUTTON') return el.textContent?.trim() ?? '';
  return '';
}

/** The controls of each article (one per cell), by the path each names. */
async function controlsByCell(view: StudyView): Promise<Array<Map<string, Element[]>>> {
  const articles = [...view.shadowRoot!.querySelectorAll('article')];
  for (const el of deep(view.shadowRoot!, '*')) await (el as { updateComplete?: Promise<unknown> }).updateComplete;
  return articles.map((a) => {
    const map = new Map<string, Element[]>();
    for (const el of deep(a, '[data-field]')) {
      const path = el.getAttribute('data-field')!;
      map.set(path, [...(map.get(path) ?? []), el]);
    }
    return map;
  });
}

describe('every field of the study format has its control in the editor', () => {
  let view: StudyView;
  // one study view for the three checks; the engine worker's first answer can be slow under load
  before(async function () {
    this.timeout(30_000);
    view = await mount(EVERY_FIELD);
  });
  after(() => view.remove());

  it('the sample study holds every field of every kind, and computes', async () => {
    const report = await until(() => view.controller.report, 'the report');
    for (const c of report.cells) expect(c.ok, `${c.id}: ${c.error?.message}`).to.equal(true);
    for (const [kind, fields] of Object.entries(FORMAT_FIELDS)) {
      const present = new Set(EVERY_FIELD.cells.filter((c) => c.kind === kind).flatMap((c) => fieldsIn(c as unknown as Record<string, unknown>).map(fieldPathOf)));
      expect([...fields].filter((f) => !present.has(f)), `fields of ${kind} missing from the sample`).to.deep.equal([]);
    }
  });

  it('each field in each cell has a control naming its path, with an accessible name', async () => {
    const controls = await controlsByCell(view);
    const missing: string[] = [];
    const unnamed: string[] = [];
    EVERY_FIELD.cells.forEach((cell, i) => {
      for (const path of fieldsIn(cell as unknown as Record<string, unknown>)) {
        if (FIXED_FIELDS.includes(path)) continue;
        const found = controls[i].get(path);
        if (!found) missing.push(`${cell.id}: ${path}`);
        for (const el of found ?? []) if (!nameOf(el)) unnamed.push(`${cell.id}: ${path} (${el.tagName.toLowerCase()})`);
      }
    });
    expect(missing, 'fields with no control').to.deep.equal([]);
    expect(unnamed, 'controls with no accessible name').to.deep.equal([]);
  });

  it('each kind offers a control for every field of the format', async () => {
    const controls = await controlsByCell(view);
    for (const [kind, fields] of Object.entries(FORMAT_FIELDS)) {
      const shown = new Set(EVERY_FIELD.cells.flatMap((c, i) => (c.kind === kind ? [...controls[i].keys()].map(fieldPathOf) : [])));
      const lacking = fields.filter((f) => !FIXED_FIELDS.includes(f) && !shown.has(f));
      expect(lacking, `${kind} fields with no control`).to.deep.equal([]);
    }
  });

  it('the study\'s own fields have their controls above the cells', async () => {
    const bar = [...view.shadowRoot!.querySelectorAll('[data-field]')].filter((el) => !el.closest('article'));
    for (const field of STUDY_FIELDS.filter((f) => !FIXED_STUDY_FIELDS.includes(f))) {
      const found = bar.filter((el) => el.getAttribute('data-field') === field);
      expect(found.length, `a control for the study's ${field}`).to.be.greaterThan(0);
      for (const el of found) expect(nameOf(el), `the ${field} control's name`).to.not.equal('');
    }
  });
});
