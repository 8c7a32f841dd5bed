// What a slider drag asks of the page, in the study view with the real engine worker (the
// trough template, invented numbers, its Monte Carlo cell left out, a slider on CL): each
// position is drawn once, with the engine's answer, and of the study's expression fields only
// the dragged value's editor is given a transaction, one per position (its new text). Each
// transaction makes an editor read the page's selection, which lays the whole page out.
// Speed itself is measured by `npm run bench -- "dragging a slider"`, not here.
import { expect } from 'chai';
import { StateEffect } from '@codemirror/state';
import { EditorView } from '@codemirror/view';
import { deep, until } from './helpers.ts';
import { MC, mount, runTrough, study, type Live } from './monte-carlo-study.ts';

let live: Live | undefined;

/** Every editor of the page, by its field's label, each counting the transactions it is given from now on. */
function countTransactions(root: ParentNode): Map<string, { n: number; texts: string[] }> {
  const counts = new Map<string, { n: number; texts: string[] }>();
  for (const dom of deep(root, '.cm-editor')) {
    const view = EditorView.findFromDOM(dom as HTMLElement)!;
    const host = (dom.getRootNode() as ShadowRoot).host as HTMLElement & { label: string };
    const key = counts.has(host.label) ? `${host.label} (${counts.size})` : host.label;
    const c = { n: 0, texts: [] as string[] };
    counts.set(key, c);
    view.dispatch({ effects: StateEffect.appendConfig.of(EditorView.updateListener.of((u) => {
      c.n += u.transactions.length;
      if (u.docChanged) c.texts.push(u.state.doc.toString());
    })) });
    c.n = 0; // the listener hears the transaction that added it
  }
  return counts;
}

describe('a slider drag and the study\'s editors', () => {
  afterEach(() => live?.view.remove());

  it('draws each position once with its answer, and gives only the dragged value\'s editor a transaction, one per position', async function () {
    this.timeout(40_000);
    const doc = study();
    doc.cells = doc.cells.filter((c) => c.id !== MC);
    live = await mount(doc);
    const { view, answers } = live;
    const slider = await until(() => deep(view.shadowRoot!, 'input.slider')[0] as HTMLInputElement | undefined, 'the CL slider');
    await until(() => deep(view.shadowRoot!, '.cm-editor').length >= 10, 'the editors');
    await view.updateComplete;
    const counts = countTransactions(view.shadowRoot!);
    expect(counts.size, 'editors on the page').to.be.at.least(10);
    expect(counts.has('Value of CL')).to.equal(true);
    const troughs: number[] = [];
    for (let i = 0; i < 4; i++) {
      const before = answers.length;
      slider.value = String(Number(slider.min) + ((Number(slider.max) - Number(slider.min)) * (i + 2)) / 10);
      slider.dispatchEvent(new Event('input', { bubbles: true, composed: true }));
      // the edit waits for its answer to be drawn: nothing asks the view to render now
      expect(view.isUpdatePending, `position ${i}: the view is not drawn before the answer`).to.equal(false);
      await until(() => answers.length > before, `the answer to position ${i}`, 20_000);
      await view.updateComplete;
      await new Promise((r) => setTimeout(r, 50)); // any deferred editor update has had its turn
      troughs.push(runTrough(view.controller.report)!);
    }
    const cl = counts.get('Value of CL')!;
    expect(cl.n, 'transactions given to the dragged value\'s editor').to.equal(4);
    expect(cl.texts).to.have.length(4);
    for (const t of cl.texts) expect(t).to.match(/ L \/ h$/);
    for (const [label, c] of counts) if (label !== 'Value of CL') expect(c.n, `transactions given to "${label}"`).to.equal(0);
    // the drag did happen: clearance rising, the trough falls
    for (let i = 1; i < troughs.length; i++) expect(troughs[i]).to.be.below(troughs[i - 1]);
  });
});
