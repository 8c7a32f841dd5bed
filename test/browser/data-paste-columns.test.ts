// A logger export pasted into a new, empty data cell (as "add Measurements" makes it, then
// "Edit as CSV text"), imported as a file into it, or typed into its text and turned into a
// table: the cell takes the header's columns, names and units, as one undoable edit, and says
// so among its notes. The export is written for this test (invented readings).
// SI values against the definition of the degree Celsius, T/K = T/°C + 273.15, and
// 1 min = 60 s (SI Brochure, 9th ed., 2.3.4 and table 8).
import { expect } from 'chai';
import '../../components/cells/registry.ts';
import { KINDS } from '../../components/cells/registry.ts';
import type { Cell } from '../../src/index.ts';
import { dataNodes } from '../../src/cells/data.ts';
import type { RunContext } from '../../src/engine/node.ts';
import { mountStudy } from './mount-study.ts';
import { until } from './helpers.ts';

type Root = HTMLElement & { shadowRoot: ShadowRoot; updateComplete: Promise<unknown> };
type DataDoc = Extract<Cell, { kind: 'data' }>;

describe('data cell: a logger export pasted into a new cell', () => {
  afterEach(() => document.querySelectorAll('study-view').forEach((e) => e.remove()));

  it('takes the header\'s columns and units as one edit, says so, and one undo gives the new cell back', async function () {
    this.timeout(30_000);
    const view = await mountStudy({ format: 'ratebook-study', version: 1, title: 'paste', cells: [{ id: 'd', kind: 'data', ...KINDS.data.blank({ cells: [] }) }] });
    const cell = () => view.shadowRoot!.querySelector('data-cell') as Root;
    const doc = () => view.controller.study!.cells[0] as DataDoc;
    ([...cell().shadowRoot.querySelectorAll('button')].find((b) => b.textContent === 'Edit as CSV text') as HTMLButtonElement).click();
    await until(() => doc().csv !== undefined && cell().shadowRoot.querySelector('textarea'), 'the cell as CSV text');
    const before = JSON.stringify(view.controller.study);

    const text = 'Elapsed (min);Temperatur (°C)\n0;74,0\n30;52,5\n60;38,1\n';
    const area = cell().shadowRoot.querySelector('textarea') as HTMLTextAreaElement;
    area.focus();
    area.select();
    const clipboard = new DataTransfer();
    clipboard.setData('text/plain', text);
    area.dispatchEvent(new ClipboardEvent('paste', { clipboardData: clipboard, bubbles: true, cancelable: true }));
    await until(() => doc().csv === text, 'the paste in the study');
    expect(doc().columns).to.deep.equal([{ name: 'Elapsed', unit: 'min' }, { name: 'Temperatur', unit: 'degC' }]);
    await until(() => view.controller.study && cell().shadowRoot.querySelector('ul.csv-notes'), 'the notes');
    await cell().updateComplete;
    const notes = [...cell().shadowRoot.querySelectorAll('ul.csv-notes li')].map((li) => li.textContent);
    expect(notes[0]).to.equal("the pasted header's columns take the place of the new cell's (t in h, C in mg / L): Elapsed in min, Temperatur in degC");
    await until(() => !cell().shadowRoot.querySelector('.foot-error'), 'no message that the columns do not match');
    const names = [...cell().shadowRoot.querySelectorAll('.columns input')].map((i) => (i as HTMLInputElement).value);
    expect(names).to.deep.equal(['Elapsed', 'min', 'Temperatur', 'degC']);

    // the values the engine reads from the cell the paste wrote, in SI
    const out = dataNodes(doc(), 'cells[0]')[0].run({} as RunContext);
    if (!out.ok) throw new Error(out.error.message);
    const b = out.bindings.get('#d');
    if (!b || b.kind !== 'data') throw new Error('no table');
    expect(b.table.rows.map((r) => r[0])).to.deep.equal([0, 1800, 3600]);
    // 74.0 °C = 347.15 K, 52.5 °C = 325.65 K, 38.1 °C = 311.25 K
    b.table.rows.forEach((r, i) => expect(r[1]).to.be.closeTo([347.15, 325.65, 311.25][i], 1e-9));

    view.controller.undo();
    await until(() => JSON.stringify(view.controller.study) === before, 'one undo back to the new cell');
    expect(doc().columns).to.deep.equal([{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }]);
    await cell().updateComplete;
    expect(cell().shadowRoot.textContent).to.not.contain('take the place');
  });

  it('a cell holding a value keeps its columns, and says the header does not match them', async function () {
    this.timeout(30_000);
    const view = await mountStudy({ format: 'ratebook-study', version: 1, title: 'paste', cells: [{ id: 'd', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], csv: 't,C\n0,3.2\n' }] });
    const cell = () => view.shadowRoot!.querySelector('data-cell') as Root;
    const doc = () => view.controller.study!.cells[0] as DataDoc;
    const text = 'Time,Temp (°C)\n0,70\n';
    const area = cell().shadowRoot.querySelector('textarea') as HTMLTextAreaElement;
    area.select();
    const clipboard = new DataTransfer();
    clipboard.setData('text/plain', text);
    const e = new ClipboardEvent('paste', { clipboardData: clipboard, bubbles: true, cancelable: true });
    area.dispatchEvent(e);
    // the browser's own paste (not made by a synthetic event): the cell leaves it to the browser
    expect(e.defaultPrevented).to.equal(false);
    area.value = text;
    area.dispatchEvent(new Event('input'));
    await until(() => doc().csv === text, 'the paste in the study');
    expect(doc().columns).to.deep.equal([{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }]);
    // the engine's message on the CSV text (matched by position: the second column is no concentration)
    const error = await until(() => view.controller.report?.cells[0]?.error, 'the message on the CSV text', 8000);
    expect(error.path).to.equal('cells[0].csv');
    const message = error.message;
    expect(message).to.contain("CSV column 2 'Temp (°C)' is in degC; the cell's column C is in mg / L, which measures something else");
  });

  /** The SI rows the engine reads from the data cell `doc`. */
  function siRows(doc: DataDoc): ReadonlyArray<ReadonlyArray<number | null>> {
    const out = dataNodes(doc, 'cells[0]')[0].run({} as RunContext);
    if (!out.ok) throw new Error(out.error.message);
    const b = out.bindings.get('#d');
    if (!b || b.kind !== 'data') throw new Error('no table');
    return b.table.rows;
  }

  it('a file imported into a new cell: the header\'s columns and values, one edit, said; one undo gives the new cell back', async function () {
    this.timeout(30_000);
    const view = await mountStudy({ format: 'ratebook-study', version: 1, title: 'import', cells: [{ id: 'd', kind: 'data', ...KINDS.data.blank({ cells: [] }) }] });
    const cell = () => view.shadowRoot!.querySelector('data-cell') as Root;
    const doc = () => view.controller.study!.cells[0] as DataDoc;
    const before = JSON.stringify(view.controller.study);

    const input = cell().shadowRoot.querySelector('input[type="file"]') as HTMLInputElement;
    const files = new DataTransfer();
    files.items.add(new File(['Time,Temp (°C)\r\n0,74.0\r\n0.5,52.5\r\n1,38.1\r\n'], 'logger.csv', { type: 'text/csv' }));
    input.files = files.files;
    input.dispatchEvent(new Event('change'));
    await until(() => doc().rows?.length === 3, 'the file read into the cell', 10_000);
    expect(doc().columns).to.deep.equal([{ name: 'Time', unit: 'h' }, { name: 'Temp', unit: 'degC' }]);
    expect(doc().rows).to.deep.equal([[0, 74], [0.5, 52.5], [1, 38.1]]);
    expect(doc().csv).to.equal(undefined);
    // 0.5 h = 1800 s; 74.0 °C = 347.15 K, 52.5 °C = 325.65 K, 38.1 °C = 311.25 K
    const rows = siRows(doc());
    expect(rows.map((r) => r[0])).to.deep.equal([0, 1800, 3600]);
    rows.forEach((r, i) => expect(r[1]).to.be.closeTo([347.15, 325.65, 311.25][i], 1e-9));
    await cell().updateComplete;
    const notes = [...cell().shadowRoot.querySelectorAll('ul.csv-notes li')].map((li) => li.textContent);
    expect(notes[0]).to.equal("the imported file's header columns take the place of the new cell's (t in h, C in mg / L): Time in h (the header gives no unit; the new cell's if the file's is another), Temp in degC");
    await until(() => view.controller.report?.cells[0]?.ok, 'no message on the cell');

    view.controller.undo();
    await until(() => JSON.stringify(view.controller.study) === before, 'one undo back to the new cell');
    await cell().updateComplete;
    expect(cell().shadowRoot.textContent).to.not.contain('take the place');
  });

  it('"Turn into a table" on a new cell with a header typed: the header\'s columns, one edit back', async function () {
    this.timeout(30_000);
    const view = await mountStudy({ format: 'ratebook-study', version: 1, title: 'typed', cells: [{ id: 'd', kind: 'data', ...KINDS.data.blank({ cells: [] }) }] });
    const cell = () => view.shadowRoot!.querySelector('data-cell') as Root;
    const doc = () => view.controller.study!.cells[0] as DataDoc;
    ([...cell().shadowRoot.querySelectorAll('button')].find((b) => b.textContent === 'Edit as CSV text') as HTMLButtonElement).click();
    await until(() => doc().csv !== undefined && cell().shadowRoot.querySelector('textarea'), 'the cell as CSV text');
    const text = 'Elapsed (min),Temp (°C)\n0,74.0\n30,52.5\n';
    const area = cell().shadowRoot.querySelector('textarea') as HTMLTextAreaElement;
    area.value = text;
    area.dispatchEvent(new Event('input'));
    await until(() => doc().csv === text, 'the text in the study');
    const typed = JSON.stringify(view.controller.study);
    ([...cell().shadowRoot.querySelectorAll('button')].find((b) => b.textContent === 'Turn into a table') as HTMLButtonElement).click();
    await until(() => doc().csv === undefined, 'the text turned into a table', 10_000);
    expect(doc().columns).to.deep.equal([{ name: 'Elapsed', unit: 'min' }, { name: 'Temp', unit: 'degC' }]);
    expect(doc().rows).to.deep.equal([[0, 74], [30, 52.5]]);
    // 30 min = 1800 s; 52.5 °C = 325.65 K
    const rows = siRows(doc());
    expect(rows[1][0]).to.equal(1800);
    expect(rows[1][1]).to.be.closeTo(325.65, 1e-9);
    await cell().updateComplete;
    expect(cell().shadowRoot.querySelector('ul.csv-notes li')!.textContent).to.match(/^the text's header columns take the place of the new cell's \(t in h, C in mg \/ L\): Elapsed in min, Temp in degC$/);

    view.controller.undo();
    await until(() => JSON.stringify(view.controller.study) === typed, 'one undo back to the text');
  });
});
