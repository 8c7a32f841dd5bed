// Charts for every reader: each chart's data in a table behind a keyboard-reachable button, a
// log axis on time plots (a checkbox whose choice the simulate cell stores, one undo step),
// values a log axis cannot place left out of the drawing with a note, the sheet's charts named
// by the engine's summary, and controls named for what they act on. Every value checked is the
// engine's own report (runStudy), the outside reference here being the report itself: the
// chart must show those numbers, not others.
import { expect } from 'chai';
import { render, html } from 'lit';
import { sendKeys } from '@web/test-runner-commands';
import { runStudy, type SimulationPlot, type Study } from '../../src/index.ts';
import '../../components/plots/time-plot.ts';
import '../../components/plots/sweep-plot.ts';
import '../../components/cells/registry.ts';
import type { TimePlot } from '../../components/plots/time-plot.ts';
import { lineChart } from '../../components/sheet/svg-chart.ts';
import { StudyView } from '../../components/study-view.ts';
import { deep, until } from './helpers.ts';

/** Invented numbers: a stock filled at a constant rate and drained in proportion; it starts empty. */
const law = { id: 'fill', kind: 'rate', state: 'x', unit: 'mg', rate: '2 mg / h - 0.5 / h * x', initial: '0 mg' };
const run = { id: 'run', kind: 'simulate', rates: ['fill'], from: '0 h', to: '10 h', find: [{ name: 't1', crossing: 'x', level: '1 mg' }] };
const doc = (cells: unknown[]) => ({ format: 'ratebook-study', version: 1, title: 'fill', cells }) as unknown as Study;

function report(cells: unknown[], id = 'run') {
  const r = runStudy(doc(cells));
  if (!r.ok) throw new Error(r.error.message);
  const cell = r.report.cells.find((c) => c.id === id)!;
  if (!cell.ok) throw new Error(`cell ${id} failed`);
  return cell as unknown as { plot: SimulationPlot; summary: string; sweep?: unknown };
}

const frame = () => new Promise((r) => requestAnimationFrame(() => setTimeout(r, 0)));

async function plotOf(cell: { plot: SimulationPlot; summary: string }, extra: Partial<TimePlot> = {}): Promise<TimePlot> {
  const el = document.createElement('time-plot');
  Object.assign(el, { plot: cell.plot, summary: cell.summary, ...extra });
  const box = document.createElement('div');
  box.style.width = '700px';
  box.append(el);
  document.body.append(box);
  await el.updateComplete;
  await frame();
  return el;
}

/** The element focused inside shadow roots. */
function focused(): Element | null {
  let a: Element | null = document.activeElement;
  while (a?.shadowRoot?.activeElement) a = a.shadowRoot.activeElement;
  return a;
}

describe('chart data tables and the log axis', () => {
  afterEach(() => {
    document.querySelectorAll('time-plot, sweep-plot, study-view, svg').forEach((e) => (e.parentElement === document.body ? e.remove() : e.parentElement!.remove()));
  });

  it('a time plot\'s data table opens by keyboard and lists every plotted value', async () => {
    const cell = report([law, run]);
    const el = await plotOf(cell);
    const data = el.shadowRoot!.querySelector('chart-data')!;
    await data.updateComplete;
    const button = data.shadowRoot!.querySelector('button.data-toggle') as HTMLButtonElement;
    expect(button.getAttribute('aria-expanded')).to.equal('false');
    button.focus();
    await sendKeys({ press: 'Enter' });
    await data.updateComplete;
    expect(button.getAttribute('aria-expanded')).to.equal('true');
    const region = data.shadowRoot!.querySelector('[role="region"]') as HTMLElement;
    expect(region.hidden).to.equal(false);
    expect(region.tabIndex).to.equal(0);
    await sendKeys({ press: 'Tab' });
    expect(focused(), 'the scrolling region takes focus next').to.equal(region);
    const table = region.querySelector('table')!;
    expect([...table.querySelectorAll('thead th')].map((th) => th.textContent)).to.deep.equal(['time (h)', 'x (mg)']);
    expect([...table.querySelectorAll('th')].every((th) => th.getAttribute('scope') === 'col')).to.equal(true);
    const rows = [...table.querySelectorAll('tbody tr')];
    expect(rows.length).to.equal(cell.plot.t.length);
    rows.forEach((tr, i) => {
      const [t, x] = [...tr.querySelectorAll('td')].map((td) => Number(td.textContent));
      expect(t).to.be.closeTo(cell.plot.t[i], 1e-5 * Math.max(1, cell.plot.t[i]));
      expect(x).to.be.closeTo(cell.plot.states[0].values[i], 1e-5 * Math.max(1, Math.abs(cell.plot.states[0].values[i])));
    });
    // the found point has its row
    const found = [...region.querySelectorAll('table')].find((t) => t.querySelector('caption')!.textContent === 'Points the run found')!;
    expect(found.querySelector('tbody td')!.textContent).to.equal('t1');
  });

  it('the log checkbox asks the host by keyboard and shows the host\'s choice, never its own', async () => {
    const el = await plotOf(report([law, run]), { scaleToggle: true });
    const box = el.shadowRoot!.querySelector('input.log-toggle') as HTMLInputElement;
    expect(box.dataset.field).to.equal('plotScale');
    expect(box.checked).to.equal(false);
    const asked: string[] = [];
    el.addEventListener('plot-scale', (e) => asked.push((e as CustomEvent).detail.scale));
    box.focus();
    await sendKeys({ press: 'Space' });
    expect(asked).to.deep.equal(['log']);
    expect(box.checked, 'unchanged until the host stores the choice').to.equal(false);
    expect(el.charts[0].scales.y0.distr).to.equal(1);
  });

  it('on a log axis, a value at or below zero is left out of the drawing and the plot says so; the data stay', async () => {
    const cell = report([law, run]);
    const before = JSON.stringify(cell.plot);
    const el = await plotOf(cell, { scale: 'log' });
    const u = el.charts[0];
    expect(u.scales.y0.distr).to.equal(3);
    // hand-worked: x(0) = 0 mg exactly (the initial value), every later value 4(1 - e^(-t/2)) > 0
    expect(cell.plot.states[0].values[0]).to.equal(0);
    expect(u.data[1][0]).to.equal(null);
    expect(u.data[1].slice(1).every((v) => v != null && v > 0)).to.equal(true);
    const note = el.shadowRoot!.querySelector('.log-note')!.textContent!;
    expect(note).to.contain(`x at or below zero, not drawn on the log axis: 1 of its ${cell.plot.t.length} plotted values`);
    expect(JSON.stringify(cell.plot), 'the report\'s plot is untouched').to.equal(before);
    el.scale = 'linear';
    await el.updateComplete;
    await frame();
    expect(el.shadowRoot!.querySelector('.log-note')).to.equal(null);
    expect(el.charts[0].data[1][0]).to.equal(0);
  });

  it('a state that never rises above zero: nothing of it drawn on a log axis, and the plot says so', async () => {
    // hand-worked: x' = -0.5/h * x from 0 mg stays exactly 0 mg
    const still = { ...law, rate: '-0.5 / h * x' };
    const cell = report([still, { ...run, find: [] }]);
    const el = await plotOf(cell, { scale: 'log' });
    expect([...el.charts[0].data[1]].every((v) => v === null)).to.equal(true);
    expect(el.shadowRoot!.querySelector('.log-note')!.textContent).to.contain(`${cell.plot.t.length} of its ${cell.plot.t.length} plotted values (none of its curve can be drawn)`);
  });

  it('the simulate cell stores the choice as plotScale through an ordinary edit, and the study undoes it', async () => {
    const view = StudyView.create();
    document.body.append(view);
    const answered = new Promise<void>((resolve) => { const off = view.controller.onAnswer(() => { off(); resolve(); }); });
    view.controller.open('log-test', doc([law, run]));
    await answered;
    const plot = await until(() => deep(view.shadowRoot!, 'time-plot')[0] as TimePlot | undefined, 'the time plot', 8000);
    await plot.updateComplete;
    const box = plot.shadowRoot!.querySelector('input.log-toggle') as HTMLInputElement;
    box.focus();
    await sendKeys({ press: 'Space' });
    const cellOf = () => view.controller.study!.cells.find((c) => c.id === 'run') as { plotScale?: string };
    expect(cellOf().plotScale).to.equal('log');
    await until(() => (deep(view.shadowRoot!, 'time-plot')[0] as TimePlot).scale === 'log', 'the plot drawn on a log axis', 8000);
    view.controller.undo();
    expect('plotScale' in cellOf(), 'undo takes the field away again').to.equal(false);
    view.controller.redo();
    expect(cellOf().plotScale).to.equal('log');
  });

  it('a sweep plot lists every equilibrium of the engine\'s branches in its table', async () => {
    const fish = { id: 'fish', kind: 'rate', state: 'N', unit: 'kg', rate: '0.5 / d * N * (1 - N / (1000 kg)) - H', initial: '800 kg' };
    const p = { id: 'p', kind: 'parameters', items: [{ name: 'H', value: '50 kg / d' }] };
    const phase = { id: 'ph', kind: 'phase', rate: 'fish', from: '0 kg', to: '1200 kg', sweep: { name: 'H', from: '0 kg / d', to: '200 kg / d', steps: 21 } };
    const cell = report([p, fish, phase], 'ph') as unknown as { sweep: { branches: Array<Array<{ value: { value: number } }>> } };
    const el = document.createElement('sweep-plot');
    Object.assign(el, { sweep: cell.sweep, state: 'N' });
    document.body.append(el);
    await el.updateComplete;
    const data = el.shadowRoot!.querySelector('chart-data')!;
    await data.updateComplete;
    (data.shadowRoot!.querySelector('button.data-toggle') as HTMLButtonElement).click();
    await data.updateComplete;
    const rows = [...data.shadowRoot!.querySelectorAll('table')[0].querySelectorAll('tbody tr')];
    expect(rows.length).to.equal(cell.sweep.branches.reduce((n, b) => n + b.length, 0));
    const values = rows.map((r) => Number(r.querySelectorAll('td')[2].textContent));
    const expected = cell.sweep.branches.flat().map((pt) => pt.value.value);
    values.forEach((v, i) => expect(v).to.be.closeTo(expected[i], 1e-5 * Math.max(1, Math.abs(expected[i]))));
  });

  it('a sheet chart is an image named by its summary, and on a log axis draws only what it can place', () => {
    const host = document.createElement('div');
    document.body.append(host);
    render(html`${lineChart({ label: 'x rises from 0 mg to 4 mg', xLabel: 'time (h)', yLabels: ['x (mg)'], logY: true, lines: [{ label: 'x', x: [0, 1, 2, 3], y: [0, 1, 2, 3] }] })}`, host);
    const svg = host.querySelector('svg')!;
    expect(svg.getAttribute('role')).to.equal('img');
    expect(svg.getAttribute('aria-label')).to.equal('x rises from 0 mg to 4 mg');
    expect(svg.querySelector('title')!.textContent).to.equal('x rises from 0 mg to 4 mg');
    // the value 0 has no place: the path starts at the second point (M) and draws two segments (L)
    const d = svg.querySelector('path')!.getAttribute('d')!;
    expect(d.match(/M/g)!.length).to.equal(1);
    expect(d.match(/L/g)!.length).to.equal(2);
    host.remove();
  });

  it('a sheet chart on a log axis with nothing it can place still draws its frame, with finite ticks and no curve', () => {
    const host = document.createElement('div');
    document.body.append(host);
    render(html`${lineChart({ label: 'x stays at 0 mg', xLabel: 'time (h)', yLabels: ['x (mg)', 'y (mg)'], logY: true,
      lines: [{ label: 'x', x: [0, 1], y: [0, -1] }, { label: 'y', x: [0, 1], y: [0, 0], axis: 1 }] })}`, host);
    const svg = host.querySelector('svg')!;
    expect([...svg.querySelectorAll('path')].map((p) => p.getAttribute('d'))).to.deep.equal(['', '']);
    const labels = [...svg.querySelectorAll('text')].map((t) => t.textContent);
    expect(labels).to.include('1').and.to.include('10');
    host.remove();
  });

  it('the phase cell names its law menu and its steps box', async () => {
    const fish = { id: 'fish', kind: 'rate', state: 'N', unit: 'kg', rate: '0.5 / d * N * (1 - N / (1000 kg)) - 50 kg / d', initial: '800 kg' };
    const phase = { id: 'ph', kind: 'phase', rate: 'fish', from: '0 kg', to: '1200 kg', sweep: { name: 'H', from: '0 kg / d', to: '1 kg / d', steps: 5 } };
    const el = document.createElement('phase-cell') as HTMLElement & { cell: unknown; report: unknown; study: unknown; updateComplete: Promise<unknown> };
    const r = runStudy(doc([fish, phase]));
    if (!r.ok) throw new Error(r.error.message);
    Object.assign(el, { cell: phase, report: r.report.cells[1], study: r.report });
    document.body.append(el);
    await el.updateComplete;
    expect(el.shadowRoot!.querySelector('select')!.getAttribute('aria-label')).to.equal('Law of the phase line');
    expect(el.shadowRoot!.querySelector('input.count')!.getAttribute('aria-label')).to.equal('Steps of the sweep');
    el.remove();
  });
});
