/**
 * Timing a repeated operation with what explains its slow iterations: each iteration's wall
 * time and processor time, whether a garbage collection ran during it, and the bytes it left
 * on the heap. Node's `gc` performance entries give each collection's start and length; an
 * iteration "had a GC" when one overlaps it. The heap's growth over an iteration with no GC
 * is what it allocated (V8's young generation is a bump allocator; a few bytes of the
 * measuring itself are included, the same in every bench).
 */
import { PerformanceObserver, performance } from 'node:perf_hooks';
import { getHeapStatistics } from 'node:v8';

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
  /** Median bytes allocated by one iteration (over iterations with no GC). */
  readonly bytesMedian: number;
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

  const n = options.runs;
  const start = new Float64Array(n), end = new Float64Array(n), cpu = new Float64Array(n), bytes = new Float64Array(n);
  const gcs: Array<{ start: number; end: number }> = [];
  const observer = new PerformanceObserver((list) => {
    for (const e of list.getEntries()) gcs.push({ start: e.startTime, end: e.startTime + e.duration });
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
  const clean: number[] = [];
  for (let r = 0; r < n; r++) {
    if (hadGc[r]) withGc++;
    else clean.push(bytes[r]);
    if (wall[r] >= slowFrom) { slow++; if (hadGc[r]) slowGc++; }
  }
  clean.sort((a, b) => a - b);
  return {
    runs: n,
    wallMedian: quantile(wallSorted, 0.5), wallP95: quantile(wallSorted, 0.95),
    cpuMedian: quantile(cpuSorted, 0.5), cpuP95: quantile(cpuSorted, 0.95),
    gcShare: withGc / n, gcShareOfSlowest: slow ? slowGc / slow : 0,
    collections: during.length, gcMs: during.reduce((s, x) => s + x.end - x.start, 0),
    bytesMedian: clean.length ? quantile(clean, 0.5) : NaN,
  };
}

/** Bytes in words: 12.3 KB. */
export function kb(bytes: number): string {
  return Number.isFinite(bytes) ? `${(bytes / 1024).toFixed(1)} KB` : 'n/a';
}
