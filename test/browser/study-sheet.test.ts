// The printed sheet: a static document from the study and the engine's report (the real
// engine, run in the page): header, typeset laws, tables, SVG charts and found results, with
// no controls. And the study view's two ways to it: the sheet mode and the browser's print.
import { expect } from 'chai';
import { StudyView } from '../../components/study-view.ts';
import '../../components/sheet/study-sheet.ts';
import '../../components/plots/phase-plot.ts';
import { openStudy, formatNumber, type Study, type Report } from '../../src/index.ts';
import cooling from '../../examples/cooling-stock-pot.ratebook.json';
import fold from '../../examples/harvested-stock-fold.ratebook.json';
import plasma from '../../examples/plasma-levels.ratebook.json';
import twoStage from '../../examples/two-stage-cooling-check.ratebook.json';
import bolus from '../../examples/iv-bolus-repeated.ratebook.json';
import coolingDesign from '../../examples/cooling-design.ratebook.json';
import pumps from '../../examples/flush-pump-settings.ratebook.json';

/**
 * Invented laws with closed-form phase lines: (S - 500 kg)^2 is semi-stable at 500 kg, drawing
 * the state in from below; -(D - 500 kg)^2 from above; `still` is zero from 1 m to 2 m (falling
 * below, rising above); `gap` is not defined below 1 m (a square root of a negative number).
 */
const phaseLines = {
  format: 'ratebook-study', version: 1, title: 'phase lines',
  cells: [
    { id: 'up', kind: 'rate', state: 'S', unit: 'kg', rate: '(S - 500 kg)^2 / (1000 kg * d)', initial: '1 kg' },
    { id: 'from-below', kind: 'phase', rate: 'up', from: '0 kg', to: '1000 kg' },
    { id: 'down', kind: 'rate', state: 'D', unit: 'kg', rate: '-(D - 500 kg)^2 / (1000 kg * d)', initial: '1 kg' },
    { id: 'from-above', kind: 'phase', rate: 'down', from: '0 kg', to: '1000 kg' },
    { id: 'flat', kind: 'rate', state: 'y', unit: 'm', rate: 'max(y - 2 m, 0 m) / (1 s) - max(1 m - y, 0 m) / (1 s)', initial: '1 m' },
    { id: 'still', kind: 'phase', rate: 'flat', from: '0 m', to: '3 m' },
    { id: 'root', kind: 'rate', state: 'z', unit: 'm', rate: '-sqrt(z * 1 m - 1 m^2) / (1 s)', initial: '2 m' },
    { id: 'gap', kind: 'phase', rate: 'root', from: '0 m', to: '3 m' },
  ],
};

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
  afterEach(() => document.querySelectorAll('study-sheet, study-view, .plot-box').forEach((v) => v.remove()));

  it('has a header with title, author, revision and date, and the caution', async () => {
    const root = await sheetOf({ ...cooling, author: 'R. Sample' }, { revision: 7, updated: Date.UTC(2026, 0, 5) });
    const header = root.querySelector('header.doc')!.textContent!;
    expect(header).to.contain(cooling.title);
    expect(header).to.contain('Prepared by: R. Sample');
    expect(header).to.contain('Revision 7');
    expect(header).to.match(/Saved .*2026/);
    expect(root.querySelector('.caution')!.textContent).to.contain('food code');
  });

  it('writes a solve cell\'s answer with the varied name as it is spelled (k is not K)', async () => {
    const root = await sheetOf(coolingDesign);
    const solve = reportOf(coolingDesign).cells.find((c) => c.id === 'k-needed')!;
    const said = [...root.querySelectorAll('p.check')].map((p) => p.textContent!.replace(/\s+/g, ' ').trim());
    expect(said).to.include(`In short: ${solve.message}; ${solve.evaluations} runs.`);
    expect(String(solve.message)).to.match(/^k = /);
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

  it('says how far the run is from the exact solution to 2 digits, as the run\'s cell does', async () => {
    const root = await sheetOf(cooling);
    const run = reportOf(cooling).cells.find((c) => c.id === 'run')!;
    const cf = Object.values(run.closedForm as Record<string, { maxError: { value: number; unit: string } }>)[0];
    const check = [...root.querySelectorAll('p.check')].map((p) => p.textContent!).find((t) => /exact solution/i.test(t));
    expect(check, 'the check under the run').to.exist;
    expect(check).to.contain(`by at most ${formatNumber(cf.maxError.value, 2)} ${cf.maxError.unit}.`);
  });

  it('typesets the TeX the report carries, and makes none itself', async () => {
    const report = reportOf(cooling);
    const rate = report.cells.find((c) => c.kind === 'rate')!;
    expect(rate.tex, 'the engine made the law\'s TeX').to.be.a('string');
    rate.tex = 'q_{\\mathrm{from\\,report}} = 1';
    const el = document.createElement('study-sheet');
    el.study = structuredClone(cooling) as Study;
    el.report = report;
    document.body.append(el);
    await el.updateComplete;
    const eq = el.shadowRoot!.querySelector('.equation math')!;
    expect(eq.textContent).to.contain('report');
    delete rate.tex;
    el.report = { ...report };
    await el.updateComplete;
    expect(el.shadowRoot!.querySelector('.equation math'), 'no TeX in the report: the law as text').to.equal(null);
    expect(el.shadowRoot!.querySelector('.equation code')!.textContent).to.contain(`d${(cooling.cells.find((c) => c.kind === 'rate') as { state: string }).state}/dt`);
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

  it('lists at a glance exactly the glance list of the engine, in its order, also when the study chooses', async () => {
    const chosen = structuredClone(cooling) as Study;
    const run = chosen.cells.find((c) => c.kind === 'simulate') as Extract<Study['cells'][number], { kind: 'simulate' }>;
    run.find![run.find!.length - 1].glance = true;
    for (const doc of [plasma, twoStage, cooling, chosen]) {
      const root = await sheetOf(doc);
      const names = [...root.querySelectorAll('section.glance td.name')].map((td) => td.textContent);
      const engine = reportOf(doc).glance!;
      expect(engine.length, doc.title).to.be.greaterThan(0);
      expect(names, doc.title).to.deep.equal(engine.map((g) => g.name));
      root.host.remove();
    }
    const one = reportOf(chosen).glance!;
    expect(one.map((g) => g.name), 'only the chosen answer').to.deep.equal([run.find![run.find!.length - 1].name]);
  });

  it('says in words why a result chosen for the glance has no value', async () => {
    const doc = { format: 'ratebook-study', version: 1, title: 'waits', cells: [
      { id: 'a', kind: 'parameters', title: 'Inputs', items: [{ name: 'k', value: 'zz / h' }] },
      { id: 'b', kind: 'parameters', items: [{ name: 'k2', value: '2 * k', glance: true }] },
    ] };
    const root = await sheetOf(doc);
    const row = [...root.querySelectorAll('section.glance tbody tr td')].map((td) => td.textContent!.trim());
    expect(row.slice(0, 2)).to.deep.equal(['k2', 'not computed: waits on Parameters "Inputs"']);
    // the failed cells say their problems in words, the wait once, with its reason
    const text = root.textContent!.replace(/\s+/g, ' ');
    expect(text).to.contain('Error in parameter "k", value: unknown name "zz"');
    expect(text).to.contain('Not computed: it waits on Parameters "Inputs": parameter "k", value: unknown name "zz".');
    expect(text).to.not.match(/cells\[\d+\]/);
  });

  it('prints notes for an inspector in words, and not the engine\'s notes on how names are read', async () => {
    // invented numbers: a tank level h read in its law, where h hides the hour (an engine-only note)
    const doc = { format: 'ratebook-study', version: 1, title: 'tank', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.2 m^0.5 / min' }] },
      { id: 'tank', kind: 'rate', state: 'h', unit: 'm', rate: '-k * sqrt(h)', initial: '2 m' },
    ] };
    expect(reportOf(doc).warnings.join(' ')).to.match(/hides the unit h/);
    const root = await sheetOf(doc);
    expect(root.textContent).to.not.match(/Engine notes|hides the unit|cells\[/);
  });

  it('a fit with no degrees of freedom says why it has no residual SD, and keeps its warning', async () => {
    // invented numbers: two readings, two estimates
    const doc = { format: 'ratebook-study', version: 1, title: 'two points', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }] },
      { id: 'cool', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - 20 degC)', initial: '80 degC' },
      { id: 'logger', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'T', unit: 'degC' }], rows: [[0, 80], [1, 56]] },
      { id: 'fit', kind: 'fit', rates: ['cool'], data: 'logger', time: 't', observe: { T: 'T' }, estimate: [{ parameter: 'k', as: 'k_fit', guess: '0.3 / h' }, { parameter: 'T', as: 'T0_fit', guess: '75 degC' }] },
    ] };
    const root = await sheetOf(doc);
    const text = root.querySelector('section.fit')!.textContent!.replace(/\s+/g, ' ');
    // hand-worked: 2 points - 2 estimates = 0 degrees of freedom
    expect(text).to.contain('0 degrees of freedom, residual SD not available: 2 points for 2 estimates leave no degrees of freedom to estimate it from,');
    expect(text).to.contain('Note: As many data points as parameters');
    expect(text).to.not.match(/residual SD ,/);
  });

  it('shows verdicts as yes or no, first among the results at a glance', async () => {
    const root = await sheetOf(twoStage);
    const rows = [...root.querySelectorAll('section.glance tbody tr')].map((tr) => [...tr.querySelectorAll('td')].map((td) => td.textContent!.trim()));
    expect(rows[0].slice(0, 2)).to.deep.equal(['stage1_ok', 'yes']);
    expect(rows.find((r) => r[0] === 'passes')?.[1]).to.equal('yes');
  });

  it('names a compare cell\'s run by its title, and its chart\'s axis by the state, not the scenarios', async () => {
    const root = await sheetOf(pumps);
    const run = pumps.cells.find((c) => c.kind === 'simulate')!;
    const compare = pumps.cells.find((c) => c.kind === 'compare')!;
    const section = root.querySelector(`section.cell[data-cell="${compare.id}"]`) ?? [...root.querySelectorAll('section.cell')].find((s) => s.textContent!.includes('under 3 scenarios'))!;
    expect(section.textContent).to.include(`The run ${run.title} under 3 scenarios`);
    const axisTexts = [...section.querySelectorAll('figure svg text')].map((t) => t.textContent);
    expect(axisTexts).to.include('c (mg / L)');
    expect(axisTexts.some((t) => /low, mid/.test(t ?? ''))).to.equal(false);
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
    const paths = [...root.querySelectorAll('section.phase figure:last-of-type svg path[d]:not(.fold)')].filter((p) => p.getAttribute('d'));
    expect(paths.some((p) => p.getAttribute('stroke-dasharray') === 'none'), 'attractors drawn solid').to.equal(true);
    expect(paths.some((p) => p.getAttribute('stroke-dasharray') !== 'none'), 'repellers drawn dashed').to.equal(true);
  });

  it('marks the sweep\'s fold as a point where its two branches end, with a legend entry saying what it is, and draws no line for it', async () => {
    const root = await sheetOf(fold);
    const chart = root.querySelector('section.phase h3 + figure svg')!;
    const legend = [...chart.querySelectorAll('g[transform] text')].map((t) => t.textContent);
    expect(legend).to.deep.equal(['stable (attractor)', 'unstable', 'fold: two equilibria meet and vanish']);
    // the harvested logistic r N (1 - N/K) - H folds at H = r K / 4, N = K / 2 (closed form): 125 tonne / year at 500 tonne for r = 0.5 / year, K = 1000 tonne
    expect([...chart.querySelectorAll('g.labels text')].map((t) => t.textContent)).to.include('fold: H = 125 tonne / year');
    const marks = [...chart.querySelectorAll(':scope > path.fold')];
    expect(marks).to.have.length(1);
    const [, cx, cy] = /^M([\d.]+) ([\d.]+)/.exec(marks[0].getAttribute('d')!)!.map(Number);
    const d = Number(/L([\d.]+)/.exec(marks[0].getAttribute('d')!)![1]) - cx;
    const centre = [cx, cy + d];
    // the stable and the unstable branch both end at the mark
    const ends = [...chart.querySelectorAll(':scope > path:not(.fold):not(.band)')].map((p) => p.getAttribute('d')!).filter((x) => x)
      .map((x) => { const pts = [...x.matchAll(/[ML](-?[\d.]+),(-?[\d.]+)/g)].map((m) => [Number(m[1]), Number(m[2])]); return [pts[0], pts[pts.length - 1]]; });
    const near = (p: number[]) => Math.hypot(p[0] - centre[0], p[1] - centre[1]) < 1;
    expect(ends.filter((e) => e.some(near))).to.have.length(2);
  });

  it('spans the sweep chart\'s x axis over the swept range, 0 to 200 tonne / year, as the app\'s sweep plot does, not to where the branches end', async () => {
    const root = await sheetOf(fold);
    const chart = root.querySelector('section.phase h3 + figure svg')!;
    // the tick labels under the plot, then the axis's name
    const under = [...chart.querySelectorAll('text[text-anchor="middle"]:not([transform])')].map((t) => t.textContent!.trim());
    expect(under.at(-1)).to.equal('H (tonne / year)');
    expect(under[0]).to.equal('0');
    expect(under.at(-2)).to.equal('200');
    // the fold at H = r K / 4 = 125 tonne / year (closed form of the harvested logistic, r = 0.5 / year, K = 1000 tonne) sits 125/200 of the way across the plot
    const plot = chart.querySelector('rect[fill="none"]')!;
    const [x0, w] = [Number(plot.getAttribute('x')), Number(plot.getAttribute('width'))];
    const mark = chart.querySelector(':scope > path.fold')!;
    const [, cx] = /^M([\d.]+) /.exec(mark.getAttribute('d')!)!.map(Number);
    expect((cx - x0) / w).to.be.closeTo(125 / 200, 0.02);
  });

  it('puts the sweep\'s fold label beside its diamond, in the room right of the fold, not at the end of a leader', async () => {
    const root = await sheetOf(fold);
    const chart = root.querySelector<SVGSVGElement>('section.phase h3 + figure svg')!;
    const mark = chart.querySelector(':scope > path.fold')!;
    const [, cx, top] = /^M([\d.]+) ([\d.]+)/.exec(mark.getAttribute('d')!)!.map(Number);
    const d = Number(/L([\d.]+)/.exec(mark.getAttribute('d')!)![1]) - cx;
    const cy = top + d;
    const label = [...chart.querySelectorAll<SVGTextElement>('g.labels text')].find((t) => t.textContent!.startsWith('fold:'))!;
    const b = label.getBBox();
    // the gap from the diamond's centre to the nearest point of the label's box
    const gap = Math.hypot(Math.max(b.x - cx, 0, cx - b.x - b.width), Math.max(b.y - cy, 0, cy - b.y - b.height));
    // beside it: the placement's gap of 6 units each way (8.5 on the diagonal) and the text inside its box, well under
    // the 14 past which a leader is drawn (common practice: a label reads as its point's when it sits beside it)
    expect(gap, `the fold label's box ${Math.round(gap)} units from the diamond`).to.be.at.most(12);
    expect(chart.querySelectorAll('g[stroke="#777"] line'), 'no leader').to.have.length(0);
  });

  it('fills a semi-stable point on the side the engine reports, the same side the screen fills', async () => {
    const root = await sheetOf(phaseLines);
    const report = reportOf(phaseLines);
    for (const [id, side] of [['from-below', 'below'], ['from-above', 'above']] as const) {
      const cell = report.cells.find((c) => c.id === id)!;
      const [eq] = cell.equilibria as Array<{ value: number; stability: string; attractsFrom?: string }>;
      // closed form: ±(S - 500 kg)^2 has one sign on both sides of 500 kg
      expect(eq.stability).to.equal('semi-stable');
      expect(eq.attractsFrom, id).to.equal(side);
      // the sheet: the filled half lies on the left of the dot for below, on the right for above
      const svgLine = root.querySelectorAll('section.phase')[id === 'from-below' ? 0 : 1].querySelector('figure svg')!;
      const dot = svgLine.querySelector<SVGCircleElement>('circle.semi-stable')!;
      const half = svgLine.querySelector<SVGPathElement>('path.half')!;
      const cx = dot.cx.baseVal.value;
      const box = half.getBBox();
      const printed = box.x + box.width <= cx + 0.01 ? 'below' : box.x >= cx - 0.01 ? 'above' : 'both';
      expect(printed, `${id}: the printed half`).to.equal(side);
      // the screen: the same cell on <phase-plot>, the pixels just left and right of the dot's centre
      const plot = Object.assign(document.createElement('phase-plot'), {
        plot: cell.plot, equilibria: cell.equilibria, intervals: cell.intervals, poles: [], summary: cell.summary as string, state: 'S',
      });
      const box2 = document.createElement('div');
      box2.style.width = '500px';
      box2.className = 'plot-box';
      box2.append(plot);
      document.body.append(box2);
      await plot.updateComplete;
      await new Promise((r) => requestAnimationFrame(() => setTimeout(r, 0)));
      const u = plot.charts[0];
      const canvas = u.ctx.canvas;
      const ratio = canvas.width / u.width;
      // canvas pixels of the dot's centre (uPlot's canvas positions include the plot's offset)
      const x = u.valToPos(eq.value, 'x', true);
      const y = u.valToPos(0, 'y', true) - 1.5 * ratio;
      const at = (dx: number) => [...canvas.getContext('2d')!.getImageData(Math.round(x + dx * ratio), Math.round(y), 1, 1).data].slice(0, 3);
      const white = [255, 255, 255];
      const screen = JSON.stringify(at(-2.5)) !== JSON.stringify(white) && JSON.stringify(at(2.5)) === JSON.stringify(white) ? 'below'
        : JSON.stringify(at(2.5)) !== JSON.stringify(white) && JSON.stringify(at(-2.5)) === JSON.stringify(white) ? 'above' : 'neither';
      expect(screen, `${id}: the screen's half`).to.equal(printed);
      box2.remove();
    }
  });

  it('draws no arrow where the state stays still or the rate is not defined', async () => {
    const root = await sheetOf(phaseLines);
    const report = reportOf(phaseLines);
    const signs = (id: string) => (report.cells.find((c) => c.id === id)!.intervals as Array<{ sign: string }>).map((iv) => iv.sign);
    // closed form: max(y - 2, 0) - max(1 - y, 0) is negative below 1, zero on [1, 2], positive above 2
    expect(signs('still')).to.deep.equal(['-', '0', '+']);
    // closed form: -sqrt(z - 1) is not defined below 1 and negative above
    expect(signs('gap')).to.deep.equal(['none', '-']);
    const lines = [...root.querySelectorAll('section.phase')].slice(2).map((s) => s.querySelector('figure svg')!);
    const arrows = (svg: Element) => [...svg.querySelectorAll('path.arrow')].map((p) => p.getAttribute('class'));
    expect(arrows(lines[0])).to.deep.equal(['arrow falling', 'arrow rising']);
    expect(lines[0].querySelectorAll('line.still').length, 'the still stretch').to.equal(1);
    expect(arrows(lines[1])).to.deep.equal(['arrow falling']);
    expect(lines[1].querySelectorAll('line.undefined').length, 'the undefined stretch').to.equal(1);
  });

  it('prints each event\'s repeats as the engine words them: to the end of the run when there is no count', async () => {
    const open = structuredClone(bolus) as Study;
    const run = open.cells.find((c) => c.id === 'run') as Extract<Study['cells'][number], { kind: 'simulate' }>;
    delete run.events![0].count;
    const cell = reportOf(open).cells.find((c) => c.id === 'run')!;
    // hand-worked: doses every 8 h at 0, 8, ..., 48 h in a 48 h run: 7
    expect(cell.schedule).to.deep.equal([{ times: 7, repeats: 'every 8 h until the end of the run (7 times)' }]);
    const root = await sheetOf(open);
    const row = [...root.querySelectorAll('section.simulate tbody tr')].map((tr) => tr.textContent!).find((t) => t.includes('dose / V'))!;
    expect(row).to.contain('every 8 h until the end of the run (7 times)');
    expect(row).to.not.contain('1 times');
    root.host.remove();
    const counted = await sheetOf(bolus);
    expect(counted.querySelector('section.simulate tbody tr')!.textContent).to.contain('every 8 h, 6 times');
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
