// End to end: the content security policy, and a hostile study file under it. Serves the
// build with `vite preview`, checks the policy is in the page (meta tag) and in the headers
// (the page's, and the engine worker's own), checks that a violation is seen when one is
// provoked, then imports a study whose every text field holds script payloads, opens it and
// its printable sheet (printed to PDF), and checks that nothing ran, no `javascript:` link
// exists, every computing cell still computed, and nothing violated the policy.
//
// The other end-to-end scripts run under the same policy: `serve.mjs` fails any of them
// whose pages (or workers) report a violation.
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import { freePort, startPreview, CHROMIUM_ARGS, fail, runScript, root, policyViolations, clearViolations, openSheet } from './serve.mjs';
import { DEFAULT_CHROMIUM, NOT_FOUND_MESSAGE, findChromium } from '../../scripts/find-chromium.mjs';

const NAME = 'content security policy';
const STEP = 30_000;

/** Script payloads, each of which sets `window.__pwned` if it ever runs. */
const PAYLOADS = [
  '<img src=x onerror=window.__pwned=1>',
  '<script>window.__pwned=1</script>',
  '[open me](javascript:window.__pwned=1)',
  '<a href="javascript:window.__pwned=1">link</a>',
  '"><svg onload=window.__pwned=1>',
];
const ALL = PAYLOADS.join(' ');

/**
 * The hostile study: the fit template (parameters, data from CSV, a rate law, a fit, a note)
 * with a payload in its title, description, author, every cell title, every parameter note and
 * the note's text, plus cells whose names, values, units, CSV header and CSV cells are payloads.
 */
function hostileStudy() {
  const doc = JSON.parse(readFileSync(join(root, 'examples', 'cooling-data-fit.ratebook.json'), 'utf8'));
  doc.title = `Hostile ${ALL}`;
  doc.description = `Every text field holds a script. ${ALL}`;
  doc.author = ALL;
  for (const cell of doc.cells) {
    cell.title = `${cell.title ?? cell.id} ${PAYLOADS[0]}`;
    if (cell.kind === 'parameters') for (const item of cell.items) item.note = `${item.note ?? ''} ${ALL}`;
    if (cell.kind === 'note') cell.text = `${cell.text}\n\nSee [the log](javascript:window.__pwned=1) and <b onclick=window.__pwned=1>this</b>. ${ALL}`;
  }
  doc.cells.push(
    { id: 'bad-names', kind: 'parameters', title: ALL, items: [
      { name: PAYLOADS[0], value: '1 / h', note: ALL },
      { name: 'x_payload', value: PAYLOADS[1], unit: PAYLOADS[0] },
      { name: 'y_payload', value: `2 ${PAYLOADS[4]}` },
    ] },
    { id: 'bad-csv', kind: 'data', title: PAYLOADS[1], columns: [{ name: PAYLOADS[0], unit: PAYLOADS[1] }, { name: 'T', unit: 'degC' }],
      csv: `${PAYLOADS[0]},T\n0,${PAYLOADS[1]}\n${PAYLOADS[2]},3\n1,"${PAYLOADS[4].replaceAll('"', '""')}"\n` },
    { id: 'bad-rate', kind: 'rate', title: PAYLOADS[2], state: 'Q', unit: PAYLOADS[0], rate: `-k * Q ${PAYLOADS[1]}`, initial: '1' },
    { id: 'bad-note', kind: 'note', title: `[x](javascript:window.__pwned=1)`, text: `# Heading\n[click](javascript:window.__pwned=1)\n${ALL}` },
  );
  return doc;
}

/** Everything in the page (through every shadow root): `javascript:` links and whether a payload ran. */
function inspect(page) {
  return page.evaluate(() => {
    const all = [];
    let text = '';
    const walk = (r) => {
      for (const el of r.querySelectorAll('*')) {
        all.push(el);
        if (el.shadowRoot) walk(el.shadowRoot);
        if (!el.children.length || el.tagName === 'TD' || el.tagName === 'P') text += ` ${el.textContent}`;
        if ('value' in el && typeof el.value === 'string') text += ` ${el.value}`;
      }
    };
    walk(document);
    const scriptLinks = all.filter((el) => /^\s*javascript:/i.test(el.getAttribute('href') ?? '') || /^\s*javascript:/i.test(el.getAttribute('src') ?? ''));
    const handlers = all.filter((el) => [...el.attributes].some((a) => /^on/i.test(a.name)));
    const images = all.filter((el) => el.tagName === 'IMG' && el.getAttribute('src') === 'x');
    return { pwned: window.__pwned, scriptLinks: scriptLinks.length, handlers: handlers.map((el) => el.tagName).slice(0, 5), images: images.length, elements: all.length, text };
  });
}

/** The open study's cells: how many, and the ids of those that failed. */
function cellStates(page) {
  return page.evaluate(() => {
    const root = document.querySelector('ratebook-app')?.shadowRoot?.querySelector('study-view')?.shadowRoot;
    const articles = [...(root?.querySelectorAll('article') ?? [])];
    const status = root?.querySelector('.status')?.textContent ?? '';
    return { count: articles.length, busy: status.includes('computing'), failed: articles.filter((a) => a.classList.contains('failed')).length };
  });
}

async function main() {
  const dist = join(root, 'dist');
  if (!existsSync(join(dist, 'index.html'))) fail('dist/ is missing: build first');
  const executablePath = findChromium() ?? (existsSync(DEFAULT_CHROMIUM) ? DEFAULT_CHROMIUM : fail(NOT_FOUND_MESSAGE));
  const { child, url } = await startPreview(await freePort());
  const profile = mkdtempSync(join(tmpdir(), 'ratebook-csp-'));
  let context;
  try {
    // 1. The policy: in the built page, and in the headers of the page and of the worker.
    const html = readFileSync(join(dist, 'index.html'), 'utf8');
    const meta = /<meta http-equiv="Content-Security-Policy" content="([^"]+)"/.exec(html)?.[1];
    if (!meta) fail('dist/index.html has no Content-Security-Policy meta tag');
    if (html.indexOf('http-equiv="Content-Security-Policy"') > html.search(/<script|<link/)) fail('the meta tag comes after a script or a style sheet, which it would not govern');
    if (/<script(?![^>]*\bsrc=)[^>]*>/.test(html) || /<style/.test(html) || /\sstyle=/.test(html)) fail('dist/index.html has an inline script or style');
    for (const must of ["default-src 'none'", "script-src 'self'", "style-src 'self'", "base-uri 'none'", "object-src 'none'"]) {
      if (!meta.includes(must)) fail(`the meta tag's policy lacks "${must}": ${meta}`);
    }
    if (/unsafe-(eval|inline)|https?:|\*/.test(meta)) fail(`the page's policy allows more than the app's own files: ${meta}`);
    const pageHeader = (await fetch(url)).headers.get('content-security-policy') ?? fail('vite preview sends no Content-Security-Policy header with the page');
    if (!pageHeader.startsWith(meta) || !pageHeader.includes("frame-ancestors 'none'")) fail(`the page's header policy is not the meta tag's plus frame-ancestors: ${pageHeader}`);
    const workerFile = readdirSync(join(dist, 'assets')).find((f) => f.startsWith('engine.worker-')) ?? fail('no engine worker in dist/assets');
    const workerHeader = (await fetch(`${url}assets/${workerFile}`)).headers.get('content-security-policy') ?? '';
    if (!/script-src 'self' 'unsafe-eval'/.test(workerHeader) || !workerHeader.includes("default-src 'none'")) fail(`the engine worker's header policy is not its own: ${workerHeader}`);

    context = await chromium.launchPersistentContext(profile, { executablePath, headless: true, args: CHROMIUM_ARGS, viewport: { width: 1280, height: 900 } });
    await context.addInitScript(() => {
      window.__violations = [];
      addEventListener('securitypolicyviolation', (e) => window.__violations.push(`${e.effectiveDirective} ${e.blockedURI || '(inline)'}`));
    });
    const page = context.pages()[0] ?? (await context.newPage());
    const consoleViolations = [];
    const errors = [];
    page.on('console', (m) => { if (/Content Security Policy/i.test(m.text())) consoleViolations.push(m.text()); });
    page.on('pageerror', (e) => errors.push(e.message));
    await page.goto(url);
    await page.locator('study-library').waitFor({ timeout: STEP });

    // 2. The watch works: an inline script is refused, and reported both in the page and to the server.
    await page.evaluate(() => { const s = document.createElement('script'); s.textContent = 'window.__pwned = 1'; document.body.append(s); });
    await page.waitForFunction(() => window.__violations.length > 0, null, { timeout: STEP }).catch(() => fail('an inline script raised no securitypolicyviolation event'));
    if (await page.evaluate(() => window.__pwned)) fail('an inline script ran under the policy');
    for (let i = 0; i < 100 && policyViolations().length === 0; i++) await page.waitForTimeout(100);
    if (policyViolations().length === 0) fail('the provoked violation was not reported to the server');
    clearViolations();
    await page.evaluate(() => { window.__violations = []; });
    consoleViolations.length = 0;

    // 3. The hostile study: imported through the library, opened, computed.
    const file = join(profile, 'hostile.ratebook.json');
    writeFileSync(file, JSON.stringify(hostileStudy(), null, 2));
    await page.locator('study-library input[type="file"]').setInputFiles(file);
    await page.getByText(/Imported ".*" as a new study/).waitFor({ timeout: STEP });
    await page.locator('study-library li .t a').first().click();
    await page.waitForURL(/#\/study\//, { timeout: STEP });
    let states = null;
    for (let i = 0; i < 300; i++) {
      states = await cellStates(page);
      if (states && states.count >= 10 && !states.busy) break;
      await page.waitForTimeout(100);
    }
    if (!states || states.count < 10) fail(`the hostile study shows ${states?.count ?? 0} cells, expected 10`);
    // the template's own cells compute (their titles and notes hold payloads, nothing else);
    // the added cells with payloads in names, values, units and CSV fail with messages
    const edit = await inspect(page);
    if (!edit.text.includes('k_fit')) fail('the fit did not show its estimate k_fit');
    if (!edit.text.includes('<img src=x onerror=window.__pwned=1>')) fail('the payload is not shown as text');

    // 4. Its printable sheet, and the sheet printed.
    await openSheet(page, STEP);
    const sheet = await inspect(page);
    await page.pdf({ format: 'A4' });
    await page.waitForTimeout(500);

    for (const [where, r] of [['the study', edit], ['its sheet', sheet]]) {
      if (r.pwned !== undefined) fail(`a payload ran in ${where}`);
      if (r.scriptLinks) fail(`${where} holds ${r.scriptLinks} javascript: link(s)`);
      if (r.handlers.length) fail(`${where} holds elements with event handler attributes: ${r.handlers.join(', ')}`);
      if (r.images) fail(`${where} holds ${r.images} payload image(s)`);
    }
    const violations = [...await page.evaluate(() => window.__violations), ...consoleViolations];
    if (violations.length) fail(`policy violations while the hostile study was open: ${violations.join(' | ')}`);
    if (errors.length) fail(`the page threw: ${errors.join(' | ')}`);
    console.log(`ok: policy in the meta tag and the headers (worker: ${workerHeader}); the hostile study opened (${states.count} cells, ${states.failed} with messages) and its sheet printed, nothing ran`);
  } finally {
    await context?.close().catch(() => {});
    child.kill();
    rmSync(profile, { recursive: true, force: true });
  }
}

await runScript(NAME, main);
