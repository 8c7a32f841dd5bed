// Each Monte Carlo percentile's own precision on screen and on paper: the uncertainty cell and
// the printed sheet show the median and the 95% interval rounded to the place of each
// percentile's own standard uncertainty, the mean and the SD to their standard errors', and say in
// words each one's interval from order statistics and the SD's standard error (engine:
// test/engine/uncertainty-percentiles.test.ts, test/engine/mc-digits.test.ts).
import { expect } from 'chai';
import '../../components/cells/registry.ts';
import '../../components/sheet/study-sheet.ts';
import type { StudySheet } from '../../components/sheet/study-sheet.ts';
import { runStudy, type Cell, type Report, type Study, type UncertaintyResult, type ReportQuantity } from '../../src/index.ts';
import pumps from '../../examples/flush-pump-settings.ratebook.json';

/** Newton cooling from 70 degC toward 20 degC with k log-normal; the time to 40 degC (invented numbers). */
function cooling(samples: number): Study {
  return {
    format: 'ratebook-study', version: 1, title: 'cooling (invented numbers)', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.8 / h', spread: { distribution: 'lognormal', cv: 0.2 } }, { name: 'Ta', value: '20 degC' }] },
      { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '70 degC' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '6 h', find: [{ name: 't_40', crossing: 'T', level: '40 degC', direction: 'down' }] },
      { id: 'how', kind: 'uncertainty', of: ['t_40'], samples, seed: 4 },
    ],
  } as Study;
}

const text = (el: Element | null | undefined) => (el?.textContent ?? '').replace(/\s+/g, ' ').trim();

/** The percentile as the test expects it shown: its value rounded to the place of u's first digit, with that many decimals, and its unit. */
function expected(q: ReportQuantity, u: ReportQuantity): string {
  const place = 10 ** Math.floor(Math.log10(u.value) + 1e-12);
  const decimals = Math.max(0, -Math.round(Math.log10(place)));
  return `${(Math.round(q.value / place) * place).toFixed(decimals)} ${q.unit}`;
}

function run(doc: Study): Report {
  const r = runStudy(doc);
  if (!r.ok) throw new Error(r.error.message);
  return r.report;
}

const resultOf = (report: Report, cellId: string, name: string) =>
  (report.cells.find((c) => c.id === cellId) as unknown as { results: Record<string, UncertaintyResult> }).results[name];

describe('the uncertainty cell: percentiles to their own precision', () => {
  type CellEl = HTMLElement & { cell: Cell; report?: unknown; study?: Report; doc?: unknown; updateComplete: Promise<unknown> };
  let el: CellEl;
  async function mount(doc: Study) {
    const report = run(doc);
    el = document.createElement('uncertainty-cell') as CellEl;
    el.cell = doc.cells.find((c) => c.id === 'how')!;
    el.report = report.cells.find((c) => c.id === 'how');
    el.study = report;
    el.doc = doc;
    document.body.append(el);
    await el.updateComplete;
    return resultOf(report, 'how', 't_40');
  }
  afterEach(() => el?.remove());

  it('shows the median and the 95% interval each rounded to its own uncertainty, and says why in words', async () => {
    const x = await mount(cooling(2000));
    const pc = x.percentiles!;
    for (const key of ['p025', 'median', 'p975'] as const) expect(pc[key].shown, key).to.equal(expected(x[key]!, pc[key].u!));
    const row = el.shadowRoot!.querySelector('table.results tbody tr')!;
    expect(text(row.querySelector('[data-label="median"]'))).to.equal(pc.median.shown);
    expect(text(row.querySelector('[data-label="95% interval"]'))).to.equal(`${pc.p025.shown} to ${pc.p975.shown}`);
    const words = text(el.shadowRoot!.querySelector('p.precision.percentiles'));
    expect(words).to.match(/^t_40: Percentiles, each to the place of its own Monte Carlo uncertainty/);
    for (const [key, label] of [['p025', '2.5 percentile'], ['median', 'median'], ['p975', '97.5 percentile']] as const) {
      expect(words).to.contain(`${label} ${pc[key].shown.replace(/ (h|min)$/, '')} ± `);
    }
    expect(words).to.match(/SD [\d.]+ ± [\d.]+ (h|min), to the place of its Monte Carlo standard error's first digit \(.*the samples' kurtosis κ [\d.]+\)\.$/);
    // the mean's line is still there, before it
    expect(text(el.shadowRoot!.querySelector('p.precision'))).to.match(/^t_40: Mean [\d.]+ ± [\d.]+ (h|min) \(Monte Carlo standard error, SD\/√n\), shown to [\d.]+ (h|min),/);
  });

  it('shows the mean and the SD each to the place of its own standard error\'s first digit, as the words say', async () => {
    const x = await mount(cooling(2000));
    const f = x.shownFigures!;
    const row = el.shadowRoot!.querySelector('table.results tbody tr')!;
    expect(text(row.querySelector('[data-label="mean"]'))).to.equal(f.mean);
    expect(text(row.querySelector('[data-label="SD"]'))).to.equal(f.sd);
    expect(text(row.querySelector('td.mcse'))).to.equal(`± ${f.meanSE}`);
    // the mean's digits: those of its standard error's first digit (the SE of the mean SD/√n, about 0.0045 h here)
    const decimals = (t: string) => (t.split(' ')[0].split('.')[1] ?? '').length;
    const place = (v: number) => Math.max(0, -Math.floor(Math.log10(v) + 1e-12));
    expect(decimals(f.mean)).to.equal(place(x.meanSE!.value));
    expect(decimals(f.sd)).to.equal(place(x.sdSE!.value));
    const words = text(el.shadowRoot!.querySelector('p.precision'));
    const shownTo = /shown to ([\d.]+) /.exec(words)![1];
    expect(decimals(shownTo), words).to.equal(decimals(f.mean));
    expect(words).to.contain(`Mean ${f.mean.split(' ')[0]} ± ${f.meanSE}`);
  });

  it('with too few samples for an interval, says so on the cell and shows the percentile to 4 figures', async () => {
    const x = await mount(cooling(100));
    expect(x.percentiles!.p025.ci95).to.equal(undefined);
    const words = text(el.shadowRoot!.querySelector('p.precision.percentiles'));
    expect(words).to.match(/2\.5 percentile [\d.]+ h \(fewer than 146 samples: no interval from order statistics\)/);
    const row = el.shadowRoot!.querySelector('table.results tbody tr')!;
    expect(text(row.querySelector('[data-label="95% interval"]'))).to.match(new RegExp(`^${Number(x.p025!.value.toPrecision(4))} h to `));
  });
});

describe('the printed sheet: percentiles to their own precision', () => {
  let sheet: StudySheet;
  afterEach(() => sheet?.remove());

  it('the pump-settings template (invented numbers): the result table and the words on paper', async () => {
    const doc = structuredClone(pumps) as unknown as Study;
    const report = run(doc);
    sheet = document.createElement('study-sheet');
    sheet.study = doc;
    sheet.report = report;
    document.body.append(sheet);
    await sheet.updateComplete;
    const how = doc.cells.find((c) => c.kind === 'uncertainty')!;
    const name = (how as Extract<Cell, { kind: 'uncertainty' }>).of[0];
    const x = resultOf(report, how.id, name);
    const pc = x.percentiles!;
    expect(pc.median.shown).to.equal(expected(x.median!, pc.median.u!));
    const table = sheet.shadowRoot!.querySelector('table.how-sure')!;
    const row = [...table.querySelectorAll('tbody tr')].find((tr) => text(tr.querySelector('td.name')) === name)!;
    expect(text(row)).to.contain(`${pc.p025.shown} to ${pc.p975.shown}`);
    expect(text(row)).to.contain(pc.median.shown);
    const words = [...sheet.shadowRoot!.querySelectorAll('p.check.percentiles')].map(text).find((t) => t.startsWith(`${name}:`))!;
    expect(words).to.contain(`median ${pc.median.shown.replace(/ min$/, '')} ± `);
    expect(words).to.contain('95% interval for the percentile itself, from order statistics');
    expect(words).to.contain(`SD ${x.shownFigures!.sd.replace(/ min$/, '')} ± ${x.shownFigures!.sdSE}, to the place of its Monte Carlo standard error's first digit`);
    // the mean and the SD as shown on screen, the mean's Monte Carlo error by the same rule
    expect([...row.querySelectorAll('td')].slice(1, 4).map(text)).to.deep.equal([x.shownFigures!.mean, `± ${x.shownFigures!.meanSE}`, x.shownFigures!.sd]);
  });
});
