/**
 * A work meter: the numerics charge their work to it (each evaluation of a rate, each step,
 * each sample of a solution, each point of a sweep, each action of a schedule) and it stops
 * the work, by throwing `WorkExceeded`, once the units charged pass the budget or the clock
 * passes the deadline. The session runs each cell under its own meter (`metered`), so a
 * runaway cell ends with a message and the others still run.
 *
 * Without a meter (a numerics function called directly) `charge` costs one comparison. A
 * `catch` in the numerics that turns a failure of f into NaN must let `WorkExceeded` through
 * (`rethrowWork`).
 */

/** Why work stopped: the units ran out, or the clock did. */
export class WorkExceeded extends Error {
  constructor(readonly reason: 'budget' | 'time', readonly limit: number) {
    super(reason === 'budget' ? `the work budget (${limit} units) ran out` : 'the time limit ran out');
    this.name = 'WorkExceeded';
  }
}

interface Meter {
  used: number;
  readonly limit: number;
  /** performance.now() after which work stops; Infinity for none. */
  readonly deadline: number;
  /** The next `used` at which the clock is read. */
  nextClock: number;
}

/**
 * Units between two readings of the clock: work smaller than this (a parameter, a short run)
 * always finishes, so a time limit stops only the cells that do real work.
 */
const CLOCK_EVERY = 4096;

let meter: Meter | undefined;

/** Charges `units` of work to the running meter; throws `WorkExceeded` when it is spent. */
export function charge(units = 1): void {
  const m = meter;
  if (m === undefined) return;
  m.used += units;
  if (m.used > m.limit) throw new WorkExceeded('budget', m.limit);
  if (m.used >= m.nextClock) {
    m.nextClock = m.used + CLOCK_EVERY;
    if (m.deadline !== Infinity && performance.now() > m.deadline) throw new WorkExceeded('time', m.limit);
  }
}

/** Rethrows `err` when it is the meter's stop; for a catch that turns f's failures into NaN. */
export function rethrowWork(err: unknown): void {
  if (err instanceof WorkExceeded) throw err;
}

/** Units charged by the current meter so far (0 without one). */
export function workUsed(): number {
  return meter?.used ?? 0;
}

/**
 * Runs `fn` under a meter of `limit` units and the `deadline` (a performance.now() time).
 * Returns what fn returned and the units it used; a `WorkExceeded` thrown inside is returned
 * as `exceeded`, any other throw passes through. Meters nest: the inner one's work is also
 * charged to the outer one when it ends.
 */
export function metered<T>(limit: number, deadline: number, fn: () => T): { value?: T; exceeded?: WorkExceeded; used: number } {
  const outer = meter;
  const own: Meter = { used: 0, limit, deadline, nextClock: CLOCK_EVERY };
  meter = own;
  try {
    return { value: fn(), used: own.used };
  } catch (err) {
    if (err instanceof WorkExceeded) return { exceeded: err, used: own.used };
    throw err;
  } finally {
    meter = outer;
    if (outer) outer.used += own.used;
  }
}
