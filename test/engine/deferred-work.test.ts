// A session that defers its Monte Carlo cells (as the app's worker does) against the same study
// evaluated at once: the reference for every figure here is the unsliced evaluation of the same
// document with the same seed, which must agree bit for bit (the report's JSON, every digit),
// however the samples are sliced and whenever an edit cancels and restarts them.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { openSession, reportJson } from './helpers.ts';
import { openStudy, type Cell, type Edit, type Report, type StudySession } from '../../src/index.ts';

type Doc = { format: string; version: number; title: string; cells: Cell[] };
const template = (): Doc => JSON.parse(readFileSync(new URL('../../examples/trough-in-range-probability.ratebook.json', import.meta.url), 'utf8'));

/** The template with fewer samples (the tests stay quick) and, optionally, a cell reading the Monte Carlo's names. */
function small(samples = 300, downstream = false): Doc {
  const d = template();
  d.cells = d.cells.map((c) => (c.kind === 'uncertainty' ? { ...c, samples } : c));
  if (downstream) d.cells.push({ id: 'after', kind: 'parameters', items: [{ name: 'margin', value: '1 mg / L' }, { name: 'upper', value: 'trough_p975 + margin' }] } as Cell);
  return d;
}

const uncertainty = (r: Report) => r.cells.find((c) => c.kind === 'uncertainty')!;
const regimen = (doc: Doc) => doc.cells.find((c) => c.id === 'regimen')! as Extract<Cell, { kind: 'parameters' }>;

/** Runs the deferred work to the end in slices of `until()`; the number of slices. */
function finish(s: StudySession, until: () => number = () => 0): number {
  let slices = 0;
  for (let w = s.work(until()); w; w = s.work(until())) slices++;
  return slices;
}

/** The document with the clearance set to `value`. */
function withCL(doc: Doc, value: string): Doc {
  const r = regimen(doc);
  return { ...doc, cells: doc.cells.map((c) => (c === r ? { ...r, items: r.items.map((it) => (it.name === 'CL' ? { ...it, value } : it)) } : c)) };
}
const replaceRegimen = (doc: Doc): Edit => ({ type: 'replace', cell: regimen(doc) });

describe('deferred Monte Carlo: the same figures sliced or not', () => {
  it('the template at 2,000 samples, one sample per slice, equals the evaluation at once bit for bit', () => {
    const doc = template();
    const at = openSession(doc, false).report();
    const s = openSession(doc, true);
    assert.deepEqual(s.pending(), ['between-patients']);
    // before: every other cell is computed and the Monte Carlo cell holds nothing yet
    for (const c of s.report().cells) if (c.kind !== 'uncertainty') assert.deepEqual(c, at.cells.find((x) => x.id === c.id));
    assert.equal((uncertainty(s.report()) as { results?: unknown }).results, undefined);
    const slices = finish(s);
    assert.equal(slices, 2000);
    assert.deepEqual(s.pending(), []);
    assert.equal(reportJson(s.report()), reportJson(at));
  });

  it('uneven slices (a time budget of 0 to 3 ms) give the same report', () => {
    const doc = small(400);
    const at = reportJson(openSession(doc, false).report());
    let i = 0;
    const s = openSession(doc, true);
    finish(s, () => performance.now() + (i++ % 4));
    assert.equal(reportJson(s.report()), at);
  });

  it('reports progress: the samples drawn so far of the total, rising to the total', () => {
    const s = openSession(small(200), true);
    const seen: number[] = [];
    for (let w = s.work(0); w; w = s.work(0)) {
      if (w.progress) {
        assert.equal(w.progress.cell, 'between-patients');
        assert.equal(w.progress.total, 200);
        assert.equal(w.progress.unit, 'samples');
        seen.push(w.progress.done);
      }
      if (w.answer) assert.deepEqual(w.answer.rerun, ['between-patients']);
    }
    assert.deepEqual(seen, Array.from({ length: 199 }, (_, k) => k + 1));
  });
});

describe('deferred Monte Carlo: an edit cancels it and it starts again on the new values', () => {
  it('an edit of an input mid-run: the other cells answer at once, the old figures stay pending, the result equals a fresh evaluation', () => {
    const doc = small(300);
    const s = openSession(doc, true);
    finish(s);
    const before = uncertainty(s.report());
    const next = withCL(doc, '5 L / h');
    const r = s.apply(replaceRegimen(next));
    assert.ok(r.ok);
    // the run's trough is the new one at once; the Monte Carlo cell keeps its old figures, pending
    const fresh = openSession(next, false).report();
    assert.deepEqual(r.report.cells.find((c) => c.id === 'run'), fresh.cells.find((c) => c.id === 'run'));
    assert.deepEqual(s.pending(), ['between-patients']);
    assert.deepEqual(uncertainty(r.report), before);
    // part of the way, then the clearance changes again: the samples start over
    for (let k = 0; k < 120; k++) s.work(0);
    assert.equal(s.work(0)!.progress!.done, 121);
    const last = withCL(doc, '3.5 L / h');
    assert.ok(s.apply(replaceRegimen(last)).ok);
    assert.equal(s.work(0)!.progress!.done, 1);
    finish(s);
    assert.equal(reportJson(s.report()), reportJson(openSession(last, false).report()));
  });

  it('an edit back to the values of the last result still computes again, and ends with the same figures', () => {
    const doc = small(150);
    const s = openSession(doc, true);
    finish(s);
    const at = reportJson(s.report());
    assert.ok(s.apply(replaceRegimen(withCL(doc, '6 L / h'))).ok);
    for (let k = 0; k < 40; k++) s.work(0);
    assert.ok(s.apply(replaceRegimen(doc)).ok);
    assert.deepEqual(s.pending(), ['between-patients']);
    finish(s);
    assert.equal(reportJson(s.report()), at);
  });

  it('an edit that does not reach the Monte Carlo inputs lets it go on', () => {
    const doc = small(200);
    const s = openSession(doc, true);
    for (let k = 0; k < 50; k++) s.work(0);
    const note = doc.cells.find((c) => c.kind === 'note')!;
    const r = s.apply({ type: 'replace', cell: { ...note, text: 'Another caution text.' } as Cell });
    assert.ok(r.ok);
    assert.deepEqual(r.rerun, ['caution']);
    assert.equal(s.work(0)!.progress!.done, 51);
    finish(s);
    const after = { ...doc, cells: doc.cells.map((c) => (c === note ? { ...note, text: 'Another caution text.' } as Cell : c)) };
    assert.equal(reportJson(s.report()), reportJson(openSession(after, false).report()));
  });

  it('a change of seed or samples restarts it; a cell reading its names waits, then runs with its own new inputs', () => {
    const doc = small(120, true);
    const s = openSession(doc, true);
    assert.deepEqual(s.pending(), ['between-patients', 'after']);
    finish(s);
    // the reader's own input changes while the Monte Carlo is pending (its seed changed too)
    const mc = doc.cells.find((c) => c.kind === 'uncertainty')!;
    const after = doc.cells.find((c) => c.id === 'after')! as Extract<Cell, { kind: 'parameters' }>;
    const seeded = { ...mc, seed: 7 } as Cell;
    const margin = { ...after, items: [{ name: 'margin', value: '2 mg / L' }, after.items[1]] };
    const upper = (rep: Report) => (rep.cells.find((c) => c.id === 'after') as { values: Record<string, unknown> }).values.upper;
    const old = upper(s.report());
    assert.ok(s.apply({ type: 'replace', cell: seeded }).ok);
    for (let k = 0; k < 30; k++) s.work(0);
    const r = s.apply({ type: 'replace', cell: margin });
    assert.ok(r.ok);
    assert.deepEqual(upper(r.report), old, 'the reader waits for the Monte Carlo');
    assert.deepEqual(s.pending(), ['between-patients', 'after']);
    finish(s);
    const last = { ...doc, cells: doc.cells.map((c) => (c === mc ? seeded : c.id === 'after' ? margin as Cell : c)) };
    assert.equal(reportJson(s.report()), reportJson(openSession(last, false).report()));
  });

  it('the work budget stops it with the same message, sliced or not', () => {
    const doc = small(400);
    const limits = { cellWork: 60_000 };
    const a = openStudy(doc, limits);
    const b = openStudy(doc, { ...limits, defer: true });
    assert.ok(a.ok && b.ok);
    finish(b.session);
    const stopped = uncertainty(a.session.report());
    assert.equal(stopped.ok, false);
    assert.match(stopped.error!.message, /^stopped: this cell needed more than/);
    assert.equal(reportJson(b.session.report()), reportJson(a.session.report()));
  });

  it('without defer nothing is pending and there is no work to do', () => {
    const s = openSession(small(50), false);
    assert.deepEqual(s.pending(), []);
    assert.equal(s.work(Infinity), undefined);
  });
});
