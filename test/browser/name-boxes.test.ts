// A name is readable in full: a parameters cell's name box grows with the longest name (up to
// its limit, past which the name is the box's title), on a desktop and on a phone, and the
// printed sheet wraps a long name only at its underscores, never inside a word.
import { expect } from 'chai';
import { setViewport } from '@web/test-runner-commands';
import '../../components/cells/registry.ts';
import '../../components/sheet/study-sheet.ts';
import { openStudy, runStudy, type Cell, type Report, type Study } from '../../src/index.ts';
import radiometric from '../../examples/radiometric-age.ratebook.json';

type CellEl = HTMLElement & { cell: Cell; report?: unknown; study?: Report; updateComplete: Promise<unknown> };

/** The template's parameters cell, with a name of 20 characters added and one of 40 (past the box's limit). */
const doc = structuredClone(radiometric) as unknown as Study;
const decay = doc.cells.find((c) => c.id === 'decay') as Extract<Cell, { kind: 'parameters' }>;
decay.items.push({ name: 'age_conventional_bp1', value: 'age_conventional' }, { name: 'age_conventional_before_present_in_years', value: 'age_conventional' });

async function mountDecay(): Promise<CellEl> {
  const r = runStudy(doc);
  if (!r.ok) throw new Error(r.error.message);
  const el = document.createElement('parameters-cell') as CellEl;
  el.cell = decay;
  el.report = r.report.cells.find((c) => c.id === 'decay');
  el.study = r.report;
  document.body.append(el);
  await el.updateComplete;
  return el;
}

const nameBoxes = (el: HTMLElement) => [...el.shadowRoot!.querySelectorAll('input.name')] as HTMLInputElement[];

describe('name boxes', () => {
  afterEach(async () => {
    document.querySelectorAll('parameters-cell, study-sheet').forEach((e) => e.remove());
    await setViewport({ width: 800, height: 600 });
  });

  for (const width of [1280, 390]) {
    it(`at ${width} px a parameter's name of 16 to 20 characters shows whole in its box`, async () => {
      await setViewport({ width, height: 900 });
      const el = await mountDecay();
      const boxes = nameBoxes(el);
      const long = boxes.filter((b) => b.value.length >= 16 && b.value.length <= 20);
      // t_half_cambridge and age_conventional (16, the template's own), age_conventional_bp1 (20)
      expect(long.map((b) => b.value)).to.deep.equal(['t_half_cambridge', 'age_conventional', 'age_conventional_bp1']);
      for (const b of boxes.filter((x) => x.value.length <= 20)) {
        expect(b.scrollWidth, `${b.value}: its text is ${b.scrollWidth} px, its box ${b.clientWidth} px`).to.be.at.most(b.clientWidth);
      }
      // past the limit the box stops growing, and the whole name is its title
      const longest = boxes.find((b) => b.value === 'age_conventional_before_present_in_years')!;
      expect(longest.title).to.equal(longest.value);
      expect(longest.getBoundingClientRect().width).to.be.at.most(17 * 16 + 1);
    });
  }

  it('grows the box as a long name is typed, before the engine answers', async () => {
    await setViewport({ width: 1280, height: 900 });
    const el = await mountDecay();
    const box = nameBoxes(el)[0];
    box.value = 't_half_in_the_sample';
    box.dispatchEvent(new Event('input'));
    expect(box.scrollWidth, 'the name typed fits at once').to.be.at.most(box.clientWidth);
  });

  it('the printed sheet breaks a long name only after an underscore', async () => {
    const r = openStudy(structuredClone(doc));
    if (!r.ok) throw new Error(r.error.message);
    const sheet = document.createElement('study-sheet') as HTMLElement & { study: Study; report: Report; meta: object; updateComplete: Promise<unknown> };
    sheet.study = structuredClone(doc);
    sheet.report = r.session.report();
    sheet.meta = {};
    // the text width of an A4 page with the sheet's margins, about 170 mm
    sheet.style.width = '170mm';
    sheet.style.display = 'block';
    document.body.append(sheet);
    await sheet.updateComplete;
    const cells = [...sheet.shadowRoot!.querySelectorAll('table.parameters td.name')] as HTMLElement[];
    const names = cells.map((c) => c.textContent);
    expect(names).to.include('t_half_cambridge').and.to.include('age_conventional_before_present_in_years');
    for (const td of cells) {
      const walker = document.createTreeWalker(td, NodeFilter.SHOW_TEXT);
      for (let n = walker.nextNode(); n; n = walker.nextNode()) {
        const range = document.createRange();
        range.selectNodeContents(n);
        const lines = new Set([...range.getClientRects()].map((rect) => Math.round(rect.top)));
        expect(lines.size, `"${n.textContent}" of ${td.textContent} lies on one line`).to.equal(1);
      }
    }
  });
});
