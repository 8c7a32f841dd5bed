// End to end: a 200-cell study (bench/large-study.mjs, invented numbers) opened in the built
// app. Every cell shows its result; the page renders a long study in chunks and makes the
// expression editors of fields far from the view only when they are needed, so opening it
// makes few editors; a field still waiting for its editor is a labelled text box that turns
// into the editor when focused, and typing in it edits the study. The goal, no main-thread
// task over 100 ms, is checked on a trace of the opening (test/e2e/trace.mjs), which gives
// each task's wall-clock and thread (CPU) time; both are printed, and
// `npm run bench -- "200-cell"` gives them against the goal itself.
// - CPU time: what the page's own work costs. Other processes change it less than the wall
//   clock, but not nothing (shared caches, the other hyperthread: the same module's loading
//   took 33 ms of CPU at load average 13 and 72 ms at 20, on 2 cores). Held to the goal on a
//   quiet machine (load per core at most 2/3), to 1.5 times the goal on a loaded one.
// - wall-clock time: what a person feels. On a quiet machine held to WALL_MS, twice the goal:
//   even then the page's thread shares 2 cores with the engine's worker, which computes the
//   study meanwhile, and with the browser's drawing (before this check, 146 to 188 ms were
//   measured quietly); on a loaded one to that times 1.5 times the load per core
//   (`wallAllowance`), since there the wall clock mostly measures the waiting for a core.
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { cpus, tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import { freePort, startPreview, CHROMIUM_ARGS, fail, runScript, root } from './serve.mjs';
import { DEFAULT_CHROMIUM, NOT_FOUND_MESSAGE, findChromium } from '../../scripts/find-chromium.mjs';
import { largeStudy, measureOpen } from '../../bench/large-study.mjs';
import { longestTasks, wallAllowance } from './trace.mjs';

const NAME = 'a 200-cell study';
/** Editors made while the study opens, at most: the 60 made before any field waits, and those near the first screen. */
const MOST_EDITORS = 100;
/** The goal for the longest main-thread task (ms). */
const GOAL_MS = 100;
/** The longest task allowed by the wall clock on a quiet machine (ms). */
const WALL_MS = 2 * GOAL_MS;

/** Counts, through every shadow root: CodeMirror editors, and fields still waiting for theirs. */
const EDITORS = `(() => {
  let editors = 0, waiting = 0;
  const walk = (r) => { for (const el of r.querySelectorAll('*')) { if (el.classList.contains('cm-editor')) editors++; if (el.classList.contains('waiting')) waiting++; if (el.shadowRoot) walk(el.shadowRoot); } };
  walk(document);
  return { editors, waiting };
})()`;

async function main() {
  if (!existsSync(join(root, 'dist', 'index.html'))) fail('dist/ is missing: build first');
  const executablePath = findChromium() ?? (existsSync(DEFAULT_CHROMIUM) ? DEFAULT_CHROMIUM : fail(NOT_FOUND_MESSAGE));
  const { child, url } = await startPreview(await freePort());
  const profile = mkdtempSync(join(tmpdir(), 'ratebook-large-'));
  let context;
  try {
    context = await chromium.launchPersistentContext(profile, { executablePath, headless: true, args: CHROMIUM_ARGS, viewport: { width: 1280, height: 900 } });
    const page = context.pages()[0] ?? (await context.newPage());
    const errors = [];
    page.on('pageerror', (e) => errors.push(e.message));
    const study = largeStudy();
    const file = join(profile, 'large.ratebook.json');
    writeFileSync(file, JSON.stringify(study));
    const opened = await measureOpen(page, url, file, study.cells.length, await context.newCDPSession(page));
    if (!(opened.tasks.length > 0)) fail('the trace holds no main-thread task');
    const longest = longestTasks(opened.tasks);
    const wallMs = wallAllowance(WALL_MS, opened.load);
    const cpuMs = opened.load / cpus().length <= 2 / 3 ? GOAL_MS : 1.5 * GOAL_MS;
    const figures = `the longest main-thread task ${Math.round(longest.wall)} ms by the wall clock (allowed ${wallMs} ms at load average ${opened.load.toFixed(1)}; ${longest.wallOver} over 100 ms) and ${Math.round(longest.cpu)} ms of CPU time (allowed ${cpuMs} ms)`;
    if (longest.cpu > cpuMs) fail(`opening took a main-thread task of ${Math.round(longest.cpu)} ms of CPU time: ${figures}`);
    if (longest.wall > wallMs) fail(`opening took a main-thread task of ${Math.round(longest.wall)} ms by the wall clock: ${figures}`);
    if (opened.cells !== 200) fail(`the page shows ${opened.cells} cells of 200`);
    const counts = await page.evaluate(EDITORS);
    if (counts.editors > MOST_EDITORS) fail(`opening made ${counts.editors} editors (at most ${MOST_EDITORS} expected)`);
    if (counts.waiting === 0) fail('no field waits for its editor: every editor was made at once');

    // the last parameter's field, far below: a text box with its label and text until focused
    const box = page.locator('expr-field[label="Value of k99"] .waiting');
    if (await box.getAttribute('role') !== 'textbox') fail('a waiting field is not a text box');
    if ((await box.textContent()) !== 'k98 * 1.001') fail(`the waiting field shows "${await box.textContent()}"`);
    await box.focus();
    const content = page.locator('expr-field[label="Value of k99"] .cm-content');
    await content.waitFor({ timeout: 5000 });
    if (!(await content.evaluate((el) => el.getRootNode().activeElement === el))) fail('the editor made on focus does not have the focus');
    await page.keyboard.press('End');
    await page.keyboard.type(' * 2');
    await page.keyboard.press('Enter');
    const shown = await page.locator('expr-field[label="Value of k99"] .cm-content').textContent();
    if (shown !== 'k98 * 1.001 * 2') fail(`after typing, the field shows "${shown}"`);
    if (errors.length) fail(`the page threw: ${errors.join(' | ')}`);
    console.log(`ok: 200 cells shown in ${(opened.ready / 1000).toFixed(1)} s, ${counts.editors} editors made and ${counts.waiting} waiting; ${figures}`);
  } finally {
    await context?.close().catch(() => {});
    child.kill();
    rmSync(profile, { recursive: true, force: true });
  }
}

await runScript(NAME, main);
