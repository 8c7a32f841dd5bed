// The page keeps a pending cell's report object while the engine sends it again unchanged (so
// its element is not drawn again at every position of a drag), and takes any report that
// changed, or of a cell no longer pending, as it comes.
import { expect } from 'chai';
import { keepPendingReports } from '../../components/pending-reports.ts';
import type { CellReport, Report } from '../../src/index.ts';

const cell = (id: string, extra: Record<string, unknown> = {}) => ({ id, kind: 'uncertainty', ok: true, ...extra }) as unknown as CellReport;
const report = (cells: CellReport[]) => ({ title: 't', ok: true, warnings: [], cautions: [], glance: [], cells }) as unknown as Report;

describe('keepPendingReports', () => {
  it('keeps the old object of a cell pending before and now whose report reads the same', () => {
    const old = cell('mc', { results: { a: 1 } });
    const prev = report([cell('run'), old]);
    const next = report([cell('run', { x: 2 }), structuredClone(old)]);
    const kept = keepPendingReports(prev, ['mc'], next, ['mc']);
    expect(kept.cells[1]).to.equal(old);
    expect(kept.cells[0]).to.equal(next.cells[0]);
  });

  it('takes a changed report, or one no longer pending, or one pending only now, as it comes', () => {
    const old = cell('mc', { results: { a: 1 } });
    const prev = report([old]);
    const changed = report([cell('mc', { results: { a: 2 } })]);
    expect(keepPendingReports(prev, ['mc'], changed, ['mc']).cells[0]).to.equal(changed.cells[0]);
    const same = report([structuredClone(old)]);
    expect(keepPendingReports(prev, ['mc'], same, []).cells[0]).to.equal(same.cells[0]);
    expect(keepPendingReports(prev, [], same, ['mc']).cells[0]).to.equal(same.cells[0]);
    expect(keepPendingReports(undefined, ['mc'], same, ['mc'])).to.equal(same);
  });
});
