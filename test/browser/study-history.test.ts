// Undo and redo by real key presses: inside an expression field they step through its own
// typing until it commits; after that, or outside any field, they step through the study's
// edits. The field, the study and the engine's report always agree, no text appears that the
// user did not type, and undo never re-creates the engine's worker.
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import { EditorView } from '@codemirror/view';
import { StudyView } from '../../components/study-view.ts';
import { createStudyStore } from '../../components/store.ts';
import type { ExprField } from '../../components/expr-field.ts';
import type { ToWorker } from '../../src/engine/worker-protocol.ts';
import type { Study } from '../../src/index.ts';
import { deep, until } from './helpers.ts';

const STUDY: Study = {
  format: 'ratebook-study', version: 1, title: 'Chiller check',
  cells: [
    { id: 'inputs', kind: 'parameters', items: [{ name: 'k', value: '0.9 / h' }] },
    { id: 'derived', kind: 'parameters', items: [{ name: 't_half', value: 'log(2) / k' }] },
  ],
};

const RealWorker = window.Worker;

/** The engine's real worker (as the app makes it), counted, with the type of every message sent to it. */
class CountedWorker extends RealWorker {
  static made: CountedWorker[] = [];
  readonly sent: string[] = [];
  constructor(url: string | URL, options?: WorkerOptions) {
    super(url, options);
    CountedWorker.made.push(this);
  }
  override postMessage(m: ToWorker): void {
    this.sent.push(m.type);
    super.postMessage(m);
  }
}

/** The element that has focus, looking inside shadow roots. */
function focused(): HTMLElement | null {
  let el = document.activeElement as HTMLElement | null;
  while (el?.shadowRoot?.activeElement) el = el.shadowRoot.activeElement as HTMLElement;
  return el;
}

async function mount(options: Parameters<typeof StudyView.create>[0] = {}, id = 'history'): Promise<StudyView> {
  CountedWorker.made = [];
  window.Worker = CountedWorker;
  const view = StudyView.create(options);
  document.body.append(view);
  view.controller.open(id, structuredClone(STUDY));
  await until(() => view.controller.report, 'the first report', 15000);
  await view.updateComplete;
  return view;
}

function kField(view: StudyView): ExprField {
  return deep(view.shadowRoot!, 'expr-field').find((f) => (f as ExprField).label === 'Value of k') as ExprField;
}

function editorOf(field: ExprField): EditorView {
  return EditorView.findFromDOM(field.shadowRoot!.querySelector('.cm-editor') as HTMLElement)!;
}

const studyK = (view: StudyView) => (view.controller.study!.cells[0] as { items: Array<{ value: string }> }).items[0].value;

/** The half-life the engine reports, in hours. */
function reportedHalfLife(view: StudyView): number | undefined {
  const derived = view.controller.report?.cells.find((c) => c.id === 'derived');
  const v = (derived?.values as Record<string, { si: number }> | undefined)?.t_half;
  return v ? v.si / 3600 : undefined;
}

/** Waits until the engine has answered the study as it now stands, and it is rendered. */
async function settled(view: StudyView): Promise<void> {
  await until(() => !view.controller.busy, 'the engine to answer', 10000);
  await view.updateComplete;
  for (const el of deep(view.shadowRoot!, 'parameters-cell')) await (el as unknown as { updateComplete: Promise<unknown> }).updateComplete;
  await new Promise((r) => setTimeout(r, 30));
}

describe('undo and redo by keyboard', () => {
  afterEach(() => {
    document.querySelectorAll('study-view').forEach((v) => v.remove());
    window.Worker = RealWorker;
  });

  it('inside a field they undo its typing, outside they undo the study; field, study and report agree', async function () {
    this.timeout(40000);
    const view = await mount();
    const field = kField(view);
    const editor = editorOf(field);
    // every text the field and the study ever hold, and every text the field reports
    const seen = new Set<string>();
    const watch = () => { seen.add(editor.state.doc.toString()); seen.add(studyK(view)); };
    const inputs: string[] = [];
    field.addEventListener('expr-input', (e) => inputs.push((e as CustomEvent<{ value: string }>).detail.value));

    const typed = '0.8 / h';
    // what the user typed: the old text and every prefix of the new one
    const allowed = new Set(['0.9 / h', ...[...typed].map((_, i) => typed.slice(0, i + 1))]);
    const agree = async (expected: string, what: string) => {
      await settled(view);
      watch();
      expect(editor.state.doc.toString(), `${what}: the field`).to.equal(expected);
      expect(studyK(view), `${what}: the study`).to.equal(expected);
      // closed form: t_half = ln 2 / k, so 0.770 h for k = 0.9 / h and 0.866 h for 0.8 / h
      const k = expected === '0.9 / h' ? 0.9 : 0.8;
      expect(reportedHalfLife(view), `${what}: the report`).to.be.closeTo(Math.LN2 / k, 1e-12);
    };

    // an earlier step of the study, for the keys to reach once the field has nothing to undo
    view.controller.edit({ type: 'insert', index: 2, cell: { id: 'n', kind: 'note', text: 'noted' } });
    const cellCount = () => view.controller.study!.cells.length;
    editor.focus();
    await sendKeys({ press: 'Control+a' });
    await sendKeys({ type: typed });
    await agree('0.8 / h', 'typed');
    const inField: Array<[string, string, number]> = [
      ['Control+z', '0.9 / h', 3],
      ['Control+Shift+Z', '0.8 / h', 3],
      ['Control+z', '0.9 / h', 3],
      ['Control+z', '0.9 / h', 2], // nothing left to undo in the field: the study's note goes
      ['Control+z', '0.9 / h', 2], // nothing left in the study either
      ['Control+Shift+Z', '0.8 / h', 2], // the field's own typing comes back first
      ['Control+y', '0.8 / h', 2], // nothing left to redo: new typing cleared the study's redo
      ['Control+Shift+Z', '0.8 / h', 2],
      ['Control+z', '0.9 / h', 2],
      ['Control+y', '0.8 / h', 2],
    ];
    for (const [key, expected, cells] of inField) {
      await sendKeys({ press: key });
      await agree(expected, `${key} in the field`);
      expect(cellCount(), `${key} in the field: cells`).to.equal(cells);
      expect(focused(), 'focus stays in the field').to.equal(editor.contentDOM);
    }

    editor.contentDOM.blur();
    await until(() => !editor.hasFocus, 'the field to lose focus');
    const outside: Array<[string, string]> = [
      ['Control+z', '0.9 / h'],
      ['Control+Shift+Z', '0.8 / h'],
      ['Control+z', '0.9 / h'],
      ['Control+y', '0.8 / h'],
    ];
    for (const [key, expected] of outside) {
      await sendKeys({ press: key });
      await agree(expected, `${key} outside`);
    }

    // back in the field, which has no typing of its own now: the keys go to the study
    editor.focus();
    for (const [key, expected] of [['Control+z', '0.9 / h'], ['Control+Shift+Z', '0.8 / h'], ['Control+z', '0.9 / h']] as const) {
      await sendKeys({ press: key });
      await agree(expected, `${key} in the field after its commit`);
    }

    for (const text of [...seen, ...inputs]) expect(allowed.has(text), `"${text}" was never typed`).to.equal(true);
    expect(CountedWorker.made.length, 'one worker for the whole session').to.equal(1);
    expect(CountedWorker.made[0].sent.filter((t) => t === 'open').length, 'the study is sent whole once').to.equal(1);
  });

  it('undo after a new title restores the name, in the report and in the list of studies', async function () {
    this.timeout(40000);
    const store = createStudyStore({ dbName: `ratebook-history-${Date.now()}-${Math.random().toString(36).slice(2)}` });
    const { id } = await store.createStudy(structuredClone(STUDY));
    const view = await mount({ save: async (sid, doc) => { await store.saveStudy(sid, doc); } }, id);
    const title = view.shadowRoot!.querySelector('textarea.title') as HTMLTextAreaElement;
    title.focus();
    title.select();
    await sendKeys({ type: 'Walk-in check' });
    title.blur();
    await settled(view);
    expect(view.controller.study!.title).to.equal('Walk-in check');
    expect(view.controller.report!.title).to.equal('Walk-in check');
    await view.controller.flush();
    expect((await store.listStudies())[0].title, 'the list follows the new title').to.equal('Walk-in check');

    await sendKeys({ press: 'Control+z' });
    await settled(view);
    expect(view.controller.study!.title).to.equal('Chiller check');
    expect(view.controller.report!.title).to.equal('Chiller check');
    expect(title.value).to.equal('Chiller check');
    await view.controller.flush();
    expect((await store.listStudies())[0].title, 'the list follows the undo').to.equal('Chiller check');

    await sendKeys({ press: 'Control+Shift+Z' });
    await settled(view);
    expect(title.value).to.equal('Walk-in check');
    expect(view.controller.report!.title).to.equal('Walk-in check');
    expect(CountedWorker.made.length, 'one worker').to.equal(1);
  });

  it('undo and redo send whole-document edits that re-run only the cells that differ', async function () {
    this.timeout(40000);
    const view = await mount();
    const c = view.controller;
    c.edit({ type: 'insert', index: 2, cell: { id: 'n', kind: 'note', text: 'noted' } });
    await settled(view);
    c.edit({ type: 'replace', cell: { id: 'inputs', kind: 'parameters', items: [{ name: 'k', value: '0.7 / h' }] } });
    await settled(view);
    c.undo();
    await settled(view);
    expect(studyK(view)).to.equal('0.9 / h');
    expect(c.rerun).to.deep.equal(['inputs', 'derived']);
    c.undo();
    await settled(view);
    expect(c.study!.cells.map((x) => x.id)).to.deep.equal(['inputs', 'derived']);
    expect(c.rerun).to.deep.equal([]);
    c.redo();
    c.redo();
    await settled(view);
    expect(studyK(view)).to.equal('0.7 / h');
    // closed form: ln 2 / 0.7 h^-1 = 0.990 h
    expect(reportedHalfLife(view)).to.be.closeTo(Math.LN2 / 0.7, 1e-12);
    expect(CountedWorker.made.length).to.equal(1);
    expect(CountedWorker.made[0].sent.slice(1), 'after the first message').to.not.include('open');
  });
});
