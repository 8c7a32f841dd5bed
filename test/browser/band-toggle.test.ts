// The band toggle of a simulate cell, in the study view with the real engine: by keyboard it
// writes `band: true` (one undoable edit, nothing else in the study changes), the uncertainty
// cell draws the band and the plot shades it (its edges in the data table); off removes the field;
// where the run's curves depend on no spread, or no uncertainty cell asks about the run, it says
// why there is nothing to show.
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import type { StudyView } from '../../components/study-view.ts';
import '../../components/cells/registry.ts';
import type { Cell, Study } from '../../src/index.ts';
import { deep, until } from './helpers.ts';
import { mountStudy } from './mount-study.ts';
import type { TimePlot } from '../../components/plots/time-plot.ts';

/** Newton cooling with k log-normal (invented numbers); the time to 40 degC. */
function cooling(spreadOn: 'k' | 'L', uncertain = true): Study {
  const spread = { distribution: 'lognormal', cv: 0.15 };
  return {
    format: 'ratebook-study', version: 1, title: 'cooling (invented numbers)', cells: [
      { id: 'p', kind: 'parameters', items: [
        { name: 'k', value: '0.8 / h', ...(spreadOn === 'k' ? { spread } : {}) }, { name: 'Ta', value: '20 degC' },
        { name: 'L', value: '40 degC', ...(spreadOn === 'L' ? { spread: { distribution: 'normal', sd: '1 K' } } : {}) }] },
      { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '70 degC' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '6 h', find: [{ name: 't_40', crossing: 'T', level: 'L', direction: 'down' }] },
      ...(uncertain ? [{ id: 'how', kind: 'uncertainty', of: ['t_40'], samples: 200, seed: 4 }] : []),
    ],
  } as Study;
}

let view: StudyView;
const runCell = () => deep(view.shadowRoot!, 'simulate-cell')[0] as HTMLElement & { updateComplete: Promise<unknown> };
const runDoc = () => view.controller.study!.cells.find((c) => c.id === 'run') as Extract<Cell, { kind: 'simulate' }>;
const plotOf = () => runCell().shadowRoot!.querySelector('time-plot') as TimePlot | null;
const note = () => runCell().shadowRoot!.querySelector('.band-note')?.textContent ?? '';

/** Focuses the band box and presses Space on it. */
async function toggle(): Promise<HTMLInputElement> {
  const box = runCell().shadowRoot!.querySelector('input[data-field="band"]') as HTMLInputElement;
  box.focus();
  expect(runCell().shadowRoot!.activeElement).to.equal(box);
  await sendKeys({ press: 'Space' });
  return box;
}

describe('the band toggle of a run', () => {
  afterEach(() => view?.remove());

  it('on by keyboard: band: true in the document alone, the band shaded with its note; off removes it; undo and redo step through', async function () {
    this.timeout(40_000);
    view = await mountStudy(cooling('k'));
    await until(() => view.controller.report?.cells.find((c) => c.id === 'how')?.ok, 'the uncertainty cell computing', 15000);
    const before = structuredClone(view.controller.study!);
    expect(plotOf()!.band, 'no band before the toggle').to.equal(undefined);
    const box = await toggle();
    await until(() => runDoc().band === true, 'band: true in the document');
    expect(box.checked).to.equal(true);
    // nothing but the toggle changed
    const { band: _b, ...rest } = runDoc();
    expect(rest).to.deep.equal(before.cells.find((c) => c.id === 'run'));
    expect(view.controller.study!.cells.filter((c) => c.id !== 'run')).to.deep.equal(before.cells.filter((c) => c.id !== 'run'));
    // the engine draws the band from the cell's samples, and the plot shades it
    await until(() => plotOf()?.band?.t?.length === 201, 'the band handed to the plot', 20000);
    const band = plotOf()!.band!;
    expect(band.states[0].name).to.equal('T');
    expect(band.states[0].p025[100]).to.be.below(band.states[0].p975[100]);
    expect(note()).to.match(/2\.5 to 97\.5 percentiles of 200 Monte Carlo samples \(seed 4\)/);
    expect(runCell().shadowRoot!.querySelector('time-plot')!.shadowRoot!.querySelector('.band-key')?.textContent).to.contain('percentile band');
    // the band is drawn: the plot area has its colour behind the curve, between the edges at mid-run
    const plot = plotOf()!;
    const u = plot.charts[0];
    const x = u.valToPos(band.t[100], 'x', true);
    const yMid = (u.valToPos(band.states[0].p025[100], 'y0', true) + u.valToPos(band.states[0].p975[100], 'y0', true)) / 2;
    const yCurve = u.valToPos(band.states[0].median[100], 'y0', true);
    // a point inside the band, away from the curve
    const y = Math.abs(yMid - yCurve) > 3 ? yMid : u.valToPos(band.states[0].p975[100], 'y0', true) + 2 * Math.sign(yCurve - u.valToPos(band.states[0].p975[100], 'y0', true));
    const pixel = u.ctx.getImageData(Math.round(x), Math.round(y), 1, 1).data;
    expect(pixel[3], 'painted').to.be.above(0);
    expect(pixel[0] < 250 || pixel[1] < 250 || pixel[2] < 250, `shaded, not white: ${pixel.join(',')}`).to.equal(true);
    // off: the field is removed, the band goes
    await toggle();
    await until(() => runDoc().band === undefined, 'the field removed');
    await until(() => plotOf()?.band === undefined, 'no band on the plot');
    expect(view.controller.study).to.deep.equal(before);
    // undo: on again (one step), then off (one step: back to the study as it was)
    view.controller.undo();
    await until(() => runDoc().band === true, 'undo turns it back on');
    await until(() => plotOf()?.band?.t?.length === 201, 'the band back', 20000);
    view.controller.undo();
    await until(() => runDoc().band === undefined, 'undo again: as it was');
    expect(view.controller.study).to.deep.equal(before);
    view.controller.redo();
    await until(() => runDoc().band === true, 'redo');
  });

  it('says why there is nothing to show: curves that depend on no spread, and no uncertainty cell at all', async function () {
    this.timeout(40_000);
    view = await mountStudy(cooling('L'));
    await until(() => view.controller.report?.cells.find((c) => c.id === 'how')?.ok, 'the uncertainty cell computing', 15000);
    await toggle();
    await until(() => /depend on no value with a spread/.test(note()), 'the reason: the curves depend on no spread', 20000);
    expect(plotOf()!.band).to.equal(undefined);
    view.remove();
    view = await mountStudy(cooling('k', false));
    await toggle();
    await until(() => /^No uncertainty cell in this study/.test(note()), 'the reason: no uncertainty cell');
    expect(note()).to.contain('"t_40"');
    expect(plotOf()!.band).to.equal(undefined);
  });
});
