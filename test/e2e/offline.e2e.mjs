// End to end: the production build opens with no network after the first visit.
//
// Expects a build in dist/ (`npm run test:e2e` builds first; this script builds nothing).
// Serves it with `vite preview` on a free localhost port, opens it in Chromium with a fresh
// profile, waits for the service worker to control the page, checks that every built file
// is in its cache, goes offline, reloads, and checks that the app renders with no failed
// request. Exits 0 when all of that holds; otherwise prints what failed and exits 1.
import { existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium } from 'playwright-core';
import { freePort, startPreview, CHROMIUM_ARGS, fail, runScript } from './serve.mjs';
import { DEFAULT_CHROMIUM, NOT_FOUND_MESSAGE, findChromium } from '../../scripts/find-chromium.mjs';

const root = fileURLToPath(new URL('../..', import.meta.url));
const dist = join(root, 'dist');
const NAME = 'offline';
const STEP_TIMEOUT_MS = 30_000;



/** Every built file, as the worker should cache it (no sw.js, no source maps). */
function distFiles() {
  return readdirSync(dist, { recursive: true, withFileTypes: true })
    .filter((e) => e.isFile())
    .map((e) => relative(dist, join(e.parentPath ?? e.path, e.name)).split(sep).join('/'))
    .filter((f) => f !== 'sw.js' && !f.endsWith('.map'))
    .sort();
}


/** Resolves when the app's shell has rendered its heading. */
async function appRendered(page, when) {
  try {
    await page.waitForFunction(
      () => document.querySelector('ratebook-app')?.shadowRoot?.querySelector('h1')?.textContent?.trim() === 'Ratebook',
      null, { timeout: STEP_TIMEOUT_MS },
    );
  } catch {
    fail(`${when}: the app did not render (no "Ratebook" heading in <ratebook-app>). Page text: ${JSON.stringify((await page.textContent('body').catch(() => '')) ?? '')}`);
  }
}

async function main() {
  if (!existsSync(join(dist, 'index.html'))) fail('dist/index.html is missing: build first (npm run test:e2e builds, then runs this).');
  if (!existsSync(join(dist, 'sw.js'))) fail('dist/sw.js is missing: the build did not write the service worker (offline/vite-plugin.ts).');
  const executablePath = findChromium() ?? (existsSync(DEFAULT_CHROMIUM) ? DEFAULT_CHROMIUM : fail(NOT_FOUND_MESSAGE));

  const { child, url } = await startPreview(await freePort());
  const profile = mkdtempSync(join(tmpdir(), 'ratebook-e2e-'));
  let context;
  try {
    context = await chromium.launchPersistentContext(profile, {
      executablePath,
      headless: true,
      serviceWorkers: 'allow',
      args: CHROMIUM_ARGS,
    });
    const page = context.pages()[0] ?? (await context.newPage());
    const pageErrors = [];
    page.on('pageerror', (err) => pageErrors.push(err.message));

    // 1. First visit, online.
    await page.goto(url);
    await appRendered(page, 'first visit (online)');
    try {
      await page.waitForFunction(() => navigator.serviceWorker?.controller != null, null, { timeout: STEP_TIMEOUT_MS });
    } catch {
      fail(`the service worker did not take control of the page within ${STEP_TIMEOUT_MS / 1000} s`);
    }

    // 2. Every built file is in the worker's cache.
    const cached = await page.evaluate(async () => {
      const urls = [];
      for (const name of await caches.keys()) {
        for (const request of await (await caches.open(name)).keys()) urls.push(new URL(request.url).pathname.slice(1));
      }
      return urls;
    });
    const missing = distFiles().filter((f) => !cached.includes(f));
    if (missing.length) fail(`built files missing from the offline cache: ${missing.join(', ')}`);

    // 3. Offline, for the page and for the worker: a request nobody cached must now fail.
    await context.setOffline(true);
    const probe = await page.evaluate((u) => fetch(`${u}offline-probe-${Date.now()}`).then(() => 'answered', () => 'failed'), url);
    if (probe !== 'failed') fail('going offline did not cut the network (a request to an uncached address was answered)');

    // 4. Reload with no network: the app renders from the cache, and nothing it asks for fails.
    const failed = [];
    page.on('requestfailed', (r) => { if (r.url().startsWith(url)) failed.push(`${r.url()} (${r.failure()?.errorText})`); });
    try {
      await page.reload({ timeout: STEP_TIMEOUT_MS });
    } catch (err) {
      fail(`reloading offline failed: ${err.message.split('\n')[0]}`);
    }
    await appRendered(page, 'reload offline');
    if (failed.length) fail(`requests failed while offline: ${failed.join(', ')}`);
    if (pageErrors.length) fail(`the page threw: ${pageErrors.join(' | ')}`);
    const controlled = await page.evaluate(() => navigator.serviceWorker.controller?.scriptURL);
    console.log(`ok: offline reload rendered the app from ${controlled}, with ${cached.length} cached files`);
  } finally {
    await context?.close().catch(() => {});
    child.kill();
    rmSync(profile, { recursive: true, force: true });
  }
}

await runScript(NAME, main);
