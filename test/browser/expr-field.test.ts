// <expr-field>: the one-line expression editor. It shows and edits the text, reports edits
// and commits as events, marks the engine's error, completes names and shows their values.
import { expect } from 'chai';
import type { EditorView } from '@codemirror/view';
import { currentCompletions, startCompletion, completionStatus } from '@codemirror/autocomplete';
import type { ExprField } from '../../components/expr-field.ts';
import { NAMES, field, frame, record, until, viewOf } from './expr-field-helpers.ts';

function key(view: EditorView, key: string, init: KeyboardEventInit = {}): void {
  view.contentDOM.dispatchEvent(new KeyboardEvent('keydown', { key, bubbles: true, cancelable: true, ...init }));
}

afterEach(() => {
  for (const el of document.querySelectorAll('expr-field')) el.remove();
});

describe('expr-field', () => {
  it('shows its value in a one-line text box named by its label', async () => {
    const el = await field({ value: '-k * (T - Ta)' });
    const view = viewOf(el);
    expect(view.state.doc.toString()).to.equal('-k * (T - Ta)');
    const content = view.contentDOM;
    expect(content.getAttribute('aria-label')).to.equal('Rate law');
    expect(content.getAttribute('role')).to.equal('textbox');
    expect(content.getAttribute('aria-multiline')).to.equal('false');
    expect(el.shadowRoot!.querySelector('[role=alert]')).to.equal(null);
  });

  it('fires expr-input with the new text when the user types', async () => {
    const el = await field({ value: '0.35' });
    const inputs = record(el, 'expr-input');
    const view = viewOf(el);
    view.dispatch({ changes: { from: 4, insert: ' / h' }, userEvent: 'input.type' });
    expect(inputs).to.deep.equal(['0.35 / h']);
    view.dispatch({ changes: { from: 0, to: 1 }, userEvent: 'delete.backward' });
    expect(inputs).to.deep.equal(['0.35 / h', '.35 / h']);
  });

  it('takes a value set from outside without an event, and keeps the cursor when the text is equal', async () => {
    const el = await field({ value: '0.35 / h' });
    const inputs = record(el, 'expr-input');
    const view = viewOf(el);
    view.dispatch({ selection: { anchor: 3 } });
    el.value = '0.35 / h';
    await el.updateComplete;
    expect(view.state.selection.main.head).to.equal(3);
    el.value = '0.40 / h';
    await el.updateComplete;
    expect(view.state.doc.toString()).to.equal('0.40 / h');
    // only "35" became "40": the cursor before it stays put
    view.dispatch({ selection: { anchor: 1 } });
    el.value = '0.45 / h';
    await el.updateComplete;
    expect(view.state.selection.main.head).to.equal(1);
    expect(inputs).to.deep.equal([]);
  });

  it('keeps what the user is typing when an outside value arrives before the commit', async () => {
    const el = await field({ value: '1 / h' });
    const view = viewOf(el);
    view.focus();
    expect(view.hasFocus).to.equal(true);
    view.dispatch({ changes: { from: 0, to: 1, insert: '2' }, userEvent: 'input.type' });
    el.value = '3 / h';
    await el.updateComplete;
    expect(view.state.doc.toString()).to.equal('2 / h');
  });

  it('undoes and redoes its own typing by key, and leaves the key alone when it has none', async () => {
    const el = await field({ value: '0.9 / h' });
    const view = viewOf(el);
    view.focus();
    const press = (k: string, init: KeyboardEventInit) => {
      const e = new KeyboardEvent('keydown', { key: k, bubbles: true, cancelable: true, composed: true, ...init });
      view.contentDOM.dispatchEvent(e);
      return e.defaultPrevented;
    };
    view.dispatch({ changes: { from: 0, to: view.state.doc.length, insert: '0.8 / h' }, userEvent: 'input.type' });
    expect(press('z', { ctrlKey: true }), 'undo handled by the field').to.equal(true);
    expect(view.state.doc.toString()).to.equal('0.9 / h');
    expect(press('z', { ctrlKey: true }), 'nothing to undo: the key goes on').to.equal(false);
    // keyCode: how CodeMirror reads the key under Shift (a pressed key carries it)
    expect(press('Z', { ctrlKey: true, shiftKey: true, keyCode: 90 } as KeyboardEventInit), 'redo handled by the field').to.equal(true);
    expect(view.state.doc.toString()).to.equal('0.8 / h');
    expect(press('y', { ctrlKey: true }), 'nothing to redo: the key goes on').to.equal(false);
    expect(view.state.doc.toString()).to.equal('0.8 / h');
  });

  it('forgets its own typing when it commits and when a value comes from outside', async () => {
    const el = await field({ value: '0.9 / h' });
    const view = viewOf(el);
    const commits = record(el, 'expr-commit');
    view.focus();
    view.dispatch({ changes: { from: 0, to: view.state.doc.length, insert: '0.8 / h' }, userEvent: 'input.type' });
    key(view, 'Enter');
    expect(commits).to.deep.equal(['0.8 / h']);
    await Promise.resolve();
    key(view, 'z', { ctrlKey: true });
    expect(view.state.doc.toString(), 'after a commit the field has nothing to undo').to.equal('0.8 / h');
    view.dispatch({ changes: { from: 0, to: view.state.doc.length, insert: '0.7 / h' }, userEvent: 'input.type' });
    key(view, 'z', { ctrlKey: true });
    expect(view.state.doc.toString()).to.equal('0.8 / h');
    // the study went back (its undo): the field takes the value and its redo is gone, so it
    // can never join an old redo onto the new text
    el.value = '0.8 / h';
    await el.updateComplete;
    el.value = '0.9 / h';
    await el.updateComplete;
    await Promise.resolve();
    expect(view.state.doc.toString()).to.equal('0.9 / h');
    key(view, 'Z', { ctrlKey: true, shiftKey: true, keyCode: 90 } as KeyboardEventInit);
    key(view, 'y', { ctrlKey: true });
    expect(view.state.doc.toString()).to.equal('0.9 / h');
  });

  it('shows an error with a span as an alert and underlines exactly that span', async () => {
    const el = await field({ value: 'k * kk + 2', names: NAMES });
    el.error = { message: 'unknown name "kk" (did you mean "k"?)', span: [4, 6] };
    await el.updateComplete;
    const alert = el.shadowRoot!.querySelector('[role=alert]')!;
    expect(alert.textContent).to.equal('unknown name "kk" (did you mean "k"?)');
    const view = viewOf(el);
    expect(view.contentDOM.getAttribute('aria-invalid')).to.equal('true');
    expect(view.contentDOM.getAttribute('aria-describedby')).to.equal(alert.id);
    const marks = [...view.contentDOM.querySelectorAll('.cm-x-error')];
    expect(marks.length).to.be.greaterThan(0);
    const from = view.posAtDOM(marks[0], 0);
    const last = marks[marks.length - 1];
    const to = view.posAtDOM(last, last.childNodes.length);
    expect([from, to]).to.deep.equal([4, 6]);
    expect(marks.map((m) => m.textContent).join('')).to.equal('kk');
    expect(el.shadowRoot!.querySelector('.box')!.classList.contains('invalid')).to.equal(false);

    el.error = undefined;
    await el.updateComplete;
    expect(view.contentDOM.querySelectorAll('.cm-x-error').length).to.equal(0);
    expect(el.shadowRoot!.querySelector('[role=alert]')).to.equal(null);
    expect(view.contentDOM.hasAttribute('aria-invalid')).to.equal(false);
  });

  it('outlines the whole field for an error without a span', async () => {
    const el = await field({ value: '2 h + 3 kg', error: { message: 'cannot add a time and a mass' } });
    expect(el.shadowRoot!.querySelector('.box')!.classList.contains('invalid')).to.equal(true);
    expect(viewOf(el).contentDOM.querySelectorAll('.cm-x-error').length).to.equal(0);
    expect(el.shadowRoot!.querySelector('[role=alert]')!.textContent).to.equal('cannot add a time and a mass');
  });

  it('marks an error at the very end with a point marker', async () => {
    const el = await field({ value: '2 *', error: { message: 'has a syntax error', span: [3, 3] } });
    const view = viewOf(el);
    expect(view.contentDOM.querySelectorAll('.cm-x-error-point').length).to.equal(1);
    expect(view.contentDOM.querySelectorAll('.cm-x-error').length).to.equal(0);
  });

  it('colours study names, units and functions differently', async () => {
    const el = await field({ value: 'k * exp(-2 h / tau) + min(1, 2) * 5 min and pi > 0 ? 1 : 0', names: NAMES });
    const view = viewOf(el);
    const texts = (cls: string) => [...view.contentDOM.querySelectorAll(`.${cls}`)].map((e) => e.textContent);
    expect(texts('cm-x-name')).to.deep.equal(['k']);
    expect(texts('cm-x-function')).to.deep.equal(['exp', 'min']);
    expect(texts('cm-x-unit')).to.deep.equal(['h', 'min']);
    expect(texts('cm-x-constant')).to.deep.equal(['pi']);
    expect(texts('cm-x-keyword')).to.deep.equal(['and', '?', ':']);
    expect(texts('cm-x-number')).to.deep.equal(['2', '1', '2', '5', '0', '1', '0']);
    // "tau" is not known: left plain
    expect(view.contentDOM.textContent).to.contain('tau');
    el.names = [...NAMES, { name: 'tau', detail: '2 h' }];
    await el.updateComplete;
    expect(texts('cm-x-name')).to.deep.equal(['k', 'tau']);
  });

  it('offers a defined name with its value, and units, for the prefix typed', async () => {
    const el = await field({ value: '', names: NAMES });
    const view = viewOf(el);
    view.focus();
    view.dispatch({ changes: { from: 0, insert: '2 * ke' }, selection: { anchor: 6 }, userEvent: 'input.type' });
    startCompletion(view);
    const named = await until(() => currentCompletions(view.state).length > 0 && currentCompletions(view.state), 'completions for "ke"');
    const labels = named.map((c) => c.label);
    expect(labels).to.include('kelvinRate');
    expect(labels).to.include('kelvin'); // the unit
    expect(named.find((c) => c.label === 'kelvinRate')!.detail).to.equal('no value yet');

    view.dispatch({ changes: { from: 0, to: view.state.doc.length, insert: '5 m' }, selection: { anchor: 3 }, userEvent: 'input.type' });
    startCompletion(view);
    const units = await until(() => {
      const c = currentCompletions(view.state).map((o) => o.label);
      return c.includes('mg') && c;
    }, 'unit completions for "m"');
    expect(units).to.include.members(['mg', 'mL', 'min', 'mol', 'mmol']);

    view.dispatch({ changes: { from: 0, to: view.state.doc.length, insert: 'k' }, selection: { anchor: 1 }, userEvent: 'input.type' });
    startCompletion(view);
    const k = await until(() => currentCompletions(view.state).find((c) => c.label === 'k'), 'the name k');
    expect(k.detail).to.equal('0.35 /h');
    // the list is on screen, with the value beside the name
    await until(() => el.shadowRoot!.querySelector('.cm-tooltip-autocomplete'), 'the completion list');
    expect(el.shadowRoot!.querySelector('.cm-tooltip-autocomplete')!.textContent).to.contain('0.35 /h');
  });

  it('inserts "name(" for a function chosen from the list', async () => {
    const el = await field({ value: '' });
    const view = viewOf(el);
    view.focus();
    view.dispatch({ changes: { from: 0, insert: 'ex' }, selection: { anchor: 2 }, userEvent: 'input.type' });
    startCompletion(view);
    await until(() => completionStatus(view.state) === 'active' && currentCompletions(view.state).some((c) => c.label === 'exp'), 'exp offered');
    await until(() => el.shadowRoot!.querySelector('.cm-tooltip-autocomplete'), 'the completion list');
    // moving into the list selects the best match, exp; Enter accepts it rather than committing
    const commits = record(el, 'expr-commit');
    await new Promise((r) => setTimeout(r, 100)); // completion ignores keys for a moment after opening
    key(view, 'ArrowDown');
    await until(() => el.shadowRoot!.querySelector('.cm-tooltip-autocomplete li[aria-selected]'), 'an option selected');
    key(view, 'Enter');
    expect(view.state.doc.toString()).to.equal('exp(');
    expect(commits).to.deep.equal([]);
  });

  it('commits on Enter without inserting a line break', async () => {
    const el = await field({ value: '0.35 / h' });
    const commits = record(el, 'expr-commit');
    const view = viewOf(el);
    view.focus();
    view.dispatch({ selection: { anchor: 4 } });
    key(view, 'Enter');
    key(view, 'Enter', { shiftKey: true });
    expect(view.state.doc.lines).to.equal(1);
    expect(view.state.doc.toString()).to.equal('0.35 / h');
    expect(commits).to.deep.equal(['0.35 / h', '0.35 / h']);
  });

  it('commits on blur when the text changed, and not when it did not', async () => {
    const el = await field({ value: '1 / h' });
    const commits = record(el, 'expr-commit');
    const view = viewOf(el);
    view.focus();
    view.contentDOM.blur();
    await frame();
    expect(commits).to.deep.equal([]);
    view.focus();
    view.dispatch({ changes: { from: 0, to: 1, insert: '2' }, userEvent: 'input.type' });
    view.contentDOM.blur();
    await until(() => commits.length > 0, 'a commit on blur');
    expect(commits).to.deep.equal(['2 / h']);
  });

  it('joins the lines of pasted text with spaces', async () => {
    const el = await field({ value: '' });
    const inputs = record(el, 'expr-input');
    const view = viewOf(el);
    view.focus();
    const data = new DataTransfer();
    data.setData('text/plain', 't < 2 h ?\n   25 degC :\r\n 4 degC');
    view.contentDOM.dispatchEvent(new ClipboardEvent('paste', { clipboardData: data, bubbles: true, cancelable: true }));
    expect(view.state.doc.toString()).to.equal('t < 2 h ? 25 degC : 4 degC');
    expect(view.state.selection.main.head).to.equal(view.state.doc.length);
    expect(inputs).to.deep.equal(['t < 2 h ? 25 degC : 4 degC']);
  });

  it('shows the value of the name under the cursor', async () => {
    const el = await field({ value: '-k * (T - Ta)', names: NAMES });
    const view = viewOf(el);
    view.focus();
    view.dispatch({ selection: { anchor: 1 } });
    const tip = await until(() => el.shadowRoot!.querySelector('.cm-x-nameinfo'), 'the name tooltip');
    expect(tip.textContent).to.equal('k = 0.35 /h');
    view.dispatch({ selection: { anchor: 11 } });
    await until(() => el.shadowRoot!.querySelector('.cm-x-nameinfo')?.textContent === 'Ta = 21 degC', 'the tooltip for Ta');
    view.dispatch({ selection: { anchor: 4 } }); // on "*": nothing to show
    await until(() => !el.shadowRoot!.querySelector('.cm-x-nameinfo'), 'no tooltip off a name');
  });

  it('shows the value of the name under the pointer', async () => {
    const el = await field({ value: '-k * (T - Ta)', names: NAMES });
    const view = viewOf(el);
    await frame();
    const at = view.coordsAtPos(11, 1)!; // inside "Ta"
    const x = at.left + 2;
    const y = (at.top + at.bottom) / 2;
    const target = el.shadowRoot!.elementFromPoint(x, y)!;
    expect(target.textContent).to.equal('Ta');
    target.dispatchEvent(new MouseEvent('mousemove', { clientX: x, clientY: y, bubbles: true, composed: true }));
    const tip = await until(() => el.shadowRoot!.querySelector('.cm-x-nameinfo'), 'the hover tooltip');
    expect(tip.textContent).to.equal('Ta = 21 degC');
  });

  it('when read-only, cannot be edited by the user and offers no completion', async () => {
    const el = await field({ value: 'k * 2', names: NAMES, readonly: true });
    const view = viewOf(el);
    expect(view.state.readOnly).to.equal(true);
    expect(view.contentDOM.getAttribute('aria-readonly')).to.equal('true');
    view.focus();
    view.dispatch({ selection: { anchor: 1 } });
    startCompletion(view);
    await new Promise((r) => setTimeout(r, 150));
    expect(currentCompletions(view.state)).to.deep.equal([]);
    el.readonly = false;
    await el.updateComplete;
    expect(view.state.readOnly).to.equal(false);
  });
});
