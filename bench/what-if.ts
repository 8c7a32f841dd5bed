/**
 * Benchmark rows for the what-if evaluator: the 6-dose schedule of `simulate.ts` with its four
 * questions, re-run with the elimination rate k replaced, beside the integrator alone on the
 * same run (the same law compiled the same way, the same schedule and tolerances). Goals: a
 * what-if run within 3x the integrator's own time, and 2,000 runs (2,000 values of k) in under
 * 0.5 s.
 */
import { openStudy, compileExpression, parseExpression } from '../src/index.ts';
import { expandSchedule } from '../src/simulate/schedule.ts';
import { runSchedule, type SystemSpec } from '../src/simulate/run-schedule.ts';
import { SIX_DOSES } from './simulate.ts';

export interface WhatIfRow {
  readonly name: string;
  readonly value: number;
  readonly unit: 'ms' | 'x';
  readonly goal: number;
}

const HOUR = 3600;
const WANTED = ['Cmax', 'trough', 'auc', 'above'];
/** The 2,000 values of k: 0.05 / h to 0.25 / h. */
const RUNS = 2000;
const kAt = (i: number) => (0.05 + (0.2 * i) / (RUNS - 1)) / HOUR;

/** The cell's run built by hand: C' = -k C with its area, a dose of 500 mg / 30 L every 8 h, six times. */
function integratorAlone(): (k: number) => number {
  const p = parseExpression('-k * C');
  if (!p.ok) throw new Error(p.error.message);
  const law = compileExpression(p.expr, () => undefined, ['t', 'C', 'k']);
  const x = new Float64Array(3);
  const dose = 0.5e-3 / 0.03; // 500 mg / 30 L in kg / m³
  const actions = expandSchedule([{ index: 0, at: 0, every: 8 * HOUR, count: 6, kind: 'add', targets: [{ name: 'C', value: dose }] }], 0, 48 * HOUR);
  if (!Array.isArray(actions)) throw new Error(actions.error);
  // the cell's default absolute tolerance: a thousandth of the relative one on the largest jump
  const settings = { method: 'auto' as const, rtol: 1e-6, atol: Float64Array.of(dose * 1e-9), maxSteps: 200_000 };
  return (k) => {
    const sys: SystemSpec = {
      n: 1, quadratures: [0], stateIndex: new Map([['C', 0]]), paramIndex: new Map([['k', 0]]),
      y0: Float64Array.of(0), p0: Float64Array.of(k), autonomous: true,
      rates: (t, y, pp, dy) => { x[0] = t; x[1] = y[0]; x[2] = pp[0]; dy[0] = law(x); },
    };
    return runSchedule(sys, actions, 0, 48 * HOUR, settings).steps;
  };
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

export function whatIfBenchmarks(): WhatIfRow[] {
  const opened = openStudy(SIX_DOSES);
  if (!opened.ok) throw new Error(opened.error.message);
  const session = opened.session;
  const w = session.whatIf(WANTED, [{ name: 'k', dimension: '1 / h' }]);
  if (!w.ok) throw new Error(w.error.message);
  const alone = integratorAlone();

  // the same run: the what-if at the study's own k gives the session's answers, and the run by hand takes the cell's steps
  const own = session.report().cells[2];
  const at = w.evaluate([0.1 / HOUR]);
  const results = own.results as Record<string, { si: number }>;
  if (!at.ok || WANTED.some((n, i) => at.values[i] !== results[n].si)) throw new Error('the what-if run does not give the session\'s answers');
  if (alone(0.1 / HOUR) !== own.steps) throw new Error(`the run by hand took ${alone(0.1 / HOUR)} steps, the cell ${String(own.steps)}`);

  // warm up both, then time them alternately on the same values of k
  for (let i = 0; i < 400; i++) { w.evaluate([kAt(i * 5)]); alone(kAt(i * 5)); }
  const whatIf: number[] = [];
  const integrator: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const k = kAt(i);
    let t0 = performance.now();
    alone(k);
    integrator.push(performance.now() - t0);
    t0 = performance.now();
    w.evaluate([k]);
    whatIf.push(performance.now() - t0);
  }
  // the loop a later cell runs: 2,000 values of k, one after another. Its processor time is
  // what the loop costs; its wall time on a shared machine adds the waits for a processor.
  // The fastest of 5 loops of each.
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let r = 0; r < 5; r++) {
    const t0 = performance.now();
    const c0 = process.cpuUsage();
    for (let i = 0; i < RUNS; i++) if (!w.evaluate([kAt(i)]).ok) throw new Error('a what-if run failed');
    const c = process.cpuUsage(c0);
    wall.push(performance.now() - t0);
    cpu.push((c.user + c.system) / 1000);
  }
  const mw = median(whatIf), mi = median(integrator);
  return [
    { name: 'what-if run of the 6-dose schedule, k replaced, 4 questions; median', value: mw, unit: 'ms', goal: NaN },
    { name: 'the integrator alone on the same run; median', value: mi, unit: 'ms', goal: NaN },
    { name: 'what-if run / integrator alone', value: mw / mi, unit: 'x', goal: 3 },
    { name: `${RUNS} what-if runs, ${RUNS} values of k: processor time (fastest of 5 loops)`, value: Math.min(...cpu), unit: 'ms', goal: 500 },
    { name: '  the same loops: wall time', value: Math.min(...wall), unit: 'ms', goal: NaN },
  ];
}
