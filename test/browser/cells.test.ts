// Each cell element on its own: renders its cell from a document and the engine's report,
// shows an engine error on the right field, and dispatches edits as new cells.
import { expect } from 'chai';
import '../../components/cells/registry.ts';
import { runStudy, switchAction, switchFind, type Cell, type FindQuery, type Report } from '../../src/index.ts';
import type { ExprField } from '../../components/expr-field.ts';

type CellEl = HTMLElement & { cell: Cell; report?: unknown; study?: Report; updateComplete: Promise<unknown> };

const study = (cells: unknown[]) => ({ format: 'ratebook-study', version: 1, title: 't', cells });

async function mount(tag: string, cells: unknown[], id: string): Promise<{ el: CellEl; report: Report }> {
  const r = runStudy(study(cells));
  if (!r.ok) throw new Error(r.error.message);
  const el = document.createElement(tag) as CellEl;
  el.cell = (cells as Cell[]).find((c) => c.id === id)!;
  el.report = r.report.cells.find((c) => c.id === id);
  el.study = r.report;
  document.body.append(el);
  await el.updateComplete;
  return { el, report: r.report };
}

const fields = (el: HTMLElement) => [...el.shadowRoot!.querySelectorAll('expr-field')] as ExprField[];
const field = (el: HTMLElement, label: string) => fields(el).find((f) => f.label === label)!;

function nextEdit(el: HTMLElement): Promise<{ cell: Record<string, unknown>; mergeKey?: string }> {
  return new Promise((resolve) => el.addEventListener('cell-edit', (e) => resolve((e as CustomEvent).detail), { once: true }));
}

function type(f: ExprField, value: string) {
  f.dispatchEvent(new CustomEvent('expr-input', { detail: { value }, bubbles: true, composed: true }));
}

const law = { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '70 degC' };
const inputs = { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h', range: ['0.1 / h', '1 / h'] }, { name: 'Ta', value: '4 degC' }] };

describe('cell elements', () => {
  afterEach(() => document.querySelectorAll('parameters-cell, rate-cell, simulate-cell, phase-cell, note-cell, data-cell, nca-cell, fit-cell, solve-cell').forEach((e) => e.remove()));

  it('parameters-cell: values, a slider for a range, an error on its field, edits', async () => {
    const { el } = await mount('parameters-cell', [{ ...inputs, items: [...inputs.items, { name: 'bad', value: 'k * 1 m + 1' }] }], 'p');
    const cells = [...el.shadowRoot!.querySelectorAll('td.result')].map((td) => td.textContent!.trim());
    expect(cells.slice(0, 2)).to.deep.equal(['0.5 /h', '4 degC']);
    expect(el.shadowRoot!.querySelectorAll('input.slider').length).to.equal(1);
    expect(field(el, 'Value of bad').error?.message).to.match(/cannot add/);
    const edit = nextEdit(el);
    type(field(el, 'Value of Ta'), '6 degC');
    const d = await edit;
    expect((d.cell.items as Array<{ value: string }>)[1].value).to.equal('6 degC');
    expect(d.mergeKey).to.equal('p:value1');
  });

  it('parameters-cell: a unit menu beside a result offers units of its dimension and writes the pick', async () => {
    const { el } = await mount('parameters-cell', [{ id: 'p', kind: 'parameters', items: [{ name: 'Q', value: '2 L / min' }, { name: 'n', value: '3' }] }], 'p');
    const picks = [...el.shadowRoot!.querySelectorAll('unit-pick')] as Array<HTMLElement & { updateComplete: Promise<unknown> }>;
    expect(picks.length, 'a plain number gets no menu').to.equal(2);
    await picks[0].updateComplete;
    const select = picks[0].shadowRoot!.querySelector('select')!;
    const offered = [...select.options].filter((o) => !o.hidden).map((o) => o.value);
    expect(offered).to.include.members(['L / h', 'gal / min', 'm^3 / s']);
    expect(picks[1].shadowRoot!.querySelector('select'), 'nothing to offer a plain number').to.equal(null);
    const edit = nextEdit(el);
    select.value = 'gal / min';
    select.dispatchEvent(new Event('change'));
    const d = await edit;
    expect((d.cell.items as Array<{ unit?: string }>)[0].unit).to.equal('gal / min');
  });

  it('parameters-cell: a unit of the wrong dimension is shown under its result', async () => {
    const { el } = await mount('parameters-cell', [{ id: 'p', kind: 'parameters', items: [{ name: 'P', value: '3 kW', unit: 'mg' }] }], 'p');
    expect(el.shadowRoot!.querySelector('td.result .foot-error')!.textContent).to.match(/cannot be shown in mg/);
  });

  it('rate-cell: the law, its unit and start, the rate at the start, a dimension error on the rate', async () => {
    const { el: plain } = await mount('rate-cell', [inputs, law], 'law');
    const pick = plain.shadowRoot!.querySelector('unit-pick') as HTMLElement & { updateComplete: Promise<unknown> };
    await pick.updateComplete;
    const menu = pick.shadowRoot!.querySelector('select')!;
    const toF = nextEdit(plain);
    menu.value = 'degF';
    menu.dispatchEvent(new Event('change'));
    expect((await toF).cell.unit, 'the state is shown in the unit picked').to.equal('degF');
    const { el } = await mount('rate-cell', [inputs, { ...law, rate: '-k' }], 'law');
    expect(field(el, 'Rate law: the rate of change of T').error?.message).to.match(/rate of T must be temperature per time/);
    const edit = nextEdit(el);
    type(field(el, 'Rate law: the rate of change of T'), '-k * (T - Ta)');
    expect((await edit).cell.rate).to.equal('-k * (T - Ta)');
  });

  it('simulate-cell: answers, a plot with its summary, and edits of the span', async () => {
    const run = { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '8 h', find: [{ name: 't21', crossing: 'T', level: '21 degC' }] };
    const { el, report } = await mount('simulate-cell', [inputs, law, run], 'run');
    const expected = (report.cells[2].results as Record<string, { value: number }>).t21.value;
    const answer = el.shadowRoot!.querySelector('table.finds td.result')!.textContent!.trim();
    expect(answer).to.equal(`${Number(expected.toPrecision(4))} h`);
    expect(el.shadowRoot!.querySelector('time-plot')).to.exist;
    const edit = nextEdit(el);
    type(field(el, 'End of the run'), '12 h');
    expect((await edit).cell.to).to.equal('12 h');
  });

  it('simulate-cell: an error on an event amount lands on that field', async () => {
    const run = { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '8 h', events: [{ at: '1 h', set: { Ta: '5 h' } }] };
    const { el } = await mount('simulate-cell', [inputs, law, run], 'run');
    expect(field(el, 'Event 1 amount').error?.message).to.match(/must be temperature/);
  });

  it('simulate-cell: a new question kind or event action is the engine\'s rule applied to the row', async () => {
    const crossing = { name: 't21', crossing: 'T', level: '21 degC', direction: 'down', unit: 'min' };
    const run = { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '8 h', events: [{ at: '1 h', add: { T: '5 K' } }], find: [crossing] };
    const { el } = await mount('simulate-cell', [inputs, law, run], 'run');
    const pick = async (label: string, value: string) => {
      const select = el.shadowRoot!.querySelector(`select[aria-label="${label}"]`) as HTMLSelectElement;
      const edit = nextEdit(el);
      select.value = value;
      select.dispatchEvent(new Event('change'));
      return (await edit).cell;
    };
    expect((await pick('Question 1 kind', 'timeBelow')).find).to.deep.equal([switchFind(crossing as FindQuery, 'timeBelow')]);
    expect((await pick('Event 1 action', 'infuse')).events).to.deep.equal([switchAction(run.events[0], 'infuse')]);
  });

  it('phase-cell: the equilibria table and plot', async () => {
    const ph = { id: 'ph', kind: 'phase', rate: 'law', from: '-10 degC', to: '80 degC' };
    const { el } = await mount('phase-cell', [inputs, law, ph], 'ph');
    const row = el.shadowRoot!.querySelector('tbody tr')!.textContent!;
    expect(row).to.contain('4 degC').and.to.contain('attractor');
    expect(el.shadowRoot!.querySelector('phase-plot')).to.exist;
  });

  it('note-cell: shows text as text, never as HTML', async () => {
    const { el } = await mount('note-cell', [{ id: 'n', kind: 'note', text: '<img src=x onerror=alert(1)> plain' }], 'n');
    expect(el.shadowRoot!.querySelector('img')).to.equal(null);
    expect(el.shadowRoot!.textContent).to.contain('<img src=x onerror=alert(1)> plain');
  });

  it('data-cell: entries edited in place, a bad entry flagged on its row, CSV turned into a table', async () => {
    const data = { id: 'd', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: [[0, 1], [1, 'lots']] };
    const { el } = await mount('data-cell', [data], 'd');
    const rows = el.shadowRoot!.querySelectorAll('table.grid tbody tr');
    expect(rows[1].classList.contains('flagged')).to.equal(true);
    expect(rows[1].getAttribute('title')).to.match(/row 2 has "lots" where a number/);
    const edit = nextEdit(el);
    const input = el.shadowRoot!.querySelector('input[aria-label="Row 2, C"]') as HTMLInputElement;
    input.value = '0.5';
    input.dispatchEvent(new Event('change'));
    expect((await edit).cell.rows).to.deep.equal([[0, 1], [1, 0.5]]);
    el.cell = { ...data, rows: undefined, csv: 'C\tt\n2\t0\n1.5\t1\n' } as unknown as Cell;
    await el.updateComplete;
    const toTable = nextEdit(el);
    ([...el.shadowRoot!.querySelectorAll('button')].find((b) => b.textContent === 'Turn into a table') as HTMLButtonElement).click();
    const d = (await toTable).cell;
    expect(d.rows).to.deep.equal([[0, 2], [1, 1.5]]);
    expect(d.csv).to.equal(undefined);
  });

  it('solve-cell: the answer with its rounded value, a unit error on its field, edits, and the button that writes the answer into the parameter', async () => {
    const p = { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }, { name: 'Ta', value: '4 degC' }] };
    const run = { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '2 h', find: [{ name: 'T2', valueOf: 'T', at: '2 h' }] };
    const solve = { id: 's', kind: 'solve', vary: { parameter: 'k', as: 'k_new', min: '0.1 / h', max: '3 / h', roundTo: '0.05 / h' }, target: { value: 'T2', equals: '21 degC' } };
    const { el, report } = await mount('solve-cell', [p, law, run, solve], 's');
    // closed form: T(2 h) = Ta + (T0 - Ta) e^{-2k} = 21 degC at k = ln(66/17) / 2 h = 0.6782 /h, rounded to 0.7 /h
    const text = el.shadowRoot!.textContent!.replace(/\s+/g, ' ');
    expect(text).to.match(/k = 0\.678[0-9]* \/h gives T2 = 21 degC/);
    expect(text).to.match(/Rounded: k = 0\.7 \/h gives T2 = 20\.2[78] degC/);
    (el as unknown as { doc: unknown }).doc = { cells: [p, law, run, solve] };
    await el.updateComplete;
    const button = el.shadowRoot!.querySelector('button[data-use]') as HTMLButtonElement;
    expect(button.textContent!.trim()).to.equal('Set k to 0.7 /h');
    const used = nextEdit(el);
    button.click();
    const u = await used;
    expect(u.cell.id).to.equal('p');
    expect((u.cell.items as Array<{ value: string }>)[0].value).to.equal('0.7 /h');
    expect(u.mergeKey).to.equal(undefined);
    expect(report.cells[0]).to.exist;

    const { el: bad } = await mount('solve-cell', [p, law, run, { ...solve, target: { value: 'T2', equals: '21 mg' } }], 's');
    expect(field(bad, 'Wanted value of the target').error?.message).to.match(/temperature/);
    const edit = nextEdit(bad);
    type(field(bad, 'Highest value to try'), '2 / h');
    const d = await edit;
    expect((d.cell.vary as { max: string }).max).to.equal('2 / h');
    expect(d.mergeKey).to.equal('s:vary.max');
  });

  it('solve-cell: choices in a table, the nearest marked; switching to a range keeps the first and last choice', async () => {
    const p = { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }, { name: 'Ta', value: '4 degC' }] };
    const run = { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '2 h', find: [{ name: 'T2', valueOf: 'T', at: '2 h' }] };
    const solve = { id: 's', kind: 'solve', vary: { parameter: 'k', as: 'k_new', choices: ['0.25 / h', '0.5 / h', '1 / h'] }, target: { value: 'T2', equals: '21 degC' } };
    const { el } = await mount('solve-cell', [p, law, run, solve], 's');
    const rows = [...el.shadowRoot!.querySelectorAll('table.choices tbody tr')];
    expect(rows.length).to.equal(3);
    // closed form: T(2 h) at k = 0.25, 0.5, 1 /h is 44.0, 28.3, 12.9 degC; 21 degC is nearest 28.3 (0.5 /h)
    expect(rows[1].classList.contains('chosen')).to.equal(true);
    const edit = nextEdit(el);
    const radios = [...el.shadowRoot!.querySelectorAll('input[type="radio"]')] as HTMLInputElement[];
    radios[0].click();
    const d = await edit;
    expect(d.cell.vary).to.deep.equal({ parameter: 'k', as: 'k_new', min: '0.25 / h', max: '1 / h' });
  });

  it('nca-cell: the profile values, an error on the dose field, edits of the route', async () => {
    const data = { id: 'd', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: [[1, 8.2], [2, 6.7], [4, 4.5], [8, 2.0]] };
    const { el } = await mount('nca-cell', [data, { id: 'n', kind: 'nca', data: 'd', time: 't', concentration: 'C', dose: '500 mg', route: 'iv-bolus' }], 'n');
    expect(el.shadowRoot!.textContent).to.contain('AUCinf');
    const { el: bad } = await mount('nca-cell', [data, { id: 'n', kind: 'nca', data: 'd', time: 't', concentration: 'C', dose: '500 mg + k', route: 'iv-bolus' }], 'n');
    expect(field(bad, 'Dose').error?.message).to.match(/unknown name "k"/);
    const edit = nextEdit(el);
    const route = [...el.shadowRoot!.querySelectorAll('select')].find((x) => x.closest('label')?.textContent?.includes('Route'))!;
    route.value = 'extravascular';
    route.dispatchEvent(new Event('change'));
    expect((await edit).cell.route).to.equal('extravascular');
  });

  it('nca-cell: a result switched to another unit is written to units, and "as written" clears it', async () => {
    const data = { id: 'd', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: [[1, 8.2], [2, 6.7], [4, 4.5], [8, 2.0]] };
    const nca = { id: 'n', kind: 'nca', data: 'd', time: 't', concentration: 'C', dose: '500 mg', route: 'iv-bolus', prefix: 'p_', units: { tmax: 'min' } };
    const { el } = await mount('nca-cell', [data, nca], 'n');
    const pickFor = async (name: string) => {
      const pick = [...el.shadowRoot!.querySelectorAll('unit-pick')].find((p) => p.getAttribute('label') === `Show ${name} in another unit`) as HTMLElement & { updateComplete: Promise<unknown> };
      await pick.updateComplete;
      return pick.shadowRoot!.querySelector('select')!;
    };
    let edit = nextEdit(el);
    const cl = await pickFor('p_CL');
    cl.value = 'mL / min';
    cl.dispatchEvent(new Event('change'));
    expect((await edit).cell.units).to.deep.equal({ tmax: 'min', CL: 'mL / min' });
    edit = nextEdit(el);
    const tmax = await pickFor('p_tmax');
    tmax.value = '=';
    tmax.dispatchEvent(new Event('change'));
    // built on the edit before (the element takes its own edit at once): CL's unit stays
    expect((await edit).cell.units).to.deep.equal({ CL: 'mL / min' });
    edit = nextEdit(el);
    const cl2 = await pickFor('p_CL');
    cl2.value = '=';
    cl2.dispatchEvent(new Event('change'));
    expect((await edit).cell.units).to.equal(undefined);
  });

  it('fit-cell: estimates with their uncertainty, the fitted curve and residuals, an error on a guess, edits', async () => {
    const data = { id: 'd', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'T', unit: 'degC' }], rows: [[0, 70], [1, 43.7], [2, 27.7], [3, 18.1]] };
    const fit = { id: 'f', kind: 'fit', rates: ['law'], data: 'd', time: 't', observe: { T: 'T' }, estimate: [{ parameter: 'k', as: 'k_hat', guess: '0.3 / h' }] };
    const { el } = await mount('fit-cell', [inputs, law, data, fit], 'f');
    expect(el.shadowRoot!.querySelector('table.est tbody td.result')!.textContent).to.match(/\d \/h/);
    expect(el.shadowRoot!.querySelectorAll('time-plot').length).to.equal(2);
    const { el: bad } = await mount('fit-cell', [inputs, law, data, { ...fit, estimate: [{ parameter: 'k', as: 'k_hat', guess: '0.3 m' }] }], 'f');
    expect(field(bad, 'Estimate 1 guess').error?.message).to.match(/must be rate \(per time\)/);
    const edit = nextEdit(el);
    ([...el.shadowRoot!.querySelectorAll('button')].find((b) => b.textContent === 'Estimate another parameter') as HTMLButtonElement).click();
    expect(((await edit).cell.estimate as unknown[]).length).to.equal(2);
  });
});
