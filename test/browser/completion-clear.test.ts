// The completion list of a field just above the Add bar leaves the bar clear: it opens above
// the field (or shortens) instead of covering it, and the bar's buttons take a click while the
// list is open.
import { expect } from 'chai';
import { sendMouse } from '@web/test-runner-commands';
import { completionStatus } from '@codemirror/autocomplete';
import { StudyView } from '../../components/study-view.ts';
import type { ExprField } from '../../components/expr-field.ts';
import type { Study } from '../../src/index.ts';
import { deep, until } from './helpers.ts';
import { viewOf } from './expr-field-helpers.ts';

const STUDY = { format: 'ratebook-study', version: 1, title: 'Flush', cells: [
  { id: 'tank', kind: 'parameters', items: [{ name: 'tau', value: '2 m^3 / (100 L / min)' }] },
] };

async function mount(): Promise<StudyView> {
  const view = StudyView.create();
  document.body.append(view);
  const answered = new Promise<void>((resolve) => { const off = view.controller.onAnswer(() => { off(); resolve(); }); });
  view.controller.open('test', structuredClone(STUDY) as Study);
  await answered;
  await view.updateComplete;
  return view;
}

const overlap = (a: DOMRect, b: DOMRect) => Math.min(a.right, b.right) - Math.max(a.left, b.left) > 0 && Math.min(a.bottom, b.bottom) - Math.max(a.top, b.top) > 0;

describe('the completion list and the Add bar', () => {
  afterEach(() => document.querySelectorAll('study-view').forEach((v) => v.remove()));

  it('does not cover the bar, whose buttons stay usable while the list is open', async function () {
    this.timeout(20000);
    const view = await mount();
    const field = deep(view.shadowRoot!, 'expr-field').find((f) => (f as ExprField).label === 'Value of tau') as ExprField;
    const bar = view.shadowRoot!.querySelector('.add')!;
    const cm = viewOf(field);
    // the field sits just above the bar, with more room below the bar than the list needs
    expect(bar.getBoundingClientRect().top - field.getBoundingClientRect().bottom).to.be.below(120);
    expect(window.innerHeight - bar.getBoundingClientRect().top).to.be.above(240);
    cm.focus();
    cm.dispatch({ changes: { from: 0, to: cm.state.doc.length, insert: 'm' }, selection: { anchor: 1 }, userEvent: 'input.type' });
    await until(() => completionStatus(cm.state) === 'active' && field.shadowRoot!.querySelector('.cm-tooltip-autocomplete'), 'the completion list');
    const list = field.shadowRoot!.querySelector('.cm-tooltip-autocomplete') as HTMLElement;
    await until(() => list.getBoundingClientRect().top > -1000 && list.getBoundingClientRect().height > 0, 'the list placed');
    await new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r)));
    const listBox = list.getBoundingClientRect();
    expect(listBox.height, 'the list shows options').to.be.above(40);
    expect(overlap(listBox, bar.getBoundingClientRect()), `the list (${Math.round(listBox.top)}…${Math.round(listBox.bottom)} px) covers the Add bar (from ${Math.round(bar.getBoundingClientRect().top)} px)`).to.equal(false);

    const note = [...bar.querySelectorAll('button')].find((b) => b.textContent === 'Note')!;
    const r = note.getBoundingClientRect();
    await sendMouse({ type: 'click', position: [Math.round(r.left + r.width / 2), Math.round(r.top + r.height / 2)] });
    await until(() => view.controller.study!.cells.at(-1)!.kind === 'note', 'a note added by a click on the bar');
  });
});
