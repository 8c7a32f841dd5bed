// A simulate cell's `schedule`: how many times each event acts in the run, and its repeats in
// words (src/simulate/schedule.ts timesInRun, src/output/event-words.ts), as the sheet prints them.
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { runStudy } from '../../src/index.ts';

function scheduleOf(events: unknown[], to = '72 h'): Array<{ times: number; repeats: string }> {
  const r = runStudy({ format: 'ratebook-study', version: 1, title: 'doses', cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.1 / h' }, { name: 'Ta', value: '1 mg / L' }] },
    { id: 'c', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
    { id: 'run', kind: 'simulate', rates: ['c'], from: '0 h', to, events },
  ] });
  assert.ok(r.ok);
  const run = r.report.cells[2];
  assert.ok(run.ok, JSON.stringify(run.error));
  return run.schedule as Array<{ times: number; repeats: string }>;
}

it('an event that repeats with no count goes on to the end of the run, and says so', () => {
  // hand-worked: doses at 0, 12, 24, 36, 48, 60 and 72 h over a 72 h run: 7
  assert.deepEqual(scheduleOf([{ at: '0 h', every: '12 h', add: { C: '1 mg / L' } }]),
    [{ times: 7, repeats: 'every 12 h until the end of the run (7 times)' }]);
  // hand-worked: from 6 h every 12 h up to 72 h: 6, 18, 30, 42, 54, 66: 6
  assert.deepEqual(scheduleOf([{ at: '6 h', every: '12 h', add: { C: '1 mg / L' } }])[0].times, 6);
});

it('an event with a count says its count, and how many fall within a shorter run', () => {
  assert.deepEqual(scheduleOf([{ at: '0 h', every: '12 h', count: 6, add: { C: '1 mg / L' } }]),
    [{ times: 6, repeats: 'every 12 h, 6 times' }]);
  // hand-worked: 10 doses every 12 h from 0 h; a 72 h run holds those at 0 ... 72 h: 7
  assert.deepEqual(scheduleOf([{ at: '0 h', every: '12 h', count: 10, add: { C: '1 mg / L' } }]),
    [{ times: 7, repeats: 'every 12 h, 10 times (7 within the run)' }]);
});

it('a single event happens once; an infusion counts by its starts', () => {
  // hand-worked: infusions start at 0, 8 and 16 h (count 3); the set at 2 h happens once
  assert.deepEqual(scheduleOf([
    { at: '2 h', set: { Ta: '2 mg / L' } },
    { at: '0 h', every: '8 h', count: 3, for: '1 h', infuse: { C: '1 mg / L / h' } },
  ]), [{ times: 1, repeats: 'once' }, { times: 3, repeats: 'every 8 h, 3 times' }]);
});
