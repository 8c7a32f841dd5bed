// The band around a run drawn after a Monte Carlo cell's samples, in the study view with the
// real engine worker (the pump-settings template: a tank flush with a log-normal flow and
// `band: true`, invented numbers). While the samples and the band are pending, an edit's
// answer brings every other cell's new figures; an edit of the flow while the band is drawn
// cancels it, and the band computed again equals, bit for bit, the same study evaluated at
// once in this page (`runStudy`, no slices). Speed is measured by `npm run bench`, not here.
import { expect } from 'chai';
import { StudyView } from '../../components/study-view.ts';
import '../../components/cells/registry.ts';
import type { EngineAnswer } from '../../components/engine-client.ts';
import { runStudy, type Cell, type CellReport, type Study } from '../../src/index.ts';
import flush from '../../examples/flush-pump-settings.ratebook.json';
import { until } from './helpers.ts';

const MC = 'flow-spread';
/**
 * Enough samples that the band's half of the work outlasts the worker's progress interval
 * (250 ms) on a fast, quiet machine: with 1,500 it could finish between two progress messages,
 * and the test never saw it under way.
 */
const SAMPLES = 10_000;

function study(Q?: string): Study {
  const doc = structuredClone(flush) as unknown as Study;
  doc.cells = doc.cells.map((c) => {
    if (c.id === MC) return { ...c, samples: SAMPLES } as Cell;
    if (c.id === 'tank' && Q) return { ...c, items: (c as Extract<Cell, { kind: 'parameters' }>).items.map((it) => (it.name === 'Q' ? { ...it, value: Q } : it)) } as Cell;
    return c;
  });
  return doc;
}

function atOnce(doc: Study): Report {
  const r = runStudy(doc);
  if (!r.ok) throw new Error(r.error.message);
  return r.report;
}
type Report = { readonly cells: readonly CellReport[] };
const cellOf = (r: Report | undefined, id: string) => r?.cells.find((c) => c.id === id);
const tLimit = (r: Report | undefined) => (cellOf(r, 'run') as { results?: { t_limit?: { value: number } } } | undefined)?.results?.t_limit?.value;
const bandOf = (r: Report | undefined) => (cellOf(r, MC) as { bands?: unknown[] } | undefined)?.bands?.[0];

let view: StudyView | undefined;

describe('the band around a run, drawn after the samples', () => {
  afterEach(() => view?.remove());

  it('an edit of the flow while the band is drawn: the other cells answer at once, the band is cancelled and drawn again on the new flow, equal to the unsliced one', async function () {
    this.timeout(90_000);
    const doc = study();
    // the reference figures first: computed in this page, they would hold it while the worker works
    const old = JSON.stringify(cellOf(atOnce(doc), MC));
    const edited = study('100 L / min');
    const fresh = atOnce(edited);
    expect(JSON.stringify(bandOf(fresh))).to.not.equal(JSON.stringify(JSON.parse(old).bands?.[0]));
    view = StudyView.create();
    document.body.append(view);
    const answers: EngineAnswer[] = [];
    view.controller.onAnswer((a) => answers.push(a));
    view.controller.open('band', doc);
    await until(() => answers.length > 0, 'the first answer', 20_000);
    expect(answers[0].pending).to.include(MC);
    // the band's samples under way: past the cell's own samples, counted as model runs
    const p = await until(() => {
      const q = view!.controller.progress;
      return q?.cell === MC && q.done > SAMPLES && q.done < q.total ? q : undefined;
    }, 'the band being drawn', 60_000);
    expect(p.unit).to.equal('model runs');
    expect(p.total).to.equal(2 * SAMPLES);
    const c = view;
    const article = () => c.shadowRoot!.querySelector(`article[data-cell="${MC}"]`) as HTMLElement;
    await c.updateComplete;
    expect(article().querySelector('.pending-line .count')!.textContent).to.match(new RegExp(`^\\d{1,3}(,\\d{3})* of ${(2 * SAMPLES).toLocaleString('en-US')} model runs$`));
    // every render of the cell from now on: shown as current only with the new figures
    const shown: string[] = [];
    const watch = setInterval(() => { if (!article().classList.contains('pending')) shown.push(JSON.stringify(cellOf(c.controller.report, MC))); }, 5);
    const before = answers.length;
    c.controller.edit({ type: 'replace', cell: edited.cells.find((x) => x.id === 'tank')! });
    await until(() => answers.length > before, 'the answer to the edit', 20_000);
    const answer = answers[before];
    // that answer: the run's new time to the limit, the Monte Carlo and its band still pending
    expect(answer.late).to.equal(undefined);
    expect(answer.pending).to.include(MC);
    expect(tLimit(answer.report)).to.equal(tLimit(fresh));
    expect(tLimit(answer.report)).to.be.above(tLimit(answers[0].report)!);
    await until(() => !c.controller.pending.includes(MC), 'the new band', 60_000);
    await c.updateComplete;
    clearInterval(watch);
    shown.push(JSON.stringify(cellOf(c.controller.report, MC)));
    expect(shown.filter((s) => s === old), 'the old result shown as current').to.deep.equal([]);
    expect(shown.every((s) => s === JSON.stringify(cellOf(fresh, MC)))).to.equal(true);
    expect(JSON.stringify(bandOf(c.controller.report))).to.equal(JSON.stringify(bandOf(fresh)));
  });
});
