// The sweep plot's parameter axis spans the whole swept range, also past the fold where no
// equilibrium is left.
import { expect } from 'chai';
import '../../components/plots/sweep-plot.ts';
import { runStudy } from '../../src/index.ts';

describe('sweep-plot axis', () => {
  it('runs from the sweep start to its end', async () => {
    const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'r', value: '0.5 / d' }, { name: 'K', value: '1000 kg' }, { name: 'H', value: '50 kg / d' }] },
      { id: 'fish', kind: 'rate', state: 'N', unit: 'kg', rate: 'r * N * (1 - N / K) - H', initial: '800 kg' },
      { id: 'ph', kind: 'phase', rate: 'fish', from: '0 kg', to: '1200 kg', sweep: { name: 'H', from: '0 kg / d', to: '200 kg / d', steps: 41 } },
    ] });
    expect(r.ok).to.equal(true);
    if (!r.ok) return;
    const el = document.createElement('sweep-plot') as unknown as HTMLElement & { sweep: unknown; updateComplete: Promise<unknown>; charts: Array<{ scales: Record<string, { min?: number; max?: number }> }> };
    el.style.width = '600px';
    el.sweep = r.report.cells[2].sweep;
    document.body.append(el);
    await el.updateComplete;
    await new Promise((res) => requestAnimationFrame(res));
    const x = el.charts[0].scales.x;
    expect(x.min).to.equal(0);
    // the fold is at H = rK/4 = 125 kg/d (common practice); the axis still reaches 200
    expect(x.max).to.equal(200);
    el.remove();
  });
});
