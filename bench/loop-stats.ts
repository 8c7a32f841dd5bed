/**
 * Timing a repeated operation with what explains its slow iterations: each iteration's wall
 * time and processor time, whether a garbage collection ran during it, and the bytes it left
 * on the heap. Node's `gc` performance entries give each collection's start and length; an
 * iteration "had a GC" when one overlaps it. The heap's growth over an iteration with no GC
 * is what it allocated (V8's young generation is a bump allocator; a few bytes of the
 * measuring itself are included, the same in every bench).
 */
import { PerformanceObserver, performance, constants } from 'node:perf_hooks';
import { getHeapStatistics } from 'node:v8';
import { loadavg } from 'node:os';

export interface LoopStats {
  readonly runs: number;
  /** Wall clock, ms: what the goals are judged on. */
  readonly wallMedian: number;
  readonly wallP95: number;
  /** Processor time of the whole process (main thread and V8's helpers), ms. */
  readonly cpuMedian: number;
  readonly cpuP95: number;
  /** Share of iterations a garbage collection overlapped, 0..1. */
  readonly gcShare: number;
  /** Share of the slowest 5 % (by the wall clock) that a collection overlapped. */
  readonly gcShareOfSlowest: number;
  /** Collections during the timed iterations, and their total length (ms). */
  readonly collections: number;
  readonly gcMs: number;
  /** Of those, the full (mark-compact) collections and their length, ms; the rest are scavenges of the young generation. */
  readonly majorCollections: number;
  readonly majorMs: number;
  /** Median bytes allocated by one iteration (over iterations with no GC). */
  readonly bytesMedian: number;
  /** The 95th percentile of the iterations no collection overlapped: wall clock and processor time, ms. */
  readonly wallP95NoGc: number;
  readonly cpuP95NoGc: number;
  /** The machine's load average over the last minute, before and after the timed iterations. */
  readonly loadBefore: number;
  readonly loadAfter: number;
}

export interface LoopOptions {
  /** Untimed iterations first, and at least this long (ms) of them. */
  readonly warmupRuns: number;
  readonly warmupMs: number;
  readonly runs: number;
}

/** The q-quantile of sorted values, the lower one of the two around it (as the bench always read them). */
export function quantile(sorted: ArrayLike<number>, q: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))];
}

const sortedCopy = (xs: Float64Array) => Float64Array.from(xs).sort();

/**
 * Runs `iteration(i)` for i = 0, 1, ... untimed, then `runs` times timed. The iteration may
 * throw to stop the bench (a result not as expected).
 */
export async function timeLoop(iteration: (i: number) => void, options: LoopOptions): Promise<LoopStats> {
  let i = 0;
  const warmStart = performance.now();
  while (i < options.warmupRuns || performance.now() - warmStart < options.warmupMs) iteration(i++);

  const loadBefore = loadavg()[0];
  const n = options.runs;
  const start = new Float64Array(n), end = new Float64Array(n), cpu = new Float64Array(n), bytes = new Float64Array(n);
  const gcs: Array<{ start: number; end: number; major: boolean }> = [];
  const observer = new PerformanceObserver((list) => {
    for (const e of list.getEntries()) {
      const kind = (e as unknown as { detail?: { kind?: number } }).detail?.kind ?? 0;
      gcs.push({ start: e.startTime, end: e.startTime + e.duration, major: kind === constants.NODE_PERFORMANCE_GC_MAJOR });
    }
  });
  observer.observe({ entryTypes: ['gc'] });
  for (let r = 0; r < n; r++, i++) {
    const h0 = getHeapStatistics().used_heap_size;
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    iteration(i);
    const t1 = performance.now();
    const c = process.cpuUsage(c0);
    const h1 = getHeapStatistics().used_heap_size;
    start[r] = t0;
    end[r] = t1;
    cpu[r] = (c.user + c.system) / 1000;
    bytes[r] = h1 - h0;
  }
  const loadAfter = loadavg()[0];
  // the entries are delivered after the loop, on a later turn of the event loop
  await new Promise((resolve) => setTimeout(resolve, 20));
  observer.disconnect();

  const t0 = start[0], t1 = end[n - 1];
  const during = gcs.filter((g) => g.end >= t0 && g.start <= t1).sort((a, b) => a.start - b.start);
  const hadGc = new Uint8Array(n);
  let g = 0;
  for (let r = 0; r < n; r++) {
    while (g < during.length && during[g].end < start[r]) g++;
    // a collection overlaps iteration r when it starts before r ends and ends after r starts
    for (let k = g; k < during.length && during[k].start <= end[r]; k++) if (during[k].end >= start[r]) hadGc[r] = 1;
  }
  const wall = Float64Array.from({ length: n }, (_, r) => end[r] - start[r]);
  const wallSorted = sortedCopy(wall), cpuSorted = sortedCopy(cpu);
  const slowFrom = quantile(wallSorted, 0.95);
  let slow = 0, slowGc = 0, withGc = 0;
  const clean: number[] = [], cleanWall: number[] = [], cleanCpu: number[] = [];
  for (let r = 0; r < n; r++) {
    if (hadGc[r]) withGc++;
    else { clean.push(bytes[r]); cleanWall.push(wall[r]); cleanCpu.push(cpu[r]); }
    if (wall[r] >= slowFrom) { slow++; if (hadGc[r]) slowGc++; }
  }
  for (const xs of [clean, cleanWall, cleanCpu]) xs.sort((a, b) => a - b);
  return {
    runs: n,
    wallMedian: quantile(wallSorted, 0.5), wallP95: quantile(wallSorted, 0.95),
    cpuMedian: quantile(cpuSorted, 0.5), cpuP95: quantile(cpuSorted, 0.95),
    gcShare: withGc / n, gcShareOfSlowest: slow ? slowGc / slow : 0,
    collections: during.length, gcMs: during.reduce((s, x) => s + x.end - x.start, 0),
    majorCollections: during.filter((x) => x.major).length,
    majorMs: during.reduce((s, x) => s + (x.major ? x.end - x.start : 0), 0),
    bytesMedian: clean.length ? quantile(clean, 0.5) : NaN,
    wallP95NoGc: clean.length ? quantile(cleanWall, 0.95) : NaN,
    cpuP95NoGc: clean.length ? quantile(cleanCpu, 0.95) : NaN,
    loadBefore, loadAfter,
  };
}

/** Bytes in words: 12.3 KB. */
export function kb(bytes: number): string {
  return Number.isFinite(bytes) ? `${(bytes / 1024).toFixed(1)} KB` : 'n/a';
}

/** Milliseconds in words: 850 µs, 1.25 ms. */
export function ms(x: number): string {
  return !Number.isFinite(x) ? 'n/a' : x < 1 ? `${(x * 1000).toFixed(0)} µs` : `${x.toFixed(2)} ms`;
}

const percent = (x: number) => `${(100 * x).toFixed(1)} %`;

/** A line of a section's table (as bench/run.ts prints it). */
export interface StatRow {
  readonly measure: string;
  readonly result: string;
  readonly goal?: string;
  readonly met?: boolean;
}

/**
 * The rows of a timed loop: its median and 95th percentile by the wall clock, each judged
 * against the goal, then what explains them, with no goal: processor time, the runs a garbage
 * collection overlapped, the bytes a run allocates, the runs no collection overlapped, and the
 * machine's load while they ran (the wall clock on a shared machine counts the waits for a core).
 */
export function loopRows(what: string, s: LoopStats, goalMs: number): StatRow[] {
  return [
    { measure: `${what}; median (wall clock)`, result: ms(s.wallMedian), goal: `< ${goalMs} ms`, met: s.wallMedian < goalMs },
    { measure: `  95th percentile of ${s.runs} (wall clock)`, result: ms(s.wallP95), goal: `< ${goalMs} ms`, met: s.wallP95 < goalMs },
    { measure: '  processor time: median / 95th percentile', result: `${ms(s.cpuMedian)} / ${ms(s.cpuP95)}` },
    { measure: '  runs a garbage collection overlapped (of the slowest 5 %)', result: `${percent(s.gcShare)} (${percent(s.gcShareOfSlowest)})` },
    { measure: `  collections: ${s.collections} (${s.majorCollections} full), time in them`, result: ms(s.gcMs) },
    { measure: '  allocated by one run (median of the runs with no collection)', result: kb(s.bytesMedian) },
    { measure: '  runs with no collection, 95th percentile: wall clock / processor time', result: `${ms(s.wallP95NoGc)} / ${ms(s.cpuP95NoGc)}` },
    { measure: '  load average (1 min) before / after', result: `${s.loadBefore.toFixed(1)} / ${s.loadAfter.toFixed(1)}` },
  ];
}
