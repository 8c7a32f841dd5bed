// A Monte Carlo cell computed after every other cell, in the study view with the real engine
// worker (the trough template, invented numbers, with a slider on CL): its progress display,
// and cancelling (an input changed mid-run: the old result never shows as current, the new one
// arrives); other cells' answers before its result while the slider moves are in
// monte-carlo-slider.test.ts. The reference for every figure is the same study evaluated at
// once in this page (`runStudy`, no slices), which the result must equal bit for bit.
import { expect } from 'chai';
import type { Cell } from '../../src/index.ts';
import { until } from './helpers.ts';
import { MC, SAMPLES, atOnce, mount, runTrough, study, type Live } from './monte-carlo-study.ts';

let live: Live;

describe('a Monte Carlo cell computed after the others', () => {
  afterEach(() => live?.view.remove());

  it('shows its progress ("1,200 of 1,500 samples", a named progress element), a few updates a second, then its result equal to the unsliced one', async function () {
    this.timeout(60_000);
    const doc = study();
    live = await mount(doc);
    const { view, answers, article, mcReport, pending } = live;
    // the first answer: every other cell computed, the Monte Carlo pending
    expect(answers[0].pending).to.deep.equal([MC]);
    expect(runTrough(answers[0].report)).to.be.a('number');
    await view.updateComplete;
    expect(article(MC).classList.contains('pending')).to.equal(true);
    expect(article(MC).querySelector('header .state')!.textContent).to.equal('updating…');
    expect(article('run').classList.contains('pending')).to.equal(false);
    // the progress element, named, its text the same figures
    const seen: Array<{ at: number; done: number }> = [];
    const bar = await until(() => {
      const p = article(MC).querySelector('progress') as HTMLProgressElement | null;
      return p && p.hasAttribute('value') && p.value > 0 ? p : null;
    }, 'a progress bar with samples drawn', 30_000);
    expect(bar.getAttribute('aria-label')).to.equal('Samples drawn');
    expect(bar.max).to.equal(SAMPLES);
    const text = article(MC).querySelector('.pending-line .count')!.textContent!;
    expect(text).to.match(/^\d{1,3}(,\d{3})* of 1,500 samples$/);
    expect(Number(text.split(' ')[0].replace(/,/g, ''))).to.equal(bar.value);
    // watch the progress the page is given until the result comes
    let last = view.controller.progress;
    const t0 = performance.now();
    await until(() => {
      const p = view.controller.progress;
      if (p && p !== last) { seen.push({ at: performance.now(), done: p.done }); last = p; }
      return !pending();
    }, 'the Monte Carlo result', 40_000);
    const spent = performance.now() - t0;
    // rising, and at most one update per 250 ms (a little slack for messages that queue up)
    for (let i = 1; i < seen.length; i++) expect(seen[i].done).to.be.greaterThan(seen[i - 1].done);
    expect(seen.length).to.be.at.most(spent / 250 + 2);
    await view.updateComplete;
    expect(article(MC).classList.contains('pending')).to.equal(false);
    expect(article(MC).querySelector('progress')).to.equal(null);
    expect(answers.at(-1)!.late).to.equal(true);
    expect(JSON.stringify(mcReport())).to.equal(JSON.stringify(atOnce(doc)));
  });

  it('cancels: CL changed mid-run, the old result never shows as current, the new one arrives and equals the unsliced one', async function () {
    this.timeout(60_000);
    const doc = study();
    live = await mount(doc);
    const { view, answers, article, mcReport, pending } = live;
    await until(() => view.controller.progress?.cell === MC && view.controller.progress.done < SAMPLES, 'the samples under way', 30_000);
    const old = JSON.stringify(atOnce(doc));
    const edited = structuredClone(doc);
    const regimen = edited.cells.find((c) => c.id === 'regimen') as Extract<Cell, { kind: 'parameters' }>;
    regimen.items = regimen.items.map((it) => (it.name === 'CL' ? { ...it, value: '5.5 L / h' } : it));
    const fresh = JSON.stringify(atOnce(edited));
    expect(fresh).to.not.equal(old);
    // every render of the cell from now on: shown as current only with the new figures
    const shown: string[] = [];
    const watch = setInterval(() => { if (!article(MC).classList.contains('pending')) shown.push(JSON.stringify(mcReport())); }, 5);
    const before = answers.length;
    view.controller.edit({ type: 'replace', cell: regimen });
    await until(() => answers.length > before, 'the answer to the edit', 20_000);
    // that answer has the run's new trough, the Monte Carlo still pending with its old figures
    const answer = answers[before];
    expect(answer.late).to.equal(undefined);
    expect(answer.pending).to.deep.equal([MC]);
    expect(runTrough(answer.report)).to.be.below(runTrough(answers[0].report)!);
    await until(() => !pending(), 'the new Monte Carlo result', 40_000);
    await view.updateComplete;
    clearInterval(watch);
    shown.push(JSON.stringify(mcReport()));
    expect(shown.filter((s) => s === old), 'the old result shown as current').to.deep.equal([]);
    expect(shown.every((s) => s === fresh)).to.equal(true);
    // no answer after the edit carried the old figures as current
    for (const a of answers.slice(before)) {
      const r = JSON.stringify(a.report.cells.find((c) => c.id === MC));
      if (!(a.pending ?? []).includes(MC)) expect(r).to.equal(fresh);
    }
  });
});
