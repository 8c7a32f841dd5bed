// A simulate cell's question windows (`from`, `to`), occurrences and directions, and repeat
// counts written as expressions, against the closed form of a one-compartment model with
// repeated intravenous bolus doses: after doses of D/V at 0, τ, 2τ, ..., the concentration is
// C(t) = (D/V) Σ_j exp(-k (t - jτ)) over the doses given by t (superposition of first-order
// elimination; the standard multiple-dosing result of any pharmacokinetics textbook).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { runStudy, openStudy, type CellReport } from '../../src/index.ts';

type Q = { value: number; unit: string; si: number };
const K = 0.1; // 1/h
const TAU = 12; // h
const DOSE = 10; // mg/L, D/V

/** The closed form: concentration in mg/L at t hours after the doses at the given times. */
function exact(t: number, doses: readonly number[]): number {
  return doses.filter((d) => d <= t).reduce((s, d) => s + DOSE * Math.exp(-K * (t - d)), 0);
}
/** Dose times 0, τ, ... below `n` doses. */
const times = (n: number) => Array.from({ length: n }, (_, j) => j * TAU);

/** The run's report: doses every 12 h of 10 mg/L over 72 h, with the given event fields and questions. */
function run(event: Record<string, unknown>, find: unknown[], items: unknown[] = []): CellReport {
  const r = runStudy({ format: 'ratebook-study', version: 1, title: 'q12h (invented numbers)', cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: `${K} / h` }, { name: 'tau', value: `${TAU} h` }, { name: 'n_doses', value: '6' }, ...items] },
    { id: 'c', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
    { id: 'run', kind: 'simulate', rates: ['c'], from: '0 h', to: '72 h', tolerance: { relative: 1e-9 },
      events: [{ at: '0 h', every: 'tau', add: { C: `${DOSE} mg / L` }, ...event }], find },
  ] });
  assert.ok(r.ok, r.ok ? '' : r.error.message);
  return r.report.cells[2];
}
const results = (c: CellReport) => c.results as Record<string, Q>;
const close = (a: number, b: number, what: string) => assert.ok(Math.abs(a - b) <= 1e-6 * Math.max(1, Math.abs(b)), `${what}: ${a} vs closed form ${b}`);

describe('question windows', () => {
  it('a trough inside the last dosing interval of a q12h regimen is the closed form before the next dose', () => {
    const c = run({ count: 6 }, [
      { name: 'trough_last', minimum: 'C', from: '60 h', to: '72 h' },
      { name: 'peak_last', maximum: 'C', from: '60 h', to: '72 h' },
      { name: 't_trough', timeOfMinimum: 'C', from: '60 h', to: '72 h' },
    ]);
    assert.ok(c.ok, JSON.stringify(c.error));
    // closed form: six doses (0 ... 60 h) seen at 72 h: 10·e^{-1.2}(1 - e^{-7.2})/(1 - e^{-1.2}) ≈ 4.3075 mg/L
    close(results(c).trough_last.value, exact(72, times(6)), 'trough in 60-72 h');
    close(results(c).peak_last.value, exact(60, times(6)), 'peak at the 60 h dose (values after the action at from)');
    close(results(c).t_trough.value, 72, 'time of the trough');
  });

  it('with no count, the window holds the values before the dose at its end (the trough before the 7th dose)', () => {
    const c = run({}, [{ name: 'trough', minimum: 'C', from: '60 h', to: '72 h' }]);
    assert.ok(c.ok, JSON.stringify(c.error));
    // the dose at 72 h (the 7th, the run repeating to its end) is not in the window: same closed form as above
    close(results(c).trough.value, exact(72, times(6)), 'trough before the dose at 72 h');
    assert.equal((c.schedule as Array<{ repeats: string }>)[0].repeats, 'every 12 h until the end of the run (7 times)');
  });

  it('the area over the last interval is the integral of the closed form', () => {
    const c = run({ count: 6 }, [{ name: 'auc_last', integralOf: 'C', from: '60 h', to: '72 h' }]);
    // closed form: ∫_60^72 C dt = C(60+) (1 - e^{-12k}) / k with C(60+) the peak after the 6th dose
    close(results(c).auc_last.value, exact(60, times(6)) * (1 - Math.exp(-K * TAU)) / K, 'area 60-72 h in mg·h/L');
    assert.equal(results(c).auc_last.unit, 'mg * h / L');
  });

  it('a crossing counts its occurrences and direction within the window', () => {
    const c = run({ count: 6 }, [
      { name: 't_down2', crossing: 'C', level: '5 mg / L', direction: 'down', occurrence: 2, from: '24 h', to: '72 h' },
      { name: 't_up1', crossing: 'C', level: '5 mg / L', direction: 'up', from: '25 h', to: '72 h' },
    ]);
    assert.ok(c.ok, JSON.stringify(c.error));
    // closed form: the 2nd fall through 5 mg/L after 24 h is in the interval after the dose at 36 h,
    // where C = P e^{-k (t - 36)} with P the peak after four doses: t = 36 + ln(P / 5) / k
    close(results(c).t_down2.value, 36 + Math.log(exact(36, times(4)) / 5) / K, 'second fall through 5 mg/L');
    // hand-worked: the trough before the dose at 36 h, 10·e^{-1.2}(1 - e^{-3.6})/(1 - e^{-1.2}) ≈ 4.2, is below 5, so that dose jumps through it
    assert.ok(exact(36 - 1e-9, times(3)) < 5);
    close(results(c).t_up1.value, 36, 'first rise through 5 mg/L after 25 h');
    const q = c.questions as Record<string, string>;
    assert.equal(q.t_down2, 'C falls through 5 mg / L, occurrence 2 from 24 h to 72 h');
  });

  it('a crossing not reached within its window says so, with the window\'s end', () => {
    // hand-worked: the lowest values before 30 h are the troughs 10·e^{-1.2} ≈ 3.01 and ≈ 3.92 mg/L, above 1
    const c = run({ count: 6 }, [{ name: 't_low', crossing: 'C', level: '1 mg / L', direction: 'down', from: '0 h', to: '30 h' }]);
    const r = (c.results as Record<string, { notReached?: boolean; message?: string }>).t_low;
    assert.equal(r.notReached, true);
    assert.match(r.message!, /by the end of the window \(30 h\)/);
  });

  it('a window outside the run, or a time outside the window, is an error on that field', () => {
    const outside = run({ count: 6 }, [{ name: 'late', minimum: 'C', from: '80 h', to: '90 h' }]);
    assert.equal(outside.ok, false);
    assert.equal(outside.error!.path, 'cells[2].find[0].from');
    assert.match(outside.error!.message, /outside the run \(0 h to 72 h\)/);
    const at = run({ count: 6 }, [{ name: 'v', valueOf: 'C', at: '10 h', from: '60 h', to: '72 h' }]);
    assert.equal(at.error!.path, 'cells[2].find[0].at');
    assert.match(at.error!.message, /outside the question's window \(60 h to 72 h\)/);
  });
});

describe('repeat counts as expressions', () => {
  for (const count of ['n_doses', 'round(72 h / tau)', '0.3 / 0.1 * 2']) {
    it(`count "${count}" gives six doses`, () => {
      const c = run({ count }, [{ name: 'C72', valueOf: 'C', at: '72 h' }]);
      assert.ok(c.ok, JSON.stringify(c.error));
      // closed form: six doses seen at 72 h (0.3 / 0.1 · 2 is 5.999...: a whole number within rounding)
      close(results(c).C72.value, exact(72, times(6)), 'C at 72 h');
      assert.deepEqual(c.schedule, [{ times: 6, repeats: 'every 12 h, 6 times' }]);
    });
  }

  it('a count read from a parameter follows it', () => {
    const c = run({ count: 'n2' }, [{ name: 'C72', valueOf: 'C', at: '72 h' }], [{ name: 'n2', value: '2' }]);
    // closed form: doses at 0 and 12 h only, seen at 72 h
    close(results(c).C72.value, exact(72, times(2)), 'C at 72 h after two doses');
    assert.equal((c.schedule as Array<{ repeats: string }>)[0].repeats, 'every 12 h, 2 times');
  });

  const refused: Array<[string, RegExp, string]> = [
    ['2.5', /must be a whole number; it is 2\.5/, 'count'],
    ['3 mg', /must be a plain number \(such as 6\), not 3 mg/, 'count'],
    ['n_doses - 6', /must be from 1 to 100000; it is 0/, 'count'],
    ['nn', /unknown name "nn"/, 'count'],
  ];
  for (const [count, message, field] of refused) {
    it(`count "${count}" is refused on the count field`, () => {
      const c = run({ count }, []);
      assert.equal(c.ok, false);
      assert.equal(c.error!.path, `cells[2].events[0].${field}`);
      assert.match(c.error!.message, message);
    });
  }

  it('a count above one with no repeat interval asks for one', () => {
    const c = run({ count: 'n_doses', every: undefined }, []);
    assert.equal(c.error!.path, 'cells[2].events[0].every');
    assert.match(c.error!.message, /is needed to repeat an event \(6 times\)/);
  });
});

describe('a count read from a parameter, in a what-if run', () => {
  it('replacing the number of doses re-expands the schedule: the closed form for each number', () => {
    const o = openStudy({ format: 'ratebook-study', version: 1, title: 'doses (invented numbers)', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: `${K} / h` }, { name: 'n_doses', value: '6' }] },
      { id: 'c', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
      { id: 'run', kind: 'simulate', rates: ['c'], from: '0 h', to: '72 h', tolerance: { relative: 1e-9 },
        events: [{ at: '0 h', every: '12 h', count: 'n_doses', add: { C: `${DOSE} mg / L` } }], find: [{ name: 'C72', valueOf: 'C', at: '72 h' }] },
    ] });
    assert.ok(o.ok);
    if (!o.ok) return;
    const w = o.session.whatIf(['C72'], ['n_doses']);
    assert.ok(w.ok, w.ok ? '' : w.error.message);
    if (!w.ok) return;
    for (const n of [1, 3, 6, 2]) {
      const r = w.evaluate([n]);
      // closed form: n doses seen at 72 h, in mg/L (the SI value is in kg/m³: 1 mg/L = 1e-3 kg/m³)
      close(r.values[0] * 1e3, exact(72, times(n)), `C at 72 h after ${n} doses`);
    }
    const bad = w.evaluate([2.5]);
    assert.match(bad.answers[0].ok ? '' : bad.answers[0].reason, /must be a whole number/);
  });
});
