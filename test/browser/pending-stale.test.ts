// What a pending cell's element shows while its Monte Carlo computes, in the study view with the
// real engine worker (the trough template, invented numbers): never an error of values the study
// no longer has, and errors worded from the study as it is now. The reference for each message
// is the study itself: the field as it now reads, and the title a cell now has.
import { expect } from 'chai';
import type { Cell } from '../../src/index.ts';
import { until } from './helpers.ts';
import { MC, hiddenSpreadStudy, mount, study, type Live } from './monte-carlo-study.ts';

let live: Live;

/** The text of every alert in a cell's element. */
function alerts(article: HTMLElement): string[] {
  const el = article.querySelector('[data-cell], uncertainty-cell, parameters-cell') ?? article.lastElementChild;
  return [...(el?.shadowRoot?.querySelectorAll('[role="alert"]') ?? [])].map((a) => a.textContent!.trim());
}

/** Makes an edit and waits until its answer is drawn. */
async function edited(l: Live, cell: Cell): Promise<void> {
  const before = l.answers.length;
  l.view.controller.edit({ type: 'replace', cell });
  await until(() => l.answers.slice(before).some((a) => !a.late), 'the answer to the edit', 20_000);
  await l.view.updateComplete;
  const el = l.article(cell.id).querySelector(`${cell.kind}-cell`) as HTMLElement & { updateComplete?: Promise<unknown> } | null;
  await el?.updateComplete;
}

describe('a pending cell\'s element', () => {
  afterEach(() => live?.view.remove());

  it('its line says the figures below are the previous ones only when there are some', async function () {
    this.timeout(60_000);
    const line = () => live.article(MC).querySelector('.pending-line')?.textContent ?? '';
    const doc = study();
    live = await mount(doc);
    // the first answer: the Monte Carlo has never finished, so there are no previous figures
    expect(live.pending()).to.equal(true);
    expect(line()).to.include('Its figures will show when it is done.');
    expect(line()).to.not.include('previous ones');
    await until(() => !live.pending(), 'the Monte Carlo done', 40_000);
    await live.view.updateComplete;
    const mc = doc.cells.find((c) => c.id === MC)!;
    await edited(live, { ...mc, seed: 11 } as Cell);
    expect(live.pending()).to.equal(true);
    expect(line()).to.include('the figures below are the previous ones');
  });

  it('the Monte Carlo\'s samples out of range, then put right: pending, its element shows no error about the old count', async function () {
    this.timeout(60_000);
    const doc = study();
    live = await mount(doc);
    const mc = doc.cells.find((c) => c.id === MC)!;
    await edited(live, { ...mc, samples: 200_000 } as Cell);
    expect(live.pending()).to.equal(false);
    expect(alerts(live.article(MC)).join(' ')).to.include('200,000 samples is more than this cell draws');
    await edited(live, mc);
    expect(live.pending()).to.equal(true);
    expect(live.article(MC).classList.contains('pending')).to.equal(true);
    // the samples field reads 1,500: an error about 200,000 would be one the study no longer has
    const field = live.article(MC).querySelector('uncertainty-cell')!.shadowRoot!.querySelector('input[data-field="samples"]') as HTMLInputElement;
    expect(field.value).to.equal('1500');
    expect(alerts(live.article(MC))).to.deep.equal([]);
    await until(() => !live.pending(), 'the Monte Carlo result', 40_000);
  });

  it('a pending cell\'s wait on another cell is worded with that cell\'s title as it is now', async function () {
    this.timeout(60_000);
    const doc = study();
    // many samples: the Monte Carlo is still computing when the title changes
    doc.cells = doc.cells.map((c) => (c.id === MC ? { ...c, samples: 40_000 } as Cell : c));
    const other = { id: 'other', kind: 'parameters', title: 'Extra dose', items: [{ name: 'extra', value: '2 mg /' }] } as Cell;
    const after = { id: 'after', kind: 'parameters', items: [{ name: 'upper', value: 'trough_p975 + 1 mg / L' }, { name: 'twice', value: 'extra * 2' }] } as Cell;
    doc.cells.push(other, after);
    live = await mount(doc);
    await until(() => live.view.controller.pending.includes('after'), 'the reader pending', 20_000);
    await until(() => alerts(live.article('after')).some((a) => a.includes('Extra dose')), 'the wait on "Extra dose"', 20_000);
    await edited(live, { ...other, title: 'Extra load' } as Cell);
    expect(live.view.controller.pending).to.include('after');
    const words = alerts(live.article('after')).join(' ');
    expect(words).to.include('Extra load');
    expect(words).to.not.include('Extra dose');
  });

  it('a "spread not carried" warning of the previous figures is greyed with them while the cell is pending', async function () {
    this.timeout(60_000);
    const doc = hiddenSpreadStudy();
    live = await mount(doc);
    const shadow = () => live.article('how').querySelector('uncertainty-cell')!.shadowRoot!;
    const warning = await until(() => !live.view.controller.pending.includes('how') && shadow().querySelector('p.hidden-spread'), 'the warning', 30_000);
    const current = getComputedStyle(warning).color;
    // many more samples: pending for a while, its previous figures and warning still shown
    await edited(live, { ...doc.cells[1], samples: 60_000 } as Cell);
    expect(live.view.controller.pending).to.include('how');
    const stale = shadow().querySelector('p.hidden-spread')!;
    const figures = shadow().querySelector('.figures')!;
    expect(getComputedStyle(stale).color).to.equal(getComputedStyle(figures).color);
    expect(getComputedStyle(stale).color).to.not.equal(current);
  });
});
