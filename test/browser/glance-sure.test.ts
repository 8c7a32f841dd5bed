// Results at a glance say how sure where an uncertainty cell follows a result: the study view's
// panel and the printed sheet show a verdict's probability of yes (with its Monte Carlo error,
// as the uncertainty cell shows it) together with the verdict at the point values, and an
// answer's 95% interval with its point value; while the cell computes, "still computing" and no
// probability from before. Templates with invented numbers; the reference for every figure is
// the uncertainty cell's own report of the same study evaluated at once in this page.
import { expect } from 'chai';
import '../../components/sheet/study-sheet.ts';
import type { StudySheet } from '../../components/sheet/study-sheet.ts';
import { type Report, type Study, type UncertaintyResult } from '../../src/index.ts';
import trough from '../../examples/trough-in-range-probability.ratebook.json';
import cooling from '../../examples/cooling-fail-probability.ratebook.json';
import { until } from './helpers.ts';
import { sheetOf, type SheetProgress } from './sheet-of.ts';
import { MC, mount, study as liveTrough, type Live } from './monte-carlo-study.ts';

const text = (el: Element | null | undefined) => (el?.textContent ?? '').replace(/\s+/g, ' ').trim();
const resultOf = (r: Report, name: string) => (r.cells.find((c) => c.kind === 'uncertainty')!.results as Record<string, UncertaintyResult>)[name];

describe('the printed sheet\'s results at a glance, how sure', () => {
  let sheet: StudySheet;
  afterEach(() => sheet?.remove());

  async function render(doc: Study, pending: string[] = [], progress?: SheetProgress) {
    const r = await sheetOf(doc, pending, progress);
    sheet = r.sheet;
    const row = (name: string) => [...sheet.shadowRoot!.querySelectorAll('section.glance tbody tr')].find((tr) => text(tr.querySelector('td.name')) === name)!;
    return { report: r.report, row };
  }

  it('trough in range: the probability of yes with its Monte Carlo error, beside yes at the point values; the answers with their 95% interval', async () => {
    const { report, row } = await render(structuredClone(trough) as unknown as Study);
    const mc = resultOf(report, 'in_range');
    const value = row('in_range').querySelector('td.num')!;
    expect(text(value.querySelector('.sure'))).to.equal(`yes in ${mc.shown} of 2,000 samples (± 1.1 points, Monte Carlo)`);
    expect(mc.shown).to.equal('54%');
    expect(text(value.querySelector('.point'))).to.equal('at the point values: yes');
    const p = resultOf(report, 'trough').percentiles!;
    const t = row('trough').querySelector('td.num')!;
    expect(text(t.querySelector('.point'))).to.equal('12.4 mg / L at the point values');
    expect(text(t.querySelector('.sure'))).to.equal(`95% interval ${p.p025.shown} to ${p.p975.shown} (2.5 to 97.5 percentile of 2,000 Monte Carlo samples)`);
  });

  it('cooling fails: the probability that it fails beside no at the point values', async () => {
    const { report, row } = await render(structuredClone(cooling) as unknown as Study);
    const value = row('fails').querySelector('td.num')!;
    expect(text(value)).to.equal(`yes in ${resultOf(report, 'fails').shown} of 2,000 samples (± 0.12 points, Monte Carlo)at the point values: no`);
    // a verdict no uncertainty cell follows: as before
    expect(text(row('stage1_ok').querySelector('td.num'))).to.equal('yes');
  });

  it('the uncertainty cell still computing: says so, with its progress, and shows no probability from before', async () => {
    const { row } = await render(structuredClone(trough) as unknown as Study, [MC], { cell: MC, done: 1200, total: 2000, unit: 'samples' });
    const value = row('in_range').querySelector('td.num')!;
    expect(text(value.querySelector('.sure'))).to.equal('how sure: still computing (1,200 of 2,000 samples)');
    expect(text(value.querySelector('.point'))).to.equal('at the point values: yes');
    expect(text(value)).to.not.contain('%');
    expect(text(row('trough').querySelector('.sure'))).to.equal('how sure: still computing (1,200 of 2,000 samples)');
    expect(text(row('trough'))).to.not.contain('95% interval');
  });
});

describe('the study view\'s results at a glance, how sure, with the real engine', () => {
  let live: Live;
  afterEach(() => live?.view.remove());

  it('says still computing until the Monte Carlo is done, then the probability with the point verdict; after an edit, never the old probability', async function () {
    this.timeout(120_000);
    // 10,000 samples: long enough to see it computing on a loaded machine
    const doc = liveTrough();
    doc.cells = doc.cells.map((c) => (c.id === MC ? { ...c, samples: 10_000 } : c));
    live = await mount(doc);
    const { view, pending, mcReport } = live;
    const row = (name: string) => view.shadowRoot!.querySelector(`section.glance tr[data-glance="${name}"]`);
    // the first answer: the point verdict, and how sure still to come
    expect(pending()).to.equal(true);
    expect(text(row('in_range')!.querySelector('.sure'))).to.match(/^how sure: still computing/);
    expect(text(row('in_range')!.querySelector('.point'))).to.equal('at the point values: yes');
    expect(text(row('in_range'))).to.not.contain('%');
    await until(() => !pending(), 'the Monte Carlo result', 100_000);
    await view.updateComplete;
    const shown = (mcReport()!.results as Record<string, UncertaintyResult>).in_range.shown!;
    expect(text(row('in_range')!.querySelector('.sure'))).to.match(new RegExp(`^yes in ${shown.replace('.', '\\.')} of 10,000 samples \\(± [\\d.]+ points, Monte Carlo\\)$`));
    expect(text(row('in_range')!.querySelector('.point'))).to.equal('at the point values: yes');
    // CL doubled: the verdict's point value is current at once; how sure is computing again, the old share not shown
    const regimen = view.controller.study!.cells.find((c) => c.id === 'regimen') as Extract<Study['cells'][number], { kind: 'parameters' }>;
    const seen: string[] = [];
    const watch = setInterval(() => { const r = row('in_range'); if (r) seen.push(text(r)); }, 5);
    view.controller.edit({ type: 'replace', cell: { ...regimen, items: regimen.items.map((it) => (it.name === 'CL' ? { ...it, value: '8 L / h' } : it)) } });
    await until(() => pending(), 'the edit\'s answer, the Monte Carlo pending', 20_000);
    await view.updateComplete;
    expect(text(row('in_range')!.querySelector('.sure'))).to.match(/^how sure: still computing/);
    await until(() => !pending(), 'the new Monte Carlo result', 100_000);
    await view.updateComplete;
    clearInterval(watch);
    const fresh = (mcReport()!.results as Record<string, UncertaintyResult>).in_range.shown!;
    expect(fresh).to.not.equal(shown);
    // from the edit on, the old share never stood as how sure
    const afterEdit = seen.slice(seen.findIndex((s) => s.includes('still computing')));
    expect(afterEdit.filter((s) => s.includes(`yes in ${shown} `))).to.deep.equal([]);
    expect(text(row('in_range')!.querySelector('.sure'))).to.contain(`yes in ${fresh} of`);
  });
});
