// A slider dragged while a Monte Carlo cell exists, in the study view with the real engine
// worker (the trough template with a slider on CL, invented numbers): the answer to each position
// brings every other cell's new figures before any Monte Carlo result, and the Monte Carlo catches
// up at the last position, equal bit for bit to the same study evaluated at once in the page.
// Speed is measured by `npm run bench -- browser`, not here.
import { expect } from 'chai';
import { deep, until } from './helpers.ts';
import { MC, atOnce, mount, runTrough, study, type Live } from './monte-carlo-study.ts';

let live: Live;

describe('a slider dragged while a Monte Carlo cell exists', () => {
  afterEach(() => live?.view.remove());

  it('a slider drag: each position\'s answer brings the run\'s new trough before any Monte Carlo result, which catches up at the last position', async function () {
    this.timeout(60_000);
    const doc = study();
    live = await mount(doc);
    const { view, answers, pending, mcReport } = live;
    const slider = await until(() => deep(view.shadowRoot!, 'input.slider')[0] as HTMLInputElement | undefined, 'the CL slider');
    const troughs: number[] = [];
    for (let i = 0; i < 6; i++) {
      const before = answers.length;
      slider.value = String(Number(slider.min) + ((Number(slider.max) - Number(slider.min)) * (i + 1)) / 10);
      slider.dispatchEvent(new Event('input', { bubbles: true, composed: true }));
      await until(() => answers.slice(before).find((a) => !a.late), `the answer to position ${i}`, 20_000);
      const a = answers.slice(before).find((x) => !x.late)!;
      // every other cell is current at once; the Monte Carlo waits (or has just been restarted)
      expect(a.pending).to.deep.equal([MC]);
      expect(answers.slice(before, answers.indexOf(a)).filter((x) => x.late), 'no Monte Carlo result before the position\'s answer').to.deep.equal([]);
      troughs.push(runTrough(a.report)!);
    }
    // clearance rising: the trough falls at each position
    for (let i = 1; i < troughs.length; i++) expect(troughs[i]).to.be.below(troughs[i - 1]);
    await until(() => !pending(), 'the Monte Carlo result at the last position', 40_000);
    expect(JSON.stringify(mcReport())).to.equal(JSON.stringify(atOnce(view.controller.study!)));
  });
});
