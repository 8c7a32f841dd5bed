// Scaling: the report of a chain of n parameters (bench/chains.ts) grows linearly with n,
// valid and with a wrong first value (each waiting cell names the cell it waits on and the
// cause once, never the chain of messages before it). Sizes here; times in `npm run bench`
// ("Studies of many cells"), never in a test.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { openStudy } from '../../src/engine/session.ts';
import { parameterChain } from '../../bench/chains.ts';

function reportOf(n: number, wrongFirst: boolean) {
  const opened = openStudy(parameterChain(n, { wrongFirst }));
  assert.ok(opened.ok);
  return opened.session.report();
}

/** Budgets per cell of the JSON report, in characters: hand-worked from one cell's report (about 210 valid, 400 waiting). */
const BYTES_PER_CELL = { valid: 300, wrong: 600 };

describe('scaling: report size of long chains', () => {
  for (const wrongFirst of [false, true]) {
    const what = wrongFirst ? 'with a wrong first value' : 'valid';
    it(`a chain of 1,000 and of 10,000 parameters, ${what}: the report grows linearly`, () => {
      const sizes = [1000, 10000].map((n) => {
        const report = reportOf(n, wrongFirst);
        assert.equal(report.cells.length, n);
        assert.equal(report.ok, !wrongFirst);
        if (wrongFirst) {
          const last = report.cells[n - 1];
          assert.equal(last.error?.kind, 'waits');
          assert.equal(last.error?.waitsOn, `p${n - 2}`);
          // the cell it waits on and the cause, once
          assert.match(last.error!.message, new RegExp(`^waits on cell "p${n - 2}" \\(the cause is in cell "p0"\\): "a0" has an error \\(cells\\[0\\]\\.items\\[0\\]\\.value: `));
          assert.equal(last.error!.message.split('waits on').length, 2);
        }
        return JSON.stringify(report).length;
      });
      const budget = wrongFirst ? BYTES_PER_CELL.wrong : BYTES_PER_CELL.valid;
      assert.ok(sizes[0] <= 1000 * budget, `1,000 cells: ${sizes[0]} characters`);
      assert.ok(sizes[1] <= 10000 * budget, `10,000 cells: ${sizes[1]} characters`);
      // linear: ten times the cells, at most ten times the size and a little (longer ids)
      assert.ok(sizes[1] <= 10.5 * sizes[0], `${sizes[1]} against ${sizes[0]}`);
    });
  }
});
