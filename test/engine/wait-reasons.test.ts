// A cell waiting on a name that its definer left undefined without a problem of its own (a
// crossing not reached) says why: the engine carries the definer's reason down the chain of
// waits as data (`undefinedName` on the wait), and the words name the cell and that reason.
// Hand-worked: T(t) = 4 degC + 70 degC · exp(-0.35/h · t) (closed form of the linear cooling
// law, invented numbers) is 4 + 70 · exp(-0.7) = 38.76 degC at 2 h, so it does not fall
// through 21 degC within a 2 h run (it would at ln(70/17) / 0.35 = 4.04 h).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { runStudy, problemWords, waitWords, type Report, type Study } from '../../src/index.ts';

const study = (cells: unknown[]): Study => ({ format: 'ratebook-study', version: 1, title: 't', cells } as unknown as Study);
function reportOf(doc: Study): Report {
  const r = runStudy(doc);
  assert.ok(r.ok);
  return (r as { report: Report }).report;
}

const COOL = { id: 'cool', kind: 'rate', state: 'T', unit: 'degC', initial: '74 degC', rate: '-0.35 / h * (T - 4 degC)' };
const run = (to: string) => ({ id: 'run', kind: 'simulate', title: 'Cooling', rates: ['cool'], from: '0 h', to,
  find: [{ name: 't_21', crossing: 'T', level: '21 degC', direction: 'down' }] });
const REASON = '"t_21" was not reached: no T falling through 21 degC by the end of the run (2 h)';

describe('a wait on a name left undefined says why', () => {
  const doc = study([
    COOL, run('2 h'),
    { id: 'hold', kind: 'parameters', title: 'Holding', items: [{ name: 'discard', value: 't_21 + 1 h' }] },
    { id: 'later', kind: 'parameters', items: [{ name: 'check', value: '2 * discard' }] },
  ]);
  const report = reportOf(doc);

  it('the definer has no problem, and the wait carries its cell, the name and the reason as data', () => {
    assert.equal(report.cells[1].ok, true);
    const e = report.cells[2].error!;
    assert.equal(e.kind, 'waits');
    assert.deepEqual(e.undefinedName, { cell: 'run', name: 't_21', reason: REASON });
    assert.deepEqual(report.cells[3].error!.undefinedName, { cell: 'run', name: 't_21', reason: REASON }, 'carried down the chain');
  });

  it('the words name the cell waited on and why, through a chain too', () => {
    const own = report.cells[2].errors ?? [report.cells[2].error!];
    assert.equal(waitWords(doc, report, 'run', own), `waits on Run "Cooling": ${REASON}`);
    assert.equal(problemWords(doc, report, report.cells[2].error!), `waits on Run "Cooling": ${REASON}`);
    assert.equal(problemWords(doc, report, report.cells[3].error!), `waits on Parameters "Holding", which waits on Run "Cooling": ${REASON}`);
  });

  it('no reason is carried when the crossing is reached, or when the definer has a problem of its own', () => {
    const reached = reportOf(study([COOL, run('5 h'), { id: 'hold', kind: 'parameters', items: [{ name: 'discard', value: 't_21 + 1 h' }] }]));
    assert.equal(reached.cells[2].ok, true);
    const broken = study([COOL, { ...run('2 h'), to: '2 zz' }, { id: 'hold', kind: 'parameters', items: [{ name: 'discard', value: 't_21 + 1 h' }] }]);
    const r = reportOf(broken);
    const e = r.cells[2].error!;
    assert.equal(e.kind, 'waits');
    assert.equal(e.undefinedName, undefined);
    assert.match(problemWords(broken, r, e), /^waits on Run "Cooling": end of the run: /);
  });
});
