// End to end: what a new user does. Open the app, start from the cooling template, change the
// walk-in temperature, see the crossing time change to the engine's own answer, reload and
// find the change kept, export the study and import it back as a second study, then go
// offline and reload.
//
// Expects a build in dist/ (`npm run test:e2e` builds first). Serves it with `vite preview`
// on a free localhost port and drives the Debian Chromium with playwright-core.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium } from 'playwright-core';
import { freePort, startPreview, CHROMIUM_ARGS, fail, runScript } from './serve.mjs';
import { DEFAULT_CHROMIUM, NOT_FOUND_MESSAGE, findChromium } from '../../scripts/find-chromium.mjs';

const root = fileURLToPath(new URL('../..', import.meta.url));
const NAME = 'user flow';
const STEP = 30_000;



/** The answer shown for a named question of the simulate cell (text of its result cell). */
function shownAnswer(page, name) {
  return page.evaluate((n) => {
    const find = (root, sel) => {
      const hit = root.querySelector(sel);
      if (hit) return hit;
      for (const el of root.querySelectorAll('*')) if (el.shadowRoot) { const x = find(el.shadowRoot, sel); if (x) return x; }
      return null;
    };
    const cell = find(document, 'simulate-cell');
    if (!cell) return null;
    for (const row of cell.shadowRoot.querySelectorAll('table.finds tbody tr')) {
      if (row.querySelector('input')?.value === n) return row.querySelector('td.result')?.textContent?.trim() ?? null;
    }
    return null;
  }, name);
}

/** The engine's answer for a study file, from the command line. */
function engineAnswer(file, cellId, name) {
  const r = spawnSync(process.execPath, [join(root, 'bin', 'ratebook.js'), 'run', file, '--json'], { encoding: 'utf8' });
  if (r.status !== 0) fail(`the command line could not run the exported study: ${r.stderr}`);
  const q = JSON.parse(r.stdout).cells.find((c) => c.id === cellId).results[name];
  return q;
}

const show = (q) => `${Number(q.value.toPrecision(4))} ${q.unit}`;

async function main() {
  if (!existsSync(join(root, 'dist', 'index.html'))) fail('dist/ is missing: build first');
  const executablePath = findChromium() ?? (existsSync(DEFAULT_CHROMIUM) ? DEFAULT_CHROMIUM : fail(NOT_FOUND_MESSAGE));
  const { child, url } = await startPreview(await freePort());
  const profile = mkdtempSync(join(tmpdir(), 'ratebook-flow-'));
  const downloads = mkdtempSync(join(tmpdir(), 'ratebook-dl-'));
  let context;
  try {
    context = await chromium.launchPersistentContext(profile, {
      executablePath, headless: true, acceptDownloads: true, serviceWorkers: 'allow', viewport: { width: 1280, height: 900 },
      args: CHROMIUM_ARGS,
    });
    const page = context.pages()[0] ?? (await context.newPage());
    const errors = [];
    page.on('pageerror', (e) => errors.push(e.message));

    // 1. Open the app and start from the cooling template.
    await page.goto(url);
    await page.locator('button.template[data-template="cooling-stock-pot"]').click({ timeout: STEP });
    await page.waitForURL(/#\/study\//, { timeout: STEP });
    await page.waitForFunction(() => true);
    let before = null;
    for (let i = 0; i < 100 && !before; i++) { before = await shownAnswer(page, 't_21'); if (!before) await page.waitForTimeout(100); }
    if (!before) fail('the simulate cell never showed t_21');

    // 2. Change the walk-in temperature: type into its field as a user would.
    const field = page.locator('expr-field[label="Value of T_walkin"] .cm-content');
    await field.click();
    await page.keyboard.press('Control+A');
    await page.keyboard.type('-2 degC');
    let after = before;
    // while the typing is half done the field holds no temperature and the answer shows empty: wait for a new answer
    for (let i = 0; i < 100 && (after === before || !after); i++) { await page.waitForTimeout(100); after = await shownAnswer(page, 't_21'); }
    if (after === before) fail(`t_21 did not change after the edit (still ${before})`);

    // 3. The shown answer is the engine's: export the study and run it on the command line.
    await page.waitForTimeout(1200); // the autosave settles
    const [download] = await Promise.all([page.waitForEvent('download', { timeout: STEP }), page.getByRole('button', { name: 'Export study' }).click()]);
    const file = join(downloads, 'exported.ratebook.json');
    await download.saveAs(file);
    const doc = JSON.parse(readFileSync(file, 'utf8'));
    const walkin = doc.cells.find((c) => c.id === 'inputs').items.find((i) => i.name === 'T_walkin').value;
    if (walkin !== '-2 degC') fail(`the exported study has T_walkin = ${walkin}`);
    const expected = show(engineAnswer(file, 'run', 't_21'));
    if (after !== expected) fail(`the app shows t_21 = ${after}; the engine gives ${expected}`);

    // 4. Reload: the study comes back with its change.
    await page.reload();
    let kept = null;
    for (let i = 0; i < 100 && kept !== after; i++) { await page.waitForTimeout(100); kept = await shownAnswer(page, 't_21'); }
    if (kept !== after) fail(`after a reload t_21 shows ${kept}, expected ${after}`);

    // 5. Import the exported file back: a second study.
    await page.goto(`${url}#/`);
    await page.locator('study-library input[type="file"]').setInputFiles(file);
    await page.getByText(/Imported ".*" as a new study/).waitFor({ timeout: STEP });
    const titles = await page.locator('study-library li .t a').allTextContents();
    if (titles.length !== 2) fail(`the library lists ${titles.length} studies after the import: ${titles.join(', ')}`);

    // 6. Offline: the app and the studies are still there.
    await page.waitForFunction(() => navigator.serviceWorker?.controller != null, null, { timeout: STEP });
    await context.setOffline(true);
    await page.reload();
    await page.locator('study-library li .t a').first().waitFor({ timeout: STEP });
    const offlineTitles = await page.locator('study-library li .t a').allTextContents();
    if (offlineTitles.length !== 2) fail(`offline, the library lists ${offlineTitles.length} studies`);
    await page.locator('study-library li .t a').first().click();
    let offlineAnswer = null;
    for (let i = 0; i < 100 && !offlineAnswer; i++) { await page.waitForTimeout(100); offlineAnswer = await shownAnswer(page, 't_21'); }
    if (offlineAnswer !== after) fail(`offline, the study shows t_21 = ${offlineAnswer}`);
    if (errors.length) fail(`the page threw: ${errors.join(' | ')}`);
    console.log(`ok: t_21 went from ${before} to ${after} (the engine's value), kept on reload, exported, imported, and worked offline`);
  } finally {
    await context?.close().catch(() => {});
    child.kill();
    rmSync(profile, { recursive: true, force: true });
    rmSync(downloads, { recursive: true, force: true });
  }
}

await runScript(NAME, main);
