// What a person reads on the cells: messages in words (places as the editor shows them, a wait
// said once per cell), and fields coloured as the engine reads them (a state `h` is the hour
// where states cannot be read). The engine's report is real; the expected words are hand-written
// from the study documents below.
import { expect } from 'chai';
import '../../components/cells/registry.ts';
import { runStudy, type Cell, type Report } from '../../src/index.ts';
import type { ExprField } from '../../components/expr-field.ts';
import { viewOf } from './expr-field-helpers.ts';

type CellEl = HTMLElement & { cell: Cell; report?: unknown; study?: Report; doc?: { cells: Cell[] }; updateComplete: Promise<unknown> };

const study = (cells: unknown[]) => ({ format: 'ratebook-study', version: 1, title: 't', cells } as { format: string; version: number; title: string; cells: Cell[] });

async function mount(tag: string, cells: unknown[], id: string): Promise<CellEl> {
  const doc = study(cells);
  const r = runStudy(doc);
  if (!r.ok) throw new Error(r.error.message);
  const el = document.createElement(tag) as CellEl;
  el.cell = doc.cells.find((c) => c.id === id)!;
  el.report = r.report.cells.find((c) => c.id === id);
  el.study = r.report;
  el.doc = doc;
  document.body.append(el);
  await el.updateComplete;
  return el;
}

const fields = (el: HTMLElement) => [...el.shadowRoot!.querySelectorAll('expr-field')] as ExprField[];
const field = (el: HTMLElement, label: string) => fields(el).find((f) => f.label === label)!;
const foot = (el: HTMLElement) => [...el.shadowRoot!.querySelectorAll('.foot-error')].map((p) => p.textContent!.replace(/\s+/g, ' ').trim());
const alerts = (el: HTMLElement) => [...el.shadowRoot!.querySelectorAll('[role="alert"]'), ...fields(el).flatMap((f) => [...f.shadowRoot!.querySelectorAll('[role="alert"]')])]
  .map((p) => p.textContent!.trim()).filter(Boolean);

describe('messages in words', () => {
  afterEach(() => document.querySelectorAll('parameters-cell, rate-cell, simulate-cell, fit-cell').forEach((e) => e.remove()));

  it('a cell whose rows all wait says "waits on" once, with the place and problem upstream in words', async () => {
    const cells = [
      { id: 'a', kind: 'parameters', title: 'Inputs', items: [{ name: 'k', value: 'zz / h' }] },
      { id: 'b', kind: 'parameters', items: [{ name: 'k2', value: '2 * k' }, { name: 'k3', value: '3 * k' }, { name: 'k4', value: '4 * k' }] },
    ];
    const el = await mount('parameters-cell', cells, 'b');
    const said = alerts(el);
    expect(said.filter((t) => /waits on/i.test(t))).to.have.length(1);
    expect(foot(el)).to.deep.equal(['Waits on Parameters "Inputs": parameter "k", value: unknown name "zz".']);
    for (const t of said) expect(t).to.not.match(/cells\[|\.items\[/);
  });

  it('a wait on a name its cell left undefined says why: a crossing not reached by the end of the run', async () => {
    // hand-worked (invented numbers): T = 4 degC + 70 degC · exp(-0.35/h · t) is 38.76 degC at 2 h, still above 21 degC
    const cells = [
      { id: 'cool', kind: 'rate', state: 'T', unit: 'degC', initial: '74 degC', rate: '-0.35 / h * (T - 4 degC)' },
      { id: 'run', kind: 'simulate', title: 'Cooling', rates: ['cool'], from: '0 h', to: '2 h', find: [{ name: 't_21', crossing: 'T', level: '21 degC', direction: 'down' }] },
      { id: 'hold', kind: 'parameters', items: [{ name: 'discard', value: 't_21 + 1 h' }] },
    ];
    const el = await mount('parameters-cell', cells, 'hold');
    expect(foot(el)).to.deep.equal(['Waits on Run "Cooling": "t_21" was not reached: no T falling through 21 degC by the end of the run (2 h).']);
  });

  it('an error the fields do not show names its place in words at the cell\'s foot', async () => {
    const law = { id: 'drug', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '10 mg / L' };
    const data = { id: 'logger', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: [[0, 10], [1, 6], [2, 3.7]] };
    const fit = { id: 'kfit', kind: 'fit', rates: ['drug'], data: 'logger', time: 't', observe: { C: 'C' }, estimate: [{ parameter: 'k', as: 'k', guess: '0.3 / h' }] };
    const el = await mount('fit-cell', [{ id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }] }, law, data, fit], 'kfit');
    const said = alerts(el).join(' | ');
    expect(said).to.match(/Estimate 1, name/i);
    expect(said).to.not.match(/cells\[\d+\]/);
  });

  it('a duplicate name says where the first one is, in words', async () => {
    const el = await mount('parameters-cell', [{ id: 'p', kind: 'parameters', items: [{ name: 'k', value: '1 / h' }, { name: 'k', value: '2 / h' }] }], 'p');
    expect(alerts(el).join(' | ')).to.contain('"k" is already defined in Parameters "p", parameter "k", name');
  });
});

describe('a field is coloured as the engine reads it', () => {
  afterEach(() => document.querySelectorAll('parameters-cell, rate-cell, simulate-cell').forEach((e) => e.remove()));
  // invented numbers: a draining tank whose level is the state h; h is also the hour
  const cells = [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.9 / h' }] },
    { id: 'tank', kind: 'rate', state: 'h', unit: 'm', rate: '-k * h', initial: '2 m' },
    { id: 'run', kind: 'simulate', rates: ['tank'], from: '0 h', to: '8 h', events: [{ at: '1 h', every: '2 h', add: { h: 'h / 10' } }] },
  ];
  const coloured = (f: ExprField, cls: string) => [...viewOf(f).contentDOM.querySelectorAll(`.${cls}`)].map((e) => e.textContent);

  it('a state h is the hour in a parameter value and the state in the rate law', async () => {
    const params = await mount('parameters-cell', cells, 'p');
    const value = field(params, 'Value of k');
    expect(coloured(value, 'cm-x-unit')).to.deep.equal(['h']);
    expect(coloured(value, 'cm-x-name')).to.deep.equal([]);
    const rate = await mount('rate-cell', cells, 'tank');
    const law = fields(rate).find((f) => f.label.startsWith('Rate law'))!;
    expect(coloured(law, 'cm-x-name')).to.deep.equal(['k', 'h']);
    expect(coloured(law, 'cm-x-unit')).to.deep.equal([]);
  });

  it('a name whose cell failed is still the study\'s: V is the volume, not the volt', async () => {
    const failing = [
      { id: 'a', kind: 'parameters', items: [{ name: 'V', value: '30 zz' }] },
      { id: 'b', kind: 'parameters', items: [{ name: 'C0', value: '500 mg / V' }] },
    ];
    const el = await mount('parameters-cell', failing, 'b');
    const value = field(el, 'Value of C0');
    expect(coloured(value, 'cm-x-name')).to.deep.equal(['V']);
    expect(coloured(value, 'cm-x-unit')).to.deep.equal(['mg']);
  });

  it('in a run, h is the hour in times and the state in an amount added', async () => {
    const run = await mount('simulate-cell', cells, 'run');
    expect(coloured(field(run, 'End of the run'), 'cm-x-unit')).to.deep.equal(['h']);
    expect(coloured(field(run, 'Event 1 repeats every'), 'cm-x-unit')).to.deep.equal(['h']);
    expect(coloured(field(run, 'Event 1 amount'), 'cm-x-name')).to.deep.equal(['h']);
  });
});
