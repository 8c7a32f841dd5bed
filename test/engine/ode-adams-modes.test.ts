// The Adams step loop shared by its two modes (adams.ts with adams-formulas.ts and
// adams-rebuilt.ts) against the two loops it replaced, the old adams.ts and adams-pec.ts kept
// for this comparison as adams-old.ts: every step's time, step, order and end, the dense
// output inside each step, the counters and the stiffness report, compared as stored numbers.
// Below rtol 1e-9 (the one-evaluation mode, a fit's model) and above (PECE), on the
// work-precision problems (closed forms in bench/work-precision.ts), the 6 IV doses through
// restarts with a carried step (the Runge–Kutta start), a 3-state chain and the stiff forced
// problem (its stiffness test).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { AdamsStepper } from '../../src/numerics/ode/adams.ts';
import { AdamsStepper as OldAdamsStepper } from '../../src/numerics/ode/adams-old.ts';
import { newContext, resolveOptions } from '../../src/numerics/ode/control.ts';
import { type Rhs, newCounters } from '../../src/numerics/ode/types.ts';
import { problems } from '../../bench/work-precision.ts';

interface Case { readonly name: string; readonly f: Rhs; readonly y0: readonly number[]; readonly cuts: readonly number[]; readonly jump?: number; readonly size?: readonly number[] }

const chain: Rhs = (t, y, dy) => { dy[0] = -1.3 * y[0] + Math.sin(t); dy[1] = 1.3 * y[0] - 0.5 * y[1]; dy[2] = y[1] * y[1] - y[2]; };

function cases(): Case[] {
  const list: Case[] = problems().map((p) => ({ name: p.name, f: p.f, y0: p.y0, cuts: p.cuts ?? [0, p.t1], jump: p.jump, size: p.size }));
  list.push({ name: '3-state chain', f: chain, y0: [1, 0, 0.5], cuts: [0, 8] });
  return list;
}

interface Stepping {
  t: number; h: number; order: number; stiffAt: number | null; readonly y: Float64Array;
  step(tEnd: number): ReturnType<AdamsStepper['step']>;
  restart(ctx: ReturnType<typeof newContext>, t0: number, y0: ArrayLike<number>, firstStep?: number): void;
}

/** Every number a run gives, in order: per step t, h, order, y, the dense output at 5 points; the counters, stiffAt. */
function trace(make: (ctx: ReturnType<typeof newContext>, t0: number, y0: ArrayLike<number>) => Stepping, c: Case, rtol: number): number[] {
  const n = c.y0.length;
  const size = c.size ?? c.y0.map((v) => Math.max(Math.abs(v), 1));
  const atol = size.map((v) => 1e-3 * rtol * v);
  const out: number[] = [];
  const y = Float64Array.from(c.y0);
  const dense = new Float64Array(n);
  let stepper: Stepping | null = null;
  for (let piece = 0; piece + 1 < c.cuts.length; piece++) {
    const t0 = c.cuts[piece], t1 = c.cuts[piece + 1];
    if (piece > 0) y[0] += c.jump!;
    const counters = newCounters();
    const ctx = newContext(c.f, y, resolveOptions({ rtol, atol }, n, t1 - t0), counters, t1 - t0);
    if (stepper) stepper.restart(ctx, t0, y, stepper.h);
    else stepper = make(ctx, t0, y);
    let steps = 0;
    while (stepper.t < t1 && steps < 100_000) {
      const o = stepper.step(t1);
      steps++;
      if (!o.ok) { out.push(NaN, o.status.length); break; }
      out.push(stepper.t, stepper.h, stepper.order, ...stepper.y);
      const s = o.segment;
      for (const th of [0, 0.1, 1 / 3, 0.77, 1]) {
        s.eval(s.t0 + th * (s.t1 - s.t0), dense);
        out.push(...dense);
      }
    }
    out.push(counters.evaluations, counters.steps, counters.rejected, stepper.stiffAt ?? -1);
    y.set(stepper.y);
  }
  return out;
}

function sameBits(a: readonly number[], b: readonly number[], what: string): void {
  assert.equal(a.length, b.length, `${what}: lengths`);
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) assert.fail(`${what}: number ${i}: ${a[i]} against ${b[i]}`);
}

const TOLERANCES = [1e-6, 1e-7, 1e-8, 1e-9, 1e-10, 1e-11, 1e-12];

describe('the shared Adams loop gives the numbers of the two loops it replaced, bit for bit', () => {
  for (const c of cases()) {
    it(`${c.name}: rtol 1e-6 … 1e-12`, () => {
      for (const rtol of TOLERANCES) {
        const now = trace((ctx, t0, y0) => new AdamsStepper(ctx, t0, y0), c, rtol);
        const before = trace((ctx, t0, y0) => new OldAdamsStepper(ctx, t0, y0), c, rtol);
        sameBits(now, before, `rtol ${rtol}`);
      }
    });
  }
});
