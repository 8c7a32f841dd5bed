// A 200-cell study (invented numbers, for measuring only) and a measurement of opening it in
// the built app: the longest main-thread task from the page's start until every cell shows
// its result. Shared by bench/browser-open.ts and test/e2e/open-large.e2e.mjs.
import { loadavg } from 'node:os';
import { mainThreadTasks, startTrace } from '../test/e2e/trace.mjs';

/** 100 parameters cells (a chain of rates and a dose each), 40 rate laws, 30 runs, 30 notes. */
export function largeStudy() {
  const cells = [];
  for (let i = 0; i < 100; i++) {
    cells.push({ id: `p${i}`, kind: 'parameters', title: `Inputs ${i + 1}`, items: [
      { name: `k${i}`, value: i === 0 ? '0.35 / h' : `k${i - 1} * 1.001`, note: 'invented' },
      { name: `dose${i}`, value: `${100 + i} mg` },
    ] });
    if (i % 5 === 4) cells.push({ id: `n${i}`, kind: 'note', text: `Invented numbers for a large study, note ${i + 1}: nothing here is a real dose.` });
  }
  for (let j = 0; j < 40; j++) {
    cells.push({ id: `r${j}`, kind: 'rate', title: `Law ${j + 1}`, state: `C${j}`, unit: 'mg / L', rate: `-k${j * 2} * C${j}`, initial: `dose${j} / (40 L)` });
  }
  for (let j = 0; j < 30; j++) {
    cells.push({ id: `s${j}`, kind: 'simulate', title: `Run ${j + 1}`, rates: [`r${j}`], from: '0 h', to: '24 h',
      find: [{ name: `t_half_run${j}`, crossing: `C${j}`, level: `dose${j} / (80 L)` }] });
  }
  for (let j = 0; j < 10; j++) cells.push({ id: `m${j}`, kind: 'note', text: `Closing note ${j + 1} (invented study).` });
  return { format: 'ratebook-study', version: 1, title: 'A large study (invented numbers)', cells };
}

/** The open study's cells: how many, and how many still wait for a result. */
export const CELL_STATES = `(() => {
  const root = document.querySelector('ratebook-app')?.shadowRoot?.querySelector('study-view')?.shadowRoot;
  const articles = [...(root?.querySelectorAll('article') ?? [])];
  const status = root?.querySelector('.status')?.textContent ?? '';
  return { count: articles.length, busy: status.includes('computing'), idle: articles.filter((a) => a.querySelector('.state.idle')).length };
})()`;

/**
 * Imports the study through the library, waits until the app's offline copy is installed (the
 * service worker: once per version, it fetches and compiles every built file, work that would
 * otherwise share the cores with the opening measured), then opens the study on a fresh page,
 * tracing the opening through the page's CDP session (`context.newCDPSession(page)`), and waits
 * until every cell shows its result. Resolves with the page's main-thread tasks from the trace
 * (`{ start, wall, cpu }` each, ms: see test/e2e/trace.mjs; the measurement's own tasks left
 * out), the time to every cell computed (ms), the number of cells shown, and the 1-minute load
 * average of the machine when the opening began.
 */
export async function measureOpen(page, url, file, cellCount, cdp, step = 60_000) {
  await page.goto(url);
  await page.locator('study-library input[type="file"]').setInputFiles(file);
  await page.getByText(/Imported ".*" as a new study/).waitFor({ timeout: step });
  const href = await page.locator('study-library li .t a').first().getAttribute('href');
  await page.evaluate(() => navigator.serviceWorker.ready.then(() => true));
  await page.waitForTimeout(1000);
  await page.goto('about:blank');
  const load = loadavg()[0];
  const tracing = startTrace(cdp);
  await tracing.started;
  const t0 = Date.now();
  await page.goto(new URL(href, url).href);
  let states;
  for (;;) {
    states = await page.evaluate(CELL_STATES);
    if (states.count >= cellCount && !states.busy && states.idle === 0) break;
    if (Date.now() - t0 > step) throw new Error(`the study did not open within ${step / 1000} s: ${JSON.stringify(states)}`);
    await page.waitForTimeout(50);
  }
  const ready = Date.now() - t0;
  await page.waitForTimeout(300);
  const tasks = mainThreadTasks(await tracing.stop());
  return { tasks, ready, cells: states.count, load };
}
