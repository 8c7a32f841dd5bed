/**
 * Integrating a system through a schedule: the solver runs from one action time to the next
 * and restarts after applying the actions (jumps, parameter changes, infusions switched on or
 * off), so no step ever crosses a discontinuity. Pure numbers (SI).
 */
import { autoExplicit, integrate, newOdeReuse, type Method, type OdeReuse } from '../numerics/ode/integrate.ts';
import { Status } from '../numerics/ode/types.ts';
import type { Action } from './schedule.ts';
import type { Piece, Trajectory } from './trajectory.ts';

export interface SystemSpec {
  /** Number of states (quadrature states come after them). */
  readonly n: number;
  /** Writes the rates of the n states at time t into dy, from the states and the parameters p. */
  readonly rates: (t: number, y: Float64Array, p: Float64Array, dy: Float64Array) => void;
  /** For each quadrature state, the state it integrates. */
  readonly quadratures: readonly number[];
  readonly stateIndex: ReadonlyMap<string, number>;
  readonly paramIndex: ReadonlyMap<string, number>;
  readonly y0: Float64Array;
  readonly p0: Float64Array;
  readonly autonomous: boolean;
}

export interface RunSettings {
  readonly method: Method;
  readonly step?: number;
  readonly rtol: number;
  readonly atol: Float64Array;
  readonly maxSteps: number;
}

export interface RunOutcome {
  readonly trajectory: Trajectory;
  readonly status: Status;
  /** On failure: where it stopped, in SI. */
  readonly failure?: { readonly t: number; readonly y: Float64Array; readonly status: Status };
  readonly steps: number;
  readonly evaluations: number;
  readonly rejected: number;
  readonly methodsUsed: ReadonlySet<string>;
  readonly switchedToStiff: number | null;
  /** The explicit method `auto` ran before it switched to the stiff method (null: no switch). */
  readonly switchedFrom: 'dopri5' | 'adams' | null;
}

/**
 * Runs the system from t0 to t1 through the actions (sorted, as from expandSchedule). The
 * integrator's set-up is made once for all the pieces, or kept in `reuse` from an earlier
 * run (a what-if loop runs one system thousands of times); the numbers are the same either way.
 */
export function runSchedule(sys: SystemSpec, actions: readonly Action[], t0: number, t1: number, settings: RunSettings, reuse: OdeReuse = newOdeReuse()): RunOutcome {
  const width = sys.n + sys.quadratures.length;
  const y = new Float64Array(width);
  y.set(sys.y0);
  const p = Float64Array.from(sys.p0);
  const infusion = new Float64Array(sys.n);
  const active = new Map<string, Array<{ i: number; v: number }>>();
  const pieces: Piece[] = [];
  let steps = 0, evaluations = 0, rejected = 0;
  const methods = new Set<string>();
  let switched: number | null = null;
  let firstStep: number | undefined;

  const f = (t: number, yy: Float64Array, dy: Float64Array) => {
    sys.rates(t, yy, p, dy);
    for (let i = 0; i < sys.n; i++) dy[i] += infusion[i];
    for (let j = 0; j < sys.quadratures.length; j++) dy[sys.n + j] = yy[sys.quadratures[j]];
  };
  const atol = width === sys.n ? settings.atol : Float64Array.from({ length: width }, (_, i) => (i < sys.n ? settings.atol[i] : settings.atol[sys.quadratures[i - sys.n]] * Math.max(1, t1 - t0)));

  let a = 0;
  let t = t0;
  const apply = (time: number) => {
    while (a < actions.length && actions[a].time <= time) {
      const act = actions[a++];
      const key = `${act.event}/${act.repeat}`;
      switch (act.kind) {
        case 'add':
          for (const { name, value } of act.targets) y[sys.stateIndex.get(name)!] += value;
          break;
        case 'set':
          for (const { name, value } of act.targets) p[sys.paramIndex.get(name)!] = value;
          break;
        case 'infuse-start': {
          const list = act.targets.map(({ name, value }) => ({ i: sys.stateIndex.get(name)!, v: value }));
          for (const { i, v } of list) infusion[i] += v;
          active.set(key, list);
          break;
        }
        case 'infuse-stop':
          for (const { i, v } of active.get(key) ?? []) infusion[i] -= v;
          active.delete(key);
          break;
      }
    }
  };

  const start = Float64Array.from(y);
  // doses inside the run: auto keeps dopri5 at rtol 1e-6 (see autoExplicit)
  const piecewise = actions.some((x) => x.time > t0 && x.time < t1);
  let switchedFrom: RunOutcome['switchedFrom'] = null;
  apply(t0);
  while (true) {
    const next = a < actions.length && actions[a].time < t1 ? actions[a].time : t1;
    const y0 = Float64Array.from(y);
    const r = integrate(f, t, y, next, {
      method: settings.method, step: settings.step, rtol: settings.rtol, atol,
      firstStep, maxSteps: Math.max(1, settings.maxSteps - steps - rejected), autonomous: sys.autonomous, piecewise,
    }, reuse);
    steps += r.counters.steps;
    rejected += r.counters.rejected;
    evaluations += r.counters.evaluations;
    methods.add(r.method);
    if (r.switchedToStiff !== null && switched === null) {
      switched = r.switchedToStiff;
      switchedFrom = autoExplicit(settings.rtol, piecewise);
    }
    // r.y is the integrator's own copy, which nothing else holds
    pieces.push({ t0: t, t1: r.t, y0, y1: r.y, segments: r.segments, params: Float64Array.from(p), infusion: Float64Array.from(infusion) });
    if (r.status !== Status.Success || next >= t1) {
      return {
        trajectory: { t0, t1: r.t, width, start, pieces }, status: r.status, steps, evaluations, rejected, methodsUsed: methods, switchedToStiff: switched, switchedFrom,
        ...(r.status === Status.Success ? {} : { failure: { t: r.failure?.t ?? r.t, y: Float64Array.from(r.failure?.y ?? r.y), status: r.status } }),
      };
    }
    y.set(r.y);
    t = next;
    firstStep = r.nextStep;
    apply(next);
  }
}
