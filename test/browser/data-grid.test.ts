// A large table in a data cell: only the rows in view are drawn, the table keeps its row count
// for assistive technology, the arrows move through entries, an entry edited far down the
// table is one undoable edit on its own row (pastes, long and past the limit, are driven through
// the real clipboard in test/e2e/big-data.e2e.mjs). The tables are generated here: t = i min,
// T = 2·i degC (invented numbers, easy to check by hand).
import { expect } from 'chai';
import '../../components/cells/registry.ts';
import type { Cell } from '../../src/index.ts';
import { mountStudy } from './mount-study.ts';

type Root = { shadowRoot: ShadowRoot; updateComplete: Promise<unknown> };

const columns = [{ name: 't', unit: 'min' }, { name: 'T', unit: 'degC' }];
const rows = (n: number) => Array.from({ length: n }, (_, i) => [i, 2 * i]);

function dataCellOf(view: HTMLElement): HTMLElement & Root {
  return view.shadowRoot!.querySelector('data-cell') as unknown as HTMLElement & Root;
}

const entry = (cell: Root, row: number, col: 't' | 'T') => cell.shadowRoot.querySelector(`input[aria-label="Row ${row}, ${col}"]`) as HTMLInputElement | null;

async function settle(cell: Root): Promise<void> {
  await new Promise((r) => setTimeout(r, 30)); // the scroll event
  await cell.updateComplete;
  await (cell.shadowRoot.querySelector('data-grid') as unknown as Root).updateComplete;
}

describe('data cell: a large table drawn in part', () => {
  afterEach(() => document.querySelectorAll('study-view').forEach((e) => e.remove()));

  it('draws the rows in view and keeps the row count; scrolling draws the rows it reaches', async () => {
    const view = await mountStudy({ format: 'ratebook-study', version: 1, title: 'big', cells: [{ id: 'd', kind: 'data', columns, rows: rows(1500) }] });
    const cell = dataCellOf(view);
    const table = cell.shadowRoot.querySelector('table.grid')!;
    expect(table.getAttribute('aria-rowcount')).to.equal('1501');
    const drawn = () => [...cell.shadowRoot.querySelectorAll('tbody tr[aria-rowindex]')].map((tr) => Number(tr.getAttribute('aria-rowindex')));
    expect(drawn().length).to.be.within(10, 80);
    expect(drawn()[0]).to.equal(2);
    const box = cell.shadowRoot.querySelector('.scroll') as HTMLElement;
    const rowHeight = (cell.shadowRoot.querySelector('tbody tr[aria-rowindex]') as HTMLElement).getBoundingClientRect().height;
    box.scrollTop = 1200 * rowHeight;
    await settle(cell);
    expect(drawn().length).to.be.within(10, 80);
    expect(entry(cell, 1201, 't')?.value).to.equal('1200');
    expect(entry(cell, 1201, 'T')?.value).to.equal('2400');
    expect(entry(cell, 1, 't')).to.equal(null);
    // the row's place: its index times the row height, below the header
    const top = (entry(cell, 1201, 't')!.closest('tr') as HTMLElement).offsetTop - (cell.shadowRoot.querySelector('tbody') as HTMLElement).offsetTop;
    expect(top).to.be.closeTo(1200 * rowHeight, 1);
  });

  it('moves with the arrows, and an edit far down is one undoable edit of its row', async () => {
    const view = await mountStudy({ format: 'ratebook-study', version: 1, title: 'big', cells: [{ id: 'd', kind: 'data', columns, rows: rows(600) }] });
    const cell = dataCellOf(view);
    const grid = cell.shadowRoot.querySelector('data-grid') as unknown as { focusEntry(r: number, c: number): Promise<void> } & Root;
    const active = () => cell.shadowRoot.activeElement as HTMLInputElement | null;
    const press = async (key: string) => {
      active()!.dispatchEvent(new KeyboardEvent('keydown', { key, bubbles: true, composed: true, cancelable: true }));
      await grid.updateComplete;
      await new Promise((r) => setTimeout(r, 0)); // the grid focuses the entry once it is drawn
    };
    entry(cell, 1, 'T')!.focus();
    for (let i = 0; i < 25; i++) await press('ArrowDown');
    expect(active()?.getAttribute('aria-label')).to.equal('Row 26, T');
    await press('ArrowUp');
    expect(active()?.getAttribute('aria-label')).to.equal('Row 25, T');
    await grid.focusEntry(40, 0);
    expect(active()?.getAttribute('aria-label')).to.equal('Row 41, t');
    // a value typed, then the table scrolled far away before it is committed: the row stays drawn
    active()!.value = '99';
    const box = cell.shadowRoot.querySelector('.scroll') as HTMLElement;
    box.scrollTop = box.scrollHeight;
    await settle(cell);
    expect(entry(cell, 600, 't')?.value).to.equal('599');
    expect(active()?.getAttribute('aria-label')).to.equal('Row 41, t');
    expect(active()!.value).to.equal('99');
    const before = view.controller.study!;
    active()!.dispatchEvent(new Event('change'));
    const after = view.controller.study!.cells[0] as Extract<Cell, { kind: 'data' }>;
    expect(after.rows![40]).to.deep.equal([99, 80]);
    expect(after.rows![39]).to.deep.equal([39, 78]);
    expect(view.controller.canUndo).to.equal(true);
    view.controller.undo();
    expect(view.controller.study).to.deep.equal(before);
  });
});
