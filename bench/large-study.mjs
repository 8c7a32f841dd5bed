// A 200-cell study (invented numbers, for measuring only) and a measurement of opening it in
// the built app: the longest main-thread task from the page's start until every cell shows
// its result. Shared by bench/browser-open.ts and test/e2e/open-large.e2e.mjs.

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

/** Installed before the page's own scripts: records every long task (over 50 ms) from the start. */
export const WATCH_LONG_TASKS = `(() => {
  window.__longTasks = [];
  new PerformanceObserver((list) => { for (const e of list.getEntries()) window.__longTasks.push({ start: e.startTime, ms: e.duration }); })
    .observe({ type: 'longtask', buffered: true });
})()`;

/** The open study's cells: how many, and how many still wait for a result. */
export const CELL_STATES = `(() => {
  const root = document.querySelector('ratebook-app')?.shadowRoot?.querySelector('study-view')?.shadowRoot;
  const articles = [...(root?.querySelectorAll('article') ?? [])];
  const status = root?.querySelector('.status')?.textContent ?? '';
  return { count: articles.length, busy: status.includes('computing'), idle: articles.filter((a) => a.querySelector('.state.idle')).length };
})()`;

/**
 * Imports the study through the library, then opens it on a fresh page and waits until every
 * cell shows its result. Resolves with the long tasks of the opening (ms each, wall clock), its
 * time to every cell computed, and the number of cells shown. Given the page's CDP session
 * (`context.newCDPSession(page)`), it also traces the opening and gives `cpu`: the thread (CPU)
 * time of each of the page's main-thread tasks, in ms (see `mainThreadCpu`).
 */
export async function measureOpen(page, url, file, cellCount, step = 60_000, cdp = undefined) {
  await page.goto(url);
  await page.locator('study-library input[type="file"]').setInputFiles(file);
  await page.getByText(/Imported ".*" as a new study/).waitFor({ timeout: step });
  const href = await page.locator('study-library li .t a').first().getAttribute('href');
  await page.goto('about:blank');
  const tracing = cdp ? startTrace(cdp) : undefined;
  if (tracing) await tracing.started;
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
  const tasks = await page.evaluate('window.__longTasks');
  const loaded = await page.evaluate('performance.getEntriesByType("navigation")[0]?.domContentLoadedEventEnd ?? 0');
  const cpu = tracing ? mainThreadCpu(await tracing.stop()) : undefined;
  return { tasks: tasks.map((t) => t.ms), starts: tasks.map((t) => t.start), loaded, ready, cells: states.count, cpu };
}

/** Starts a trace of the browser's task scheduling; `stop()` resolves with its events. */
function startTrace(cdp) {
  const events = [];
  cdp.on('Tracing.dataCollected', (e) => events.push(...e.value));
  const complete = new Promise((resolve) => cdp.once('Tracing.tracingComplete', resolve));
  const started = cdp.send('Tracing.start', { transferMode: 'ReportEvents', traceConfig: { includedCategories: ['toplevel', 'devtools.timeline'] } });
  return { started, stop: async () => { await cdp.send('Tracing.end'); await complete; return events; } };
}

/**
 * The thread time (CPU time, ms) of each task of the busiest renderer main thread in a trace:
 * on a quiet machine a task's duration; on a loaded one, its duration less the time the thread
 * waited for a core (which makes wall-clock long tasks of a shared machine mostly noise).
 */
export function mainThreadCpu(events) {
  const mains = events.filter((e) => e.name === 'thread_name' && e.args?.name === 'CrRendererMain');
  // the measurement's own tasks (the DevTools session's messages) are left out
  const devtools = events.filter((e) => e.name === 'Receive mojo message' && e.args?.chrome_mojo_event_info?.mojo_interface_tag === 'blink.mojom.DevToolsSession');
  const ours = (e) => !devtools.some((d) => d.pid === e.pid && d.tid === e.tid && d.ts >= e.ts && d.ts <= e.ts + e.dur);
  let best = [];
  for (const m of mains) {
    const tasks = events.filter((e) => e.pid === m.pid && e.tid === m.tid && e.ph === 'X' && e.name === 'ThreadControllerImpl::RunTask' && ours(e)).map((e) => (e.tdur ?? e.dur) / 1000);
    if (tasks.reduce((a, b) => a + b, 0) > best.reduce((a, b) => a + b, 0)) best = tasks;
  }
  return best;
}
