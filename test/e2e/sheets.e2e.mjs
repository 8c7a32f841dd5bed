// End to end: every template, as a user would use it. Start a study from the template, check
// that every cell computes without error, open its printable sheet, print it to PDF on A4 and
// on US Letter, and read the PDFs back (poppler's pdftotext and pdfinfo): the page count is
// sane, and the text holds the study's title and every result the run found, each equal to
// the command line's answer for the same file to the 4 significant figures shown.
//
// Expects a build in dist/. Set RATEBOOK_SHEETS_OUT=<dir> to keep the PDFs for a look
// (pdftoppm -r 60 -png <pdf> <prefix>).
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, rmSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import { freePort, startPreview, CHROMIUM_ARGS, fail, runScript, root, openSheet } from './serve.mjs';
import { DEFAULT_CHROMIUM, NOT_FOUND_MESSAGE, findChromium } from '../../scripts/find-chromium.mjs';

const NAME = 'printed sheets';
const STEP = 30_000;
/** A sheet longer than this many pages means something is laid out wrong. */
const MOST_PAGES = 12;

function tool(name, args) {
  const r = spawnSync(name, args, { encoding: 'utf8' });
  if (r.error) fail(`${name} is missing (${r.error.message}): install poppler-utils (apt-get install -y poppler-utils)`);
  if (r.status !== 0) fail(`${name} ${args.join(' ')} failed: ${r.stderr}`);
  return r.stdout;
}

/** The command line's report for a template file. */
function engineReport(file) {
  const r = spawnSync(process.execPath, [join(root, 'bin', 'ratebook.js'), 'run', file, '--json'], { encoding: 'utf8' });
  if (r.status !== 0) fail(`the command line could not run ${file} (exit ${r.status}): ${r.stderr}`);
  return JSON.parse(r.stdout);
}

/** Every result the report's cells found: simulate answers, fit estimates and profile values (name, value, unit). */
function foundResults(report) {
  const quantities = (c) => (c.kind === 'simulate' ? Object.entries(c.results ?? {})
    : c.kind === 'fit' ? Object.entries(c.estimates ?? {}).map(([name, e]) => [name, e.value])
    : c.kind === 'nca' ? Object.entries(c.values ?? {}) : []);
  return report.cells.flatMap((c) => quantities(c).filter(([, q]) => q && typeof q.value === 'number').map(([name, q]) => ({ cell: c.id, name, ...q })));
}

/** The cells' states in the open study: how many there are, and which failed or were not computed. */
function cellStates(page) {
  return page.evaluate(() => {
    const view = document.querySelector('ratebook-app')?.shadowRoot?.querySelector('study-view');
    const root = view?.shadowRoot;
    if (!root) return null;
    const status = root.querySelector('.status')?.textContent ?? '';
    const articles = [...root.querySelectorAll('article')];
    return {
      busy: status.includes('computing'),
      count: articles.length,
      failed: articles.filter((a) => a.classList.contains('failed')).map((a) => `${a.getAttribute('aria-label')}: ${a.querySelector('.state')?.textContent ?? ''}`),
      idle: articles.filter((a) => a.querySelector('.state.idle')).map((a) => a.getAttribute('aria-label')),
    };
  });
}

/** The answers the sheet shows in its tables of found results, estimates and profile values: name → text. */
function sheetAnswers(page) {
  return page.evaluate(() => {
    const sheet = document.querySelector('ratebook-app')?.shadowRoot?.querySelector('study-view')?.shadowRoot?.querySelector('study-sheet');
    const out = {};
    for (const tr of sheet?.shadowRoot?.querySelectorAll('table.results tbody tr') ?? []) {
      const answer = tr.querySelector('td.answer');
      if (answer) out[tr.querySelector('td.name').textContent.trim()] = answer.textContent.trim();
    }
    return out;
  });
}

/** Text of a PDF with its lines joined, so wrapped phrases still match. */
const flat = (s) => s.replace(/\s+/g, ' ');

async function main() {
  if (!existsSync(join(root, 'dist', 'index.html'))) fail('dist/ is missing: build first');
  const executablePath = findChromium() ?? (existsSync(DEFAULT_CHROMIUM) ? DEFAULT_CHROMIUM : fail(NOT_FOUND_MESSAGE));
  const keep = process.env.RATEBOOK_SHEETS_OUT;
  const out = keep ?? mkdtempSync(join(tmpdir(), 'ratebook-sheets-'));
  if (keep) mkdirSync(keep, { recursive: true });
  const files = readdirSync(join(root, 'examples')).filter((f) => f.endsWith('.ratebook.json')).sort();
  if (files.length === 0) fail('no templates in examples/');
  const { child, url } = await startPreview(await freePort());
  const profile = mkdtempSync(join(tmpdir(), 'ratebook-sheets-profile-'));
  let context;
  const lines = [];
  try {
    context = await chromium.launchPersistentContext(profile, { executablePath, headless: true, args: CHROMIUM_ARGS, viewport: { width: 1280, height: 900 } });
    const page = context.pages()[0] ?? (await context.newPage());
    const errors = [];
    page.on('pageerror', (e) => errors.push(e.message));
    for (const file of files) {
      const key = file.replace('.ratebook.json', '');
      const report = engineReport(join(root, 'examples', file));
      await page.goto(`${url}#/`);
      await page.locator(`button.template[data-template="${key}"]`).click({ timeout: STEP });
      await page.waitForURL(/#\/study\/[^/]+$/, { timeout: STEP });

      // every cell computes without error
      let states = null;
      for (let i = 0; i < 300; i++) {
        states = await cellStates(page);
        if (states && !states.busy && states.count === report.cells.length && states.idle.length === 0 && (states.failed.length === 0 || i > 50)) break;
        await page.waitForTimeout(100);
      }
      if (!states || states.count !== report.cells.length) fail(`${key}: the study shows ${states?.count} cells, the file has ${report.cells.length}`);
      if (states.failed.length) fail(`${key}: cells failed in the app: ${states.failed.join('; ')}`);
      if (states.idle.length) fail(`${key}: cells not computed: ${states.idle.join('; ')}`);

      // the printable sheet, then PDFs on both paper sizes
      await openSheet(page, STEP).catch(async () => {
        const shown = await page.evaluate(() => document.querySelector('ratebook-app')?.shadowRoot?.querySelector('study-view')?.shadowRoot?.textContent?.replace(/\s+/g, ' ').slice(0, 300));
        fail(`${key}: the printable sheet did not appear; the page shows: ${shown}`);
      });
      const answers = await sheetAnswers(page);
      const found = foundResults(report);
      for (const f of found) {
        const shown = answers[f.name];
        if (shown === undefined) fail(`${key}: the sheet does not list ${f.name}`);
        const number = Number(shown.split(' ')[0]);
        if (!(Math.abs(number - f.value) <= 5e-4 * Math.abs(f.value) + 1e-12)) fail(`${key}: the sheet shows ${f.name} = ${shown}; the command line gives ${f.value} ${f.unit}`);
        // text for people writes `1 / h` after a number as `/h` (unitAfterNumber in src/units/units.ts)
        const unitShown = f.unit.startsWith('1 / ') ? `/${f.unit.slice(4)}` : f.unit;
        if (f.unit && !shown.endsWith(unitShown)) fail(`${key}: the sheet shows ${f.name} = ${shown}, not in ${unitShown}`);
      }
      const pages = {};
      for (const format of ['A4', 'Letter']) {
        const pdf = join(out, `${key}-${format}.pdf`);
        await page.pdf({ path: pdf, format, printBackground: true });
        const count = Number(/Pages:\s+(\d+)/.exec(tool('pdfinfo', [pdf]))?.[1]);
        if (!(count >= 1 && count <= MOST_PAGES)) fail(`${key} (${format}): the PDF has ${count} pages`);
        pages[format] = count;
        const text = flat(tool('pdftotext', ['-layout', pdf, '-']));
        if (!text.includes(flat(report.title))) fail(`${key} (${format}): the PDF does not contain the title "${report.title}"`);
        for (const f of found) {
          if (!text.includes(`${f.name} `) || !text.includes(flat(answers[f.name]))) fail(`${key} (${format}): the PDF lacks the result ${f.name} = ${answers[f.name]}`);
        }
        for (const c of report.cautions ?? []) {
          if (!text.includes(flat(c.text).slice(0, 60))) fail(`${key} (${format}): the PDF lacks the caution "${c.text}"`);
        }
      }
      lines.push(`${key}: ${report.cells.length} cells ok, ${found.length} results on the sheet, ${pages.A4} A4 / ${pages.Letter} Letter pages`);
    }
    if (errors.length) fail(`the page threw: ${errors.join(' | ')}`);
    for (const l of lines) console.log(`ok: ${l}`);
  } finally {
    await context?.close().catch(() => {});
    child.kill();
    rmSync(profile, { recursive: true, force: true });
    if (!keep) rmSync(out, { recursive: true, force: true });
  }
}

await runScript(NAME, main);
