/**
 * Browser figures (run by bench/run.ts): from a slider's input event to the last downstream
 * plot repainted, over a long drag of the cooling template's k, median and 95th percentile;
 * the same with a Monte Carlo cell in the study (the trough template, a slider put on CL): the
 * other cells' answer and repaint, and the time the Monte Carlo takes to catch up after the
 * last position, then the same drag with the Monte Carlo cell removed (the other cells' own cost); the longest main-thread task during the drag; and the production bundle's
 * size, gzipped.
 * Builds the app, serves it with `vite preview` and drives the Debian Chromium.
 */
import { spawn, spawnSync } from 'node:child_process';
import { readdirSync, readFileSync, mkdtempSync, rmSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium } from 'playwright-core';
// @ts-expect-error: a plain JavaScript module shared with the end-to-end tests
import { freePort } from '../test/e2e/serve.mjs';

const root = fileURLToPath(new URL('..', import.meta.url));

export interface BrowserRow { readonly name: string; readonly value: string; readonly goal?: string; readonly met?: boolean }


/** The gzipped size of what the first page loads (the page and its entry script) and of the engine's worker. */
function bundleSizes(): { first: number; worker: number } {
  const assets = join(root, 'dist', 'assets');
  const html = readFileSync(join(root, 'dist', 'index.html'), 'utf8');
  let first = gzipSync(html).length;
  let worker = 0;
  for (const f of readdirSync(assets)) {
    const size = gzipSync(readFileSync(join(assets, f))).length;
    if (html.includes(f)) first += size;
    else if (f.startsWith('engine.worker')) worker += size;
  }
  return { first, worker };
}

/** In-page JavaScript shared by the scripts below: `find(root, selector)`, the first match in the page or inside any shadow root under it. */
const FIND = `const find = (r, sel) => {
    const hit = r.querySelector(sel);
    if (hit) return hit;
    for (const el of r.querySelectorAll('*')) if (el.shadowRoot) { const x = find(el.shadowRoot, sel); if (x) return x; }
    return null;
  };`;

/** What runs in the page: drags the first slider step by step, timing each input to the repaint after the engine's answer. */
export const IN_PAGE = `async (n) => {
  ${FIND}
  const view = find(document, 'study-view');
  const slider = find(document, 'input.slider');
  const long = [];
  new PerformanceObserver((list) => { for (const e of list.getEntries()) long.push(e.duration); }).observe({ type: 'longtask' });
  const lo = Number(slider.min), hi = Number(slider.max);
  const latencies = [];
  const work = [];
  const engine = [];
  const compute = [];
  const queued = [];
  const settled = async (el) => { await el.updateComplete; for (const c of el.shadowRoot?.querySelectorAll('*') ?? []) if (c.updateComplete) await settled(c); };
  let t0 = 0;
  for (let i = 0; i < n; i++) {
    let rendered = 0;
    const painted = new Promise((resolve) => {
      const off = view.controller.onAnswer((a) => {
        if (a.late) return; // a Monte Carlo finished: not this position's answer
        off();
        engine.push(performance.now() - t0);
        compute.push(view.controller.lastRunMs);
        const tm = view.controller.lastTiming;
        queued.push(tm.arrived - tm.sent);
        settled(view).then(() => { rendered = performance.now(); requestAnimationFrame(() => resolve(performance.now())); });
      });
    });
    const v = lo + ((hi - lo) * ((i * 37) % n)) / n;
    await new Promise((r) => requestAnimationFrame(r));
    t0 = performance.now();
    slider.value = String(v);
    slider.dispatchEvent(new Event('input', { bubbles: true, composed: true }));
    latencies.push((await painted) - t0);
    work.push(rendered - t0);
  }
  // a Monte Carlo cell catches up after the last position
  const end = performance.now();
  while (view.controller.pending.length) await new Promise((r) => setTimeout(r, 10));
  const catchUp = performance.now() - end;
  await new Promise((r) => setTimeout(r, 100));
  return { latencies, work, engine, compute, queued, catchUp, longest: long.length ? Math.max(...long) : 0 };
}`;

/** Gives the trough template's CL a slider (2 to 8 L/h) through the page's own edit path, and waits for it and for the Monte Carlo. */
export const CL_SLIDER = `async () => {
  ${FIND}
  const view = find(document, 'study-view');
  const regimen = view.controller.study.cells.find((c) => c.id === 'regimen');
  view.controller.edit({ type: 'replace', cell: { ...regimen, items: regimen.items.map((it) => it.name === 'CL' ? { ...it, range: ['2 L / h', '8 L / h'] } : it) } });
  while (!find(document, 'input.slider') || !view.controller.report || view.controller.pending.length) await new Promise((r) => setTimeout(r, 20));
}`;

/** Removes the trough template's uncertainty cell through the page's own edit path, and waits for the answer. */
export const WITHOUT_MC = `async () => {
  ${FIND}
  const view = find(document, 'study-view');
  view.controller.edit({ type: 'remove', id: 'between-patients' });
  while (view.controller.busy || view.controller.report.cells.some((c) => c.id === 'between-patients')) await new Promise((r) => setTimeout(r, 20));
}`;

type Drag = { latencies: number[]; work: number[]; engine: number[]; compute: number[]; queued: number[]; catchUp: number; longest: number };

const quantile = (xs: number[]) => { const s = [...xs].sort((a, b) => a - b); return (p: number) => s[Math.min(s.length - 1, Math.floor(p * s.length))]; };
const ms = (x: number) => `${x.toFixed(1)} ms`;

/** The rows of a drag with a Monte Carlo cell in the study, and of the same drag once the cell is removed. */
function monteCarloRows(d: Drag, without: Drag, steps: number): BrowserRow[] {
  const w = quantile(d.work);
  const e = quantile(d.engine);
  const w0 = quantile(without.work);
  const e0 = quantile(without.engine);
  return [
    { name: `with a Monte Carlo cell (trough template, 2,000 samples; a slider on CL, ${steps} positions): input to every other cell redrawn, median`, value: ms(w(0.5)), goal: '< 16 ms at p95', met: w(0.5) < 16 },
    { name: '  95th percentile', value: ms(w(0.95)), goal: '< 16 ms', met: w(0.95) < 16 },
    { name: '  of which the engine round trip (the Monte Carlo waits until no edit has come for 100 ms), median / 95th percentile', value: `${ms(e(0.5))} / ${ms(e(0.95))}` },
    { name: '  the same study with its Monte Carlo cell removed: input to every other cell redrawn, median / 95th percentile', value: `${ms(w0(0.5))} / ${ms(w0(0.95))}` },
    { name: '  the same study with its Monte Carlo cell removed: engine round trip, median / 95th percentile', value: `${ms(e0(0.5))} / ${ms(e0(0.95))}` },
    { name: '  the Monte Carlo result after the last position (it restarts at each)', value: ms(d.catchUp) },
    { name: '  longest main-thread task during the drag', value: d.longest ? ms(d.longest) : 'none over 50 ms', goal: '< 50 ms', met: d.longest < 50 },
  ];
}

/** Waits until the preview server answers at `url` (at most about 10 s: then the page load that follows says what is wrong). */
export async function untilServed(url: string): Promise<void> {
  for (let i = 0; i < 100; i++) {
    try { if ((await fetch(url)).ok) return; } catch { /* not yet */ }
    await new Promise((r) => setTimeout(r, 100));
  }
}

export async function browserBenchmarks(steps = 120): Promise<BrowserRow[]> {
  const build = spawnSync(process.execPath, [join(root, 'node_modules', 'vite', 'bin', 'vite.js'), 'build'], { cwd: root, encoding: 'utf8' });
  if (build.status !== 0) throw new Error(`vite build failed: ${build.stderr}`);
  const sizes = bundleSizes();
  const port = await freePort();
  const preview = spawn(process.execPath, [join(root, 'node_modules', 'vite', 'bin', 'vite.js'), 'preview', '--host', '127.0.0.1', '--port', String(port), '--strictPort'], { cwd: root, stdio: 'ignore' });
  const url = `http://127.0.0.1:${port}/`;
  const profile = mkdtempSync(join(tmpdir(), 'ratebook-bench-'));
  try {
    await untilServed(url);
    const context = await chromium.launchPersistentContext(profile, {
      executablePath: process.env.CHROME_PATH ?? '/usr/bin/chromium', headless: true, viewport: { width: 1280, height: 900 },
      args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    const page = context.pages()[0] ?? (await context.newPage());
    await page.goto(url);
    await page.locator('button.template[data-template="cooling-stock-pot"]').click();
    await page.locator('time-plot').first().waitFor();
    // plain JavaScript text: the page must not see the TypeScript loader's helpers
    const result = (await page.evaluate(`(${IN_PAGE})(${steps})`)) as Drag;
    await page.goto(url);
    await page.locator('button.template[data-template="trough-in-range-probability"]').click();
    await page.locator('time-plot').first().waitFor();
    await page.evaluate(`(${CL_SLIDER})()`);
    const withMonteCarlo = (await page.evaluate(`(${IN_PAGE})(${steps})`)) as Drag;
    // the same study without its Monte Carlo cell: what the other cells cost by themselves
    await page.evaluate(`(${WITHOUT_MC})()`);
    const withoutMonteCarlo = (await page.evaluate(`(${IN_PAGE})(${steps})`)) as Drag;
    await context.close();
    const q = quantile(result.latencies);
    const w = quantile(result.work);
    const e = quantile(result.engine);
    const c = quantile(result.compute);
    const qd = quantile(result.queued);
    return [
      { name: `slider input to the last plot redrawn (engine round trip and every element rendered; cooling template, ${steps} positions); median`, value: ms(w(0.5)), goal: '< 16 ms at p95', met: w(0.5) < 16 },
      { name: '  95th percentile', value: ms(w(0.95)), goal: '< 16 ms', met: w(0.95) < 16 },
      { name: '  to the next frame the browser shows (the input is sent at the start of a frame, so at least one frame), median', value: ms(q(0.5)) },
      { name: '  the same, 95th percentile', value: ms(q(0.95)) },
      { name: '  of which the engine round trip (edit sent, answer back), median', value: ms(e(0.5)) },
      { name: '  of which the engine computing in its worker, median', value: ms(c(0.5)) },
      { name: '  of which its answer waiting for the page (rendering the edit itself), median', value: ms(qd(0.5)) },
      { name: 'longest main-thread task during the drag (long tasks are those over 50 ms)', value: result.longest ? ms(result.longest) : 'none over 50 ms', goal: '< 50 ms', met: result.longest < 50 },
      ...monteCarloRows(withMonteCarlo, withoutMonteCarlo, steps),
      { name: 'production bundle the first page loads, gzipped', value: `${(sizes.first / 1024).toFixed(0)} KB`, goal: '< 400 KB', met: sizes.first < 400 * 1024 },
      { name: 'engine worker, loaded when a study opens, gzipped', value: `${(sizes.worker / 1024).toFixed(0)} KB` },
    ];
  } finally {
    preview.kill();
    try { rmSync(profile, { recursive: true, force: true, maxRetries: 5 }); } catch { /* the browser may still hold a file; the folder is in tmp */ }
  }
}
