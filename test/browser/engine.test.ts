// The engine runs unchanged in the browser: the same study gives the same report as in Node.
import { expect } from 'chai';
import { openStudy, runStudy, parseExpression, compileExpression } from '../../src/index.ts';
import mixedUnits from '../../examples/mixed-units-prep.ratebook.json';

describe('the engine in Chromium', () => {
  it('evaluates a study with mixed units to the hand-worked values', () => {
    const r = runStudy(mixedUnits);
    expect(r.ok).to.equal(true);
    if (!r.ok) return;
    expect(r.report.ok).to.equal(true);
    const loop = r.report.cells.find((c) => c.id === 'loop')!.values as Record<string, { si: number; unit: string }>;
    // hand-worked: 2.35 L / (250 mL/min) = 9.4 min = 564 s
    expect(loop.tau.si).to.be.closeTo(564, 1e-9);
    expect(loop.tau.unit).to.equal('min');
    // t1/2 = ln 2 / k (common practice) = 1.98042 h
    expect(loop.t_half.si).to.be.closeTo((Math.LN2 / 0.35) * 3600, 1e-9);
  });

  it('re-runs only the cells downstream of an edit', () => {
    const opened = openStudy(mixedUnits);
    expect(opened.ok).to.equal(true);
    if (!opened.ok) return;
    const loop = structuredClone(opened.session.document().cells.find((c) => c.id === 'loop')!) as any;
    loop.items[0].value = '0.5 / h';
    const r = opened.session.apply({ type: 'replace', cell: loop });
    expect(r.ok).to.equal(true);
    if (!r.ok) return;
    expect(r.rerun).to.deep.equal(['loop', 'cooling']);
  });

  it('compiles a rate law into a plain function', () => {
    const p = parseExpression('-k * (T - Ta)');
    expect(p.ok).to.equal(true);
    if (!p.ok) return;
    const k = { si: 0.35 / 3600, dim: [0, 0, -1, 0, 0, 0, 0, 0, 0], unit: [['h', -1]] as const };
    const Ta = { si: 277.15, dim: [0, 0, 0, 0, 1, 0, 0, 0, 0], unit: [['degC', 1]] as const, temp: 'point' as const };
    const f = compileExpression(p.expr, (n) => (n === 'k' ? k : n === 'Ta' ? Ta : undefined) as any, ['T']);
    expect(f([300])).to.be.closeTo(-(0.35 / 3600) * (300 - 277.15), 1e-15);
  });

  it('reports a refused expression instead of running it', () => {
    const r = runStudy({ format: 'ratebook-study', version: 1, title: 'x', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'u', value: 'createUnit("x")' }] },
    ] });
    expect(r.ok && r.report.cells[0].ok).to.equal(false);
  });
});
