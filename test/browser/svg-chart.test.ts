// The sheet's SVG chart: round ticks that cover the data, and sane axes for awkward data.
import { expect } from 'chai';
import { niceTicks } from '../../components/sheet/svg-chart.ts';

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
