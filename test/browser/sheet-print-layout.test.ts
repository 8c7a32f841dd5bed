// The printed sheet on paper: every template laid out at the printable size of an A4 and a US
// Letter page. Nothing is wider than the page, no text runs out of its table cell or over
// another label of a chart; and wherever a page ends, a section's heading stays with what it
// introduces (a run's span and schedule with its chart, a data cell's row count with its
// table, an uncertainty cell's spreads with its results), a chart stays with the table it
// illustrates and a run's check with the lines above it, a law, a solve or a profile summary is
// never cut, and the closing words never stand alone on the last page. A name breaks only after
// an underscore where it has one. Pages are columns here: the
// browser breaks a multi-column box by the same rules (`break-inside`, `break-after`) as pages.
import { expect } from 'chai';
import { render } from 'lit';
import '../../components/sheet/study-sheet.ts';
import { phaseLine } from '../../components/sheet/phase-line.ts';
import { TEMPLATES } from '../../components/templates.ts';
import { openStudy, type Report, type Study } from '../../src/index.ts';

/** CSS pixels per millimetre: 96 to the inch (CSS Values and Units Level 3, 6.2), 25.4 mm to the inch. */
const MM = 96 / 25.4;
/**
 * The printable area of a page: A4 is 210 × 297 mm (ISO 216), US Letter 8.5 × 11 in (ANSI/ASME
 * Y14.1), less the sheet's page margins (components/page.css: 14 mm top and bottom, 15 mm either side).
 */
const PAGES = {
  A4: { w: (210 - 2 * 15) * MM, h: (297 - 2 * 14) * MM },
  Letter: { w: 8.5 * 96 - 2 * 15 * MM, h: 11 * 96 - 2 * 14 * MM },
} as const;
type Page = (typeof PAGES)[keyof typeof PAGES];

function reportOf(doc: Study): Report {
  const r = openStudy(structuredClone(doc));
  if (!r.ok) throw new Error(r.error.message);
  return r.session.report();
}

/** The sheet of `doc` in a box `width` wide; with `pages`, a box of columns of the page's size, one per page. */
async function sheetIn(doc: Study, report: Report, width: number, pages?: Page): Promise<{ box: HTMLDivElement; root: ShadowRoot }> {
  const box = document.createElement('div');
  box.style.cssText = `position: absolute; left: 0; top: 0; width: ${width}px;`
    + (pages ? ` height: ${pages.h}px; column-width: ${pages.w}px; column-gap: 0; column-fill: auto;` : '');
  const el = document.createElement('study-sheet');
  el.study = structuredClone(doc);
  el.report = report;
  box.append(el);
  document.body.append(box);
  await el.updateComplete;
  return { box, root: el.shadowRoot! };
}

/** Two boxes that overlap by more than `slack` pixels each way (a text's box holds its font's ascent and descent). */
const overlap = (a: DOMRect, b: DOMRect, slack = 1.5) =>
  a.left < b.right - slack && b.left < a.right - slack && a.top < b.bottom - slack && b.top < a.bottom - slack;

const sectionName = (el: Element) => (el.closest('section')?.querySelector('h2')?.textContent ?? 'the header').replace(/\s+/g, ' ').trim();

describe('the printed sheet across the page: every template at A4\'s printable width', function () {
  this.timeout(20000);
  afterEach(() => document.querySelectorAll('body > div').forEach((d) => d.remove()));

  for (const t of TEMPLATES) {
    it(`${t.key}: nothing wider than the page, no text out of its cell or over another label`, async () => {
      const { box, root } = await sheetIn(t.doc, reportOf(t.doc), PAGES.A4.w);
      const right = box.getBoundingClientRect().right;
      const problems: string[] = [];
      for (const el of root.querySelectorAll('*')) {
        const r = el.getBoundingClientRect();
        if (r.width && r.right > right + 0.5) problems.push(`<${el.localName}> ends ${Math.round(r.right - right)} px past the page in ${sectionName(el)}`);
        if ((el.localName === 'td' || el.localName === 'th') && el.scrollWidth > el.clientWidth + 1) problems.push(`"${el.textContent!.trim()}" runs out of its cell in ${sectionName(el)}`);
      }
      for (const svg of root.querySelectorAll('svg')) {
        const frame = svg.getBoundingClientRect();
        // rotated texts (the y axes' names) stand apart from the rest
        const texts = [...svg.querySelectorAll('text')].filter((x) => !x.getAttribute('transform') && x.textContent!.trim());
        const boxes = texts.map((x) => x.getBoundingClientRect());
        boxes.forEach((b, i) => { if (b.left < frame.left - 0.5 || b.right > frame.right + 0.5) problems.push(`"${texts[i].textContent}" cut at the chart's edge in ${sectionName(svg)}`); });
        for (let i = 0; i < boxes.length; i++) {
          for (let j = i + 1; j < boxes.length; j++) if (overlap(boxes[i], boxes[j])) problems.push(`"${texts[i].textContent}" over "${texts[j].textContent}" in ${sectionName(svg)}`);
        }
      }
      expect(problems).to.deep.equal([]);
    });
  }
});

/**
 * Where a name cell's text wraps: the index of each character that starts a new line.
 * Each character's box from a Range over it, read as laid out.
 */
function lineStarts(td: Element): { text: string; starts: number[]; widthOf: (from: number, to: number) => number } {
  const nodes: Text[] = [];
  const walk = document.createTreeWalker(td, NodeFilter.SHOW_TEXT);
  while (walk.nextNode()) nodes.push(walk.currentNode as Text);
  const chars = nodes.flatMap((n) => [...n.data].map((_, i) => ({ n, i })));
  const range = document.createRange();
  const rects = chars.map(({ n, i }) => { range.setStart(n, i); range.setEnd(n, i + 1); return range.getBoundingClientRect(); });
  const starts = rects.flatMap((r, i) => (i > 0 && r.top > rects[i - 1].top + r.height / 2 ? [i] : []));
  return { text: chars.map(({ n, i }) => n.data[i]).join(''), starts, widthOf: (from, to) => rects.slice(from, to).reduce((w, r) => w + r.width, 0) };
}

describe('the printed sheet\'s name columns: every template at A4\'s printable width', function () {
  this.timeout(20000);
  afterEach(() => document.querySelectorAll('body > div').forEach((d) => d.remove()));

  it('a name breaks only after an underscore, unless the part between underscores is wider than its column', async () => {
    const problems: string[] = [];
    let wrapped = 0;
    for (const t of TEMPLATES) {
      const { root } = await sheetIn(t.doc, reportOf(t.doc), PAGES.A4.w);
      for (const td of root.querySelectorAll('td.name')) {
        const { text, starts, widthOf } = lineStarts(td);
        const style = getComputedStyle(td);
        const room = td.clientWidth - parseFloat(style.paddingLeft) - parseFloat(style.paddingRight);
        for (const at of starts) {
          wrapped++;
          if (text[at - 1] === '_') continue;
          // the part of the name between underscores that the break cuts
          const from = text.lastIndexOf('_', at - 1) + 1;
          const to = text.indexOf('_', at) < 0 ? text.length : text.indexOf('_', at) + 1;
          if (widthOf(from, to) <= room) problems.push(`${t.key}: "${text}" broken before "${text.slice(at)}" in ${sectionName(td)}`);
        }
      }
      document.querySelectorAll('body > div').forEach((d) => d.remove());
    }
    expect(problems).to.deep.equal([]);
    // the long names of the dosing and dating templates do wrap at A4's width: the check above was asked
    expect(wrapped).to.be.greaterThan(0);
  });
});

/**
 * What a section's heading must share a page with, by kind, when it all fits on one page: the
 * element itself, or `whole` for the section to the end.
 */
const KEPT_WITH_HEADING: Record<string, string> = {
  simulate: 'figure', phase: 'figure', sensitivity: 'figure',
  data: 'table, pre', fit: 'table', uncertainty: 'table.how-sure', compare: 'table', parameters: 'tbody tr',
  rate: 'whole', solve: 'whole', nca: 'whole',
};

/**
 * What must share a page, where the two fit on one (with what the sheet keeps with them): pairs
 * of a section's parts, the upper first. A run's chart with its answers, and its check against the
 * exact solution with the lines above it; a fit's estimates with the chart of the fitted curve; a
 * compare cell's scenario tables with its overlay chart; a sweep's chart with its folds.
 */
const KEPT_TOGETHER: Record<string, (section: Element) => Array<[Element | null, Element | null]>> = {
  simulate: (s) => [
    [s.querySelector(':scope > div.keep'), s.querySelector(':scope > table.results')],
    ...[...s.querySelectorAll(':scope > p.check:not(.note)')].map((p): [Element | null, Element] => [p.previousElementSibling, p]),
  ],
  fit: (s) => [[s.querySelector(':scope > table.results'), s.querySelector(':scope > div.keep')]],
  compare: (s) => [...s.querySelectorAll(':scope > table')].map((t): [Element, Element | null] => [t, s.querySelector(':scope > div.keep')]),
  phase: (s) => [[s.querySelector(':scope > h3 + figure'), s.querySelector(':scope > h3 + figure + *')]],
};

/** A section's parts from `a` to `b` and those the page's end may not come between (`break-after` or `break-before: avoid`): [first, last]. */
function keptRun(a: Element, b: Element): [Element, Element] {
  const avoided = (x: Element, y: Element) => getComputedStyle(x).breakAfter === 'avoid' || getComputedStyle(y).breakBefore === 'avoid';
  let first = a;
  while (first.previousElementSibling && avoided(first.previousElementSibling, first)) first = first.previousElementSibling;
  let last = b;
  while (last.nextElementSibling && avoided(last, last.nextElementSibling)) last = last.nextElementSibling;
  return [first, last];
}

/** The page (column) an element's first or last piece is on. */
function pageOf(el: Element, box: HTMLDivElement, page: Page, piece: 'first' | 'last' = 'first'): number {
  const rects = [...el.getClientRects()].filter((r) => r.height > 0);
  const r = piece === 'first' ? rects[0] : rects[rects.length - 1];
  return Math.floor((r.left - box.getBoundingClientRect().left + 1) / page.w);
}

/**
 * Each section of `doc` alone on the pages, pushed down by a blank of every height from 0 to a
 * page's in `step` px: wherever the page ends, is its heading on the page of what it introduces,
 * and is every chart on one page with its caption? Returns what went wrong, in words.
 */
async function breaksOf(doc: Study, report: Report, page: Page, step = 24): Promise<string[]> {
  const { box, root } = await sheetIn(doc, report, page.w, page);
  const problems: string[] = [];
  const tops = [...root.children].filter((c): c is HTMLElement => c instanceof HTMLElement && c.localName !== 'style');
  const blank = document.createElement('div');
  root.prepend(blank);
  for (const section of root.querySelectorAll<HTMLElement>('section.cell:not(.glance)')) {
    const kind = [...section.classList].find((c) => c in KEPT_WITH_HEADING);
    const kept = kind === undefined ? null : KEPT_WITH_HEADING[kind] === 'whole' ? section : section.querySelector(KEPT_WITH_HEADING[kind]);
    for (const el of tops) el.style.display = el === section ? '' : 'none';
    const h2 = section.querySelector('h2')!;
    blank.style.height = '0px';
    // asked only of what fits on one page
    const fits = kept && kept.getBoundingClientRect().bottom - h2.getBoundingClientRect().top <= page.h && pageOf(kept, box, page, 'last') === 0;
    const together = (kind && KEPT_TOGETHER[kind] ? KEPT_TOGETHER[kind](section) : [])
      .filter((pair): pair is [Element, Element] => !!pair[0] && !!pair[1])
      .filter(([a, b]) => {
        const [first, last] = keptRun(a, b);
        return last.getBoundingClientRect().bottom - first.getBoundingClientRect().top <= page.h && pageOf(last, box, page, 'last') === 0;
      });
    for (let y = 0; y < page.h; y += step) {
      blank.style.height = `${y}px`;
      const at = `${sectionName(h2)} pushed ${y} px down`;
      if (fits && pageOf(h2, box, page) !== pageOf(kept, box, page, 'last')) problems.push(`${at}: its heading is on another page than its ${kind === 'rate' || kind === 'solve' || kind === 'nca' ? 'end' : KEPT_WITH_HEADING[kind!]}`);
      for (const [a, b] of together) {
        if (pageOf(a, box, page, 'last') !== pageOf(b, box, page)) problems.push(`${at}: "${b.textContent!.trim().slice(0, 40)}" overleaf from "${a.textContent!.trim().slice(0, 40)}"`);
      }
      for (const f of section.querySelectorAll('figure, .keep')) {
        if (f.getBoundingClientRect().height <= page.h && pageOf(f, box, page) !== pageOf(f, box, page, 'last')) problems.push(`${at}: a ${f.localName === 'figure' ? 'chart' : 'chart and its caption'} cut by the page's end`);
      }
    }
  }
  // the whole sheet pushed down likewise: the closing words never on a page of their own
  for (const el of tops) el.style.display = '';
  const footer = root.querySelector('footer')!;
  for (let y = 0; y < page.h; y += step) {
    blank.style.height = `${y}px`;
    if (pageOf(footer, box, page) !== pageOf(footer.previousElementSibling!.lastElementChild!, box, page, 'last')) problems.push(`the sheet pushed ${y} px down: its closing words alone on the last page`);
  }
  return problems;
}

describe('the printed sheet page by page: wherever a page ends', function () {
  this.timeout(60000);
  afterEach(() => document.querySelectorAll('body > div').forEach((d) => d.remove()));
  // between them: every kind of section that has a heading to keep (run with a schedule, law,
  // data, profile summary, fit, solve, phase line with a sweep, uncertainty, sensitivity, compare)
  // and those where a run's check, a fit's or a compare cell's chart, or the last answers were seen apart from what they go with
  const keys = ['cooling-stock-pot', 'plasma-levels', 'two-level-infusion-dosing', 'harvested-stock-fold', 'flush-pump-settings',
    'oral-first-order-absorption', 'intermittent-iv-infusion', 'tank-changing-volume', 'bayesian-two-levels'];
  for (const key of keys) {
    it(`${key}: each heading stays with what it introduces, a chart with its table, no chart is cut, the closing words never stand alone, on A4 and on Letter`, async () => {
      const doc = TEMPLATES.find((t) => t.key === key)!.doc;
      const report = reportOf(doc);
      for (const [name, page] of Object.entries(PAGES)) {
        expect(await breaksOf(doc, report, page), name).to.deep.equal([]);
        document.querySelectorAll('body > div').forEach((d) => d.remove());
      }
    });
  }
});

describe('the phase line\'s labels', () => {
  /** The texts under a phase line of 0 to `to` with equilibria at `at`, and their boxes as laid out. */
  function labels(to: number, unit: string, at: number[]): Array<{ text: string; box: DOMRect }> {
    const host = document.createElement('div');
    document.body.append(host);
    render(phaseLine({ label: 'phase line', state: 'T', from: 0, to, unit, intervals: [],
      equilibria: at.map((value) => ({ value, unit, stability: 'attractor' })) }), host);
    const out = [...host.querySelectorAll('g.labels text')].map((t) => ({ text: t.textContent!, box: t.getBoundingClientRect() }));
    host.remove();
    return out;
  }

  it('an equilibrium near an end of the range is labelled clear of the end\'s label', () => {
    // invented numbers: a part cooling toward 25 degC air, drawn from 0 to 700 degC
    const l = labels(700, 'degC', [25]);
    expect(l.map((x) => x.text)).to.have.members(['0 degC', '700 degC', '25 degC']);
    for (let i = 0; i < l.length; i++) for (let j = i + 1; j < l.length; j++) expect(overlap(l[i].box, l[j].box), `${l[i].text} / ${l[j].text}`).to.equal(false);
  });

  it('an equilibrium at an end of the range is labelled once', () => {
    // invented numbers: a tank draining to empty, 0 m, drawn from 0 to 2 m
    expect(labels(2, 'm', [0]).map((x) => x.text)).to.deep.equal(['2 m', '0 m']);
  });

  it('two equilibria close together are labelled on two rows', () => {
    const l = labels(1000, 'kg', [500, 510]);
    const [a, b] = l.filter((x) => x.text !== '0 kg' && x.text !== '1000 kg');
    expect(overlap(a.box, b.box)).to.equal(false);
  });
});
