// Edits that do not reach a Monte Carlo cell's inputs, made while it computes, in the study view
// with the real engine worker (the trough template, invented numbers): typing in the study's note
// a keystroke 10 ms after each answer, faster than the worker's pause after an edit (SETTLE_MS, 100 ms). The samples
// go on between those edits and the result arrives while the typing goes on; only an edit of an
// input it reads holds it back (test/engine/deferred-settle.test.ts). The reference is the same
// study evaluated at once in the page, which the result must equal bit for bit.
import { expect } from 'chai';
import type { Cell } from '../../src/index.ts';
import { until } from './helpers.ts';
import { MC, atOnce, mount, study, type Live } from './monte-carlo-study.ts';

let live: Live;

describe('a Monte Carlo cell while other cells are edited', () => {
  afterEach(() => live?.view.remove());

  it('typing in the note, a keystroke 10 ms after each answer: the samples go on, and the result arrives while the typing goes on', async function () {
    this.timeout(90_000);
    // more samples than the other Monte Carlo tests: the typing goes on for a while
    const doc = study();
    doc.cells = doc.cells.map((c) => (c.id === MC ? { ...c, samples: 6000 } as Cell : c));
    live = await mount(doc);
    const { view, answers, pending, mcReport } = live;
    await until(() => view.controller.progress?.cell === MC && view.controller.progress.done > 0, 'the samples under way', 30_000);
    const note = doc.cells.find((c) => c.kind === 'note') as Extract<Cell, { kind: 'note' }>;
    const start = view.controller.progress!.done;
    // the samples drawn as each keystroke's answer arrived
    const seen: number[] = [];
    let typed = 0;
    // the samples take about 2 s on a quiet machine; a loaded one is given 60 s of typing
    const end = performance.now() + 60_000;
    while (pending() && performance.now() < end) {
      const answered = new Promise<void>((resolve) => { const off = view.controller.onAnswer((a) => { if (!a.late) { off(); resolve(); } }); });
      view.controller.edit({ type: 'replace', cell: { ...note, text: `${note.text} ${'x'.repeat(++typed)}` } }, 'caution:text');
      await answered;
      seen.push(view.controller.progress?.cell === MC ? view.controller.progress.done : pending() ? -1 : Infinity);
      await new Promise((r) => setTimeout(r, 10));
    }
    expect(pending(), `the Monte Carlo finished while the note was typed in (${typed} keystrokes)`).to.equal(false);
    expect(typed).to.be.greaterThan(2);
    // it went on from where it was, never from its first sample again, and between keystrokes:
    // the longest stretch of keystrokes that found it where the one before did is short
    // (without this, it stood still until a pause of 100 ms in the typing)
    expect(seen.every((d) => d >= start), `samples seen: ${seen.join(', ')}`).to.equal(true);
    let still = 0, longest = 0;
    for (let i = 1; i < seen.length; i++) longest = Math.max(longest, still = seen[i] === seen[i - 1] ? still + 1 : 0);
    expect(longest, `samples seen: ${seen.join(', ')}`).to.be.at.most(10);
    expect(JSON.stringify(mcReport())).to.equal(JSON.stringify(atOnce(view.controller.study!)));
  });
});
