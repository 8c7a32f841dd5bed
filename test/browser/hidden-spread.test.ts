// A computed value with a spread of its own (k = CL / V) hides the spreads of CL and V from
// what reads k: the uncertainty cell says so, naming them, in the study view with the real
// engine; removing k's spread (the user's edit) takes the warning away and draws CL and V.
import { expect } from 'chai';
import { StudyView } from '../../components/study-view.ts';
import '../../components/cells/registry.ts';
import type { Cell, Study } from '../../src/index.ts';
import { deep, until } from './helpers.ts';
import { hiddenSpreadStudy } from './monte-carlo-study.ts';

const STUDY: Study = hiddenSpreadStudy();

describe('a spread on a computed value, in the study view', () => {
  let view: StudyView;
  const article = (id: string) => view.shadowRoot!.querySelector(`article[data-cell="${id}"]`)!;
  const howReport = () => view.controller.report?.cells.find((c) => c.id === 'how') as { ok: boolean; warnings?: string[]; inputs?: Array<{ name: string }> } | undefined;
  const warningIn = (id: string) => deep(article(id), 'p.hidden-spread')[0] as HTMLElement | undefined;

  beforeEach(async function () {
    this.timeout(30_000); // the engine worker's first answer can be slow under load
    view = StudyView.create();
    document.body.append(view);
    view.controller.open('hidden-spread', structuredClone(STUDY));
  });
  afterEach(() => view.remove());

  it('the uncertainty cell warns, naming CL and V; k\'s spread in the parameters cell says what it stands for; removing k\'s spread draws CL and V', async function () {
    this.timeout(30_000);
    await until(() => howReport()?.ok && howReport()!.inputs, 'the uncertainty cell computing', 20_000);
    const p = await until(() => warningIn('how'), 'the warning on the uncertainty cell', 8000);
    const text = (e: Element) => e.textContent!.replace(/\s+/g, ' ').trim();
    const warning = text(p);
    expect(warning).to.contain('Spread not carried.');
    expect(warning).to.contain('k has a spread of its own, which stands for all of its uncertainty: the spreads of CL and V upstream of it are not carried through k.');
    expect(warning).to.contain('CL and V reach t_half only through k, so their spreads are not drawn at all.');
    expect(warning).to.contain("remove k's spread");
    expect(p.getAttribute('role')).to.equal('note');
    expect(warningIn('pk'), 'not the uncertainty cell\'s warning on the parameters cell').to.equal(undefined);
    // beside k's spread, the parameters cell says what it stands for
    const note = await until(() => deep(article('pk'), '.spread-note')[0] as HTMLElement | undefined, 'the note on k\'s spread', 8000);
    expect(text(note)).to.equal("k is computed from CL and V, which have spreads of their own: an uncertainty cell draws k from this spread alone, without carrying the spreads of CL and V through it. Remove this spread to carry theirs instead.");
    expect(howReport()!.inputs!.map((i) => i.name)).to.deep.equal(['k']);

    // the user removes k's spread: one edit of theirs; no value changes
    const cells = view.controller.study!.cells;
    const pk = cells[0] as Extract<Cell, { kind: 'parameters' }>;
    const { spread: _dropped, ...k } = pk.items[2];
    view.controller.edit({ type: 'replace', cell: { ...pk, items: [pk.items[0], pk.items[1], k, pk.items[3]] } });
    await until(() => howReport()?.inputs?.length === 2 && !view.controller.pending.includes('how'), 'CL and V drawn', 20_000);
    await view.updateComplete;
    await until(() => !warningIn('how'), 'the warning gone', 8000);
    await until(() => deep(article('pk'), '.spread-note').length === 0, 'the note gone with the spread', 8000);
    expect(howReport()!.warnings).to.equal(undefined);
    expect((view.controller.study!.cells[0] as Extract<Cell, { kind: 'parameters' }>).items.map((i) => i.value)).to.deep.equal(['5 L / h', '50 L', 'CL / V', 'log(2) / k']);
  });
});
