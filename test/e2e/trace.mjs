// The one reader of Chromium traces for the end-to-end scripts and the browser benchmark: each
// task of the page's main thread with its wall-clock time and its thread (CPU) time. The wall
// clock also counts the time the thread waited: for a core (on a shared, loaded machine,
// most of it), for the browser's other threads (the engine's worker, drawing, the garbage
// collector's helpers); the CPU time leaves that out. The tasks that carry the measurement's
// own DevTools messages (a script's `page.evaluate`) are left out.

import { cpus, loadavg } from 'node:os';

/** What the tasks are read from: 'toplevel' gives every task, with `dur` and `tdur`. */
const CATEGORIES = ['toplevel', 'devtools.timeline'];

/** The events kept: thread names, tasks, and the DevTools messages that mark the measurement's own tasks. */
const kept = (e) => e.ph === 'M' || e.name === 'ThreadControllerImpl::RunTask' || isDevtools(e);

function isDevtools(e) {
  return e.name === 'Receive mojo message' && e.args?.chrome_mojo_event_info?.mojo_interface_tag === 'blink.mojom.DevToolsSession';
}

/**
 * Starts a trace of the browser's tasks through a page's CDP session
 * (`context.newCDPSession(page)`). `started` resolves once tracing runs; `stop()` ends it and
 * resolves with the kept events (thread names, tasks and DevTools messages: a long run's other
 * events are dropped as they arrive). `categories` adds trace categories (their events are
 * kept too, for looking into a task).
 */
export function startTrace(cdp, categories = []) {
  const events = [];
  const keep = categories.length ? () => true : kept;
  cdp.on('Tracing.dataCollected', (e) => { for (const x of e.value) if (keep(x)) events.push(x); });
  const complete = new Promise((resolve) => cdp.once('Tracing.tracingComplete', resolve));
  const started = cdp.send('Tracing.start', { transferMode: 'ReportEvents', traceConfig: { includedCategories: [...CATEGORIES, ...categories] } });
  return {
    started,
    stop: async () => {
      await started;
      await cdp.send('Tracing.end');
      await complete;
      return events;
    },
  };
}

/**
 * The tasks of the busiest renderer main thread in a trace (the one with the most CPU time:
 * the page's), in the order they ran: `{ start, wall, cpu }` in ms, `start` on the trace's
 * clock. Tasks that handled a DevTools message (the measurement's own) are left out.
 */
export function mainThreadTasks(events) {
  const mains = events.filter((e) => e.ph === 'M' && e.name === 'thread_name' && e.args?.name === 'CrRendererMain');
  const devtools = events.filter(isDevtools);
  let best = [];
  let bestCpu = 0;
  for (const m of mains) {
    const own = devtools.filter((d) => d.pid === m.pid && d.tid === m.tid).map((d) => d.ts).sort((a, b) => a - b);
    const tasks = events
      .filter((e) => e.pid === m.pid && e.tid === m.tid && e.ph === 'X' && e.name === 'ThreadControllerImpl::RunTask')
      .filter((e) => !holds(own, e.ts, e.ts + e.dur))
      .sort((a, b) => a.ts - b.ts)
      .map((e) => ({ start: e.ts / 1000, wall: e.dur / 1000, cpu: (e.tdur ?? e.dur) / 1000 }));
    const cpu = tasks.reduce((sum, t) => sum + t.cpu, 0);
    if (cpu > bestCpu) { best = tasks; bestCpu = cpu; }
  }
  return best;
}

/** Whether the sorted times `ts` hold one in [from, to]. */
function holds(ts, from, to) {
  let lo = 0;
  let hi = ts.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (ts[mid] < from) lo = mid + 1;
    else hi = mid;
  }
  return lo < ts.length && ts[lo] <= to;
}

/** The longest wall-clock and CPU times among `tasks` (0 when there are none), and how many exceed `over` ms of each. */
export function longestTasks(tasks, over = 100) {
  return {
    wall: Math.max(0, ...tasks.map((t) => t.wall)),
    cpu: Math.max(0, ...tasks.map((t) => t.cpu)),
    wallOver: tasks.filter((t) => t.wall > over).length,
    cpuOver: tasks.filter((t) => t.cpu > over).length,
  };
}

/**
 * The wall-clock time allowed for a task whose goal is `goalMs` at the 1-minute load average
 * `load` (by default, now): the goal times the load per core (the load over the cores) times 1.5, the
 * scheduler's unevenness, when that exceeds 1; the goal itself on a quiet machine (load per
 * core at most 2/3). A loaded machine stretches a task's wall-clock time by about the load per
 * core, since the page's thread waits for a core; its CPU time it barely changes.
 */
export function wallAllowance(goalMs, load = loadavg()[0]) {
  return Math.round(goalMs * Math.max(1, (load / cpus().length) * 1.5));
}
