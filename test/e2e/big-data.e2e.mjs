// End to end: a 10,000-row paste stays responsive. Opens the "fit a logged cooling curve"
// template, pastes a 10,000-row CSV (invented data: Newton cooling, generated below) into its
// data cell through the clipboard (after one past the paste limit, which is refused), waits for the fit below to refit on it, turns the
// text into a table, waits for the table and the fit again, scrolls the table and checks that
// the rows in view are drawn (and only about those). Throughout, a Chromium trace of the page
// (test/e2e/trace.mjs) records every main-thread task; the longest must stay under the goal.
//
// The goal is 100 ms (issue: "the page answers input within 100 ms"). Two measures of each
// task, from the trace, both printed:
// - its thread's CPU time: what the page's own work costs, which other processes on the
//   machine barely change. Held to the goal outright: the longest must be under 100 ms.
// - its wall-clock time: what a person feels, which a shared machine stretches (2 cores,
//   several test runs at once, loads of 15 seen) by about the load per core. Held to
//   `wallAllowance`: the goal times the load per core (the 1-minute load average over the
//   cores) times 1.5, the scheduler's unevenness, when that is above 1; on a quiet machine
//   (load per core at most 2/3) to the goal itself.
// A 'longtask' PerformanceObserver gives the printed figure of the paste alone.
// Measured on a quiet moment (load per core 1.1) before this work: longest 272 ms wall
// (turning the text into a table); see DEVELOPERS.md for the costs and what removed them.
// RATEBOOK_BIG_LONGEST_MS sets the wall-clock threshold outright.
//
// Expects a build in dist/ (`npm run test:e2e` builds first).
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import { freePort, startPreview, CHROMIUM_ARGS, fail, runScript, root } from './serve.mjs';
import { DEFAULT_CHROMIUM, NOT_FOUND_MESSAGE, findChromium } from '../../scripts/find-chromium.mjs';
import { longestTasks, mainThreadTasks, startTrace, wallAllowance } from './trace.mjs';

const NAME = 'big data';
const ROWS = Number(process.env.RATEBOOK_BIG_ROWS ?? 10_000);
const GOAL_MS = 100;
const LOAD_PER_CORE = loadavg()[0] / cpus().length;
const LONGEST_MS = Number(process.env.RATEBOOK_BIG_LONGEST_MS ?? wallAllowance(GOAL_MS));
const STEP = 40_000;
const OUT = process.env.RATEBOOK_BIG_OUT;

/** Invented data: a probe's reading every 3 s, T = 1 + 69·exp(-t / 50 min) degC, to 0.01 degC. */
function bigCsv() {
  const lines = ['t (min),T (degC)'];
  for (let i = 0; i < ROWS; i++) {
    const t = i * 0.05;
    lines.push(`${t.toFixed(2)},${(1 + 69 * Math.exp(-t / 50)).toFixed(2)}`);
  }
  return lines.join('\n');
}

async function main() {
  if (!existsSync(join(root, 'dist', 'index.html'))) fail('dist/ is missing: build first');
  const executablePath = findChromium() ?? (existsSync(DEFAULT_CHROMIUM) ? DEFAULT_CHROMIUM : fail(NOT_FOUND_MESSAGE));
  const { child, url } = await startPreview(await freePort());
  const profile = mkdtempSync(join(tmpdir(), 'ratebook-big-'));
  let context;
  try {
    context = await chromium.launchPersistentContext(profile, { executablePath, headless: true, args: CHROMIUM_ARGS, viewport: { width: 1280, height: 900 } });
    await context.grantPermissions(['clipboard-read', 'clipboard-write']);
    const page = context.pages()[0] ?? (await context.newPage());
    const errors = [];
    page.on('pageerror', (e) => errors.push(e.message));
    page.on('crash', () => console.error('the page crashed'));
    page.on('console', (m) => { if (m.type() === 'error') console.error('console:', m.text()); });
    await page.addInitScript(() => {
      window.__longTasks = [];
      new PerformanceObserver((list) => { for (const e of list.getEntries()) window.__longTasks.push(Math.round(e.duration)); }).observe({ type: 'longtask', buffered: true });
    });
    await page.goto(url);
    await page.locator('button.template[data-template="cooling-data-fit"]').click({ timeout: STEP });
    await page.waitForURL(/#\/study\//, { timeout: STEP });
    const fitRows = () => page.evaluate(() => {
      const find = (r, s) => { const h = r.querySelector(s); if (h) return h; for (const el of r.querySelectorAll('*')) if (el.shadowRoot) { const x = find(el.shadowRoot, s); if (x) return x; } return null; };
      const fit = find(document, 'fit-cell');
      return fit?.report?.ok ? fit.report.residuals?.length ?? fit.report.n ?? -1 : null;
    });
    const dataRows = () => page.evaluate(() => {
      const find = (r, s) => { const h = r.querySelector(s); if (h) return h; for (const el of r.querySelectorAll('*')) if (el.shadowRoot) { const x = find(el.shadowRoot, s); if (x) return x; } return null; };
      const cell = find(document, 'data-cell');
      return cell?.report?.ok ? cell.report.rowCount : null;
    });
    await page.waitForFunction(() => true);
    for (let i = 0; i < 300 && (await dataRows()) !== 11; i++) await page.waitForTimeout(100);
    if ((await dataRows()) !== 11) fail('the template\'s data cell never showed its 11 rows');
    await page.evaluate(() => { window.__longTasks.length = 0; });
    const trace = startTrace(await page.context().newCDPSession(page));
    await trace.started;

    // 0. A paste past the limit is refused with a pointer to the file import; the text stays.
    const over = ['t,T', ...Array.from({ length: 20_001 }, (_, i) => `${i},${i}`)].join('\n');
    await page.evaluate((text) => navigator.clipboard.writeText(text), over);
    await page.locator('data-cell textarea').click();
    await page.keyboard.press('Control+A');
    await page.keyboard.press('Control+V');
    await page.locator('data-cell p.foot-error', { hasText: 'Import a CSV file' }).waitFor({ timeout: STEP });
    if ((await dataRows()) !== 11) fail('the refused paste changed the data cell');
    await page.evaluate(() => { window.__longTasks.length = 0; });

    // 1. Paste: the whole text in one insertion into the CSV text box.
    const csv = bigCsv();
    const box = page.locator('data-cell textarea');
    await box.click();
    await page.keyboard.press('Control+A');
    // a real paste: the text on the clipboard, then Ctrl+V in the box
    await page.evaluate((text) => navigator.clipboard.writeText(text), csv);
    await page.keyboard.press('Control+V');
    for (let i = 0; i < 600 && (await dataRows()) !== ROWS; i++) await page.waitForTimeout(100);
    if ((await dataRows()) !== ROWS) fail(`after the paste the data cell shows ${await dataRows()} rows, not ${ROWS}`);
    const afterPaste = await page.evaluate(() => Math.max(0, ...window.__longTasks));
    console.log(`paste of ${ROWS} rows: longest main-thread task ${afterPaste} ms`);
    if (OUT) await page.screenshot({ path: join(OUT, 'big-pasted.png') });

    // 2. Turn into a table: converted off the page's thread, then drawn in part.
    await page.locator('data-cell button', { hasText: 'Turn into a table' }).click();
    let progressSeen = false;
    for (let i = 0; i < 600; i++) {
      const state = await page.evaluate(() => {
        const find = (r, s) => { const h = r.querySelector(s); if (h) return h; for (const el of r.querySelectorAll('*')) if (el.shadowRoot) { const x = find(el.shadowRoot, s); if (x) return x; } return null; };
        const cell = find(document, 'data-cell');
        return { progress: !!cell?.shadowRoot.querySelector('[role="progressbar"], progress'), table: !!cell?.shadowRoot.querySelector('table.grid') };
      });
      if (state.progress && !progressSeen && OUT) await page.screenshot({ path: join(OUT, 'big-progress.png') });
      progressSeen ||= state.progress;
      if (state.table) break;
      await page.waitForTimeout(20);
    }
    console.log(`progress shown while converting: ${progressSeen ? 'yes' : 'not caught (conversion finished between looks)'}`);
    for (let i = 0; i < 600 && (await dataRows()) !== ROWS; i++) await page.waitForTimeout(100);
    const table = await page.evaluate(() => {
      const find = (r, s) => { const h = r.querySelector(s); if (h) return h; for (const el of r.querySelectorAll('*')) if (el.shadowRoot) { const x = find(el.shadowRoot, s); if (x) return x; } return null; };
      const t = find(document, 'data-cell')?.shadowRoot.querySelector('table.grid');
      return t ? { rowcount: t.getAttribute('aria-rowcount'), drawn: t.querySelectorAll('tbody tr[aria-rowindex]').length } : null;
    });
    if (!table) fail('the table never appeared');
    if (Number(table.rowcount) !== ROWS + 1) fail(`the table's aria-rowcount is ${table.rowcount}, not ${ROWS + 1} (the header and ${ROWS} rows)`);
    if (table.drawn === 0 || table.drawn > 200) fail(`the table draws ${table.drawn} rows; it should draw those in view and a margin`);
    if ((await dataRows()) !== ROWS) fail(`the table gives the engine ${await dataRows()} rows, not ${ROWS}`);
    for (let i = 0; i < 600 && (await fitRows()) === null; i++) await page.waitForTimeout(100);
    if ((await fitRows()) === null) fail('the fit never answered on the table');
    if (OUT) await page.screenshot({ path: join(OUT, 'big-table.png') });
    if (OUT) await page.locator('fit-cell').screenshot({ path: join(OUT, 'big-fit.png') });

    // 3. Scroll the table to row 7,000 and check that it is drawn, with its value.
    const at = await page.evaluate(() => {
      const find = (r, s) => { const h = r.querySelector(s); if (h) return h; for (const el of r.querySelectorAll('*')) if (el.shadowRoot) { const x = find(el.shadowRoot, s); if (x) return x; } return null; };
      const root = find(document, 'data-cell').shadowRoot;
      const box = root.querySelector('.scroll');
      const row = root.querySelector('tbody tr[aria-rowindex]');
      box.scrollTop = 6999 * row.getBoundingClientRect().height;
      return box.scrollTop;
    });
    await page.waitForTimeout(300);
    const seen = await page.evaluate(() => {
      const find = (r, s) => { const h = r.querySelector(s); if (h) return h; for (const el of r.querySelectorAll('*')) if (el.shadowRoot) { const x = find(el.shadowRoot, s); if (x) return x; } return null; };
      const root = find(document, 'data-cell').shadowRoot;
      const input = root.querySelector('input[aria-label="Row 7000, t"]');
      return input ? input.value : null;
    });
    const expected = (6999 * 0.05).toFixed(2);
    if (seen === null) fail(`scrolled to ${at} px, row 7000 is not drawn`);
    if (Number(seen) !== Number(expected)) fail(`row 7000 shows t = ${seen}, not ${expected}`);
    if (OUT) await page.screenshot({ path: join(OUT, 'big-scrolled.png') });

    const tasks = mainThreadTasks(await trace.stop());
    const longest = longestTasks(tasks);
    const heavy = tasks.filter((t) => t.cpu >= 30 || t.wall >= 50);
    console.log(`longest main-thread task over the whole run: ${longest.wall.toFixed(0)} ms wall (threshold ${LONGEST_MS} ms: goal ${GOAL_MS} ms, load per core ${LOAD_PER_CORE.toFixed(1)}), ${longest.cpu.toFixed(0)} ms of CPU (goal ${GOAL_MS} ms); tasks of 50 ms wall or 30 ms CPU (wall/CPU): ${heavy.map((t) => `${t.wall.toFixed(0)}/${t.cpu.toFixed(0)}`).join(', ') || 'none'}`);
    if (errors.length) fail(`the page threw: ${errors.join('; ')}`);
    if (tasks.length === 0) fail('the trace holds no task of the page\'s main thread');
    if (longest.cpu >= GOAL_MS) fail(`the longest main-thread task took ${longest.cpu.toFixed(0)} ms of CPU time (goal ${GOAL_MS} ms)`);
    if (longest.wall >= LONGEST_MS) fail(`the longest main-thread task took ${longest.wall.toFixed(0)} ms (threshold ${LONGEST_MS} ms, goal ${GOAL_MS} ms at load per core ${LOAD_PER_CORE.toFixed(1)})`);
  } finally {
    await context?.close();
    child.kill();
    rmSync(profile, { recursive: true, force: true });
  }
}

await runScript(NAME, main);
