// A chart's labels are sized from their text measured in their font (a canvas 2D context),
// not read back from the page's layout: each redraw of a chart during a slider drag would
// otherwise lay the whole page out. The checks hold the measured sizes to what the browser
// renders, and a redraw to reading no label's layout and keeping its elements.
import { expect } from 'chai';
import { runStudy, type SimulationPlot } from '../../src/index.ts';
import '../../components/plots/time-plot.ts';
import '../../components/plots/phase-plot.ts';
import { labelSize } from '../../components/plots/label-sizes.ts';
import bolus from '../../examples/iv-bolus-repeated.ratebook.json';

type Study = typeof bolus;

/** The run cell's plot of the bolus template, with the dose text replaced. */
function plotWithDose(dose: string): SimulationPlot {
  const study: Study = { ...bolus, cells: bolus.cells.map((c) => c.id === 'regimen' && 'items' in c ? { ...c, items: c.items!.map((it) => it.name === 'dose' ? { ...it, value: dose } : it) } : c) } as Study;
  const r = runStudy(study);
  if (!r.ok) throw new Error(r.error.message);
  const cell = r.report.cells.find((c) => c.id === 'run') as { ok: boolean; plot?: SimulationPlot } | undefined;
  if (!cell?.ok || !cell.plot) throw new Error('the run failed');
  return cell.plot;
}

const frame = () => new Promise((r) => requestAnimationFrame(() => setTimeout(r, 0)));

async function mountPlot(plot: SimulationPlot, width = 700) {
  const box = document.createElement('div');
  box.style.width = `${width}px`;
  const el = Object.assign(document.createElement('time-plot'), { plot, summary: 'a run' });
  box.append(el);
  document.body.append(box);
  await el.updateComplete;
  await frame();
  return el;
}

const labelsOf = (el: HTMLElement) => [...el.shadowRoot!.querySelectorAll<HTMLElement>('.lbl')];

describe('chart labels sized from their text', () => {
  afterEach(() => { document.body.replaceChildren(); });

  it('gives each kind of label (found points upright, levels in italics) its rendered size within 1 px', async () => {
    const el = await mountPlot(plotWithDose('500 mg'));
    const labels = labelsOf(el);
    const kinds = new Set(labels.map((l) => l.className));
    expect([...kinds].sort()).to.deep.equal(['lbl level', 'lbl mark']);
    for (const l of labels) {
      const layer = l.parentElement!;
      const [w, h] = labelSize(layer, l);
      const r = l.getBoundingClientRect();
      // the measured size may round up, never down: a label never covers more than it was given
      expect(w - r.width, `"${l.textContent}" width ${w} against ${r.width}`).to.be.within(0, 1);
      expect(h - r.height, `"${l.textContent}" height ${h} against ${r.height}`).to.be.within(0, 1);
    }
  });

  it('matches a bold label and a long one too', async () => {
    const el = await mountPlot(plotWithDose('500 mg'));
    const layer = labelsOf(el)[0].parentElement!;
    for (const [cls, text] of [['lbl fold', 'fold: H = 125 kg / d'], ['lbl mark', 'a much longer label: 12,345.678 mg / L at 47.999 h (WMW)'], ['lbl level', 'ÄÉ µg·L⁻¹ ≥ 3']]) {
      const span = document.createElement('span');
      span.className = cls;
      span.textContent = text;
      layer.append(span);
      const [w, h] = labelSize(layer, span);
      const r = span.getBoundingClientRect();
      expect(w - r.width, `"${text}" width`).to.be.within(0, 1);
      expect(h - r.height, `"${text}" height`).to.be.within(0, 1);
      span.remove();
    }
  });

  it('redraws with new figures without reading any label\'s layout, and keeps its elements and a focused marker\'s focus', async () => {
    const el = await mountPlot(plotWithDose('500 mg'));
    const before = labelsOf(el);
    const textsBefore = before.map((l) => l.textContent);
    const marker = el.shadowRoot!.querySelectorAll<HTMLButtonElement>('button.event')[2];
    marker.focus();
    let reads = 0;
    const proto = HTMLElement.prototype;
    const saved = ['offsetWidth', 'offsetHeight'].map((k) => [k, Object.getOwnPropertyDescriptor(proto, k)!] as const);
    const savedRect = Element.prototype.getBoundingClientRect;
    for (const [k, d] of saved) {
      Object.defineProperty(proto, k, { configurable: true, get(this: HTMLElement) { if (this.classList.contains('lbl')) reads++; return d.get!.call(this); } });
    }
    Element.prototype.getBoundingClientRect = function (this: Element) { if (this.classList.contains('lbl')) reads++; return savedRect.call(this); };
    try {
      el.plot = plotWithDose('650 mg');
      await el.updateComplete;
      await frame();
    } finally {
      for (const [k, d] of saved) Object.defineProperty(proto, k, d);
      Element.prototype.getBoundingClientRect = savedRect;
    }
    expect(reads, 'layout reads of labels during the redraw').to.equal(0);
    const after = labelsOf(el);
    expect(after.map((l) => l.textContent)).to.not.deep.equal(textsBefore);
    expect(after.length).to.equal(before.length);
    after.forEach((l, i) => expect(l, `label ${i} kept`).to.equal(before[i]));
    expect(el.shadowRoot!.activeElement, 'the focused marker keeps focus').to.equal(marker);
  });
});
