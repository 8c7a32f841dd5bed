/**
 * Work to reach a given accuracy with the ODE layer, side by side with odex (Hairer & Wanner's
 * Gragg–Bulirsch–Stoer extrapolation code, ported to JavaScript; npm "odex").
 *
 * For each problem (closed-form solutions, SI magnitudes) and each accuracy target, each
 * solver is run at tolerances 10^(-k/4), loosest first, until its largest error on an hourly
 * grid (relative to the state's largest size) meets the target; that run's evaluations of f
 * and median wall time are reported. Goal: no more evaluations than odex at equal accuracy
 * (and no more time). The dense output supplies our grid values; odex's own dense output
 * supplies its.
 *
 * `odeBench()` returns rows `{ name, value, goal, met, unit }`: `value` is ours, `goal` is
 * odex's, `met` is value <= goal, `unit` is 'evaluations' or 'ms'.
 */
import { createRequire } from 'node:module';
import { integrate, denseAt } from '../src/numerics/ode/integrate.ts';
import type { Rhs } from '../src/numerics/ode/types.ts';

export interface OdeBenchRow {
  readonly name: string;
  /** Ours: evaluations of f, or the median milliseconds of one run. */
  readonly value: number;
  /** odex's figure at the same accuracy. */
  readonly goal: number;
  /** value <= goal. */
  readonly met: boolean;
  readonly unit: 'evaluations' | 'ms';
}

interface OdexSolver {
  relativeTolerance: number | number[];
  absoluteTolerance: number | number[];
  denseOutput: boolean;
  maxSteps: number;
  grid(dt: number, out: (t: number, y: number[]) => void): unknown;
  solve(f: (t: number, y: number[]) => number[], t0: number, y0: number[], t1: number, out?: unknown): { outcome: number; nEval: number };
}
const odex = createRequire(import.meta.url)('odex') as { Solver: new (n: number) => OdexSolver };

const HOUR = 3600;

interface Problem {
  readonly name: string;
  readonly f: Rhs;
  readonly y0: readonly number[];
  readonly hours: number;
  readonly exact: (t: number) => number[];
  /** atol = typical · rtol for each state. */
  readonly typical: readonly number[];
}

const ka = 1.2 / HOUR, k = 0.15 / HOUR, V = 0.04, dose = 5e-4, r = 1 / HOUR, K = 1000, kc = 0.35 / HOUR;

const PROBLEMS: readonly Problem[] = [
  {
    name: 'Newton cooling',
    f: (_t, y, dy) => { dy[0] = -kc * (y[0] - 293.15); },
    y0: [353.15], hours: 8, typical: [1],
    exact: (t) => [293.15 + 60 * Math.exp(-kc * t)],
  },
  {
    name: 'logistic growth',
    f: (_t, y, dy) => { dy[0] = r * y[0] * (1 - y[0] / K); },
    y0: [10], hours: 24, typical: [1],
    exact: (t) => [K / (1 + (K / 10 - 1) * Math.exp(-r * t))],
  },
  {
    name: 'oral absorption (Bateman)',
    f: (_t, y, dy) => {
      dy[0] = -ka * y[0];
      dy[1] = (ka * y[0]) / V - k * y[1];
    },
    y0: [dose, 0], hours: 24, typical: [1e-3, 1e-2],
    exact: (t) => [dose * Math.exp(-ka * t), ((dose * ka) / (V * (ka - k))) * (Math.exp(-k * t) - Math.exp(-ka * t))],
  },
];

/** Largest error on the hourly grid, relative to each state's largest size there. */
function gridError(p: Problem, values: (t: number) => number[]): number {
  const n = p.y0.length;
  const size = new Array<number>(n).fill(0);
  for (let h = 0; h <= p.hours; h++) p.exact(h * HOUR).forEach((v, i) => { size[i] = Math.max(size[i], Math.abs(v)); });
  let worst = 0;
  for (let h = 0; h <= p.hours; h++) {
    const ex = p.exact(h * HOUR);
    const got = values(h * HOUR);
    for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(got[i] - ex[i]) / size[i]);
  }
  return worst;
}

interface Run { readonly error: number; readonly evaluations: number; readonly run: () => void }

function ours(p: Problem, rtol: number): Run {
  const opts = { method: 'dopri5' as const, rtol, atol: p.typical.map((s) => s * rtol) };
  const go = () => integrate(p.f, 0, p.y0, p.hours * HOUR, opts);
  const res = go();
  const out = new Float64Array(p.y0.length);
  const error = gridError(p, (t) => {
    denseAt(res.segments, t, out);
    return [...out];
  });
  return { error, evaluations: res.counters.evaluations, run: go };
}

function theirs(p: Problem, rtol: number): Run {
  const n = p.y0.length;
  const y = new Float64Array(n);
  const dy = new Float64Array(n);
  const f = (t: number, yy: number[]) => {
    y.set(yy);
    p.f(t, y, dy);
    return Array.from(dy);
  };
  const go = () => {
    const solver = new odex.Solver(n);
    solver.relativeTolerance = rtol;
    solver.absoluteTolerance = p.typical.map((s) => s * rtol);
    solver.denseOutput = true;
    solver.maxSteps = 100_000;
    const seen = new Map<number, number[]>();
    const result = solver.solve(f, 0, [...p.y0], p.hours * HOUR, solver.grid(HOUR, (t, yy) => { seen.set(Math.round(t / HOUR), yy.slice()); }));
    return { result, seen };
  };
  const { result, seen } = go();
  const error = result.outcome === 0 ? gridError(p, (t) => seen.get(Math.round(t / HOUR)) ?? p.y0.map(() => NaN)) : Infinity;
  return { error: Number.isNaN(error) ? Infinity : error, evaluations: result.nEval, run: () => { go(); } };
}

/** The loosest tolerance 10^(-k/4) (rtol from 1e-2 down to 1e-13) whose run meets the target. */
function loosest(make: (rtol: number) => Run, target: number): Run | null {
  for (let q = 8; q <= 52; q++) {
    const run = make(10 ** (-q / 4));
    if (run.error <= target) return run;
  }
  return null;
}

function medianMs(run: () => void, runs: number): number {
  for (let i = 0; i < 3; i++) run();
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    run();
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  return times[times.length >> 1];
}

/** Rows for every problem and accuracy target (1e-5 and 1e-9 of the state's size). About a second. */
export function odeBench(runs = 15): OdeBenchRow[] {
  const rows: OdeBenchRow[] = [];
  for (const p of PROBLEMS) {
    for (const target of [1e-5, 1e-9]) {
      const a = loosest((rtol) => ours(p, rtol), target);
      const b = loosest((rtol) => theirs(p, rtol), target);
      const label = `ode dopri5 vs odex, ${p.name}, error ${target.toExponential()}`;
      if (!a || !b) {
        rows.push({ name: `${label}: ${a ? 'odex' : 'dopri5'} never reached the target`, value: a ? 0 : Infinity, goal: b ? b.evaluations : Infinity, met: a !== null, unit: 'evaluations' });
        continue;
      }
      rows.push({ name: `${label}: evaluations`, value: a.evaluations, goal: b.evaluations, met: a.evaluations <= b.evaluations, unit: 'evaluations' });
      const msOurs = medianMs(a.run, runs);
      const msTheirs = medianMs(b.run, runs);
      rows.push({ name: `${label}: time`, value: msOurs, goal: msTheirs, met: msOurs <= msTheirs, unit: 'ms' });
    }
  }
  return rows;
}

/**
 * The forced stiff problem y' = -1e4 (y - cos t), y(0) = 0, t in [0, 10], atol = 1e-3·rtol,
 * at rtol 1e-3 … 1e-10, for the stiff method and auto: evaluations (every call of f),
 * Jacobians, the largest error at the steps in tolerance units, and the ratio to LSODA's
 * evaluations on the same problem and tolerances (SciPy 1.17 `solve_ivp`, measured once and
 * quoted here, `LSODA_FORCED`). Goal: a ratio of at most 1.25.
 */
export interface StiffBenchRow {
  readonly method: 'stiff' | 'auto';
  readonly rtol: number;
  readonly formula: string;
  readonly evaluations: number;
  readonly jacobians: number;
  /** Largest |y - exact| / (atol + rtol·|exact|) at the step ends. */
  readonly units: number;
  readonly lsoda: number;
}

/** LSODA's evaluations at rtol 1e-3 … 1e-10 on the forced stiff problem (SciPy 1.17). */
export const LSODA_FORCED: readonly number[] = [204, 351, 429, 639, 642, 929, 1347, 1474];

export function stiffBench(): StiffBenchRow[] {
  const lambda = 1e4;
  const f: Rhs = (t, y, dy) => { dy[0] = -lambda * (y[0] - Math.cos(t)); };
  const slow = (t: number) => (1e8 * Math.cos(t) + 1e4 * Math.sin(t)) / (1e8 + 1);
  const exact = (t: number) => slow(t) - slow(0) * Math.exp(-lambda * t);
  const rows: StiffBenchRow[] = [];
  for (const method of ['stiff', 'auto'] as const) {
    LSODA_FORCED.forEach((lsoda, i) => {
      const rtol = 10 ** -(i + 3);
      const atol = 1e-3 * rtol;
      const res = integrate(f, 0, [0], 10, { method, rtol, atol });
      const out = new Float64Array(1);
      let units = 0;
      for (const s of res.segments) {
        s.eval(s.t1, out);
        units = Math.max(units, Math.abs(out[0] - exact(s.t1)) / (atol + rtol * Math.abs(exact(s.t1))));
      }
      rows.push({
        method, rtol, formula: res.stiffFormula ?? res.method, evaluations: res.counters.evaluations,
        jacobians: res.counters.jacobians, units, lsoda,
      });
    });
  }
  return rows;
}
