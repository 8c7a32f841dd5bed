/**
 * The work-precision benchmark: six problems with closed forms (bench/work-precision-problems.json),
 * rtol 1e-3 … 1e-10, atol = 1e-3·rtol·(the state's largest size); for dopri5, dp853, stiff
 * and auto, every evaluation of f and the largest error on a 2001-point grid relative to the
 * state's largest size (the dense output supplies the grid values), beside SciPy's
 * `solve_ivp` (RK45, DOP853, Radau, LSODA) measured once on the same problems by
 * bench/scipy-reference.py (bench/scipy-reference.json).
 *
 * "Equal accuracy": auto's run reached error E with N evaluations; for each SciPy method the
 * evaluations it needs for E are read off its tolerance sweep (rtol 10^(-q/2)) by linear
 * interpolation of log(evaluations) against log(error) between the last run whose error is
 * above E and the first whose error is at or below E (its loosest run's count when even that
 * one is below E; never reached when none is). The ratio is N over the smallest of these.
 * Goal: at most 1.25, and auto within 1 tolerance unit on the grid.
 */
import { readFileSync } from 'node:fs';
import { denseAt, integrate, type Method } from '../src/numerics/ode/integrate.ts';
import type { Rhs } from '../src/numerics/ode/types.ts';

const here = new URL('.', import.meta.url);
const P = JSON.parse(readFileSync(new URL('work-precision-problems.json', here), 'utf8'));

interface RefRun { readonly rtol: number; readonly evaluations: number; readonly error: number }
interface Reference { readonly scipy: string; readonly problems: Record<string, Record<string, RefRun[]>> }
const REF: Reference = JSON.parse(readFileSync(new URL('scipy-reference.json', here), 'utf8'));

const GRID = 2001;

/** W₀(x) for x ≥ 0 (the principal branch of Lambert's W: w e^w = x), by Halley's iteration. */
export function lambertW0(x: number): number {
  let w = x < 3 ? Math.log1p(x) : Math.log(x) - Math.log(Math.log(x));
  for (let i = 0; i < 50; i++) {
    const e = Math.exp(w);
    const f = w * e - x;
    const step = f / (e * (w + 1) - ((w + 2) * f) / (2 * w + 2));
    w -= step;
    if (Math.abs(step) <= 1e-16 * Math.max(1, Math.abs(w))) break;
  }
  return w;
}

export interface Problem {
  readonly name: string;
  readonly f: Rhs;
  readonly y0: readonly number[];
  readonly t1: number;
  readonly exact: (t: number) => number[];
  /** Each state's size for atol and the error; the largest |exact| on the grid when absent. */
  readonly size?: readonly number[];
  /** Times where a bolus of `jump` is added to state 0 (the run restarts there). */
  readonly cuts?: readonly number[];
  readonly jump?: number;
}

export function problems(): Problem[] {
  const H = P.hour;
  const c = P.cooling, g = P.logistic, b = P.bateman, d = P.doses, s = P.forced, m = P.michaelis;
  const amp = (b.dose * b.ka) / (b.V * (b.ka - b.k));
  const tau = d.every_hours * H;
  const c0 = d.dose / d.V;
  const slow = (t: number) => (s.lambda ** 2 * Math.cos(t) + s.lambda * Math.sin(t)) / (s.lambda ** 2 + 1);
  return [
    {
      // closed form: T = Ta + (T0 - Ta) e^{-kt}
      name: 'Newton cooling', y0: [c.T0], t1: c.hours * H,
      f: (_t, y, dy) => { dy[0] = -c.k * (y[0] - c.ambient); },
      exact: (t) => [c.ambient + (c.T0 - c.ambient) * Math.exp(-c.k * t)],
    },
    {
      // closed form: N = K / (1 + (K/N0 - 1) e^{-rt})
      name: 'logistic growth', y0: [g.N0], t1: g.hours * H,
      f: (_t, y, dy) => { dy[0] = g.r * y[0] * (1 - y[0] / g.K); },
      exact: (t) => [g.K / (1 + (g.K / g.N0 - 1) * Math.exp(-g.r * t))],
    },
    {
      // closed form (Bateman)
      name: 'oral absorption (Bateman)', y0: [b.dose, 0], t1: b.hours * H,
      f: (_t, y, dy) => { dy[0] = -b.ka * y[0]; dy[1] = (b.ka * y[0]) / b.V - b.k * y[1]; },
      exact: (t) => [b.dose * Math.exp(-b.ka * t), amp * (Math.exp(-b.k * t) - Math.exp(-b.ka * t))],
    },
    {
      // closed form: superposition of the doses given so far, each c0 e^{-k (t - t_i)}
      name: '6 IV doses', y0: [c0], t1: d.count * tau, jump: c0,
      cuts: Array.from({ length: d.count + 1 }, (_, i) => i * tau),
      f: (_t, y, dy) => { dy[0] = -d.k * y[0]; },
      exact: (t) => {
        let total = 0;
        for (let i = 0; i < d.count; i++) if (t >= i * tau) total += c0 * Math.exp(-d.k * (t - i * tau));
        return [total];
      },
    },
    {
      // closed form by substitution (see test/engine/ode-stiff-tight.test.ts)
      name: "stiff forced y' = -1e4 (y - cos t)", y0: [0], t1: s.t1, size: [1],
      f: (t, y, dy) => { dy[0] = -s.lambda * (y[0] - Math.cos(t)); },
      exact: (t) => [slow(t) - slow(0) * Math.exp(-s.lambda * t)],
    },
    {
      // closed form: C = Km W((C0/Km) e^{(C0 - Vmax t)/Km}) (Schnell & Mendoza 1997)
      name: 'Michaelis–Menten', y0: [m.C0], t1: m.hours * H,
      f: (_t, y, dy) => { dy[0] = (-m.Vmax * y[0]) / (m.Km + y[0]); },
      exact: (t) => [m.Km * lambertW0((m.C0 / m.Km) * Math.exp((m.C0 - m.Vmax * t) / m.Km))],
    },
  ];
}

/** One run of ours: evaluations, the error measure, the error in tolerance units, the method that ran. */
export interface OurRun { readonly evaluations: number; readonly error: number; readonly units: number; readonly method: string }

export function ours(p: Problem, method: Method, rtol: number): OurRun {
  const grid = Array.from({ length: GRID }, (_, i) => (p.t1 * i) / (GRID - 1));
  const exact = grid.map(p.exact);
  const n = p.y0.length;
  const size = p.size ?? p.y0.map((_, j) => Math.max(...exact.map((e) => Math.abs(e[j]))));
  const atol = size.map((v) => 1e-3 * rtol * v);
  const cuts = p.cuts ?? [0, p.t1];
  let y = Float64Array.from(p.y0);
  let firstStep: number | undefined;
  let evaluations = 0;
  let error = 0;
  let units = 0;
  const used = new Set<string>();
  const out = new Float64Array(n);
  for (let c = 0; c + 1 < cuts.length; c++) {
    if (c > 0) y[0] += p.jump!;
    // a schedule with doses runs as a simulate cell runs it (run-schedule.ts: piecewise)
    const res = integrate(p.f, cuts[c], y, cuts[c + 1], { method, rtol, atol, firstStep, piecewise: cuts.length > 2 });
    evaluations += res.counters.evaluations;
    if (res.status !== 'success') return { evaluations, error: Infinity, units: Infinity, method: res.method };
    used.add(res.method);
    const last = c + 2 === cuts.length;
    grid.forEach((t, i) => {
      if (t < cuts[c] || (last ? t > cuts[c + 1] : t >= cuts[c + 1])) return;
      denseAt(res.segments, t, out);
      for (let j = 0; j < n; j++) {
        const e = Math.abs(out[j] - exact[i][j]);
        error = Math.max(error, e / size[j]);
        units = Math.max(units, e / (atol[j] + rtol * Math.abs(exact[i][j])));
      }
    });
    y = Float64Array.from(res.y);
    firstStep = res.nextStep;
  }
  return { evaluations, error, units, method: [...used].join('+') };
}

/**
 * The evaluations a reference method needs for error E (see the file's doc comment), with
 * how it was found.
 */
export function atEqualAccuracy(runs: readonly RefRun[], E: number): { evaluations: number; how: 'interpolated' | 'loosest' | 'never' } {
  const j = runs.findIndex((r) => r.error <= E);
  if (j < 0) return { evaluations: Infinity, how: 'never' };
  if (j === 0) return { evaluations: runs[0].evaluations, how: 'loosest' };
  const a = runs[j - 1];
  const b = runs[j];
  const s = (Math.log(E) - Math.log(a.error)) / (Math.log(b.error) - Math.log(a.error));
  return { evaluations: Math.exp(Math.log(a.evaluations) + s * (Math.log(b.evaluations) - Math.log(a.evaluations))), how: 'interpolated' };
}

/** The SciPy method with the fewest evaluations at error E on a problem, and that count (Infinity when none was that accurate). */
export function bestReference(problem: string, E: number): { method: string; evaluations: number; how: string } {
  let best = { method: 'none', evaluations: Infinity, how: 'never' };
  for (const [method, list] of Object.entries(REF.problems[problem] ?? {})) {
    const at = atEqualAccuracy(list, E);
    if (at.evaluations < best.evaluations) best = { method, ...at };
  }
  return best;
}

export interface WorkPrecisionRow {
  readonly problem: string;
  readonly rtol: number;
  readonly runs: Readonly<Record<'dopri5' | 'dp853' | 'stiff' | 'auto', OurRun>>;
  /** The SciPy method with the fewest evaluations at auto's error, and that count. */
  readonly best: { readonly method: string; readonly evaluations: number; readonly how: string };
  /** auto's evaluations over the best reference's (NaN when no reference run was that accurate). */
  readonly ratio: number;
}

/** Every problem at rtol 1e-3 … 1e-10. A few seconds. */
export function workPrecisionBench(): WorkPrecisionRow[] {
  const rows: WorkPrecisionRow[] = [];
  for (const p of problems()) {
    for (let q = 3; q <= 10; q++) {
      const rtol = 10 ** -q;
      const runs = {
        dopri5: ours(p, 'dopri5', rtol), dp853: ours(p, 'dp853', rtol), stiff: ours(p, 'stiff', rtol), auto: ours(p, 'auto', rtol),
      };
      const best = bestReference(p.name, runs.auto.error);
      rows.push({ problem: p.name, rtol, runs, best, ratio: Number.isFinite(best.evaluations) ? runs.auto.evaluations / best.evaluations : NaN });
    }
  }
  return rows;
}

/** The SciPy version the reference counts come from. */
export const REFERENCE_VERSION = REF.scipy;
