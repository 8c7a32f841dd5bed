// The data cell with a logger's CSV export pasted in: the element shows what the engine read
// (columns matched, units from the header, the start of clock times) and refused rows on their
// row, and turns the text into a table.
import { expect } from 'chai';
import '../../components/cells/registry.ts';
import { runStudy, type Cell, type CellReport } from '../../src/index.ts';

type DataEl = HTMLElement & { cell: Cell; report?: CellReport; updateComplete: Promise<unknown> };

const columns = [{ name: 't', unit: 'min' }, { name: 'T', unit: 'degC' }];

/** Shows `cell` with the engine's report of it, as the study view does after an edit. */
async function show(el: DataEl, cell: Cell): Promise<void> {
  const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [cell] });
  if (!r.ok) throw new Error(r.error.message);
  el.cell = cell;
  el.report = r.report.cells[0];
  await el.updateComplete;
}

function edited(el: HTMLElement): Promise<Cell> {
  return new Promise((resolve) => el.addEventListener('cell-edit', (e) => resolve((e as CustomEvent).detail.cell), { once: true }));
}

function paste(el: HTMLElement, text: string): void {
  const area = el.shadowRoot!.querySelector('textarea') as HTMLTextAreaElement;
  area.value = text;
  area.dispatchEvent(new Event('input'));
}

describe('data cell: a logger export pasted as CSV', () => {
  let el: DataEl;
  beforeEach(async () => {
    el = document.createElement('data-cell') as DataEl;
    document.body.append(el);
    await show(el, { id: 'd', kind: 'data', columns, csv: 't,T\n' } as Cell);
  });
  afterEach(() => el.remove());

  it('shows the engine\'s notes, then turns the text into the table', async () => {
    const edit = edited(el);
    paste(el, 'Clock,Temp (°C)\n10:00,70.0\n10:30,52.4\n11:00,40.1\n');
    const pasted = await edit;
    await show(el, pasted);
    const notes = [...el.shadowRoot!.querySelectorAll('ul.csv-notes li')].map((li) => li.textContent);
    expect(notes).to.include("CSV column 1 'Clock' read as t");
    expect(notes).to.include("CSV column 2 'Temp (°C)' read as T, in degC (from the header)");
    expect(notes).to.include('times are clock times, read as min since the first row; starts 10:00');

    const toTable = edited(el);
    ([...el.shadowRoot!.querySelectorAll('button')].find((b) => b.textContent === 'Turn into a table') as HTMLButtonElement).click();
    const table = await toTable as Extract<Cell, { kind: 'data' }>;
    // hand-worked: 10:30 - 10:00 = 30 min; 11:00 - 10:00 = 60 min
    expect(table.rows).to.deep.equal([[0, 70], [30, 52.4], [60, 40.1]]);
    expect(table.columns).to.deep.equal([{ name: 't', unit: 'min' }, { name: 'T', unit: 'degC' }]);
    expect(table.csv).to.equal(undefined);
    await show(el, table);
    expect((el.shadowRoot!.querySelector('input[aria-label="Row 2, t"]') as HTMLInputElement).value).to.equal('30');
    expect(el.shadowRoot!.textContent).to.contain('starts 10:00');
  });

  it('shows a row with a field too many on its row, and keeps the text', async () => {
    const edit = edited(el);
    const text = 'Time (min),Temp (°C)\n0,70\n10,61,5\n20,54\n';
    paste(el, text);
    const pasted = await edit;
    await show(el, pasted);
    const rows = [...el.shadowRoot!.querySelectorAll('ol.csv-rows li')];
    expect(rows).to.have.length(1);
    expect(rows[0].querySelector('code')!.textContent).to.equal('10,61,5');
    expect(rows[0].textContent).to.match(/^Row 2 \(line 3\) 10,61,5: 3 fields; the header has 2/);
    expect(rows[0].textContent).to.contain('export it with semicolons between fields');

    let changed = false;
    el.addEventListener('cell-edit', () => { changed = true; }, { once: true });
    ([...el.shadowRoot!.querySelectorAll('button')].find((b) => b.textContent === 'Turn into a table') as HTMLButtonElement).click();
    await (el as DataEl & { converted?: Promise<void> }).converted;
    await el.updateComplete;
    expect(changed).to.equal(false);
    expect((el.shadowRoot!.querySelector('textarea') as HTMLTextAreaElement).value).to.equal(text);
    expect(el.shadowRoot!.querySelectorAll('ol.csv-rows li')).to.have.length(1);
  });
});
