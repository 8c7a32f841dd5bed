// The band around a run (the pump-settings template: a tank flush with a log-normal flow and
// `band: true`, invented numbers) drawn by a session that defers its Monte Carlo cells, as the
// app's worker does: samples and band in slices, counted in the progress, cancelled by an edit
// of an input. The reference for every figure is the unsliced evaluation of the same document
// with the same seed, which must agree bit for bit (the report's JSON, every digit).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { openSession, reportJson } from './helpers.ts';
import type { Cell, Report } from '../../src/index.ts';

type Doc = { format: string; version: number; title: string; cells: Cell[] };
const MC = 'flow-spread';

/** The template with fewer samples (the tests stay quick) and the flow set to `Q` when given. */
function flush(samples: number, Q?: string): Doc {
  const d: Doc = JSON.parse(readFileSync(new URL('../../examples/flush-pump-settings.ratebook.json', import.meta.url), 'utf8'));
  d.cells = d.cells.map((c) => {
    if (c.id === MC) return { ...c, samples } as Cell;
    if (c.id === 'tank' && Q) return { ...c, items: (c as Extract<Cell, { kind: 'parameters' }>).items.map((it) => (it.name === 'Q' ? { ...it, value: Q } : it)) } as Cell;
    return c;
  });
  return d;
}

const band = (r: Report) => (r.cells.find((c) => c.id === MC) as { bands?: Array<{ t?: number[]; samples?: number }> }).bands?.[0];

describe('the band in slices: the same figures, counted in the progress', () => {
  it('one unit per slice: samples, then the band\'s samples, then its grid times sorted a slice at a time; the report equals the unsliced one', () => {
    const doc = flush(300);
    const at = openSession(doc, false).report();
    assert.equal(band(at)?.samples, 300, 'the unsliced report has its band');
    const s = openSession(doc, true);
    const seen: Array<{ done: number; total: number; unit: string }> = [];
    let slices = 0;
    for (let w = s.work(0); w; w = s.work(0)) {
      slices++;
      if (w.progress) seen.push({ done: w.progress.done, total: w.progress.total, unit: w.progress.unit });
    }
    // 300 samples, 300 band samples, then each of the band's grid times sorted in a slice of its own
    assert.ok(slices > 600 + band(at)!.t!.length - 2, `slices: ${slices}`);
    assert.ok(seen.every((p) => p.unit === 'model runs' && p.total === 600));
    for (let i = 1; i < seen.length; i++) assert.ok(seen[i].done >= seen[i - 1].done);
    assert.equal(seen[0].done, 1);
    assert.equal(seen.at(-1)!.done, 600);
    assert.ok(seen.some((p) => p.done > 300 && p.done < 600), 'the band\'s samples are counted');
    assert.equal(reportJson(s.report()), reportJson(at));
  });

  it('uneven slices (0 to 2 ms) give the same report', () => {
    const doc = flush(250);
    let i = 0;
    const s = openSession(doc, true);
    while (s.work(performance.now() + (i++ % 3)));
    assert.equal(reportJson(s.report()), reportJson(openSession(doc, false).report()));
  });

  it('an edit of the flow while the band is drawn cancels it: samples and band start again on the new value, and end equal to a fresh evaluation', () => {
    const doc = flush(200);
    const s = openSession(doc, true);
    let w = s.work(0);
    while (w && !(w.progress && w.progress.done > 250)) w = s.work(0);
    assert.ok(w?.progress && w.progress.done > 250 && w.progress.done < 400, 'in the band\'s samples');
    const old = band(s.report());
    const next = flush(200, '100 L / min');
    const r = s.apply({ type: 'replace', cell: next.cells.find((c) => c.id === 'tank')! });
    assert.ok(r.ok);
    // the other cells answer at once with the new flow; the Monte Carlo cell keeps its old figures, pending
    const fresh = openSession(next, false).report();
    assert.deepEqual(r.report.cells.find((c) => c.id === 'run'), fresh.cells.find((c) => c.id === 'run'));
    assert.ok(s.pending().includes(MC));
    assert.deepEqual(band(r.report), old);
    assert.equal(s.work(0)!.progress!.done, 1, 'started again from the first sample');
    while (s.work(0));
    assert.equal(reportJson(s.report()), reportJson(fresh));
    assert.notEqual(JSON.stringify(band(s.report())), JSON.stringify(band(openSession(doc, false).report())));
  });

  it('an edit elsewhere (the note) lets the band go on', () => {
    const doc = flush(150);
    const s = openSession(doc, true);
    for (let k = 0; k < 200; k++) s.work(0);
    const note = doc.cells.find((c) => c.kind === 'note')!;
    const edited = { ...note, text: 'Another note.' } as Cell;
    assert.ok(s.apply({ type: 'replace', cell: edited }).ok);
    assert.equal(s.work(0)!.progress!.done, 201);
    while (s.work(0));
    assert.equal(reportJson(s.report()), reportJson(openSession({ ...doc, cells: doc.cells.map((c) => (c === note ? edited : c)) }, false).report()));
  });
});
