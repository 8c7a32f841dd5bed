// The sheet's SVG chart: round ticks that cover the data, and sane axes for awkward data.
import { expect } from 'chai';
import { render } from 'lit';
import { lineChart, niceTicks, type ChartSpec } from '../../components/sheet/svg-chart.ts';

/** The rendered boxes of the chart's mark and level labels, as the browser lays the text out. */
function labelBoxes(spec: ChartSpec): DOMRect[] {
  const host = document.createElement('div');
  document.body.append(host);
  render(lineChart(spec), host);
  const boxes = [...host.querySelectorAll<SVGTextElement>('text.lbl')].map((t) => t.getBBox());
  host.remove();
  return boxes;
}
const overlap = (a: DOMRect, b: DOMRect) => a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height;

describe('svg-chart ticks', () => {
  it('gives round steps covering the range', () => {
    const { ticks, step } = niceTicks(0, 10);
    expect(step).to.equal(2);
    expect(ticks).to.deep.equal([0, 2, 4, 6, 8, 10]);
  });

  it('a flat line held at a level, up to rounding, gets a band around it, not millions of ticks', () => {
    const { ticks } = niceTicks(12.000000000000002, 12.000000000000004);
    expect(ticks.length).to.be.within(3, 16);
    expect(ticks[0]).to.be.below(12);
    expect(ticks[ticks.length - 1]).to.be.above(12);
  });

  it('never gives more than a handful of ticks, even for extreme ranges', () => {
    for (const [lo, hi] of [[1e-300, 1e300], [-5e-12, 5e-12], [0, 0], [1e15, 1e15 + 1]]) {
      expect(niceTicks(lo, hi).ticks.length, `${lo}..${hi}`).to.be.within(1, 16);
    }
  });
});

describe('svg-chart labels', () => {
  const t = Array.from({ length: 49 }, (_, i) => i * 0.5);
  const line = { label: 'C', x: t, y: t.map((x) => 10 * Math.exp(-0.1 * (x % 8)) + x / 4) };

  it('labels of marks and levels never overlap, as the browser lays them out, even on one point', () => {
    // the case seen on the sheet: the last peak and the time of that peak mark the same point
    const spec: ChartSpec = {
      label: 'C against time', xLabel: 'time (h)', yLabels: ['C (mg/L)'], lines: [line],
      marks: [
        { x: 24, y: 16, label: 'peak_last' }, { x: 24, y: 16, label: 't_peak_last' },
        { x: 16, y: 14, label: 'peak_3' }, { x: 16.2, y: 14, label: 'trough_3' }, { x: 0, y: 10, label: 'C0' },
      ],
      levels: [{ y: 15.8, label: 'toxic above' }, { y: 15.5, label: 'target' }, { y: 4, label: 'minimum effective level' }],
    };
    const boxes = labelBoxes(spec);
    expect(boxes.length).to.equal(8, 'every label found room');
    for (let i = 0; i < boxes.length; i++) for (let j = i + 1; j < boxes.length; j++) {
      expect(overlap(boxes[i], boxes[j]), `label ${i} overlaps label ${j}`).to.equal(false);
    }
    const width = spec.width ?? 640;
    for (const b of boxes) expect(b.x + b.width).to.be.at.most(width);
  });

  it('a label with no room left is listed under the chart, not drawn over another', () => {
    const marks = Array.from({ length: 60 }, (_, i) => ({ x: 12, y: 12, label: `a_rather_long_label_${i}` }));
    const host = document.createElement('div');
    document.body.append(host);
    render(lineChart({ label: 'C against time', xLabel: 'time (h)', yLabels: ['C (mg/L)'], lines: [line], marks, height: 120 }), host);
    const boxes = [...host.querySelectorAll<SVGTextElement>('text.lbl')].map((x) => x.getBBox());
    for (let i = 0; i < boxes.length; i++) for (let j = i + 1; j < boxes.length; j++) expect(overlap(boxes[i], boxes[j])).to.equal(false);
    expect(boxes.length).to.be.below(60);
    expect(host.querySelector('text.unplaced')!.textContent).to.match(/not labelled, for want of room: .*a_rather_long_label_59/);
    host.remove();
  });
});

describe('svg-chart bands', () => {
  it('shades a band between its two curves, behind the line, widens the axis to it, and lists it in the legend', () => {
    const x = [0, 1, 2, 3, 4];
    const host = document.createElement('div');
    document.body.append(host);
    // the band reaches above the line's own range: the axis must show it whole
    render(lineChart({
      label: 'C against time', xLabel: 'time (h)', yLabels: ['C (mg/L)'],
      lines: [{ label: 'C', x, y: [10, 6, 4, 3, 2] }],
      bands: [{ label: 'C: 2.5–97.5 percentile band', x, lo: [10, 5, 3, 2, 1], hi: [10, 8, 6, 5, 30], colourOf: 0 }],
    }), host);
    const band = host.querySelector('path.band') as SVGPathElement;
    expect(band, 'a band path').to.not.equal(null);
    const paths = [...host.querySelectorAll('path')];
    expect(paths.indexOf(band), 'drawn before the line').to.be.below(paths.findIndex((p) => p.getAttribute('fill') === 'none'));
    // one closed outline: five points along the lower edge, five back along the upper
    expect((band.getAttribute('d')!.match(/[ML]/g) ?? []).length).to.equal(10);
    expect(band.getAttribute('d')!.endsWith('Z')).to.equal(true);
    const box = band.getBBox();
    const frame = host.querySelector('rect')!.getBBox();
    expect(box.y, 'the band\'s top (30 mg/L) inside the plot').to.be.at.least(frame.y - 0.5);
    expect(host.textContent).to.contain('C: 2.5–97.5 percentile band');
    host.remove();
  });
});
