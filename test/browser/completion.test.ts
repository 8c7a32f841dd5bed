// Completion in <expr-field>, driven by real key presses as a person types: the list helps
// but never changes what was typed unless the user moves into it and picks an option.
import { expect } from 'chai';
import { resetMouse, sendKeys, sendMouse } from '@web/test-runner-commands';
import { completionStatus, currentCompletions, selectedCompletion } from '@codemirror/autocomplete';
import type { EditorView } from '@codemirror/view';
import type { ExprField } from '../../components/expr-field.ts';
import { NAMES, field, record, until, viewOf } from './expr-field-helpers.ts';

/** Completion ignores keys for a moment after the list opens; wait longer than that. */
const settle = () => new Promise((r) => setTimeout(r, 150));

/** Focuses an empty field, types `text` key by key, and waits for the completion list. */
async function typeWithList(text: string, props: Parameters<typeof field>[0] = {}): Promise<{ el: ExprField; view: EditorView; commits: string[] }> {
  const el = await field({ names: NAMES, ...props });
  const view = viewOf(el);
  const commits = record(el, 'expr-commit');
  view.focus();
  await sendKeys({ type: text });
  await until(() => completionStatus(view.state) === 'active' && listOf(el), `the completion list after "${text}"`);
  await settle();
  return { el, view, commits };
}

const listOf = (el: ExprField) => el.shadowRoot!.querySelector('.cm-tooltip-autocomplete');
const first = (view: EditorView) => currentCompletions(view.state)[0];

afterEach(async () => {
  await resetMouse();
  for (const el of document.querySelectorAll('expr-field, button')) el.remove();
});

describe('expr-field completion', () => {
  // the unit spelled as typed leads the list, unselected; Enter keeps the text and commits it
  for (const [text, unit] of [['1 g', 'g'], ['100 L / min', 'min'], ['2 h', 'h']]) {
    it(`keeps "${text}" on Enter and commits it, with the unit ${unit} first in the list`, async () => {
      const { el, view, commits } = await typeWithList(text);
      expect(first(view)).to.include({ label: unit, type: 'unit' });
      expect(selectedCompletion(view.state)).to.equal(null);
      await sendKeys({ press: 'Enter' });
      expect(view.state.doc.toString()).to.equal(text);
      expect(commits).to.deep.equal([text]);
      await until(() => !listOf(el), 'the list closed');
    });
  }

  it('accepts the option the user moved to with ArrowDown, without committing', async () => {
    const { el, view, commits } = await typeWithList('1 g');
    await sendKeys({ press: 'ArrowDown' });
    expect(selectedCompletion(view.state)).to.include({ label: 'g', type: 'unit' });
    await sendKeys({ press: 'ArrowDown' });
    const picked = selectedCompletion(view.state)!;
    expect(picked.label).to.not.equal('g');
    expect(picked.label.startsWith('g')).to.equal(true);
    await sendKeys({ press: 'Enter' });
    expect(view.state.doc.toString()).to.equal(`1 ${picked.label}`);
    expect(commits).to.deep.equal([]);
    await until(() => !listOf(el), 'the list closed');
    await sendKeys({ press: 'Enter' });
    expect(commits).to.deep.equal([`1 ${picked.label}`]);
  });

  it('accepts an option the user clicks', async () => {
    const { el, view, commits } = await typeWithList('2 m');
    const option = await until(() => [...listOf(el)!.querySelectorAll('li')].find((li) => li.textContent === 'min'), 'the option min');
    const at = option.getBoundingClientRect();
    await sendMouse({ type: 'click', position: [Math.round(at.left + at.width / 2), Math.round(at.top + at.height / 2)] });
    await until(() => view.state.doc.toString() === '2 min', 'the clicked option in the text');
    expect(commits).to.deep.equal([]);
  });

  it('moves focus on with Tab, closing the list and leaving the text', async () => {
    const { el, view } = await typeWithList('2 h');
    const next = document.createElement('button');
    next.textContent = 'next';
    el.after(next);
    await sendKeys({ press: 'Tab' });
    // compared by name: chai would walk the whole editor to describe a mismatch
    expect(document.activeElement?.textContent, 'the focused element').to.equal('next');
    expect(view.state.doc.toString()).to.equal('2 h');
    await until(() => !listOf(el), 'the list closed');
  });

  it('closes the list with Escape, leaving the text and the focus', async () => {
    const { el, view, commits } = await typeWithList('1 g');
    await sendKeys({ press: 'Escape' });
    await until(() => !listOf(el), 'the list closed');
    expect(completionStatus(view.state)).to.equal(null);
    expect(view.state.doc.toString()).to.equal('1 g');
    expect(view.hasFocus).to.equal(true);
    expect(commits).to.deep.equal([]);
  });

  it('lists the study\'s names first after "0.3 *": arithmetic, not a quantity', async () => {
    const { view } = await typeWithList('0.3 * k');
    expect(first(view)).to.include({ label: 'k', type: 'variable' });
  });

  it('adds "(" to a function only when accepted, and not before one already there', async () => {
    const { view } = await typeWithList('mi');
    expect(view.state.doc.toString()).to.equal('mi');
    await sendKeys({ press: 'ArrowDown' });
    expect(selectedCompletion(view.state)).to.include({ label: 'min', type: 'function' });
    await sendKeys({ press: 'Enter' });
    expect(view.state.doc.toString()).to.equal('min(');

    view.dispatch({ changes: { from: 0, to: view.state.doc.length, insert: '(1, 2)' }, selection: { anchor: 0 } });
    await sendKeys({ type: 'ma' });
    await until(() => completionStatus(view.state) === 'active', 'the list for "ma"');
    await settle();
    await sendKeys({ press: 'ArrowDown' });
    expect(selectedCompletion(view.state)).to.include({ label: 'max', type: 'function' });
    await sendKeys({ press: 'Enter' });
    expect(view.state.doc.toString()).to.equal('max(1, 2)');
  });

  it('opens the list below the field, clear of the field\'s own box', async () => {
    const { el } = await typeWithList('1 g');
    const box = el.shadowRoot!.querySelector('.box')!.getBoundingClientRect();
    expect(listOf(el)!.getBoundingClientRect().top).to.be.at.least(box.bottom);
  });
});
