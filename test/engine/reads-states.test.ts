// Which fields can read states (src/cells/reads-states.ts), the fact the editor colours by, is
// the one the builders act on: every name a builder reads is marked `readsStates` exactly
// where the rule says so. The rule itself is the contract's names-and-units rule (a state is
// read in rate laws, event amounts under add or infuse, and the fields that name a state).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readdirSync, readFileSync } from 'node:fs';
import { fieldReadsStates, type Cell } from '../../src/index.ts';
import { buildCellNodes } from '../../src/cells/index.ts';

function check(cell: Cell): number {
  let seen = 0;
  for (const node of buildCellNodes(cell)) {
    for (const use of node.uses) {
      if (use.name.startsWith('#')) continue; // cell references
      const rel = use.path.replace(/^@/, '');
      assert.equal(use.readsStates === true, fieldReadsStates(cell.kind, rel), `${cell.id}: ${use.name} at ${rel}`);
      seen++;
    }
  }
  return seen;
}

describe('fields that can read states', () => {
  it('the rule, hand-written from the contract', () => {
    assert.equal(fieldReadsStates('rate', '.rate'), true);
    assert.equal(fieldReadsStates('rate', '.initial'), false);
    assert.equal(fieldReadsStates('simulate', '.events[0].add.C'), true);
    assert.equal(fieldReadsStates('simulate', '.events[2].infuse.A'), true);
    assert.equal(fieldReadsStates('simulate', '.events[0].set.C'), false, 'a value set is not read from the states');
    assert.equal(fieldReadsStates('simulate', '.events[0].every'), false);
    assert.equal(fieldReadsStates('simulate', '.to'), false);
    assert.equal(fieldReadsStates('simulate', '.find[1].level'), false);
    assert.equal(fieldReadsStates('parameters', '.items[0].value'), false);
  });

  it('matches what the builders mark, in every template and in a schedule with every action', () => {
    let seen = 0;
    const dir = new URL('../../examples/', import.meta.url);
    for (const f of readdirSync(dir).filter((x) => x.endsWith('.ratebook.json'))) {
      for (const cell of JSON.parse(readFileSync(new URL(f, dir), 'utf8')).cells as Cell[]) seen += check(cell);
    }
    seen += check({ id: 'run', kind: 'simulate', rates: ['tank'], from: '0 h', to: '12 h', events: [
      { at: '1 h', add: { h: '0.1 m + h / 10' } }, { at: '2 h', set: { h: '1 m' } }, { at: '3 h', for: '1 h', infuse: { h: '0.2 m / h' } },
    ], find: [{ name: 'q', crossing: 'h', level: '0.5 m', from: '1 h', to: '2 h' }] } as unknown as Cell);
    assert.ok(seen > 100, `${seen} uses checked`);
  });
});
