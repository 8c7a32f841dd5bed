/**
 * The processor cost of a step: the variable-order Adams formulas against dopri5 on the same
 * problems at the same tolerance (the work-precision problems of `work-precision.ts`, with the
 * steppers kept from run to run through `OdeReuse`, as a simulate node keeps them). The two
 * methods are timed in alternation, many times over, so that a machine other processes share
 * slows both alike: read the ratios, not the absolute figures.
 *
 * Rows per problem: each method's processor time per run and per step (median over the
 * rounds), its steps and evaluations per run, and Adams / dopri5 per run (the median of each
 * round's ratio) and per step.
 */
import { integrate, newOdeReuse, type OdeReuse } from '../src/numerics/ode/integrate.ts';
import { problems, type Problem } from './work-precision.ts';

export interface StepCostRow {
  readonly problem: string;
  readonly rtol: number;
  readonly method: 'adams' | 'dopri5';
  readonly steps: number;
  readonly evaluations: number;
  /** Median microseconds of processor time of one run, and of one step. */
  readonly runUs: number;
  readonly stepUs: number;
  /** Median over the rounds of Adams's time over dopri5's in the same round (the same on both rows). */
  readonly ratio: number;
}

/** atol as in `work-precision.ts`: 1e-3·rtol·(the state's largest size on a coarse grid). */
function atolOf(p: Problem, rtol: number): number[] {
  const size = p.size ?? p.y0.map((_, j) => {
    let m = 0;
    for (let i = 0; i <= 200; i++) m = Math.max(m, Math.abs(p.exact((p.t1 * i) / 200)[j]));
    return m;
  });
  return size.map((v) => 1e-3 * rtol * v);
}

/** One run over the problem's pieces (doses add to state 0 between pieces, the step carried across). */
function runner(p: Problem, method: 'adams' | 'dopri5', rtol: number): () => { steps: number; evaluations: number } {
  const atol = atolOf(p, rtol);
  const cuts = p.cuts ?? [0, p.t1];
  const reuse: OdeReuse = newOdeReuse();
  const y = new Float64Array(p.y0.length);
  return () => {
    y.set(p.y0);
    let firstStep: number | undefined;
    let steps = 0;
    let evaluations = 0;
    for (let c = 0; c + 1 < cuts.length; c++) {
      if (c > 0) y[0] += p.jump!;
      const res = integrate(p.f, cuts[c], y, cuts[c + 1], { method, rtol, atol, firstStep }, reuse);
      if (res.status !== 'success') throw new Error(`${p.name}, ${method}: ${res.message}`);
      steps += res.counters.steps;
      evaluations += res.counters.evaluations;
      y.set(res.y);
      firstStep = res.nextStep;
    }
    return { steps, evaluations };
  };
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

/** Processor time of `reps` calls of `run`, in microseconds per call. */
function timeRuns(run: () => unknown, reps: number): number {
  const c0 = process.cpuUsage();
  for (let i = 0; i < reps; i++) run();
  const c = process.cpuUsage(c0);
  return (c.user + c.system) / reps;
}

/** Problems timed: the smooth ones (not the stiff problem, where neither runs). */
export const STEP_COST_PROBLEMS = ['Newton cooling', 'logistic growth', 'oral absorption (Bateman)', '6 IV doses', 'Michaelis–Menten'];

/**
 * Each problem at `rtol`: both methods warmed up for about 0.3 s, then `rounds` rounds of
 * about 20 ms each (processor time), Adams and dopri5 in turn (which goes first alternates).
 */
export function stepCostBench(rtol = 1e-6, rounds = 21, only?: readonly string[]): StepCostRow[] {
  const rows: StepCostRow[] = [];
  for (const p of problems()) {
    if (!(only ?? STEP_COST_PROBLEMS).includes(p.name)) continue;
    const run = { adams: runner(p, 'adams', rtol), dopri5: runner(p, 'dopri5', rtol) };
    const work = { adams: run.adams(), dopri5: run.dopri5() };
    // the repetitions that make about 20 ms of a round, from an untimed warm-up of 0.3 s
    const reps = { adams: 1, dopri5: 1 };
    const start = performance.now();
    while (performance.now() - start < 300) for (const m of ['adams', 'dopri5'] as const) {
      const us = timeRuns(run[m], reps[m]);
      reps[m] = Math.max(1, Math.round(20_000 / us));
    }
    const times = { adams: [] as number[], dopri5: [] as number[] };
    for (let r = 0; r < rounds; r++) {
      const order = r % 2 ? (['dopri5', 'adams'] as const) : (['adams', 'dopri5'] as const);
      for (const m of order) times[m].push(timeRuns(run[m], reps[m]));
    }
    const ratio = median(times.adams.map((a, r) => a / times.dopri5[r]));
    for (const m of ['adams', 'dopri5'] as const) {
      const runUs = median(times[m]);
      rows.push({ problem: p.name, rtol, method: m, ...work[m], runUs, stepUs: runUs / work[m].steps, ratio });
    }
  }
  return rows;
}

/** The section's table rows: per problem, each method's run and step, and the ratios. */
export function stepCostRows(): { measure: string; result: string }[] {
  const rows = stepCostBench();
  const out: { measure: string; result: string }[] = [];
  for (let i = 0; i + 1 < rows.length; i += 2) {
    const [a, d] = rows[i].method === 'adams' ? [rows[i], rows[i + 1]] : [rows[i + 1], rows[i]];
    const us = (x: number) => `${x.toFixed(x < 10 ? 2 : 1)} µs`;
    out.push(
      { measure: `${a.problem}, rtol ${a.rtol.toExponential(0)}: adams ${a.steps} steps, ${a.evaluations} evaluations; per run`, result: us(a.runUs) },
      { measure: `  dopri5 ${d.steps} steps, ${d.evaluations} evaluations; per run`, result: us(d.runUs) },
      { measure: '  per step: adams, dopri5', result: `${us(a.stepUs)}, ${us(d.stepUs)}` },
      { measure: '  adams / dopri5 per run (median of the rounds\' ratios), and per step', result: `${a.ratio.toFixed(2)}x, ${((a.ratio * d.steps) / a.steps).toFixed(2)}x` },
    );
  }
  return out;
}
