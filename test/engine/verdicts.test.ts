// Parameters that are conditions (verdicts such as "passes"): reported as yes/no, usable by
// other parameters, refused where a quantity is needed. Expected values are hand-worked from
// the inputs (common practice: a limit is met when the value is at or below it).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { openStudy, runStudy, type CellReport } from '../../src/index.ts';
import { formatReport } from '../../src/output/report-text.ts';

type V = { value: number; unit: string; si: number; truth?: boolean };
const study = (items: unknown[], extra: unknown[] = []) => ({ format: 'ratebook-study', version: 1, title: 'verdicts', cells: [{ id: 'p', kind: 'parameters', items }, ...extra] });
const cells = (items: unknown[], extra: unknown[] = []): CellReport[] => {
  const r = runStudy(study(items, extra));
  assert.ok(r.ok);
  return (r as { report: { cells: CellReport[] } }).report.cells;
};
const limits = [
  { name: 'T2', value: '18 degC' }, { name: 'T6', value: '6 degC' },
  { name: 'ok1', value: 'T2 <= 21 degC' }, { name: 'ok2', value: 'T6 <= 5 degC' },
];

describe('verdicts', () => {
  it('a comparison is a yes/no value, reported as 1 or 0 with truth', () => {
    const v = cells(limits)[0].values as Record<string, V>;
    assert.deepEqual(v.ok1, { value: 1, unit: '', si: 1, truth: true });
    assert.deepEqual(v.ok2, { value: 0, unit: '', si: 0, truth: false });
  });

  it('verdicts combine with and, or, not, and choose a quantity with ? :', () => {
    const v = cells([...limits,
      { name: 'both', value: 'ok1 and ok2' }, { name: 'either', value: 'ok1 or ok2' }, { name: 'failed', value: 'not (ok1 and ok2)' },
      { name: 'extra', value: 'ok2 ? 0 h : 2 h' }])[0].values as Record<string, V>;
    assert.equal(v.both.truth, false);
    assert.equal(v.either.truth, true);
    assert.equal(v.failed.truth, true);
    assert.equal(v.extra.value, 2);
    assert.equal(v.extra.unit, 'h');
  });

  it('arithmetic on a verdict is an error on that value', () => {
    const c = cells([...limits, { name: 'bad', value: 'ok1 + 1' }])[0];
    assert.equal(c.error?.path, 'cells[0].items[4].value');
    assert.match(c.error!.message, /true\/false value cannot be used as a number/);
  });

  it('a verdict cannot have a range or a display unit', () => {
    const ranged = cells([...limits.slice(0, 2), { name: 'ok1', value: 'T2 <= 21 degC', range: ['0 degC', '1 degC'] }])[0];
    assert.match(ranged.error!.message, /true\/false; a range is for a quantity/);
    const unit = cells([...limits.slice(0, 2), { name: 'ok1', value: 'T2 <= 21 degC', unit: 'h' }])[0];
    assert.equal(unit.error?.path, 'cells[0].items[2].unit');
  });

  it('a rate law that reads a verdict is refused with the reason', () => {
    const law = { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: 'ok1 ? -T / (1 h) : 0 degC / h', initial: '5 degC' };
    const c = cells(limits, [law])[1];
    assert.equal(c.ok, false);
    assert.match(c.error!.message, /"ok1" is true\/false; a rate law reads quantities only/);
  });

  it('an edit that flips a verdict marks its cell changed, and the text report says yes or no', () => {
    const r = openStudy(study(limits));
    assert.ok(r.ok);
    if (!r.ok) return;
    const edit = r.session.apply({ type: 'replace', cell: { id: 'p', kind: 'parameters', items: [{ name: 'T2', value: '25 degC' }, ...limits.slice(1)] } });
    assert.ok(edit.ok);
    if (!edit.ok) return;
    assert.deepEqual(edit.changed, ['p']);
    assert.equal((r.session.report().cells[0].values as Record<string, V>).ok1.truth, false);
    const text = formatReport(r.session.report());
    assert.match(text, /ok1\s+no/);
    assert.match(text, /T2\s+25 degC/);
  });
});
