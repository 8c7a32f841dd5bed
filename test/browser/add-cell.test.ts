// Adding a cell from the Add bar: focus moves into the new cell's first field, a new run
// integrates every law of the study, and laws are offered by what they describe (their state
// and their cell's title), not by cell id.
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import { StudyView } from '../../components/study-view.ts';
import { KINDS, ADDABLE } from '../../components/cells/registry.ts';
import type { Study } from '../../src/index.ts';
import falling from '../../examples/falling-body-drag.ratebook.json';
import plasma from '../../examples/plasma-levels.ratebook.json';
import { mountStudy } from './mount-study.ts';
import { deep, until } from './helpers.ts';

const mount = mountStudy;

/** The element that has focus, looked for through shadow roots. */
function focused(): Element | null {
  let el: Element | null = document.activeElement;
  while (el?.shadowRoot?.activeElement) el = el.shadowRoot.activeElement;
  return el;
}

/** The field's accessible name: its own aria-label, or its expression field's label. */
function nameOf(el: Element | null): string {
  if (!el) return '(nothing)';
  const host = (el.getRootNode() as ShadowRoot).host;
  return el.getAttribute('aria-label') ?? (host?.localName === 'expr-field' ? host.getAttribute('label') ?? '' : el.localName);
}

const addButton = (view: StudyView, kind: keyof typeof KINDS) =>
  [...view.shadowRoot!.querySelectorAll('.add button')].find((b) => b.textContent === KINDS[kind].label) as HTMLButtonElement;

/** The first field of a new cell of each kind, by its accessible name. */
const FIRST_FIELD: Record<string, string> = {
  parameters: 'Name of parameter 1',
  rate: 'State name',
  simulate: 'Start of the run',
  phase: 'Lower end of the range',
  data: 'Name of column 1',
  fit: 'Estimate 1: parameter or state',
  nca: 'Dose',
  solve: 'Parameter or state to vary',
  sensitivity: 'Result to follow 1',
  compare: 'Name of scenario 1',
  uncertainty: 'Names to carry the uncertainty to, separated by commas',
  note: 'Note text',
};

describe('adding a cell', () => {
  afterEach(() => document.querySelectorAll('study-view').forEach((v) => v.remove()));

  it('moves focus from the Add button into the new cell\'s first field, for every kind', async function () {
    this.timeout(30000);
    const view = await mount(plasma);
    for (const kind of ADDABLE) {
      const button = addButton(view, kind);
      button.focus();
      await sendKeys({ press: 'Enter' });
      const last = view.controller.study!.cells.at(-1)!;
      expect(last.kind, `a ${kind} cell was added`).to.equal(kind);
      await until(() => focused() !== button && focused() !== document.body, `focus to leave the Add button (${kind})`);
      const article = view.shadowRoot!.querySelector(`article[data-cell="${last.id}"]`)!;
      expect(article.contains((focused()!.getRootNode() as ShadowRoot).host) || deep(article, '*').includes(focused()!), `focus is inside the new ${kind} cell`).to.equal(true);
      expect(nameOf(focused()), `the first field of the new ${kind} cell`).to.equal(FIRST_FIELD[kind]);
    }
  });

  it('typing right after adding a parameters cell names its first parameter', async function () {
    this.timeout(20000);
    const view = await mount(plasma);
    addButton(view, 'parameters').focus();
    await sendKeys({ press: 'Enter' });
    await until(() => nameOf(focused()) === 'Name of parameter 1', 'focus in the name');
    await sendKeys({ press: 'Control+a' });
    await sendKeys({ type: 'Vd' });
    const id = view.controller.study!.cells.at(-1)!.id;
    await until(() => (view.controller.study!.cells.find((c) => c.id === id) as { items?: Array<{ name: string }> }).items?.[0].name === 'Vd', 'the name typed into the new cell');
  });

  it('a new run integrates every law of the study', async function () {
    this.timeout(20000);
    const view = await mount(falling);
    addButton(view, 'simulate').click();
    await view.updateComplete;
    const run = view.controller.study!.cells.at(-1)! as { kind: string; rates: string[]; id: string };
    expect(run.kind).to.equal('simulate');
    expect(run.rates).to.deep.equal(['fall', 'distance']);
    const cell = view.shadowRoot!.querySelector(`article[data-cell="${run.id}"] simulate-cell`) as HTMLElement & { updateComplete: Promise<unknown> };
    await cell.updateComplete;
    const boxes = [...cell.shadowRoot!.querySelectorAll('input[type="checkbox"][data-field="rates"]')] as HTMLInputElement[];
    expect(boxes.map((b) => b.checked)).to.deep.equal([true, true]);
  });

  it('lists laws by their state and title in runs, fits and phase cells', async function () {
    this.timeout(20000);
    const view = await mount(falling);
    const run = deep(view.shadowRoot!, 'simulate-cell')[0];
    const labels = [...run.shadowRoot!.querySelectorAll('label')].filter((l) => l.querySelector('input[type="checkbox"][data-field="rates"]')).map((l) => l.textContent!.trim());
    expect(labels).to.deep.equal(['v (Speed with quadratic drag)', 'x (Distance fallen)']);
    const phase = deep(view.shadowRoot!, 'phase-cell')[0];
    expect([...phase.shadowRoot!.querySelectorAll('select option')].map((o) => o.textContent!.trim()).slice(0, 2)).to.deep.equal(['v (Speed with quadratic drag)', 'x (Distance fallen)']);
    expect((phase.shadowRoot!.querySelector('select') as HTMLSelectElement).value, 'the phase cell still refers to the law by id').to.equal('fall');

    const other = await mount(plasma);
    const fit = deep(other.shadowRoot!, 'fit-cell')[0];
    const fitLabels = [...fit.shadowRoot!.querySelectorAll('label')].filter((l) => l.querySelector('input[type="checkbox"][data-field="rates"]')).map((l) => l.textContent!.trim());
    expect(fitLabels).to.deep.equal(['Cp (One compartment)']);
  });
});
