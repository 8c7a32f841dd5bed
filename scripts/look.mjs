// A developer's look at the built app: opens a template (argument: its key), waits for the
// results, and writes a full-page screenshot and a printed PDF (A4, or Letter with --letter)
// into the directory given by --out (default /tmp/look). Not a test.
import { mkdtempSync, rmSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import { freePort, startPreview, CHROMIUM_ARGS } from '../test/e2e/serve.mjs';
import { DEFAULT_CHROMIUM, findChromium } from './find-chromium.mjs';

const args = process.argv.slice(2);
const key = args.find((a) => !a.startsWith('--')) ?? 'cooling-stock-pot';
const outAt = args.indexOf('--out');
const out = outAt >= 0 ? args[outAt + 1] : '/tmp/look';
const format = args.includes('--letter') ? 'Letter' : 'A4';
mkdirSync(out, { recursive: true });
const { child, url } = await startPreview(await freePort());
const profile = mkdtempSync(join(tmpdir(), 'ratebook-look-'));
try {
  const context = await chromium.launchPersistentContext(profile, { executablePath: findChromium() ?? DEFAULT_CHROMIUM, headless: true, args: CHROMIUM_ARGS, viewport: { width: Number(process.env.LOOK_WIDTH ?? 1280), height: 900 } });
  const page = context.pages()[0] ?? (await context.newPage());
  page.on('pageerror', (e) => console.log('pageerror', e.message));
  page.on('console', (m) => { if (m.type() === 'error') console.log('console', m.text()); });
  await page.goto(url);
  await page.locator(`button.template[data-template="${key}"]`).click();
  await page.waitForURL(/#\/study\//);
  // Until the study has computed (the status leaves "computing…" and no cell is "updating…"), at most a minute.
  await page.waitForFunction(() => {
    const view = document.querySelector('ratebook-app')?.shadowRoot?.querySelector('study-view')?.shadowRoot;
    const text = view?.textContent ?? '';
    return view && !text.includes('computing…') && !text.includes('updating…');
  }, undefined, { timeout: 60_000, polling: 250 }).catch(() => console.warn('still computing after a minute; the picture shows it as it is'));
  await page.waitForTimeout(500);
  await page.screenshot({ path: join(out, `${key}.png`), fullPage: true });
  await page.pdf({ path: join(out, `${key}-${format}.pdf`), format, printBackground: true });
  await context.close();
  console.log(`wrote ${out}/${key}.png and ${key}-${format}.pdf`);
} finally {
  child.kill();
  rmSync(profile, { recursive: true, force: true });
}
