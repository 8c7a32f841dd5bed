// The command line's text report (`ratebook run` without --json) opens, under the title and the
// cautions, with the results at a glance: the JSON report's `glance` list (the contract,
// docs/study-format.md) in its order, each point value to 4 significant figures (checked against
// JavaScript's own Number.prototype.toPrecision, ECMA-262), and where an uncertainty cell follows
// a result, its figures as that cell's own JSON report shows them: a verdict's probability of yes
// (`shown`), its Monte Carlo standard error in percentage points (100 × `probabilitySE` to one or
// two significant figures), the samples with a value, a quantity's 2.5 and 97.5 percentiles
// (`percentiles.p025.shown`, `p975.shown`). Templates with invented numbers.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { formatReport } from '../../src/output/report-text.ts';
import { reportOf } from './helpers.ts';
import type { GlanceEntry, Report, UncertaintyResult } from '../../src/index.ts';

const reportOfTemplate = (id: string): Report =>
  reportOf(JSON.parse(readFileSync(new URL(`../../examples/${id}.ratebook.json`, import.meta.url), 'utf8')));

/** The text's lines up to the first cell's block, and the glance block's entries: name → its lines (the first one's text after the name). */
function opening(text: string): { head: string[]; entries: Map<string, string[]>; order: string[] } {
  const lines = text.split('\n');
  const firstCell = lines.findIndex((l) => /^\[(ok|ERROR|not computed)\] /.test(l));
  assert.ok(firstCell > 0, 'the report has cell blocks');
  const head = lines.slice(0, firstCell);
  const at = head.indexOf('Results at a glance');
  assert.ok(at > 0, `no glance block before the first cell:\n${head.join('\n')}`);
  const entries = new Map<string, string[]>();
  const order: string[] = [];
  let current: string[] | undefined;
  for (const l of head.slice(at + 2)) {
    if (!l.trim()) break;
    const m = /^ {4}(\S+) {2,}(.*)$/.exec(l);
    if (m) { current = [m[2]]; entries.set(m[1], current); order.push(m[1]); } else { assert.ok(current && /^ {6,}\S/.test(l), `stray line: ${l}`); current.push(l.trim()); }
  }
  return { head, entries, order };
}

/** The title, its rule, then each caution with a blank line, then the glance heading and its rule. */
function opensWithGlance(head: string[], report: Report): void {
  const cautions = (report.cautions ?? []).flatMap((c) => [`CAUTION: ${c.text}`, '']);
  assert.deepEqual(head.slice(0, 3 + cautions.length + 2),
    [report.title, head[1], '', ...cautions, 'Results at a glance', '-------------------']);
}

/** The first number of a line, and that it is the value to 4 significant figures. */
function pointIs(line: string, value: number, what: string): void {
  const m = /^-?\d+(?:\.\d+)?(?:e[-+]?\d+)?/.exec(line);
  assert.ok(m, `${what}: no number in "${line}"`);
  assert.equal(Number(m[0]), Number(value.toPrecision(4)), `${what}: ${line}`);
}

const fromLine = (report: Report, g: GlanceEntry) => `from ${report.cells.find((c) => c.id === g.cell)?.title || g.cell}`;

describe('the text report opens with the results at a glance', () => {
  for (const id of ['trough-in-range-probability', 'cooling-fail-probability', 'flush-pump-settings']) {
    it(`${id}: each result with how sure, its figures the uncertainty cell's own`, () => {
      const report = reportOfTemplate(id);
      const { head, entries, order } = opening(formatReport(report));
      opensWithGlance(head, report);
      const glance = report.glance ?? [];
      assert.deepEqual(order, glance.map((g) => g.name));
      let followed = 0;
      for (const g of glance) {
        const lines = entries.get(g.name)!;
        assert.equal(lines.at(-1), fromLine(report, g), g.name);
        if (!g.sure) continue;
        followed++;
        const unc = report.cells.find((c) => c.id === g.sure!.cell)!;
        const x = (unc.results as Record<string, UncertaintyResult>)[g.name];
        const samples = (unc.samples as number) - x.failed;
        if (g.kind === 'verdict') {
          assert.equal(typeof x.probability, 'number', g.name);
          const m = /^yes in (\S+) of ([\d,]+) samples \(± (\S+) points, Monte Carlo\)$/.exec(lines[0]);
          assert.ok(m, `${g.name}: ${lines[0]}`);
          assert.equal(m[1], x.shown, `${g.name} probability`);
          assert.equal(Number(m[2].replace(/,/g, '')), samples, `${g.name} samples`);
          const se = 100 * x.probabilitySE!;
          assert.ok([1, 2].some((d) => Number(m[3]) === Number(se.toPrecision(d))), `${g.name}: ± ${m[3]} points for an SE of ${se}`);
          assert.equal(lines[1], `at the point values: ${g.value!.truth ? 'yes' : 'no'}`);
        } else {
          pointIs(lines[0], g.value!.value, g.name);
          assert.match(lines[0], / at the point values$/);
          const p = x.percentiles!;
          assert.equal(lines[1], `95% interval ${p.p025.shown} to ${p.p975.shown} (2.5 to 97.5 percentile of ${samples.toLocaleString('en-US')} Monte Carlo samples)`);
          // the shown ends are the percentiles themselves, rounded
          for (const [shown, q] of [[p.p025.shown, x.p025!], [p.p975.shown, x.p975!]] as const) {
            assert.ok(Math.abs(parseFloat(shown) - q.value) <= 0.05 * Math.abs(q.value), `${g.name}: ${shown} for ${q.value}`);
          }
        }
      }
      assert.ok(followed >= 2, `${id}: results an uncertainty cell follows (${followed})`);
    });
  }

  for (const id of ['cooling-design', 'plasma-levels', 'dose-for-target-trough']) {
    it(`${id} (no uncertainty cell): its glance, each value to 4 figures, without how sure`, () => {
      const report = reportOfTemplate(id);
      const text = formatReport(report);
      const { head, entries, order } = opening(text);
      opensWithGlance(head, report);
      const glance = report.glance ?? [];
      assert.ok(glance.length > 0, `${id} lists results at a glance`);
      assert.deepEqual(order, glance.map((g) => g.name));
      for (const g of glance) {
        const lines = entries.get(g.name)!;
        assert.deepEqual(lines.slice(1), [fromLine(report, g)], g.name);
        if (g.kind === 'verdict') assert.equal(lines[0], g.value!.truth ? 'yes' : 'no');
        else if (g.value) pointIs(lines[0], g.value.value, g.name);
        if (g.standardError) assert.match(lines[0], new RegExp(` ± ${Number(g.standardError.value.toPrecision(4))}\\b.* \\(SE\\)$`), g.name);
      }
      const block = head.slice(head.indexOf('Results at a glance')).join('\n');
      assert.doesNotMatch(block, /how sure|at the point values|95% interval|Monte Carlo/);
    });
  }
});
