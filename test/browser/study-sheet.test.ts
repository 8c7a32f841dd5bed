// The printed sheet: a static document from the study and the engine's report (the real
// engine, run in the page): header, typeset laws, tables, SVG charts and found results, with
// no controls. And the study view's two ways to it: the sheet mode and the browser's print.
import { expect } from 'chai';
import { StudyView } from '../../components/study-view.ts';
import '../../components/sheet/study-sheet.ts';
import { openStudy, formatNumber, type Study, type Report } from '../../src/index.ts';
import cooling from '../../examples/cooling-stock-pot.ratebook.json';
import fold from '../../examples/harvested-stock-fold.ratebook.json';
import plasma from '../../examples/plasma-levels.ratebook.json';
import twoStage from '../../examples/two-stage-cooling-check.ratebook.json';

function reportOf(doc: unknown): Report {
  const r = openStudy(structuredClone(doc));
  if (!r.ok) throw new Error(r.error.message);
  return r.session.report();
}

async function sheetOf(doc: unknown, meta = {}) {
  const el = document.createElement('study-sheet');
  el.study = structuredClone(doc) as Study;
  el.report = reportOf(doc);
  el.meta = meta;
  document.body.append(el);
  await el.updateComplete;
  return el.shadowRoot!;
}

describe('study-sheet', () => {
  afterEach(() => document.querySelectorAll('study-sheet, study-view').forEach((v) => v.remove()));

  it('has a header with title, author, revision and date, and the caution', async () => {
    const root = await sheetOf({ ...cooling, author: 'R. Sample' }, { revision: 7, updated: Date.UTC(2026, 0, 5) });
    const header = root.querySelector('header.doc')!.textContent!;
    expect(header).to.contain(cooling.title);
    expect(header).to.contain('Prepared by: R. Sample');
    expect(header).to.contain('Revision 7');
    expect(header).to.match(/Saved .*2026/);
    expect(root.querySelector('.caution')!.textContent).to.contain('food code');
  });

  it('typesets the rate law as MathML and shows each found result as the engine computed it', async () => {
    const root = await sheetOf(cooling);
    expect(root.querySelector('.equation math'), 'a MathML equation').to.exist;
    const run = reportOf(cooling).cells.find((c) => c.id === 'run')!;
    const results = run.results as Record<string, { value: number; unit: string }>;
    const rows = [...root.querySelectorAll('table.results tbody tr')].map((tr) => [...tr.querySelectorAll('td')].map((td) => td.textContent!.trim()));
    for (const [name, q] of Object.entries(results)) {
      const row = rows.find((r) => r[0] === name);
      expect(row, name).to.exist;
      expect(row![2]).to.equal(`${formatNumber(q.value, 4)} ${q.unit}`);
      expect(row![1], `${name}: the question in the engine's words`).to.equal((run.questions as Record<string, string>)[name]);
    }
  });

  it('opens with the results at a glance: each answer, each estimate, with the cell it comes from', async () => {
    const root = await sheetOf(plasma);
    const glance = root.querySelector('section.glance')!;
    const names = [...glance.querySelectorAll('td.name')].map((td) => td.textContent);
    const report = reportOf(plasma);
    const fit = report.cells.find((c) => c.kind === 'fit')!;
    for (const name of Object.keys(fit.estimates as object)) expect(names).to.include(name);
    expect(names).to.include.members(['CL', 't_half', 'AUCinf']);
    expect(glance.textContent).to.contain('(SE)');
  });

  it('shows verdicts as yes or no, first among the results at a glance', async () => {
    const root = await sheetOf(twoStage);
    const rows = [...root.querySelectorAll('section.glance tbody tr')].map((tr) => [...tr.querySelectorAll('td')].map((td) => td.textContent!.trim()));
    expect(rows[0].slice(0, 2)).to.deep.equal(['stage1_ok', 'yes']);
    expect(rows.find((r) => r[0] === 'passes')?.[1]).to.equal('yes');
  });

  it('has one section per cell, charts as SVG, and no controls', async () => {
    const root = await sheetOf(plasma);
    expect(root.querySelectorAll('section.cell').length).to.be.at.least(plasma.cells.length);
    expect(root.querySelectorAll('figure svg').length).to.be.at.least(1);
    expect(root.querySelectorAll('button, input, select, textarea').length).to.equal(0);
  });

  it('draws the phase line with one dot per equilibrium, and the sweep with its fold', async () => {
    const root = await sheetOf(fold);
    const line = root.querySelector('section.phase figure svg')!;
    expect(line.querySelectorAll('circle').length).to.equal(2);
    const foldRow = root.querySelector('section.phase table:last-of-type tbody tr')!.textContent!;
    expect(foldRow).to.contain('125 tonne / year');
    const paths = [...root.querySelectorAll('section.phase figure:last-of-type svg path[d]')].filter((p) => p.getAttribute('d'));
    expect(paths.some((p) => p.getAttribute('stroke-dasharray') === 'none'), 'attractors drawn solid').to.equal(true);
    expect(paths.some((p) => p.getAttribute('stroke-dasharray') !== 'none'), 'repellers drawn dashed').to.equal(true);
  });

  it('a study view shows the sheet in sheet mode, and renders it for print in edit mode', async () => {
    const view = StudyView.create();
    document.body.append(view);
    const answered = new Promise<void>((resolve) => { const off = view.controller.onAnswer(() => { off(); resolve(); }); });
    view.controller.open('t', structuredClone(cooling) as Study);
    await answered;
    await view.updateComplete;
    expect(view.shadowRoot!.querySelector('study-sheet'), 'no sheet while editing').to.equal(null);
    window.dispatchEvent(new Event('beforeprint'));
    await view.updateComplete;
    expect(view.shadowRoot!.querySelector('.for-print study-sheet'), 'a sheet for print').to.exist;
    window.dispatchEvent(new Event('afterprint'));
    view.mode = 'sheet';
    await view.updateComplete;
    expect(view.shadowRoot!.querySelector('.paper study-sheet')).to.exist;
    expect(view.shadowRoot!.querySelector('article'), 'no cell editors in sheet mode').to.equal(null);
  });
});
