// End to end: no accessibility violations that axe-core (a general-purpose checker from the
// npm registry, rules from WCAG 2.x A and AA and common practice) finds on the library, on a
// study of each kind of cell, and on each of those studies' printable sheets. axe reads open
// shadow roots, which is where every element of the app renders. Any violation fails the
// script, listed rule by rule with the elements it names.
//
// Expects a build in dist/ (`npm run test:e2e` builds first).
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import { freePort, startPreview, CHROMIUM_ARGS, fail, runScript, root, openSheet } from './serve.mjs';
import { DEFAULT_CHROMIUM, NOT_FOUND_MESSAGE, findChromium } from '../../scripts/find-chromium.mjs';

const NAME = 'accessibility (axe-core)';
const STEP = 30_000;
const AXE_SOURCE = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');

/**
 * Templates that between them hold every cell kind: parameters, rate, phase (with its plot)
 * and simulate (time plot); data, fit and NCA; a fit whose plot shows measured points; a phase
 * cell with a sweep; solve cells over a range and among choices; a compare and a sensitivity cell;
 * an uncertainty cell and parameters with spreads.
 */
const TEMPLATES = ['convection-radiation-cooling', 'plasma-levels', 'cooling-data-fit', 'harvested-stock-fold', 'dose-for-target-trough', 'flush-pump-settings', 'trough-in-range-probability'];

/** Runs axe on the page as it is and returns its violations, one line per element. */
async function violations(page) {
  if (!(await page.evaluate(() => 'axe' in window))) await page.evaluate(AXE_SOURCE);
  const found = await page.evaluate(async () => {
    // eslint-disable-next-line no-undef
    const r = await axe.run(document, { resultTypes: ['violations'] });
    return r.violations.map((v) => ({ id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.map((n) => `${JSON.stringify(n.target)} ${n.failureSummary?.split('\n').slice(1).join(' ').trim() ?? ''}`) }));
  });
  return found.flatMap((v) => v.nodes.map((n) => `${v.id} (${v.impact}): ${v.help}: ${n}`));
}

/** Waits until the open study has computed (no cell waiting for the engine). */
async function computed(page) {
  await page.waitForFunction(() => {
    const root = document.querySelector('ratebook-app')?.shadowRoot?.querySelector('study-view')?.shadowRoot;
    if (!root) return false;
    const articles = [...root.querySelectorAll('article')];
    return articles.length > 0 && !(root.querySelector('.status')?.textContent ?? '').includes('computing') && !articles.some((a) => a.querySelector('.state.idle'));
  }, null, { timeout: STEP });
  // the charts draw in the next frame
  await page.waitForTimeout(300);
}

async function main() {
  if (!existsSync(join(root, 'dist', 'index.html'))) fail('dist/ is missing: build first');
  const executablePath = findChromium() ?? (existsSync(DEFAULT_CHROMIUM) ? DEFAULT_CHROMIUM : fail(NOT_FOUND_MESSAGE));
  const { child, url } = await startPreview(await freePort());
  const profile = mkdtempSync(join(tmpdir(), 'ratebook-axe-'));
  let context;
  const problems = [];
  const checked = [];
  const check = async (page, where) => {
    const v = await violations(page);
    checked.push(`${where}: ${v.length ? `${v.length} violations` : 'no violations'}`);
    problems.push(...v.map((line) => `${where}: ${line}`));
  };
  try {
    context = await chromium.launchPersistentContext(profile, { executablePath, headless: true, args: CHROMIUM_ARGS, viewport: { width: 1280, height: 900 } });
    const page = context.pages()[0] ?? (await context.newPage());
    const errors = [];
    page.on('pageerror', (e) => errors.push(e.message));

    await page.goto(`${url}#/`);
    await page.locator('button.template').first().waitFor({ timeout: STEP });
    await check(page, 'library, empty');

    for (const key of TEMPLATES) {
      await page.goto(`${url}#/`);
      await page.locator(`button.template[data-template="${key}"]`).click({ timeout: STEP });
      await page.waitForURL(/#\/study\/[^/]+$/, { timeout: STEP });
      await computed(page);
      await check(page, `study ${key}`);
      // Every chart's data table open too, so that axe checks the tables.
      const opened = await page.evaluate(() => {
        const walk = (root, out) => {
          for (const el of root.querySelectorAll('*')) {
            if (el.matches('button.data-toggle[aria-expanded="false"]')) out.push(el);
            if (el.shadowRoot) walk(el.shadowRoot, out);
          }
          return out;
        };
        const buttons = walk(document, []);
        buttons.forEach((b) => b.click());
        return buttons.length;
      });
      if (opened) {
        await page.waitForTimeout(200);
        await check(page, `study ${key}, chart data tables open`);
      }
      // Time plots on a log axis (stored in the study, so the sheet draws it too).
      const logged = await page.evaluate(() => {
        const walk = (root, out) => {
          for (const el of root.querySelectorAll('*')) {
            if (el.matches('input.log-toggle')) out.push(el);
            if (el.shadowRoot) walk(el.shadowRoot, out);
          }
          return out;
        };
        const boxes = walk(document, []);
        boxes.forEach((b) => b.click());
        return boxes.length;
      });
      if (logged) {
        await computed(page);
        await check(page, `study ${key}, time plots on a log axis`);
      }
      await openSheet(page, STEP);
      await check(page, `sheet ${key}`);
    }

    await page.goto(`${url}#/`);
    await page.locator('button.template').first().waitFor({ timeout: STEP });
    await page.waitForTimeout(300);
    await check(page, 'library with studies');
    // each study's buttons say which study they act on
    for (const key of TEMPLATES) {
      const { title } = JSON.parse(readFileSync(join(root, 'examples', `${key}.ratebook.json`), 'utf8'));
      for (const verb of ['Rename', 'Duplicate', 'Delete']) {
        if ((await page.getByRole('button', { name: `${verb} ${title}`, exact: true }).count()) !== 1) fail(`the library has no one button named "${verb} ${title}"`);
      }
    }

    if (errors.length) fail(`the page threw: ${errors.join(' | ')}`);
    if (problems.length) fail(`axe found ${problems.length} violations:\n  ${problems.join('\n  ')}`);
    for (const c of checked) console.log(`ok: ${c}`);
  } finally {
    await context?.close().catch(() => {});
    child.kill();
    rmSync(profile, { recursive: true, force: true });
  }
}

await runScript(NAME, main);
