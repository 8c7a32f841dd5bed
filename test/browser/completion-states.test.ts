// Completion offers a state as one of the study's names only in a field that can read states
// (the engine's `fieldReadsStates`, passed to <expr-field> as `readsStates`); elsewhere a
// state spelled like a unit is offered as that unit, as the engine reads it there
// (docs/study-format.md, names and units: a state's name hides a unit only where a state can
// be read). Driven by real key presses in the study view with the real engine.
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import { completionStatus, currentCompletions } from '@codemirror/autocomplete';
import { EditorView } from '@codemirror/view';
import { StudyView } from '../../components/study-view.ts';
import type { ExprField } from '../../components/expr-field.ts';
import type { Study } from '../../src/index.ts';
import { deep, until } from './helpers.ts';
import { mountStudy } from './mount-study.ts';

/** Invented numbers: a draining tank whose level is the state `h` (metres); time in hours. */
const study = {
  format: 'ratebook-study', version: 1, title: 'Tank (invented numbers)', cells: [
    { id: 'tank', kind: 'rate', state: 'h', unit: 'm', rate: '-0.2 / hour * h', initial: '2 m' },
    { id: 'run', kind: 'simulate', rates: ['tank'], from: '0 hour', to: '8 hour' },
  ],
} as unknown as Study;

const settle = () => new Promise((r) => setTimeout(r, 150));

async function open(): Promise<StudyView> {
  const view = await mountStudy(study, 'completion-states');
  return view;
}

/** Types `text` at the end of the field's text with real keys and returns the options listed. */
async function offered(view: StudyView, cell: string, path: string, text: string) {
  const el = await until(() => deep(view.shadowRoot!, `${cell} expr-field[data-field="${path}"]`)[0] as ExprField | undefined
    ?? (deep(view.shadowRoot!, cell)[0]?.shadowRoot?.querySelector(`expr-field[data-field="${path}"]`) as ExprField | undefined), `the ${path} field`, 8000);
  await el.updateComplete;
  const editor = EditorView.findFromDOM(el.shadowRoot!.querySelector('.cm-editor') as HTMLElement)!;
  editor.focus();
  editor.dispatch({ selection: { anchor: editor.state.doc.length } });
  await sendKeys({ type: text });
  await until(() => (completionStatus(editor.state) === 'active' ? true : undefined), `the completion list after "${text}"`, 8000);
  await settle();
  const list = currentCompletions(editor.state).map((o) => ({ label: o.label, type: o.type }));
  await sendKeys({ press: 'Escape' });
  return list;
}

describe('completion and states', () => {
  it('a field that cannot read states (the run\'s end) offers h as the unit, not as the study\'s state', async () => {
    const view = await open();
    const list = await offered(view, 'simulate-cell', 'to', ' + 1 h');
    expect(list.filter((o) => o.label === 'h'), 'h is offered once, as the hour').to.deep.equal([{ label: 'h', type: 'unit' }]);
    view.remove();
  });

  it('a field that reads states (the rate law) offers h as the study\'s state', async () => {
    const view = await open();
    const list = await offered(view, 'rate-cell', 'rate', ' + h');
    expect(list.some((o) => o.label === 'h' && o.type === 'variable'), 'the state h among the study\'s names').to.equal(true);
    view.remove();
  });
});
