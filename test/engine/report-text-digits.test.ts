// The terminal table (`ratebook run` without --json) shows every figure to the digits the table
// gives a quantity, 6 significant, and a run's error against the exact solution to 2, as the
// simulate cell shows it; counts stay whole. The figures are checked against the JSON report of
// the same study (the contract, docs/study-format.md) rounded to those digits, and a prior's
// ratio and shift against their definitions there (ratio = estimate / median, shift =
// (log estimate − log median) / omega), computed here from the estimate and the prior.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readdirSync, readFileSync } from 'node:fs';
import { formatReport } from '../../src/output/report-text.ts';
import { reportOf, cell } from './helpers.ts';
import type { Report } from '../../src/index.ts';

const examples = new URL('../../examples/', import.meta.url);
const templates = readdirSync(examples).filter((f) => f.endsWith('.ratebook.json')).sort();
const reportOfTemplate = (file: string): Report => reportOf(JSON.parse(readFileSync(new URL(file, examples), 'utf8')));

/** The significant digits a figure is written with: those of its mantissa, leading zeros left out. */
function significant(token: string): number {
  const mantissa = token.replace(/^-/, '').split(/e/i)[0].replace('.', '');
  return mantissa.replace(/^0+/, '').length;
}

/** The row of the table whose name is `key` in the block of cell `id`: the text after the name. */
function row(text: string, id: string, key: string): string {
  const block = text.split('\n\n').find((b) => b.includes(`] ${id} (`));
  assert.ok(block, `no block for ${id}`);
  const line = block.split('\n').find((l) => l.trimStart().startsWith(`${key} `));
  assert.ok(line, `no row ${key} in ${id}:\n${block}`);
  return line.trimStart().slice(key.length).trim();
}

const rounded = (x: number, digits: number) => Number(x.toPrecision(digits));

describe('the terminal table shows each figure to the digits it supports', () => {
  it('no figure of any template is written with more than 6 significant digits (counts aside)', () => {
    for (const file of templates) {
      const text = formatReport(reportOfTemplate(file));
      // figures with a decimal point or an exponent: whole numbers are counts, rows or seeds
      const long = (text.match(/-?\d+\.\d+(?:e[-+]?\d+)?|\d+e[-+]?\d+/gi) ?? []).filter((t) => significant(t) > 6);
      assert.deepEqual(long, [], `${file}: ${long.join(', ')}`);
    }
  });

  it('a Bayesian fit: prior ratio and shift from their definitions, log SD and objective from the JSON report, to 6 digits', () => {
    const report = reportOfTemplate('bayesian-two-levels.ratebook.json');
    const text = formatReport(report);
    const fit = cell(report, 'bayes') as { estimates: Record<string, { value: { si: number; value: number }; prior: { median: { value: number }; omega: number }; logSD: number }>; objective: number };
    for (const [name, e] of Object.entries(fit.estimates)) {
      const ratio = e.value.value / e.prior.median.value;
      const shift = (Math.log(e.value.value) - Math.log(e.prior.median.value)) / e.prior.omega;
      assert.equal(Number(row(text, 'bayes', `${name}.prior.ratio`)), rounded(ratio, 6), `${name} ratio`);
      assert.equal(Number(row(text, 'bayes', `${name}.prior.shift`)), rounded(shift, 6), `${name} shift`);
      assert.equal(Number(row(text, 'bayes', `${name}.logSD`)), rounded(e.logSD, 6), `${name} logSD`);
    }
    assert.equal(Number(row(text, 'bayes', 'objective')), rounded(fit.objective, 6));
    // the exactly determined least-squares fit beside it: an objective of round-off, in 6 digits at most
    const plain = (cell(report, 'plain') as { objective: number }).objective;
    const shown = row(text, 'plain', 'objective');
    assert.equal(Number(shown), rounded(plain, 6));
    assert.ok(significant(shown) <= 6, shown);
    // counts stay whole
    assert.equal(row(text, 'bayes', 'n'), '2');
  });

  it('a run\'s error against the exact solution: 2 significant digits, in tolerances and as a quantity', () => {
    const report = reportOfTemplate('cooling-design.ratebook.json');
    const text = formatReport(report);
    const run = report.cells.find((c) => c.kind === 'simulate' && c.closedForm) as { id: string; closedForm: Record<string, { maxError: { value: number; unit: string }; maxErrorInTolerances: number }> };
    assert.ok(run, 'the template has a run with an exact solution');
    for (const [state, cf] of Object.entries(run.closedForm)) {
      assert.equal(Number(row(text, run.id, `closedForm.${state}.maxErrorInTolerances`)), rounded(cf.maxErrorInTolerances, 2));
      const q = row(text, run.id, `closedForm.${state}.maxError`);
      assert.equal(Number(q.split(' ')[0]), rounded(cf.maxError.value, 2), q);
      // the time constant beside it keeps the quantities' 6 digits
      assert.ok(row(text, run.id, `closedForm.${state}.timeConstant`).length > 0);
    }
  });
});
