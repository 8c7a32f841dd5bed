// The ⇄ unit menu after a switch still offers the unit the value started in, and values read
// in their simplest unit on screen.
import { expect } from 'chai';
import '../../components/cells/registry.ts';
import { runStudy, type Cell } from '../../src/index.ts';

type CellEl = HTMLElement & { cell: Cell; report?: unknown; updateComplete: Promise<unknown> };
type Pick = HTMLElement & { updateComplete: Promise<unknown> };

async function mount(tag: string, cells: Array<Record<string, unknown>>, id: string): Promise<CellEl> {
  const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells });
  if (!r.ok) throw new Error(r.error.message);
  const el = document.createElement(tag) as CellEl;
  el.cell = cells.find((c) => c.id === id) as unknown as Cell;
  el.report = r.report.cells.find((c) => c.id === id);
  document.body.append(el);
  await el.updateComplete;
  return el;
}

async function offered(el: HTMLElement, label: string): Promise<{ select: HTMLSelectElement; units: string[] }> {
  const pick = [...el.shadowRoot!.querySelectorAll('unit-pick')].find((p) => p.getAttribute('label') === label) as Pick;
  await pick.updateComplete;
  const select = pick.shadowRoot!.querySelector('select')!;
  return { select, units: [...select.options].filter((o) => !o.hidden).map((o) => o.value) };
}

function pickIn(el: HTMLElement, select: HTMLSelectElement, unit: string): Promise<Record<string, unknown>> {
  const edit = new Promise<Record<string, unknown>>((resolve) => el.addEventListener('cell-edit', (e) => resolve((e as CustomEvent).detail.cell), { once: true }));
  select.value = unit;
  select.dispatchEvent(new Event('change'));
  return edit;
}

describe('units on screen', () => {
  afterEach(() => document.querySelectorAll('parameters-cell, rate-cell').forEach((e) => e.remove()));

  it('parameters-cell: after a switch, the menu offers the unit the value started in', async () => {
    // dose / vol = 8 mg / 1 dL comes out in mg / dL, a unit the menu's trade list lacks
    const items = [{ name: 'dose', value: '8 mg' }, { name: 'vol', value: '1 dL' }, { name: 'c', value: 'dose / vol' }];
    const el = await mount('parameters-cell', [{ id: 'p', kind: 'parameters', items }], 'p');
    const before = await offered(el, 'Show c in another unit');
    expect(before.units).to.not.include('mg / dL');
    const cell = await pickIn(el, before.select, 'ug / mL');
    el.remove();
    const switched = await mount('parameters-cell', [cell], 'p');
    const rows = [...switched.shadowRoot!.querySelectorAll('td.result')].map((td) => td.textContent!.trim());
    expect(rows[2]).to.match(/^80 ug \/ mL/); // hand-worked: 8 mg/dL = 8000 ug / 100 mL = 80 ug/mL
    const after = await offered(switched, 'Show c in another unit');
    expect(after.units[0]).to.equal('mg / dL');
    const back = await pickIn(switched, after.select, 'mg / dL');
    expect((back.items as Array<{ unit?: string }>)[2].unit).to.equal('mg / dL');
  });

  it('rate-cell: after a switch of the state\'s unit, the menu offers the unit its start is written in', async () => {
    const law = { id: 'law', kind: 'rate', state: 'C', unit: 'mg / dL', rate: '-C / (2 h)', initial: '8 mg / dL' };
    const el = await mount('rate-cell', [law], 'law');
    const before = await offered(el, 'Show C in another unit');
    const cell = await pickIn(el, before.select, 'ug / mL');
    expect(cell.unit).to.equal('ug / mL');
    el.remove();
    const switched = await mount('rate-cell', [cell], 'law');
    expect((await offered(switched, 'Show C in another unit')).units[0]).to.equal('mg / dL');
  });

  it('a rate constant computed as CL / V reads 0.1 /h', async () => {
    const items = [{ name: 'CL', value: '5 L / h' }, { name: 'V', value: '50 L' }, { name: 'k', value: 'CL / V' }];
    const el = await mount('parameters-cell', [{ id: 'p', kind: 'parameters', items }], 'p');
    const rows = [...el.shadowRoot!.querySelectorAll('td.result')].map((td) => td.textContent!.trim());
    expect(rows[2]).to.equal('0.1 /h'); // hand-worked: 5 L/h / 50 L = 0.1 /h
  });
});
