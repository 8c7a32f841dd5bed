// End to end: the study reads and edits on a phone (390 px wide) and a tablet (820 px). Opens
// a template of each trade at both widths, saves a full-page screenshot of each (to
// test-results/narrow/, or RATEBOOK_NARROW_OUT; the folder is gitignored: look at them), and
// checks by geometry, through every shadow root:
// - no element reaches past the viewport's left or right edge, and the page does not scroll sideways;
// - every computed value (`.result`) is inside the viewport and shown whole (not clipped, no ellipsis),
//   and every parameter shows its computed value;
// - no two controls (buttons, fields, menus, expression editors, links) overlap;
// - the study's title and every cell's title are shown whole (they wrap instead of being cut).
// Then, on the phone, edits a parameter by typing and sees its computed value change.
//
// Expects a build in dist/ (`npm run test:e2e` builds first).
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import { freePort, startPreview, CHROMIUM_ARGS, fail, runScript, root } from './serve.mjs';
import { DEFAULT_CHROMIUM, NOT_FOUND_MESSAGE, findChromium } from '../../scripts/find-chromium.mjs';
import { pageGeometry } from './geometry.mjs';

const NAME = 'narrow screens';
const STEP = 30_000;
/** One template of each trade (the library's headings), covering every cell kind between them. */
const TEMPLATES = [
  'cooling-data-fit', // heating and cooling: data, fit
  'iv-bolus-repeated', // drug levels: simulate with a schedule and questions
  'plasma-levels', // drug levels: profile summary, fit
  'mixing-tank-flush', // mixing and flushing
  'harvested-stock-fold', // growth and decay: phase line with a sweep
  'flush-pump-settings', // how sure, what matters most, scenarios, a run's band
];
/** A phone held upright (390 × 844, a common size) and a tablet (820 × 1180). */
const WIDTHS = [{ width: 390, height: 844 }, { width: 820, height: 1180 }];

const out = process.env.RATEBOOK_NARROW_OUT ?? join(root, 'test-results', 'narrow');

/** Waits until every cell that will compute has, and no cell says it is recomputing. */
async function settled(page) {
  await page.waitForFunction(() => {
    const view = document.querySelector('ratebook-app')?.shadowRoot?.querySelector('study-view');
    const c = view?.controller;
    return c && c.report && !c.busy && !c.pending.length;
  }, null, { timeout: STEP });
  await page.waitForTimeout(400); // plots draw in the next frames
}

async function openTemplate(page, url, key) {
  await page.goto(`${url}#/`);
  await page.locator(`button.template[data-template="${key}"]`).click({ timeout: STEP });
  await page.waitForURL(/#\/study\//, { timeout: STEP });
  await settled(page);
}

function check(problems, where) {
  if (problems.length) fail(`${where}:\n  ${problems.slice(0, 12).join('\n  ')}${problems.length > 12 ? `\n  … and ${problems.length - 12} more` : ''}`);
}

async function main() {
  if (!existsSync(join(root, 'dist', 'index.html'))) fail('dist/ is missing: build first');
  const executablePath = findChromium() ?? (existsSync(DEFAULT_CHROMIUM) ? DEFAULT_CHROMIUM : fail(NOT_FOUND_MESSAGE));
  mkdirSync(out, { recursive: true });
  const { child, url } = await startPreview(await freePort());
  const profile = mkdtempSync(join(tmpdir(), 'ratebook-narrow-'));
  let context;
  try {
    context = await chromium.launchPersistentContext(profile, { executablePath, headless: true, args: CHROMIUM_ARGS, viewport: WIDTHS[0] });
    const page = context.pages()[0] ?? (await context.newPage());
    const errors = [];
    page.on('pageerror', (e) => errors.push(e.message));
    for (const size of WIDTHS) {
      await page.setViewportSize(size);
      for (const key of TEMPLATES) {
        await openTemplate(page, url, key);
        await page.screenshot({ path: join(out, `${key}-${size.width}.png`), fullPage: true });
        const g = await page.evaluate(pageGeometry);
        const where = `${key} at ${size.width} px`;
        if (g.results < 3) fail(`${where}: only ${g.results} computed values found; the page did not compute`);
        check(g.overflow, `${where}: past the viewport's edge`);
        check(g.hiddenResults, `${where}: computed values not shown whole`);
        check(g.overlaps, `${where}: controls that overlap`);
        check(g.cutTitles, `${where}: titles cut`);
        console.log(`ok: ${where}: ${g.results} computed values, ${g.controls} controls, nothing past the edge or overlapping`);
      }
    }
    await editOnPhone(page, url);
    if (errors.length) fail(`the page threw: ${errors.join(' | ')}`);
    console.log(`screenshots in ${out}`);
  } finally {
    await context?.close().catch(() => {});
    child.kill();
    rmSync(profile, { recursive: true, force: true });
  }
}

/** On the phone: type a new dose and see the parameter that reads it change, still in view. */
async function editOnPhone(page, url) {
  await page.setViewportSize(WIDTHS[0]);
  await openTemplate(page, url, 'iv-bolus-repeated');
  const shown = (name) => page.evaluate((n) => {
    const view = document.querySelector('ratebook-app').shadowRoot.querySelector('study-view');
    for (const cell of view.shadowRoot.querySelectorAll('parameters-cell')) {
      for (const row of cell.shadowRoot.querySelectorAll('.item')) {
        if (row.querySelector('input.name')?.value === n) return row.querySelector('.result')?.textContent?.trim() ?? null;
      }
    }
    return null;
  }, name);
  const before = await shown('C0');
  if (!before) fail('on the phone, C0 shows no computed value');
  const field = page.locator('expr-field[label="Value of dose"] .cm-content');
  await field.scrollIntoViewIfNeeded();
  await field.click();
  await page.keyboard.press('Control+A');
  await page.keyboard.type('1000 mg');
  await page.keyboard.press('Enter');
  await settled(page);
  const after = await shown('C0');
  // hand-worked: C0 = dose / V; doubling the dose from 500 mg to 1000 mg doubles C0
  if (!after || after === before) fail(`on the phone, C0 did not change after editing the dose (${before} → ${after})`);
  const ratio = Number.parseFloat(after) / Number.parseFloat(before);
  if (Math.abs(ratio - 2) > 1e-3) fail(`on the phone, C0 went from ${before} to ${after}; doubling the dose should double it`);
  const g = await page.evaluate(pageGeometry);
  check(g.hiddenResults, 'after the edit on the phone: computed values not shown whole');
  console.log(`ok: on the phone, editing the dose changed C0 from ${before} to ${after}`);
}

await runScript(NAME, main);
