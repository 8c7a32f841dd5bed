/**
 * A simulate event's repeats in words, for the report's `schedule` and the printed sheet:
 * "once", "every 12 h, 6 times", "every 12 h until the end of the run (7 times)".
 */

/**
 * `every`: the repeat interval as text (undefined for a single event); `count`: the study's
 * count (undefined: repeats to the end of the run); `times`: how many times it acts in the run.
 */
export function repeatsText(every: string | undefined, count: number | undefined, times: number): string {
  if (every === undefined) return times === 0 ? 'once (outside the run)' : 'once';
  const n = (k: number) => `${k} ${k === 1 ? 'time' : 'times'}`;
  if (count === undefined) return `every ${every} until the end of the run (${n(times)})`;
  return `every ${every}, ${n(count)}${times < count ? ` (${times} within the run)` : ''}`;
}
