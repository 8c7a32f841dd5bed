/**
 * Speed of non-compartmental analysis (`ncaProfile`) on one 12-point profile.
 *
 * `ncaProfile` takes microseconds, near the resolution of `performance.now()`, so each sample
 * times a batch of `BATCH` calls and divides; the figure is the median of `SAMPLES` samples,
 * after at least `WARMUP_MS` of untimed calls (so that the optimising compiler has finished).
 * Goal: under 0.1 ms per profile, so that a table of a few hundred profiles re-analyses within
 * a keystroke's budget. Not a test: a goal not met is reported, nothing fails.
 */
import { ncaProfile, type NcaInput } from '../src/numerics/nca/nca.ts';

export interface NcaBenchRow {
  /** What was timed. */
  readonly name: string;
  /** Median wall time of one call, in milliseconds. */
  readonly ms: number;
  /** The time it should stay under, in milliseconds. */
  readonly goalMs: number;
  /** ms <= goalMs. */
  readonly ok: boolean;
}

const WARMUP_MS = 300;
const BATCH = 1000;
const SAMPLES = 31;
const GOAL_MS = 0.1;
const H = 3600;

/** An oral dose (invented numbers, SI): absorption 1.5 /h, elimination 0.12 /h, 12 samples over 24 h. */
function oralProfile(): NcaInput {
  const hours = [0, 0.25, 0.5, 1, 1.5, 2, 3, 4, 6, 8, 12, 24];
  const t = hours.map((x) => x * H);
  const ka = 1.5 / H;
  const k = 0.12 / H;
  const c = t.map((x) => 2e-3 * (Math.exp(-k * x) - Math.exp(-ka * x)));
  return { t, c, dose: 100e-6, route: 'extravascular', auc: 'linear-up-log-down', terminal: 'auto' };
}

/** Keeps results alive so that the calls cannot be optimised away. */
let sink = 0;

function time(name: string, input: NcaInput): NcaBenchRow {
  const call = () => {
    const r = ncaProfile(input);
    sink += r.ok ? r.AUClast : 0;
  };
  const start = performance.now();
  while (performance.now() - start < WARMUP_MS) call();
  const perCall: number[] = [];
  for (let s = 0; s < SAMPLES; s++) {
    const t0 = performance.now();
    for (let i = 0; i < BATCH; i++) call();
    perCall.push((performance.now() - t0) / BATCH);
  }
  perCall.sort((a, b) => a - b);
  const ms = perCall[Math.floor(SAMPLES / 2)];
  return { name, ms, goalMs: GOAL_MS, ok: ms <= GOAL_MS };
}

/** One row per case: a 12-point oral profile with the 'auto' tail, and the same with a fixed count of 3. */
export function ncaBenchmarks(): NcaBenchRow[] {
  const oral = oralProfile();
  const check = ncaProfile(oral);
  if (!check.ok || check.lambdaZ === null) throw new Error(`the benchmark profile does not analyse: ${check.ok ? 'no lambda_z' : check.message}`);
  const rows = [
    time('ncaProfile, 12-point oral profile, auto tail', oral),
    time('ncaProfile, 12-point oral profile, last 3 points', { ...oral, terminal: 3 }),
  ];
  if (sink === 0) throw new Error('no results');
  return rows;
}
