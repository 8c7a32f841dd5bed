// What a chart's labels keep clear of, on the templates as drawn, at a phone's width and wider:
// a leader (the line from a label back to its point) crosses no other leader and passes through
// no other label; no label sits on the event markers at the top of a run's plot, nor on the
// label an event shows when hovered or focused. The geometry is plain (segments and boxes:
// components/plots/label-placement.ts, checked by hand-worked cases in test/app).
import { expect } from 'chai';
import '../../components/plots/time-plot.ts';
import '../../components/plots/phase-plot.ts';
import { LEADER_FROM, segmentHitsBox, segmentsCross, overlaps, type Box, type Segment } from '../../components/plots/label-placement.ts';
import fold from '../../examples/harvested-stock-fold.ratebook.json';
import troughStudy from '../../examples/trough-in-range-probability.ratebook.json';
import bolus from '../../examples/iv-bolus-repeated.ratebook.json';
import { mountInBox, reportedCell } from './helpers.ts';

const cellOf = reportedCell;


/** Puts `el` in a box `width` pixels wide and waits until it has drawn. */
const mount = <T extends HTMLElement & { updateComplete: Promise<boolean> }>(el: T, width: number) => mountInBox(el, width, 'clearance-box');

/** The shown labels' boxes and the leaders of one chart's label layer, in the layer's pixels. */
function layerGeometry(layer: Element): { labels: Array<{ text: string; box: Box }>; leaders: Segment[] } {
  const origin = layer.getBoundingClientRect();
  const labels = [...layer.querySelectorAll<HTMLElement>('.lbl')].filter((l) => !l.hidden).map((l) => {
    const r = l.getBoundingClientRect();
    return { text: l.textContent ?? '', box: { x: r.left - origin.left, y: r.top - origin.top, w: r.width, h: r.height } };
  });
  const leaders = [...layer.querySelectorAll('.leaders line')].map((l) => ['x1', 'y1', 'x2', 'y2'].map((a) => Number(l.getAttribute(a))) as unknown as Segment);
  return { labels, leaders };
}

function expectTidy(layer: Element, where: string): void {
  const { labels, leaders } = layerGeometry(layer);
  leaders.forEach((s, i) => {
    // a leader ends on its own label's edge (half a pixel of rounding inward allowed)
    for (const l of labels) {
      const inner = { x: l.box.x + 0.5, y: l.box.y + 0.5, w: l.box.w - 1, h: l.box.h - 1 };
      expect(segmentHitsBox(s, inner), `${where}: a leader passes through "${l.text}"`).to.equal(false);
    }
    leaders.slice(i + 1).forEach((t) => expect(segmentsCross(s, t), `${where}: two leaders cross`).to.equal(false));
  });
}

afterEach(() => document.querySelectorAll('.clearance-box').forEach((b) => b.remove()));

describe('chart labels keep clear of leaders and event markers', () => {
  it('the harvest template\'s phase plot: no leader crosses another or passes through a label, and a label beside its point is nearer it than the other, from a phone\'s width up', async () => {
    // at 390 px the plot is about 230 px wide: the attractor's leader used to run down through the repeller's label
    const cell = cellOf(fold, 'settle');
    for (const width of [280, 300, 320, 340, 360, 390, 500, 700]) {
      const el = await mount(Object.assign(document.createElement('phase-plot'), { plot: cell.plot, equilibria: cell.equilibria, intervals: cell.intervals, summary: cell.summary, state: 'N' }), width);
      const layer = el.shadowRoot!.querySelector('.chart.rate .plot-labels')!;
      const { labels } = layerGeometry(layer);
      expect(labels, `${width} px: both equilibria labelled`).to.have.length(2);
      expectTidy(layer, `${width} px`);
      // a label beside its equilibrium (no leader: within LEADER_FROM of it) is nearer it than
      // the other one (at 320 px the attractor's label once sat over the repeller's dot, 6 px
      // from it and 8.5 px from its own)
      const u = el.charts[0];
      const dots = cell.equilibria.map((e: { value: number }) => [u.valToPos(e.value, 'x'), u.valToPos(0, 'y')]);
      const gap = (b: Box, [x, y]: number[]) => Math.hypot(Math.max(b.x - x, 0, x - b.x - b.w), Math.max(b.y - y, 0, y - b.y - b.h));
      labels.forEach((l, i) => {
        if (gap(l.box, dots[i]) > LEADER_FROM) return;
        expect(gap(l.box, dots[i]), `${width} px: "${l.text}" nearer the other equilibrium`).to.be.below(gap(l.box, dots[1 - i]));
      });
      el.parentElement!.remove();
    }
  });

  it('the dosing templates\' run plots: no label on an event marker or on the label it shows, and tidy leaders', async () => {
    // the trough template's peak_last sat on the dose markers at the top of the plot
    for (const study of [troughStudy, bolus]) {
      const cell = cellOf(study, 'run');
      for (const width of [320, 360, 500, 700, 1200]) {
        const el = await mount(Object.assign(document.createElement('time-plot'), { plot: cell.plot, summary: cell.summary }), width);
        const layer = el.shadowRoot!.querySelector('.plot-labels')!;
        const origin = layer.getBoundingClientRect();
        const { labels } = layerGeometry(layer);
        const markers = [...layer.querySelectorAll<HTMLButtonElement>('button.event')];
        expect(markers.length, 'dose markers').to.be.greaterThan(3);
        for (const m of markers) {
          const r = m.getBoundingClientRect();
          // the head: the marker's width, the canvas's 7 px triangle at the top
          const head = { x: r.left - origin.left, y: 0, w: r.width, h: 7 };
          m.focus();
          const t = m.querySelector('.tip')!.getBoundingClientRect();
          const tip = { x: t.left - origin.left, y: t.top - origin.top, w: t.width, h: t.height };
          m.blur();
          expect(tip.w, 'the event\'s label shows on focus').to.be.greaterThan(0);
          for (const l of labels) {
            expect(overlaps(l.box, head), `${width} px: "${l.text}" on the marker "${m.getAttribute('aria-label')}"`).to.equal(false);
            expect(overlaps(l.box, tip), `${width} px: "${l.text}" under the label of "${m.getAttribute('aria-label')}"`).to.equal(false);
          }
        }
        expectTidy(layer, `${width} px`);
        el.parentElement!.remove();
      }
    }
  });
});
