// The new controls driven by real key presses as a person types (sendKeys), in the study view
// with the real engine: a question's window, an event's number of times as an expression (and
// blank: until the end of the run, in words), a parameter's slider range. Opening a disclosure
// or moving focus writes nothing into the document.
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import { StudyView } from '../../components/study-view.ts';
import type { ExprField } from '../../components/expr-field.ts';
import type { Study } from '../../src/index.ts';
import { deep, until } from './helpers.ts';
import { viewOf } from './expr-field-helpers.ts';

/** Doses of 10 mg/L every 12 h over 72 h, C' = -k C with k = 0.1 /h (invented numbers). */
const Q12H: Study = {
  format: 'ratebook-study', version: 1, title: 'q12h (invented numbers)', cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.1 / h' }, { name: 'n_doses', value: '6' }] },
    { id: 'c', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
    { id: 'run', kind: 'simulate', rates: ['c'], from: '0 h', to: '72 h', tolerance: { relative: 1e-8 },
      events: [{ at: '0 h', every: '12 h', add: { C: '10 mg / L' } }],
      find: [{ name: 'trough', minimum: 'C' }] },
  ],
} as Study;

// closed form (superposition of first-order elimination after bolus doses): six doses of
// 10 mg/L at 0 ... 60 h, seen at 72 h: 10 e^{-1.2} (1 - e^{-7.2}) / (1 - e^{-1.2}) mg/L
const TROUGH_LAST = 10 * Math.exp(-1.2) * (1 - Math.exp(-7.2)) / (1 - Math.exp(-1.2));

let view: StudyView;

async function mount(doc: Study): Promise<StudyView> {
  const v = StudyView.create();
  document.body.append(v);
  const answered = new Promise<void>((resolve) => { const off = v.controller.onAnswer(() => { off(); resolve(); }); });
  v.controller.open('keys', structuredClone(doc));
  await answered;
  await v.updateComplete;
  return v;
}

const cellOf = (kind: string) => deep(view.shadowRoot!, `${kind}-cell`)[0] as HTMLElement & { updateComplete: Promise<unknown> };
const control = (kind: string, path: string) => cellOf(kind).shadowRoot!.querySelector(`[data-field="${path}"]`) as HTMLElement;
const runCell = () => view.controller.study!.cells.find((c) => c.id === 'run') as Extract<Study['cells'][number], { kind: 'simulate' }>;
const answer = (name: string) => (view.controller.report?.cells.find((c) => c.id === 'run')?.results as Record<string, { value: number }> | undefined)?.[name]?.value;
const activeLabel = () => {
  let a: Element | null = document.activeElement;
  while (a?.shadowRoot?.activeElement) a = a.shadowRoot.activeElement;
  return a?.closest('.cm-editor') ? (a.getRootNode() as ShadowRoot).host.getAttribute('data-field') : a?.getAttribute('data-field') ?? a?.tagName;
};

/** Focuses a disclosure's summary and opens it with Enter, as a keyboard user does. */
async function openWithKeys(summary: HTMLElement) {
  summary.focus();
  await sendKeys({ press: 'Enter' });
  await until(() => (summary.parentElement as HTMLDetailsElement).open, 'the disclosure open');
}

describe('the new controls, by key presses', () => {
  beforeEach(async function () {
    this.timeout(30_000); // the engine worker's first answer can be slow under load
    view = await mount(Q12H);
  });
  afterEach(() => view.remove());

  it('a question\'s window: typing its start and Enter changes the document and the answer', async () => {
    const before = JSON.stringify(view.controller.study);
    const summary = cellOf('simulate').shadowRoot!.querySelector('tr.more summary') as HTMLElement;
    await openWithKeys(summary);
    await sendKeys({ press: 'Tab' });
    expect(activeLabel(), 'Tab moves from the disclosure to the window start').to.equal('find[0].from');
    expect(JSON.stringify(view.controller.study), 'opening and focusing write nothing').to.equal(before);
    await sendKeys({ type: '60 h' });
    await sendKeys({ press: 'Enter' });
    await until(() => runCell().find?.[0].from === '60 h', 'the window start in the document', 8000);
    expect(runCell().find?.[0].to, 'the window end stays unset').to.equal(undefined);
    const trough = await until(() => { const v = answer('trough'); return v !== undefined && Math.abs(v - TROUGH_LAST) < 1e-4 && v; }, 'the trough over 60-72 h', 8000);
    expect(trough).to.be.closeTo(TROUGH_LAST, 1e-4);
  });

  it('a repeat count set to a parameter, then cleared: the schedule in words follows', async () => {
    const words = () => cellOf('simulate').shadowRoot!.querySelector('table.events .repeats')?.textContent ?? '';
    await until(() => /until the end of the run \(7 times\)/.test(words()), 'no count: seven doses to the end of the run');
    const field = control('simulate', 'events[0].count') as ExprField;
    viewOf(field).focus();
    await sendKeys({ type: 'n_doses' });
    await sendKeys({ press: 'Enter' });
    await until(() => runCell().events?.[0].count === 'n_doses', 'the count in the document', 8000);
    await until(() => /every 12 h, 6 times/.test(words()), 'six doses in words', 8000);
    await sendKeys({ press: 'Control+a' });
    await sendKeys({ press: 'Backspace' });
    await sendKeys({ press: 'Enter' });
    await until(() => runCell().events?.[0].count === undefined && !('count' in runCell().events![0]), 'no count in the document', 8000);
    await until(() => /repeats every 12 h until the end of the run \(7 times\)/.test(words()), '"until the end of the run" in words', 8000);
  });

  it('a slider range typed end by end gives the value a slider', async () => {
    const params = cellOf('parameters');
    const summary = params.shadowRoot!.querySelector('details.more summary') as HTMLElement;
    const before = JSON.stringify(view.controller.study);
    await openWithKeys(summary);
    await sendKeys({ press: 'Tab' });
    expect(JSON.stringify(view.controller.study), 'opening and focusing write nothing').to.equal(before);
    await sendKeys({ type: '0.05 / h' });
    await sendKeys({ press: 'Enter' });
    await sendKeys({ press: 'Tab' });
    await sendKeys({ type: '0.2 / h' });
    await sendKeys({ press: 'Enter' });
    const items = () => (view.controller.study!.cells[0] as Extract<Study['cells'][number], { kind: 'parameters' }>).items;
    await until(() => items()[0].range?.[1] === '0.2 / h', 'the range in the document', 8000);
    expect(items()[0].range).to.deep.equal(['0.05 / h', '0.2 / h']);
    expect(items()[0].value, 'the value itself is untouched').to.equal('0.1 / h');
    const slider = await until(() => params.shadowRoot!.querySelector('input.slider') as HTMLInputElement | null, 'the slider', 8000);
    expect([slider.min, slider.max]).to.deep.equal(['0.05', '0.2']);
    // the thumb sits at the value, to within one of the slider's 200 steps (the browser snaps it to its grid)
    expect(Number(slider.value)).to.be.closeTo(0.1, (0.2 - 0.05) / 200);
  });
});
