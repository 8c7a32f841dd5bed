/**
 * Where the time of a slider drag goes, thread by thread: the drag of bench/browser.ts (the
 * trough template with a slider on CL and its Monte Carlo cell; `nomc` removes the cell first;
 * another template's name drags its first slider), traced with Chromium's tracing (CDP,
 * test/e2e/trace.mjs) and its CPU sampler. Prints the drag's figures, each thread's CPU time
 * over the drag and per position (the page's main thread, the engine's worker, the compositor),
 * the page's main thread by kind of work (script, style, layout, paint and compositing, hit
 * testing: each trace event's own CPU time, its children's left out; layouts forced by a script
 * counted apart), and the functions with the most CPU samples on the busiest threads. CPU time,
 * unlike the wall clock, depends less on what else the machine runs; compare builds back to
 * back. DRAG_TRACE_OUT=file.json keeps the trace's events for a closer look.
 *
 *   npx vite build --minify false --outDir /tmp/rb-dist    # readable function names
 *   node --import tsx bench/drag-profile.ts /tmp/rb-dist [positions] [template] [nomc]
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
// @ts-expect-error: a plain JavaScript module shared with the end-to-end tests
import { freePort } from '../test/e2e/serve.mjs';
// @ts-expect-error: a plain JavaScript module shared with the end-to-end tests
import { startTrace } from '../test/e2e/trace.mjs';
import { IN_PAGE, CL_SLIDER, WITHOUT_MC, untilServed } from './browser.ts';

type TraceEvent = { ph: string; name: string; pid: number; tid: number; dur?: number; tdur?: number; args?: any };

/** What a main-thread trace event's own time is spent on. */
const KINDS: [string, RegExp][] = [
  ['paint and compositing', /Paint|Layerize|^Commit$|CompositingInputs|CullRect|FinalizeFrame|UpdateLifecycle/],
  ['hit testing', /HitTest|MouseMove/],
  ['style', /UpdateLayoutTree|[Ss]tyle/],
  ['layout', /Layout|layout|Shape|IntersectionObserver/],
  ['script', /FunctionCall|EvaluateScript|RunMicrotasks|TimerFire|FireAnimationFrame|EventDispatch|^v8\.|^V8\.|GC|HandlePostMessage|AsyncTask/],
];
const SCRIPT = KINDS[4][1];


const [dist = 'dist', positions = '60', template = 'trough-in-range-probability', nomc] = process.argv.slice(2);
const steps = Number(positions);
const port = await freePort();
const preview = spawn(process.execPath, ['node_modules/vite/bin/vite.js', 'preview', '--outDir', dist, '--host', '127.0.0.1', '--port', String(port), '--strictPort'], { stdio: 'ignore' });
const url = `http://127.0.0.1:${port}/`;
const profile = mkdtempSync(join(tmpdir(), 'ratebook-drag-'));
try {
  await untilServed(url);
  const context = await chromium.launchPersistentContext(profile, { executablePath: process.env.CHROME_PATH ?? '/usr/bin/chromium', headless: true, viewport: { width: 1280, height: 900 }, args: ['--no-sandbox', '--disable-gpu'] });
  const page = context.pages()[0] ?? (await context.newPage());
  await page.goto(url);
  await page.locator(`button.template[data-template="${template}"]`).click();
  await page.locator('time-plot').first().waitFor();
  if (template === 'trough-in-range-probability') await page.evaluate(`(${CL_SLIDER})()`);
  if (nomc === 'nomc') await page.evaluate(`(${WITHOUT_MC})()`);
  await page.waitForTimeout(500);
  const cdp = await context.newCDPSession(page);
  const trace = startTrace(cdp, ['disabled-by-default-v8.cpu_profiler', 'blink', 'v8.execute']);
  await trace.started;
  const d = (await page.evaluate(`(${IN_PAGE})(${steps})`)) as { work: number[]; engine: number[]; compute: number[]; catchUp: number };
  const events = (await trace.stop()) as TraceEvent[];
  await context.close();
  if (process.env.DRAG_TRACE_OUT) writeFileSync(process.env.DRAG_TRACE_OUT, JSON.stringify(events));
  report(d, events);
} finally {
  preview.kill();
  try { rmSync(profile, { recursive: true, force: true, maxRetries: 5 }); } catch { /* the browser may still hold a file */ }
}

/** The main thread's CPU time per position by kind of work, and how many layouts a script forced. */
function byKind(evs: TraceEvent[]): void {
  evs.sort((a, b) => (a as any).ts - (b as any).ts || (b.dur ?? 0) - (a.dur ?? 0));
  const own = new Map<string, number>();
  const stack: { e: TraceEvent; end: number; inScript: boolean }[] = [];
  let forced = 0;
  let forcedMs = 0;
  const self = new Map<TraceEvent, number>(evs.map((e) => [e, e.tdur!]));
  for (const e of evs) {
    const ts = (e as any).ts as number;
    while (stack.length && stack[stack.length - 1].end <= ts) stack.pop();
    const parent = stack[stack.length - 1];
    if (parent) self.set(parent.e, self.get(parent.e)! - e.tdur!);
    const script = SCRIPT.test(e.name);
    const inScript = !!parent && (parent.inScript || SCRIPT.test(parent.e.name));
    if (inScript && (e.name === 'Layout' || e.name === 'UpdateLayoutTree')) { forced += e.name === 'Layout' ? 1 : 0; forcedMs += e.tdur! / 1000; }
    stack.push({ e, end: ts + (e.dur ?? 0), inScript: inScript || script });
  }
  for (const [e, t] of self) {
    const kind = KINDS.find(([, re]) => re.test(e.name))?.[0] ?? 'other (tasks, messages, the browser\'s own)';
    own.set(kind, (own.get(kind) ?? 0) + t / 1000);
  }
  console.log(`the page's main thread per position, by kind: ${[...own].sort((a, b) => b[1] - a[1]).map(([k, v]) => `${k} ${(v / steps).toFixed(2)} ms`).join(', ')}`);
  console.log(`  layouts forced by a script: ${(forced / steps).toFixed(1)} per position, ${(forcedMs / steps).toFixed(2)} ms of style and layout`);
}

function report(d: { work: number[]; engine: number[]; compute: number[]; catchUp: number }, events: TraceEvent[]): void {
  const q = (xs: number[], p: number) => { const s = [...xs].sort((a, b) => a - b); return s[Math.min(s.length - 1, Math.floor(p * s.length))].toFixed(1); };
  console.log(`input to every other cell redrawn: median ${q(d.work, 0.5)} ms, p95 ${q(d.work, 0.95)} ms; engine round trip: median ${q(d.engine, 0.5)} ms, p95 ${q(d.engine, 0.95)} ms; engine computing: median ${q(d.compute, 0.5)} ms; Monte Carlo caught up ${d.catchUp.toFixed(0)} ms after the last position`);
  const names = new Map<string, string>();
  for (const e of events) if (e.ph === 'M' && e.name === 'thread_name') names.set(`${e.pid}:${e.tid}`, e.args.name);
  const cpu = new Map<string, number>();
  for (const e of events) if (e.ph === 'X' && e.name === 'ThreadControllerImpl::RunTask') cpu.set(`${e.pid}:${e.tid}`, (cpu.get(`${e.pid}:${e.tid}`) ?? 0) + (e.tdur ?? e.dur ?? 0) / 1000);
  for (const [k, v] of [...cpu].sort((a, b) => b[1] - a[1]).slice(0, 4)) console.log(`${(names.get(k) ?? k).padEnd(24)} CPU ${v.toFixed(0)} ms, per position ${(v / steps).toFixed(2)} ms`);
  const main = [...cpu].filter(([k]) => names.get(k) === 'CrRendererMain').sort((a, b) => b[1] - a[1])[0]?.[0];
  if (main) byKind(events.filter((e) => `${e.pid}:${e.tid}` === main && e.ph === 'X' && e.tdur !== undefined));
  // the sampler's chunks, per profile: CPU samples by function
  const profiles = new Map<string, { nodes: Map<number, { callFrame: { functionName: string; url: string; lineNumber: number } }>; self: Map<number, number> }>();
  for (const e of events) {
    const c = e.name === 'ProfileChunk' ? e.args?.data?.cpuProfile : undefined;
    if (!c) continue;
    const k = `${e.pid}:${e.args?.id ?? e.tid}`;
    let p = profiles.get(k);
    if (!p) profiles.set(k, (p = { nodes: new Map(), self: new Map() }));
    for (const n of c.nodes ?? []) p.nodes.set(n.id, n);
    const deltas: number[] = e.args.data.timeDeltas ?? [];
    (c.samples ?? []).forEach((s: number, i: number) => p!.self.set(s, (p!.self.get(s) ?? 0) + (deltas[i + 1] ?? 0)));
  }
  for (const p of profiles.values()) {
    const byFunction = new Map<string, number>();
    let all = 0;
    for (const [id, t] of p.self) {
      const f = p.nodes.get(id)?.callFrame;
      if (!f || f.functionName === '(idle)') continue;
      const key = `${f.functionName || '(anonymous)'} ${String(f.url ?? '').split('/').pop()}:${f.lineNumber}`;
      byFunction.set(key, (byFunction.get(key) ?? 0) + t);
      all += t;
    }
    if (all < 50_000) continue;
    console.log(`-- a profile with ${(all / 1000).toFixed(0)} ms of samples (idle left out)`);
    for (const [f, t] of [...byFunction].sort((a, b) => b[1] - a[1]).slice(0, 12)) console.log(`${(t / 1000).toFixed(1).padStart(8)} ms ${((100 * t) / all).toFixed(1).padStart(5)}%  ${f}`);
  }
}
