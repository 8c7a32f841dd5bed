// End to end: saving that survives the page. An edit is kept when the page is reloaded or
// closed 0, 50 or 200 ms after it; a tab whose study was saved in another tab is refused and
// offered the two choices; tabs hear each other's saves at once; a storage quota error (stubbed in the page) is said in words and
// saving recovers by itself when space returns; damaged records are listed as damaged while
// the other studies open normally.
//
// Each group uses a fresh Chromium profile (user data dir): storage persists across a reload
// and a close within the group, never across groups. Expects a build in dist/.
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import { freePort, startPreview, CHROMIUM_ARGS, fail, runScript, root } from './serve.mjs';
import { DEFAULT_CHROMIUM, NOT_FOUND_MESSAGE, findChromium } from '../../scripts/find-chromium.mjs';

const NAME = 'storage safety';
const STEP = 20_000;
const profiles = [];
let executablePath;
let url;

/** Every browser launched, closed at the end whatever happened (a failed step leaves its own open). */
const launched = [];

async function launch(profile) {
  const context = await chromium.launchPersistentContext(profile, {
    executablePath, headless: true, acceptDownloads: true, serviceWorkers: 'block', viewport: { width: 1200, height: 900 }, args: CHROMIUM_ARGS,
  });
  launched.push(context);
  return context;
}

function newProfile() {
  const p = mkdtempSync(join(tmpdir(), 'ratebook-store-'));
  profiles.push(p);
  return p;
}

/** A page that records uncaught errors and accepts confirm dialogs. */
async function openPage(context, hash = '') {
  const page = context.pages()[0] ?? (await context.newPage());
  page.errors ??= [];
  if (!page.watched) {
    page.watched = true;
    page.on('pageerror', (e) => page.errors.push(e.message));
    page.on('dialog', (d) => void d.accept());
  }
  await page.goto(url + hash);
  return page;
}

async function newBlankStudy(page) {
  await page.locator('button.template').first().click({ timeout: STEP });
  await page.waitForURL(/#\/study\//, { timeout: STEP });
  await page.locator('textarea.title').waitFor({ timeout: STEP });
  return new URL(page.url()).hash;
}

const titleOf = (page) => page.locator('textarea.title').inputValue({ timeout: STEP });
const statusOf = (page) => page.locator('span.status').textContent({ timeout: STEP });

async function waitForText(page, selector, text, what) {
  try {
    await page.locator(selector, { hasText: text }).first().waitFor({ timeout: STEP });
  } catch {
    fail(`${what}: no ${selector} saying "${text}" appeared`);
  }
}

function noErrors(page, where) {
  if (page.errors?.length) fail(`${where}: uncaught errors in the page: ${page.errors.join(' | ')}`);
}

/**
 * Reload (same page) or close `ms` after an edit. Close at 0 ms closes the whole browser and
 * starts a new one on the same profile; at 50 and 200 ms it closes the page (no unload
 * handlers run) and opens a new one (a browser start costs seconds on a loaded machine).
 */
async function editThenLeave(mode) {
  const profile = newProfile();
  let context = await launch(profile);
  let page = await openPage(context);
  const hash = await newBlankStudy(page);
  for (const ms of [0, 50, 200]) {
    const title = `Kept after ${mode} at ${ms} ms`;
    await page.locator('textarea.title').fill(title);
    if (ms) await page.waitForTimeout(ms);
    if (mode === 'reload') await page.reload();
    else if (ms === 0) {
      await context.close();
      context = await launch(profile);
    } else {
      await page.close();
      await context.newPage();
    }
    page = await openPage(context, hash);
    await page.locator('textarea.title').waitFor({ timeout: STEP });
    const shown = await titleOf(page);
    if (shown !== title) fail(`${mode} ${ms} ms after an edit: the title is "${shown}", not the edited "${title}"`);
    noErrors(page, `${mode} at ${ms} ms`);
  }
  await context.close();
}

async function twoTabs() {
  const context = await launch(newProfile());
  const a = await openPage(context);
  const hash = await newBlankStudy(a);
  const b = await context.newPage();
  b.on('dialog', (d) => void d.accept());
  await b.goto(url + hash);
  await b.locator('textarea.title').waitFor({ timeout: STEP });
  await a.locator('textarea.title').fill('Title typed in tab A');
  await waitForText(a, 'span.status', 'saved', 'tab A after its edit');
  await a.waitForFunction(() => !localStorage.length, undefined, { timeout: STEP }); // A's save landed: its journal is empty
  await b.locator('textarea.title').fill('Title typed in tab B');
  await waitForText(b, '.conflict', 'saved elsewhere', 'tab B, whose study was saved in tab A');
  await b.locator('button[data-choice="newer"]').waitFor({ timeout: STEP });
  await b.locator('button[data-choice="copy"]').click();
  await b.waitForURL((u) => u.hash !== hash, { timeout: STEP });
  await b.locator('textarea.title').waitFor({ timeout: STEP });
  if (!(await titleOf(b)).startsWith('Title typed in tab B')) fail(`tab B's copy is titled "${await titleOf(b)}"`);
  await a.reload();
  await a.locator('textarea.title').waitFor({ timeout: STEP });
  if ((await titleOf(a)) !== 'Title typed in tab A') fail(`tab A's study was overwritten: "${await titleOf(a)}"`);
  // The other choice: tab B, stale again, takes the newer version.
  const c = await context.newPage();
  await c.goto(url + hash);
  await c.locator('textarea.title').waitFor({ timeout: STEP });
  await a.locator('textarea.title').fill('Second title from tab A');
  await waitForText(a, 'span.status', 'saved', 'tab A after its second edit');
  await c.locator('textarea.title').fill('Stale edit in tab C');
  await c.locator('button[data-choice="newer"]').click({ timeout: STEP });
  await c.waitForFunction(() => !document.querySelector('ratebook-app').shadowRoot.querySelector('.conflict'), undefined, { timeout: STEP });
  await c.locator('textarea.title').waitFor({ timeout: STEP });
  const shown = await titleOf(c);
  if (shown !== 'Second title from tab A') fail(`tab C chose the newer version but shows "${shown}"`);
  noErrors(a, 'tab A');
  await context.close();
}

/**
 * Tabs hear each other's saves as they happen: tab B, with the study open and no edits, says
 * it changed in tab A without replacing what it shows, and opens the newer version on request;
 * a third tab on the library lists A's new title without a reload.
 */
async function tabsHearSaves() {
  const context = await launch(newProfile());
  const a = await openPage(context);
  const hash = await newBlankStudy(a);
  const b = await context.newPage();
  await b.goto(url + hash);
  await b.locator('textarea.title').waitFor({ timeout: STEP });
  const before = await titleOf(b);
  const lib = await context.newPage();
  await lib.goto(url);
  await lib.locator('study-library li', { hasText: before }).first().waitFor({ timeout: STEP });
  await a.locator('textarea.title').fill('Saved in tab A');
  await waitForText(b, '.elsewhere', 'changed in another tab', 'tab B, after tab A saved');
  if ((await titleOf(b)) !== before) fail(`tab B replaced what it showed without a choice: "${await titleOf(b)}"`);
  await waitForText(lib, 'study-library li', 'Saved in tab A', 'the library tab, after tab A saved');
  await b.locator('.elsewhere button[data-choice="newer"]').click({ timeout: STEP });
  await b.waitForFunction(() => !document.querySelector('ratebook-app').shadowRoot.querySelector('.elsewhere'), undefined, { timeout: STEP });
  await b.locator('textarea.title').waitFor({ timeout: STEP });
  if ((await titleOf(b)) !== 'Saved in tab A') fail(`tab B chose the newer version but shows "${await titleOf(b)}"`);
  // The library tab moves the study to the trash while tab B types: B says so, keeps its edit,
  // saves none of it into the trash, and restores the study on request.
  await a.close();
  await lib.locator('study-library button[aria-label="Delete Saved in tab A"]').click({ timeout: STEP });
  await waitForText(b, '.gone', 'moved to the trash in another tab', 'tab B, after the library tab trashed the study');
  await b.locator('textarea.title').fill('Typed in tab B after the trash');
  await waitForText(b, 'span.status', 'could not save', 'tab B\'s save refused while the study is in the trash');
  await lib.reload();
  await waitForText(lib, 'study-library li', 'Saved in tab A', 'the trash in the library tab');
  if (await lib.locator('study-library li', { hasText: 'Typed in tab B' }).count()) fail('tab B\'s edit was saved into the trash');
  await b.locator('.gone button[data-choice="restore"]').click({ timeout: STEP });
  await waitForText(b, 'span.status', 'saved', 'tab B after restoring');
  await waitForText(lib, 'study-library li', 'Typed in tab B after the trash', 'the library tab, after tab B restored and saved');
  // The library tab moves it to the trash again and empties the trash: B offers only a new study.
  await lib.locator('study-library button[aria-label="Delete Typed in tab B after the trash"]').click({ timeout: STEP });
  lib.once('dialog', (d) => void d.accept());
  await lib.locator('study-library button.purge').click({ timeout: STEP });
  await waitForText(b, '.gone', 'deleted for good in another tab', 'tab B, after the trash was emptied');
  if (await b.locator('.gone button[data-choice="restore"]').count()) fail('tab B offers to restore a study no longer in the trash');
  await b.locator('.gone button[data-choice="copy"]').click({ timeout: STEP });
  await waitForText(b, '.notice', 'kept as a new study', 'tab B after keeping its version');
  await waitForText(lib, 'study-library li', 'Typed in tab B after the trash (copy)', 'the library tab, after tab B kept its version');
  noErrors(b, 'tab B');
  await context.close();
}

async function quotaThenRecovery() {
  const context = await launch(newProfile());
  const page = await openPage(context);
  await newBlankStudy(page);
  await page.evaluate(() => {
    window.realPut = IDBObjectStore.prototype.put;
    IDBObjectStore.prototype.put = function () { throw new DOMException('stubbed full disk', 'QuotaExceededError'); };
  });
  await page.locator('textarea.title').fill('Written while the disk is full');
  await waitForText(page, 'span.status', 'could not save', 'a save on a full disk');
  await waitForText(page, '.save-error', 'no more storage space', 'the quota message');
  const says = await page.locator('.save-error').textContent();
  if (!/export/i.test(says) || !/trash/i.test(says)) fail(`the quota message names no way out: "${says}"`);
  await page.evaluate(() => { IDBObjectStore.prototype.put = window.realPut; });
  await waitForText(page, '.notice', 'stored now', 'saving after space returned');
  await waitForText(page, 'span.status', 'saved', 'the status after space returned');
  await page.reload();
  await page.locator('textarea.title').waitFor({ timeout: STEP });
  if ((await titleOf(page)) !== 'Written while the disk is full') fail('the edit made on a full disk was not stored after recovery');
  // Creating a study on a full disk says so on the page.
  await page.goto(`${url}#/`);
  await page.evaluate(() => {
    IDBObjectStore.prototype.put = function () { throw new DOMException('stubbed full disk', 'QuotaExceededError'); };
  });
  await page.locator('button.template').first().click({ timeout: STEP });
  await waitForText(page, 'study-library .problem', 'was not created', 'creating a study on a full disk');
  noErrors(page, 'quota');
  await context.close();
}

async function damagedRecords() {
  const context = await launch(newProfile());
  const page = await openPage(context);
  for (const t of ['Sound study one', 'Sound study two']) {
    await newBlankStudy(page);
    await page.locator('textarea.title').fill(t);
    await waitForText(page, 'span.status', 'saved', `saving "${t}"`);
    await page.goto(`${url}#/`);
  }
  await page.evaluate(() => new Promise((resolve, reject) => {
    const open = indexedDB.open('ratebook');
    open.onerror = () => reject(open.error);
    open.onsuccess = () => {
      const tx = open.result.transaction('studies', 'readwrite');
      const os = tx.objectStore('studies');
      const meta = (id, title) => ({ id, title, created: 1, updated: 2, revision: 1, cells: 0 });
      os.put(null, ['meta', 'nullmeta']);
      os.put({ format: 'ratebook-study', version: 1, title: 'Doc beside a null meta', cells: [] }, ['doc', 'nullmeta']);
      os.put(meta('brokendoc', 'Study with a broken document'), ['meta', 'brokendoc']);
      os.put({ format: 'something-else', cells: 'no' }, ['doc', 'brokendoc']);
      os.put(meta('objtitle', { bad: true }), ['meta', 'objtitle']);
      os.put({ format: 'ratebook-study', version: 1, title: 'Recovered title', cells: [] }, ['doc', 'objtitle']);
      tx.oncomplete = () => resolve();
      tx.onerror = () => reject(tx.error);
    };
  }));
  await page.reload();
  await page.locator('study-library li.damaged').first().waitFor({ timeout: STEP });
  const lib = page.locator('study-library');
  for (const t of ['Sound study one', 'Sound study two']) {
    if (!(await lib.locator('li a', { hasText: t }).count())) fail(`"${t}" is not listed beside the damaged records`);
  }
  if (await lib.locator('li a', { hasText: 'Study with a broken document' }).count()) fail('a damaged study is listed as one that opens');
  const damaged = await lib.locator('li.damaged').count();
  if (damaged !== 3) fail(`${damaged} damaged records listed, not 3`);
  const text = await page.evaluate(() => document.querySelector('ratebook-app').shadowRoot.querySelector('study-library').shadowRoot.textContent);
  if (text.includes('[object Object]')) fail('a title shows as [object Object]');
  if (!text.includes('Doc beside a null meta') || !text.includes('Recovered title')) fail('the titles that could be recovered are not shown');
  const [download] = await Promise.all([page.waitForEvent('download', { timeout: STEP }), lib.locator('li.damaged[data-id="brokendoc"] button[data-action="export-raw"]').click()]);
  const saved = await download.path();
  const raw = JSON.parse((await import('node:fs')).readFileSync(saved, 'utf8'));
  if (raw.doc?.format !== 'something-else') fail('the raw export does not hold the stored document');
  await lib.locator('li.damaged[data-id="nullmeta"] button[data-action="remove"]').click();
  await page.waitForFunction(() => document.querySelector('ratebook-app').shadowRoot.querySelector('study-library').shadowRoot.querySelectorAll('li.damaged').length === 2, undefined, { timeout: STEP });
  await page.goto(`${url}#/study/brokendoc`);
  await waitForText(page, 'ratebook-app .problem', 'damaged', 'opening a damaged study');
  await lib.locator('li a', { hasText: 'Sound study one' }).click({ timeout: STEP });
  await page.locator('textarea.title').waitFor({ timeout: STEP });
  if ((await titleOf(page)) !== 'Sound study one') fail('a sound study did not open beside the damaged ones');
  noErrors(page, 'damaged records');
  await context.close();
}

async function main() {
  if (!existsSync(join(root, 'dist', 'index.html'))) fail('dist/ is missing: build first');
  executablePath = findChromium() ?? (existsSync(DEFAULT_CHROMIUM) ? DEFAULT_CHROMIUM : fail(NOT_FOUND_MESSAGE));
  const server = await startPreview(await freePort());
  url = server.url;
  const started = Date.now();
  try {
    for (const [what, run] of [['reload after an edit', () => editThenLeave('reload')], ['close after an edit', () => editThenLeave('close')],
      ['two tabs', twoTabs], ['tabs hear saves', tabsHearSaves], ['quota error then recovery', quotaThenRecovery], ['damaged records', damagedRecords]]) {
      if (process.env.STORAGE_E2E_ONLY && !what.includes(process.env.STORAGE_E2E_ONLY)) continue; // to run one group while working
      const t = Date.now();
      await run();
      console.log(`  ${what}: ok (${((Date.now() - t) / 1000).toFixed(1)} s)`);
    }
    console.log(`  all in ${((Date.now() - started) / 1000).toFixed(1)} s`);
  } finally {
    await Promise.all(launched.map((c) => c.close().catch(() => {})));
    server.child.kill();
    for (const p of profiles) rmSync(p, { recursive: true, force: true });
  }
}

await runScript(NAME, main);
