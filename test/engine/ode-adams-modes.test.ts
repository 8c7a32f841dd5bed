// The Adams step loop shared by its two modes (adams.ts with adams-formulas.ts and
// adams-rebuilt.ts) keeps the numbers of the two loops it replaced. Below rtol 1e-9 the
// one-evaluation mode is a fit's model, which must stay the same to the last bit (see
// `PECE_FROM_RTOL` in adams.ts). The shared loop was compared there, step by step (every
// step's time, step, order and end, the dense output inside each step, the counters, the
// stiffness report), with the old adams.ts and adams-pec.ts at rtol 1e-6 … 1e-12 on the
// work-precision problems, the 6 IV doses through restarts and a 3-state chain: equal bit for
// bit. The figures pinned below were computed by that previous implementation at commit
// 97fa066 (the old adams.ts handing its steps to adams-pec.ts), with the driver below; the
// closed forms the problems are checked against are in bench/work-precision.ts.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { AdamsStepper } from '../../src/numerics/ode/adams.ts';
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

interface Digest { evaluations: number; steps: number; y: number[]; mid: number[] }

/**
 * A run of the Adams stepper through the case's pieces (a dose added to y[0] at each cut, the
 * stepper restarted with its step carried, so the Runge–Kutta start runs): the evaluations and
 * steps of all pieces, the end, and the dense output at 0.37 of the span.
 */
function digest(c: Case, rtol: number): Digest {
  const n = c.y0.length;
  const size = c.size ?? c.y0.map((v) => Math.max(Math.abs(v), 1));
  const atol = size.map((v) => 1e-3 * rtol * v);
  const y = Float64Array.from(c.y0);
  const tMid = 0.37 * c.cuts[c.cuts.length - 1];
  const mid = new Float64Array(n);
  let stepper: AdamsStepper | null = null;
  let evaluations = 0, steps = 0;
  for (let i = 0; i + 1 < c.cuts.length; i++) {
    const t0 = c.cuts[i], t1 = c.cuts[i + 1];
    if (i > 0) y[0] += c.jump!;
    const counters = newCounters();
    const ctx = newContext(c.f, y, resolveOptions({ rtol, atol }, n, t1 - t0), counters, t1 - t0);
    if (stepper) stepper.restart(ctx, t0, y, stepper.h);
    else stepper = new AdamsStepper(ctx, t0, y);
    while (stepper.t < t1) {
      const o = stepper.step(t1);
      assert.ok(o.ok, `${c.name}: a step failed at ${stepper.t}`);
      steps++;
      if (o.segment.t0 <= tMid && tMid <= o.segment.t1) o.segment.eval(tMid, mid);
    }
    evaluations += counters.evaluations;
    y.set(stepper.y);
  }
  return { evaluations, steps, y: [...y], mid: [...mid] };
}

// computed by the previous implementation at commit 97fa066 (see the top of this file)
const PINNED: ReadonlyArray<Digest & { name: string; rtol: number }> = [
  { name: 'oral absorption (Bateman)', rtol: 1e-10, evaluations: 412, steps: 356, y: [5.1409377013476776e-16, 0.00039033889205018242], mid: [1.1779536256015635e-8, 0.0037703610900977993] },
  { name: 'oral absorption (Bateman)', rtol: 1e-12, evaluations: 602, steps: 492, y: [1.6430069034338824e-16, 0.00039033889210034585], mid: [1.1779531190406314e-8, 0.0037703610902415220] },
  { name: '6 IV doses', rtol: 1e-10, evaluations: 350, steps: 222, y: [0.0053836371583707307], mid: [0.013361896404875569] },
  { name: '6 IV doses', rtol: 1e-12, evaluations: 477, steps: 340, y: [0.0053836371585367264], mid: [0.013361896405012941] },
  { name: 'Michaelis–Menten', rtol: 1e-10, evaluations: 70, steps: 57, y: [0.0016291066238908302], mid: [0.0064400863035336984] },
  { name: 'Michaelis–Menten', rtol: 1e-12, evaluations: 90, steps: 77, y: [0.0016291066238772228], mid: [0.0064400863035793520] },
  { name: '3-state chain', rtol: 1e-10, evaluations: 340, steps: 299, y: [0.53225949824426855, 0.020884463359122189, 0.16790885621301690], mid: [0.48216055403258373, 1.2783414192923841, 1.1787735377838666] },
  { name: '3-state chain', rtol: 1e-12, evaluations: 496, steps: 439, y: [0.53225949824584573, 0.020884463356437146, 0.16790885620811347], mid: [0.48216055403652119, 1.2783414192887557, 1.1787735378103046] },
  { name: 'logistic growth', rtol: 1e-10, evaluations: 390, steps: 316, y: [999.99999625266082], mid: [986.41190727544608] },
  { name: 'logistic growth', rtol: 1e-12, evaluations: 574, steps: 479, y: [999.99999626266811], mid: [986.41190728747790] },
];

function sameBits(a: readonly number[], b: readonly number[], what: string): void {
  assert.equal(a.length, b.length, `${what}: lengths`);
  for (let i = 0; i < a.length; i++) assert.ok(Object.is(a[i], b[i]), `${what}[${i}]: ${a[i]} against ${b[i]}`);
}

describe('the one-evaluation Adams mode (rtol below 1e-9) gives the figures of the loop it replaced, bit for bit', () => {
  const all = cases();
  for (const pin of PINNED) {
    it(`${pin.name}, rtol ${pin.rtol}: ${pin.steps} steps, ${pin.evaluations} evaluations, the same end and dense value`, () => {
      const got = digest(all.find((c) => c.name === pin.name)!, pin.rtol);
      assert.equal(got.evaluations, pin.evaluations);
      assert.equal(got.steps, pin.steps);
      sameBits(got.y, pin.y, 'y at the end');
      sameBits(got.mid, pin.mid, 'dense y at 0.37 of the span');
    });
  }
});
