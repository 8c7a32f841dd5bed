// The chart elements draw what the engine reports: each is given a real cell report, and the
// checks look at the chart's series and data, the labels laid over it, and its canvases.
import { expect } from 'chai';
import type { SimulationPlot } from '../../src/index.ts';
import '../../components/plots/time-plot.ts';
import '../../components/plots/phase-plot.ts';
import '../../components/plots/sweep-plot.ts';
import { PRINT_WIDTH } from '../../components/plots/chart-controller.ts';
import { runsOf } from '../../components/plots/sweep-runs.ts';
import { placeLabel, type Box, type Taken } from '../../components/plots/label-placement.ts';
import { tickLabels } from '../../components/plots/axes.ts';
import cooling from '../../examples/cooling-stock-pot.ratebook.json';
import bolus from '../../examples/iv-bolus-repeated.ratebook.json';
import radiometric from '../../examples/radiometric-age.ratebook.json';
import troughStudy from '../../examples/trough-in-range-probability.ratebook.json';
import { frame, mountInBox, reportedCell } from './helpers.ts';

/** Invented numbers: a harvested logistic stock, a pole, a transcritical exchange, a semi-stable point. */
const phaseStudy = {
  format: 'ratebook-study', version: 1, title: 'phase plots',
  cells: [
    { id: 'p', kind: 'parameters', items: [
      { name: 'r', value: '0.5 / d' }, { name: 'K', value: '1000 kg' }, { name: 'H', value: '50 kg / d' },
      { name: 'mu', value: '0.5 kg' }, { name: 'c', value: '1 / (kg * d)' },
    ] },
    { id: 'fish', kind: 'rate', state: 'N', unit: 'kg', rate: 'r * N * (1 - N / K) - H', initial: '800 kg' },
    { id: 'harvest', kind: 'phase', rate: 'fish', from: '0 kg', to: '1200 kg', sweep: { name: 'H', from: '0 kg / d', to: '200 kg / d', steps: 81 } },
    { id: 'wall', kind: 'rate', state: 'y', unit: 'm', rate: '1 m^2 / s / (y - 1 m)', initial: '3 m' },
    { id: 'pole', kind: 'phase', rate: 'wall', from: '0 m', to: '3 m' },
    { id: 'swap', kind: 'rate', state: 'M', unit: 'kg', rate: 'c * M * (mu - M)', initial: '1 kg' },
    { id: 'exchange', kind: 'phase', rate: 'swap', from: '-2 kg', to: '2 kg', sweep: { name: 'mu', from: '-1 kg', to: '1 kg', steps: 41 } },
    { id: 'touch', kind: 'rate', state: 'S', unit: 'kg', rate: 'r * (S - K / 2)^2 / K', initial: '1 kg' },
    { id: 'semi', kind: 'phase', rate: 'touch', from: '0 kg', to: '1000 kg' },
    { id: 'dip', kind: 'rate', state: 'Q', unit: 'kg', rate: '-r * (Q - K / 2)^2 / K', initial: '1 kg' },
    { id: 'semi-down', kind: 'phase', rate: 'dip', from: '0 kg', to: '1000 kg' },
  ],
};

const cellOf = reportedCell;

const simulation = (study: unknown) => cellOf(study, 'run') as { plot: SimulationPlot; summary: string };

/** Puts `el` in a box `width` pixels wide and waits until it has drawn. */
const mount = <T extends HTMLElement & { updateComplete: Promise<boolean> }>(el: T, width = 700) => mountInBox(el, width, 'plot-box');

const shadow = (el: HTMLElement) => el.shadowRoot!;
const texts = (el: HTMLElement, sel: string) => [...shadow(el).querySelectorAll(sel)].map((n) => (n.textContent ?? '').trim());

function expectVisibleCanvas(c: HTMLCanvasElement | null) {
  expect(c, 'a canvas').to.exist;
  expect(c!.width).to.be.greaterThan(0);
  expect(c!.height).to.be.greaterThan(0);
  const box = c!.getBoundingClientRect();
  expect(box.width).to.be.greaterThan(0);
  expect(box.height).to.be.greaterThan(0);
}

/** RGBA of one CSS pixel of a canvas (canvas coordinates scaled by its pixel ratio). */
function pixel(c: HTMLCanvasElement, cssX: number, cssY: number): number[] {
  const r = c.width / c.getBoundingClientRect().width;
  return [...c.getContext('2d')!.getImageData(Math.round(cssX * r), Math.round(cssY * r), 1, 1).data];
}

/** Sum of alpha over a rectangle of a canvas, in canvas pixels. */
function ink(c: HTMLCanvasElement, x0: number, x1: number, y0: number, y1: number): number {
  const d = c.getContext('2d')!.getImageData(Math.round(x0), Math.round(y0), Math.round(x1 - x0), Math.round(y1 - y0)).data;
  let sum = 0;
  for (let i = 3; i < d.length; i += 4) sum += d[i];
  return sum;
}

afterEach(() => document.querySelectorAll('.plot-box').forEach((b) => b.remove()));

describe('<time-plot>', () => {
  it('draws each state against time and shows the summary as text and as the canvas name', async () => {
    const cell = simulation(cooling);
    const el = await mount(Object.assign(document.createElement('time-plot'), { plot: cell.plot, summary: cell.summary }));
    const u = el.charts[0];
    const canvas = shadow(el).querySelector('canvas');
    expectVisibleCanvas(canvas);
    expect(canvas!.getAttribute('role')).to.equal('img');
    expect(canvas!.getAttribute('aria-label')).to.equal(cell.summary);
    expect(shadow(el).querySelector('.summary')!.textContent).to.equal(cell.summary);
    expect(u.series.slice(1).map((s) => s.label)).to.deep.equal(cell.plot.states.map((s) => s.name));
    expect(u.data[0]).to.equal(cell.plot.t);
    expect(u.data[1]).to.equal(cell.plot.states[0].values);
    expect((u.axes[1].label as string)).to.equal('T (degC)');
  });

  it('names the axis of a state without a unit by the state alone, with no empty brackets', async () => {
    const cell = simulation(radiometric);
    expect(cell.plot.states[0].unit).to.equal('', 'the template\'s N14 is a fraction');
    const el = await mount(Object.assign(document.createElement('time-plot'), { plot: cell.plot, summary: cell.summary }));
    expect((el.charts[0].axes[1].label as string)).to.equal('N14');
  });

  it('marks every event time, every level and every found point with its label', async () => {
    const cell = simulation(bolus);
    const el = await mount(Object.assign(document.createElement('time-plot'), { plot: cell.plot, summary: cell.summary }));
    const times = new Set(cell.plot.events.map((e) => e.time));
    expect(times.size).to.equal(6); // the study gives six doses, 8 h apart
    const markers = [...shadow(el).querySelectorAll<HTMLButtonElement>('button.event')];
    expect(markers).to.have.length(times.size);
    expect(markers[1].getAttribute('aria-label')).to.equal(`${cell.plot.events[1].label} at 8 h`);
    expect(texts(el, '.lbl.mark')).to.deep.equal(cell.plot.marks.map((m) => m.label));
    expect(texts(el, '.lbl.level')).to.deep.equal(cell.plot.levels.map((l) => l.label));
    // an event's label shows when its marker has focus
    const tip = markers[2].querySelector<HTMLElement>('.tip')!;
    expect(getComputedStyle(tip).display).to.equal('none');
    markers[2].focus();
    expect(getComputedStyle(tip).display).to.equal('block');
  });

  it('keeps the labels of found points and levels apart', async () => {
    const cell = simulation(cooling);
    const el = await mount(Object.assign(document.createElement('time-plot'), { plot: cell.plot, summary: cell.summary }), 500);
    const boxes = [...shadow(el).querySelectorAll<HTMLElement>('.lbl')].map((l) => l.getBoundingClientRect());
    expect(boxes).to.have.length(cell.plot.marks.length + cell.plot.levels.length);
    for (let i = 0; i < boxes.length; i++) {
      for (let j = i + 1; j < boxes.length; j++) {
        const [a, b] = [boxes[i], boxes[j]];
        const overlap = a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom;
        expect(overlap, `labels ${i} and ${j} overlap`).to.equal(false);
      }
    }
  });

  it('never lets two labels overlap, at any width, on a crowded dosing chart (peaks and their times)', async () => {
    const cell = simulation(bolus);
    for (const width of [320, 500, 700]) {
      const el = await mount(Object.assign(document.createElement('time-plot'), { plot: cell.plot, summary: cell.summary }), width);
      const shown = [...shadow(el).querySelectorAll<HTMLElement>('.lbl')].filter((l) => !l.hidden);
      expect(shown.length, `${width} px: most labels shown`).to.be.at.least(Math.min(4, cell.plot.marks.length));
      const boxes = shown.map((l) => l.getBoundingClientRect());
      for (let i = 0; i < boxes.length; i++) {
        for (let j = i + 1; j < boxes.length; j++) {
          const [a, b] = [boxes[i], boxes[j]];
          const overlap = a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom;
          expect(overlap, `${width} px: "${shown[i].textContent}" overlaps "${shown[j].textContent}"`).to.equal(false);
        }
      }
      el.parentElement!.remove();
    }
  });

  it('relabels the time axis in the unit picked, without touching the data', async () => {
    const cell = simulation(cooling);
    const el = await mount(Object.assign(document.createElement('time-plot'), { plot: cell.plot, summary: cell.summary }));
    const u = el.charts[0];
    const axis = u.axes[0] as any;
    const label = () => (typeof axis.label === 'function' ? axis.label(u, 0, 0, 0) : axis.label);
    expect(label()).to.equal('time (h)');
    const select = shadow(el).querySelector('select')!;
    // a 10 h run: offered in min and h (36 000 s is too many, 0.42 d too few)
    expect([...select.options].map((o) => o.value)).to.deep.equal(['min', 'h']);
    expect([...select.options].map((o) => o.value), 'the units the engine offers').to.deep.equal(cell.plot.timeUnits.map((u) => u.unit));
    select.value = 'min';
    select.dispatchEvent(new Event('change'));
    await el.updateComplete;
    await frame();
    expect(el.charts[0]).to.equal(u);
    expect(label()).to.equal('time (min)');
    const splits: number[] = axis._splits;
    const values: string[] = axis._values;
    expect(splits.length).to.be.greaterThan(2);
    // 1 h = 60 min (definition): each tick at x hours reads 60·x
    splits.forEach((h, i) => expect(Number(values[i])).to.be.closeTo(h * 60, 1e-9 * Math.max(1, h * 60)));
    expect(u.data[0]).to.equal(cell.plot.t);
    // the change of air at 30 min (the study's moved_at)
    expect(shadow(el).querySelector('button.event')!.getAttribute('aria-label')).to.equal('change: Ta at 30 min');
    // new data keep the reader's unit
    const faster = structuredClone(cooling) as any;
    faster.cells.find((c: any) => c.id === 'inputs').items[0].value = '0.9 / h';
    el.plot = simulation(faster).plot;
    await el.updateComplete;
    await frame();
    expect(label()).to.equal('time (min)');
    expect(select.value).to.equal('min');
  });

  it('starts in the unit the host sets, and in the plot\'s own when that unit is unknown', async () => {
    const cell = simulation(bolus);
    const el = await mount(Object.assign(document.createElement('time-plot'), { plot: cell.plot, summary: cell.summary, unit: 'd' }));
    const axis = el.charts[0].axes[0] as any;
    expect(axis.label(el.charts[0], 0, 0, 0)).to.equal('time (d)');
    // 48 h = 2 d (definition of the day): the last tick reads 2
    expect(axis._values[axis._values.length - 1]).to.equal('2');
    el.unit = 'fortnight';
    await el.updateComplete;
    await frame();
    expect(axis.label(el.charts[0], 0, 0, 0)).to.equal('time (h)');
  });

  it('sets new data on the same chart, and makes it again only for other series', async () => {
    const cell = simulation(cooling);
    const el = await mount(Object.assign(document.createElement('time-plot'), { plot: cell.plot, summary: cell.summary }));
    const u = el.charts[0];
    const faster = structuredClone(cooling) as any;
    faster.cells.find((c: any) => c.id === 'inputs').items[0].value = '0.9 / h';
    const next = simulation(faster);
    el.plot = next.plot;
    el.summary = next.summary;
    await el.updateComplete;
    expect(el.charts[0]).to.equal(u);
    expect(u.data[1]).to.equal(next.plot.states[0].values);
    expect(shadow(el).querySelector('canvas')!.getAttribute('aria-label')).to.equal(next.summary);
    const bolusCell = simulation(bolus);
    el.plot = bolusCell.plot;
    await el.updateComplete;
    expect(el.charts[0]).to.not.equal(u);
    expect(u.root.isConnected).to.equal(false);
  });

  it('draws measured points as dots over the curve', async () => {
    const cell = simulation(cooling);
    const measured = [{ state: 'T', t: [4.5], values: [55] }]; // off the curve, which is near 9 degC at 4.5 h
    const plain = await mount(Object.assign(document.createElement('time-plot'), { plot: cell.plot, summary: cell.summary }));
    const dotted = await mount(Object.assign(document.createElement('time-plot'), { plot: cell.plot, summary: cell.summary, points: measured }));
    const at = (el: typeof plain) => {
      const u = el.charts[0];
      const left = u.bbox.left / (u.ctx.canvas.width / u.width);
      const top = u.bbox.top / (u.ctx.canvas.width / u.width);
      // on the dot's ring, 3.5 px right of its centre
      return pixel(u.ctx.canvas, left + u.valToPos(4.5, 'x') + 3.5, top + u.valToPos(55, 'y0'));
    };
    expect(at(plain)[3]).to.equal(0);
    expect(at(dotted)[3]).to.be.greaterThan(100);
    expect(texts(dotted, '.key li').join()).to.contain('measured');
    expect(shadow(plain).querySelector('.key')).to.equal(null);
  });

  it('draws a measured point and a found point at the end of the span whole, over the plot\'s edge', async () => {
    // the trough template's trough is found at the run's last time, 96 h; a measured point is
    // put there too, and one at the first time. A dot is 3.5 px (measured) or 4.5 px (found) in
    // radius: the ring's outer half lies outside the plotting area, where a clip would cut it off
    const cell = simulation(troughStudy);
    const tEnd = cell.plot.t[cell.plot.t.length - 1];
    const trough = cell.plot.marks.find((m: { name: string }) => m.name === 'trough')!;
    const measured = [{ state: 'C', t: [0, tEnd], values: [15, 20] }];
    const el = await mount(Object.assign(document.createElement('time-plot'), { plot: cell.plot, summary: cell.summary, points: measured }));
    const u = el.charts[0];
    const ratio = u.ctx.canvas.width / u.width;
    const left = u.bbox.left / ratio;
    const top = u.bbox.top / ratio;
    const right = left + u.bbox.width / ratio;
    expect(trough.time).to.equal(tEnd);
    // ink beyond the plot's edge, in the 1.5 to 5 px outside it, across the point's row: the
    // outer half of its ring (a line 1.5 px wide on a circle of 3.5 px; the found point's dot
    // 4.5 px with a 2 px white ring, whose antialiased edge still shows)
    const outside = (x0: number, x1: number, y: number) => ink(u.ctx.canvas, x0 * ratio, x1 * ratio, (y - 1) * ratio, (y + 1) * ratio);
    expect(outside(right + 1.5, right + 5, top + u.valToPos(20, 'y0')), 'the measured point at the end').to.be.greaterThan(255);
    expect(outside(left - 5, left - 1.5, top + u.valToPos(15, 'y0')), 'the measured point at the start').to.be.greaterThan(255);
    expect(outside(right + 1.5, right + 4, top + u.valToPos(trough.value, 'y0')), 'the found point at the end').to.be.greaterThan(255);
  });

  it('follows its box\'s width, widens to the printed width for printing, and comes back', async () => {
    const cell = simulation(cooling);
    const el = await mount(Object.assign(document.createElement('time-plot'), { plot: cell.plot, summary: cell.summary }), 500);
    const u = el.charts[0];
    expect(u.width).to.equal(500);
    (el.parentElement as HTMLElement).style.width = '420px';
    await frame();
    await frame();
    expect(u.width).to.equal(420);
    dispatchEvent(new Event('beforeprint'));
    expect(u.width).to.equal(PRINT_WIDTH);
    expect(u.ctx.canvas.width).to.equal(Math.round(PRINT_WIDTH * devicePixelRatio));
    dispatchEvent(new Event('afterprint'));
    await frame();
    expect(u.width).to.equal(420);
  });

  it('destroys its chart when taken out of the document, and draws again when put back', async () => {
    const cell = simulation(cooling);
    const el = await mount(Object.assign(document.createElement('time-plot'), { plot: cell.plot, summary: cell.summary }));
    const u = el.charts[0];
    const errors: unknown[] = [];
    const onError = (e: ErrorEvent) => errors.push(e.error);
    addEventListener('error', onError);
    const box = el.parentElement!;
    el.remove();
    await frame();
    expect(el.charts).to.have.length(0);
    expect(u.root.isConnected).to.equal(false);
    expect(shadow(el).querySelector('.uplot')).to.equal(null);
    dispatchEvent(new Event('beforeprint')); // a destroyed chart no longer listens
    dispatchEvent(new Event('afterprint'));
    box.append(el);
    await el.updateComplete;
    await frame();
    removeEventListener('error', onError);
    expect(errors).to.deep.equal([]);
    expect(el.charts).to.have.length(1);
    expect(el.charts[0]).to.not.equal(u);
    expectVisibleCanvas(shadow(el).querySelector('canvas'));
  });
});

describe('<phase-plot>', () => {
  const phaseEl = (id: string, state: string) => {
    const c = cellOf(phaseStudy, id);
    return { cell: c, el: Object.assign(document.createElement('phase-plot'), {
      plot: c.plot, equilibria: c.equilibria, intervals: c.intervals, poles: c.poles ?? [], summary: c.summary, state,
    }) };
  };

  it('draws the rate, the phase line and the direction field, with the summary', async () => {
    const { cell, el } = phaseEl('harvest', 'N');
    await mount(el);
    const [rate, field] = el.charts;
    expectVisibleCanvas(rate.ctx.canvas);
    expectVisibleCanvas(shadow(el).querySelector<HTMLCanvasElement>('canvas.strip'));
    expectVisibleCanvas(field.ctx.canvas);
    expect(rate.ctx.canvas.getAttribute('aria-label')).to.equal(cell.summary);
    expect(shadow(el).querySelector('.summary')!.textContent).to.equal(cell.summary);
    expect(rate.data[0]).to.deep.equal(cell.plot.y);
    expect(rate.data[1]).to.deep.equal(cell.plot.f);
    expect(rate.axes[0].label).to.equal('N (kg)');
    expect(rate.axes[1].label).to.equal('dN/dt (kg / d)');
    expect(field.series).to.have.length(cell.plot.solutions.length + 1);
    expect(field.data[0]).to.equal(cell.plot.solutions[0].t);
    cell.plot.solutions.forEach((s: { y: unknown[] }, i: number) => expect(field.data[i + 1]).to.equal(s.y));
  });

  it('labels each equilibrium with its stability', async () => {
    const { cell, el } = phaseEl('harvest', 'N');
    await mount(el);
    expect(cell.equilibria).to.have.length(2);
    expect(texts(el, '.lbl.equilibrium')).to.deep.equal(['repeller: 112.7 kg', 'attractor: 887.3 kg']);
    expect(texts(el, '.key li')).to.include.members(['attractor', 'repeller']);
  });

  it('points the phase line\'s arrows the way the state moves', async () => {
    const { cell, el } = phaseEl('harvest', 'N');
    await mount(el, 500);
    const u = el.charts[0];
    const strip = shadow(el).querySelector<HTMLCanvasElement>('canvas.strip')!;
    const r = strip.width / strip.getBoundingClientRect().width;
    const mid = Math.round(44 * r * 0.45);
    expect(cell.intervals.map((iv: any) => iv.sign)).to.deep.equal(['-', '+', '-']);
    for (const iv of cell.intervals) {
      // one arrow per interval at this width, at its middle (canvas pixels)
      const [a, b] = [iv.from?.value ?? 0, iv.to?.value ?? 1200].map((v: number) => u.valToPos(v, 'x', true));
      const x = Math.round((a + b) / 2);
      // The arrow's tail is wide and its tip narrow: in the two rows 4 to 5 px above the line
      // only the tail's barbs have ink. So the ink there lies behind the arrow's centre.
      const left = ink(strip, x - 6 * r, x, mid - 5 * r, mid - 3 * r);
      const right = ink(strip, x, x + 6 * r, mid - 5 * r, mid - 3 * r);
      const [behind, ahead] = iv.sign === '+' ? [left, right] : [right, left];
      expect(behind, `ink behind the ${iv.sign} arrow`).to.be.greaterThan(200);
      expect(ahead, `ink ahead of the ${iv.sign} arrow`).to.be.lessThan(behind / 4);
    }
  });

  it('marks a pole with a dashed line and its label, and does not join the curve across it', async () => {
    const { cell, el } = phaseEl('pole', 'y');
    await mount(el);
    expect(cell.poles).to.have.length(1);
    expect(cell.equilibria).to.have.length(0);
    expect(texts(el, '.lbl.pole')).to.deep.equal(['pole: 1 m']);
    expect(texts(el, '.lbl.equilibrium')).to.deep.equal([]);
    const [xs, fs] = el.charts[0].data as [number[], Array<number | null>];
    const at = xs.indexOf(cell.poles[0].value);
    expect(at).to.be.greaterThan(0);
    expect(fs[at]).to.equal(null);
    expect(xs).to.have.length(cell.plot.y.length + 1);
  });

  it('keeps its data when a host passes an equal list of poles again', async () => {
    const { cell, el } = phaseEl('pole', 'y');
    await mount(el);
    const data = el.charts[0].data;
    el.poles = structuredClone(cell.poles);
    await el.updateComplete;
    expect(el.charts[0].data).to.equal(data);
    el.poles = [];
    await el.updateComplete;
    expect(el.charts[0].data).to.not.equal(data);
    expect(el.charts[0].data[0]).to.have.length(cell.plot.y.length);
  });

  it('shows a semi-stable point half filled on the side the state comes from', async () => {
    const { cell, el } = phaseEl('semi', 'S');
    await mount(el, 500);
    expect(cell.equilibria.map((e: any) => e.stability)).to.deep.equal(['semi-stable']);
    expect(texts(el, '.lbl.equilibrium')).to.deep.equal(['semi-stable: 500 kg']);
    // rising on both sides: the state comes in from below, so the left half is filled
    const u = el.charts[0];
    const r = u.ctx.canvas.width / u.width;
    const x = u.bbox.left / r + u.valToPos(500, 'x');
    const y = u.bbox.top / r + u.valToPos(0, 'y');
    const left = pixel(u.ctx.canvas, x - 2.5, y - 1.5);
    const right = pixel(u.ctx.canvas, x + 2.5, y - 1.5);
    expect(left.slice(0, 3), 'left half filled').to.not.deep.equal([255, 255, 255]);
    expect(right.slice(0, 3), 'right half white').to.deep.equal([255, 255, 255]);
  });

  it('fills the half the engine reports, also on the phase line: the right one for a point that attracts from above', async () => {
    const { cell, el } = phaseEl('semi-down', 'Q');
    await mount(el, 500);
    // closed form: -(Q - 500 kg)^2 < 0 on both sides: a state above 500 kg falls into it
    expect(cell.equilibria.map((e: any) => [e.stability, e.attractsFrom])).to.deep.equal([['semi-stable', 'above']]);
    const u = el.charts[0];
    const r = u.ctx.canvas.width / u.width;
    const x = u.bbox.left / r + u.valToPos(500, 'x');
    const y = u.bbox.top / r + u.valToPos(0, 'y');
    expect(pixel(u.ctx.canvas, x + 2.5, y - 1.5).slice(0, 3), 'right half filled').to.not.deep.equal([255, 255, 255]);
    expect(pixel(u.ctx.canvas, x - 2.5, y - 1.5).slice(0, 3), 'left half white').to.deep.equal([255, 255, 255]);
    const strip = shadow(el).querySelector<HTMLCanvasElement>('canvas.strip')!;
    const sx = u.valToPos(500, 'x') + u.bbox.left / r;
    const sy = 44 * 0.45;
    expect(pixel(strip, sx + 2.5, sy - 1.5).slice(0, 3), 'strip: right half filled').to.not.deep.equal([255, 255, 255]);
    expect(pixel(strip, sx - 2.5, sy - 1.5).slice(0, 3), 'strip: left half white').to.deep.equal([255, 255, 255]);
  });

  it('destroys both charts when taken out of the document', async () => {
    const { el } = phaseEl('harvest', 'N');
    await mount(el);
    const charts = [...el.charts];
    el.remove();
    expect(el.charts).to.have.length(0);
    charts.forEach((u) => expect(u.root.isConnected).to.equal(false));
    expect(shadow(el).querySelector('canvas')).to.equal(null);
  });
});

describe('<sweep-plot>', () => {
  it('draws the branches, marks each fold with its label, and shows the summary', async () => {
    const { sweep } = cellOf(phaseStudy, 'harvest');
    const el = await mount(Object.assign(document.createElement('sweep-plot'), { sweep, state: 'N' }));
    const u = el.charts[0];
    expectVisibleCanvas(u.ctx.canvas);
    expect(u.ctx.canvas.getAttribute('aria-label')).to.equal(sweep.summary);
    expect(shadow(el).querySelector('.summary')!.textContent).to.equal(sweep.summary);
    expect(sweep.folds).to.have.length(1);
    expect(texts(el, '.lbl.fold')).to.deep.equal(['fold: H = 125 kg / d']);
    // the key says what the mark is, as the printed sheet's legend does
    expect(shadow(el).querySelector('.key li.fold')!.textContent!.trim()).to.equal('fold: two equilibria meet and vanish');
    expect(u.axes[0].label).to.equal('H (kg / d)');
    expect(u.axes[1].label).to.equal('N (kg)');
  });

  it('draws stable stretches solid and the others dashed, split where a branch changes', async () => {
    const { sweep } = cellOf(phaseStudy, 'exchange');
    const el = await mount(Object.assign(document.createElement('sweep-plot'), { sweep, state: 'M' }));
    const u = el.charts[0];
    expect(sweep.folds).to.have.length(0);
    expect(texts(el, '.lbl.fold')).to.deep.equal([]);
    // one branch goes from attractor to repeller through mu = 0: two runs; the others one each
    const changing = sweep.branches.filter((b: any[]) => new Set(b.map((p) => p.stability)).size > 1);
    expect(changing).to.have.length(1);
    expect(u.series).to.have.length(1 + sweep.branches.length + 1);
    const runs = u.series.slice(1);
    expect(runs.filter((s) => !s.dash).length).to.equal(2);
    expect(runs.filter((s) => s.dash).length).to.equal(2);
    expect(runs.every((s) => (s.dash ? s.label!.toString().endsWith('unstable') : s.label!.toString().endsWith('stable')))).to.equal(true);
  });

  it('destroys its chart when taken out of the document', async () => {
    const { sweep } = cellOf(phaseStudy, 'harvest');
    const el = await mount(Object.assign(document.createElement('sweep-plot'), { sweep, state: 'N' }));
    const u = el.charts[0];
    el.remove();
    expect(el.charts).to.have.length(0);
    expect(u.root.isConnected).to.equal(false);
  });
});

describe('splitting a branch by stability', () => {
  const q = (value: number) => ({ value, unit: 'kg' });
  const pt = (p: number, v: number, stability: 'attractor' | 'repeller' | 'semi-stable') => ({ parameter: q(p), value: q(v), stability });

  it('starts each run at the last point of the one before, so the curve stays joined', () => {
    const runs = runsOf({ parameter: 'a', folds: [], branches: [[pt(0, 1, 'attractor'), pt(1, 2, 'attractor'), pt(2, 3, 'repeller'), pt(3, 4, 'repeller')]] });
    expect(runs.map((r) => [r.stable, r.x, r.y])).to.deep.equal([[true, [0, 1], [1, 2]], [false, [1, 2, 3], [2, 3, 4]]]);
  });

  it('keeps a semi-stable point with the stretch it ends, and orders runs by the parameter', () => {
    const runs = runsOf({ parameter: 'a', folds: [], branches: [[pt(3, 1, 'repeller'), pt(2, 2, 'repeller'), pt(1, 3, 'semi-stable')]] });
    expect(runs.map((r) => [r.stable, r.x, r.y])).to.deep.equal([[false, [1, 2, 3], [3, 2, 1]]]);
  });
});

describe('label placement and tick labels', () => {
  const bounds: Box = { x: 0, y: 0, w: 400, h: 200 };

  it('puts a label above right of its point, and the next one elsewhere when that is taken', () => {
    const taken: Taken = { labels: [], clear: [] };
    const a = placeLabel(100, 100, 60, 16, taken, bounds);
    expect(a).to.deep.equal({ x: 106, y: 78, w: 60, h: 16 });
    const b = placeLabel(104, 100, 60, 16, taken, bounds);
    expect(b).to.deep.equal({ x: 110, y: 106, w: 60, h: 16 });
    expect(taken.labels).to.have.length(2);
  });

  it('moves a level\'s label along its line before pushing it off the line', () => {
    const taken: Taken = { labels: [], clear: [{ x: 300, y: 0, w: 100, h: 200 }] }; // the right end is busy
    const box = placeLabel(398, 100, 60, 16, taken, bounds, [200, 100]);
    // first free spot: right above the line at x = 200
    expect(box).to.deep.equal({ x: 206, y: 78, w: 60, h: 16 });
  });

  it('keeps a label inside the plot near an edge', () => {
    const box = placeLabel(398, 4, 60, 16, { labels: [], clear: [] }, bounds)!;
    expect(box.x + box.w).to.be.at.most(400);
    expect(box.y).to.be.at.least(0);
  });

  it('gives ticks as many decimals as their step needs', () => {
    expect(tickLabels([0, 0.25, 0.5, 0.75], 0.25)).to.deep.equal(['0', '0.25', '0.5', '0.75']);
    expect(tickLabels([0, 20, 40], 20)).to.deep.equal(['0', '20', '40']);
    expect(tickLabels([0.1 + 0.2, 0.4], 0.1)).to.deep.equal(['0.3', '0.4']);
    expect(tickLabels([0, 5e-5, 1e-4], 5e-5)).to.deep.equal(['0', '5e-5', '1e-4']);
  });
});
