// The printed sheet made while a Monte Carlo cell is still computing: its figures are the
// previous ones, and the sheet says so (a notice under the header with the progress, a line
// on each pending section, a mark on each of their results at a glance, the band of a run
// drawn from that cell); once it is done, no mark. First the sheet element with the report
// and pending cells given; then the study view with the real engine, printing mid-run.
import { expect } from 'chai';
import '../../components/sheet/study-sheet.ts';
import type { StudySheet } from '../../components/sheet/study-sheet.ts';
import { runStudy, type Study } from '../../src/index.ts';
import flush from '../../examples/flush-pump-settings.ratebook.json';
import { until } from './helpers.ts';
import { sheetOf, type SheetProgress } from './sheet-of.ts';
import { MC, mount, study as trough, type Live } from './monte-carlo-study.ts';

/** The pump-settings template (invented numbers) with a verdict read from its Monte Carlo cell, listed at a glance. */
function flushStudy(): Study {
  const doc = structuredClone(flush) as unknown as Study;
  doc.cells.push({ id: 'late', kind: 'parameters', title: 'Late flush?', items: [{ name: 'late', value: 't_limit_p975 > 40 min', glance: true }] } as Study['cells'][number]);
  return doc;
}

const text = (el: Element | null | undefined) => (el?.textContent ?? '').replace(/\s+/g, ' ').trim();

describe('the sheet of a study with a cell still computing', () => {
  let sheet: StudySheet;
  afterEach(() => sheet?.remove());

  async function render(pending: string[], progress?: SheetProgress) {
    sheet = (await sheetOf(flushStudy(), pending, progress)).sheet;
    const root = sheet.shadowRoot!;
    const sectionOf = (cls: string, n = 0) => root.querySelectorAll(`section.cell.${cls}`)[n];
    return { root, sectionOf };
  }

  it('marks the computing cell, the cell reading it, its result at a glance and the band it drew, with the progress', async () => {
    const { root, sectionOf } = await render(['flow-spread', 'late'], { cell: 'flow-spread', done: 1200, total: 2000, unit: 'samples' });
    const notice = root.querySelector('.pending-notice');
    expect(text(notice)).to.contain('Still computing when printed: How sure "How sure, with the flow drifting" (1,200 of 2,000 samples); Parameters "Late flush?".');
    expect(text(notice)).to.contain('Their figures on this sheet are from the previous inputs, not from the inputs printed here');
    // before the figures: under the header, above the results at a glance
    expect(notice!.compareDocumentPosition(root.querySelector('section.glance')!) & Node.DOCUMENT_POSITION_FOLLOWING).to.not.equal(0);
    const how = sectionOf('uncertainty');
    expect(how.classList.contains('pending')).to.equal(true);
    expect(text(how.querySelector('h2 + .pending-mark'))).to.equal('Still computing: 1,200 of 2,000 samples. The figures below are from the previous inputs, not from the inputs printed on this sheet.');
    const late = root.querySelector('section.cell.pending:not(.uncertainty)')!;
    expect(text(late.querySelector('.pending-mark'))).to.contain('Waits for How sure "How sure, with the flow drifting", still computing (1,200 of 2,000 samples).');
    expect(text(root.querySelector('section.glance .pending-glance'))).to.equal('(previous inputs: still computing)');
    // the run is current, its band is not
    const run = sectionOf('simulate');
    expect(run.classList.contains('pending')).to.equal(false);
    expect(run.querySelector('h2 + .pending-mark')).to.equal(null);
    expect(text(run.querySelector('.band-note .pending-mark'))).to.contain('This band is from the previous inputs');
  });

  it('no cell pending: no notice and no mark anywhere', async () => {
    const { root } = await render([]);
    expect(root.querySelector('.pending-notice, .pending-mark, .pending-glance, section.pending')).to.equal(null);
  });

  it('a first computation still under way says there are no figures yet', async () => {
    const doc = flushStudy();
    const r = runStudy(doc);
    if (!r.ok) throw new Error(r.error.message);
    sheet = document.createElement('study-sheet');
    sheet.study = doc;
    // the report the engine gives a pending cell never computed: no fields but its id, kind and title
    sheet.report = { ...r.report, cells: r.report.cells.map((c) => (c.id === 'flow-spread' ? { id: c.id, kind: c.kind, title: c.title, ok: true } as typeof c : c)) };
    sheet.pending = ['flow-spread'];
    sheet.progress = { cell: 'flow-spread', done: 10, total: 2000, unit: 'samples' };
    document.body.append(sheet);
    await sheet.updateComplete;
    const how = sheet.shadowRoot!.querySelector('section.uncertainty')!;
    expect(text(how.querySelector('.pending-mark'))).to.equal('Still computing: 10 of 2,000 samples. No figures yet.');
    // no empty table of results under it
    expect(how.querySelector('table')).to.equal(null);
  });
});

describe('printing from the study view while the Monte Carlo computes', () => {
  let live: Live;
  afterEach(() => { window.dispatchEvent(new Event('afterprint')); live?.view.remove(); });

  it('the sheet rendered for print marks the cell with its progress, and drops the mark once the result has come', async function () {
    this.timeout(120_000);
    // 10,000 samples: long enough to print mid-run on a loaded machine
    const doc = trough();
    doc.cells = doc.cells.map((c) => (c.id === MC ? { ...c, samples: 10_000 } : c));
    live = await mount(doc);
    const { view, pending } = live;
    await import('../../components/sheet/study-sheet.ts');
    // the first answer leaves the Monte Carlo pending (monte-carlo-live.test.ts)
    expect(pending()).to.equal(true);
    window.dispatchEvent(new Event('beforeprint'));
    await view.updateComplete;
    const sheetEl = view.shadowRoot!.querySelector('.for-print study-sheet') as StudySheet;
    await sheetEl.updateComplete;
    const notice = () => text(sheetEl.shadowRoot!.querySelector('.pending-notice'));
    expect(notice()).to.match(/^Still computing when printed: How sure "Across patients"/);
    // once samples are drawn, the sheet gives their count
    await until(() => /^Still computing when printed: How sure "Across patients" \(\d{1,3}(,\d{3})* of 10,000 samples\)/.test(notice()), 'the progress on the sheet', 60_000);
    expect(text(sheetEl.shadowRoot!.querySelector('section.uncertainty .pending-mark'))).to.match(/^Still computing: [\d,]+ of 10,000 samples\. No figures yet\./);
    await until(() => !pending(), 'the Monte Carlo result', 100_000);
    await view.updateComplete;
    await sheetEl.updateComplete;
    expect(sheetEl.shadowRoot!.querySelector('.pending-notice, .pending-mark')).to.equal(null);
  });
});
