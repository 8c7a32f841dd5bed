// Bad and awkward data given to ncaProfile (src/numerics/nca/nca.ts): every fatal problem is a
// result with a message naming the row or field, never an exception; awkward but usable data
// (zeros or negatives in a falling stretch, missing samples) give warnings. Random inputs
// (fast-check) check that nothing throws and that the results keep their invariants.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { ncaProfile, type NcaInput, type NcaResult, type NcaSuccess } from '../../src/numerics/nca/nca.ts';
import { near } from './helpers.ts';

const ok = { dose: 1, route: 'extravascular', auc: 'linear-up-log-down', terminal: 'auto' } as const;

/** The analysis of input given as any value (the shape a parsed file might have); asserts it does not throw. */
function run(input: unknown): NcaResult {
  let r: NcaResult | undefined;
  assert.doesNotThrow(() => { r = ncaProfile(input as NcaInput); });
  return r as NcaResult;
}

/** Asserts a failure whose message contains `words`, and returns it. */
function fails(input: unknown, words: string, field?: string, index?: number): void {
  const r = run(input);
  assert.equal(r.ok, false, 'should fail');
  if (r.ok) return;
  assert.ok(r.message.includes(words), `message "${r.message}" should contain "${words}"`);
  if (field !== undefined) assert.equal(r.problems[0].field, field);
  if (index !== undefined) assert.equal(r.problems[0].index, index);
}

function succeeds(input: unknown): NcaSuccess {
  const r = run(input);
  assert.ok(r.ok, r.ok ? '' : r.message);
  return r;
}

describe('fatal problems are results that name the row or the field', () => {
  it('a single point', () => fails({ ...ok, t: [1], c: [5] }, 'only 1 row has a concentration; at least 3 are needed', 'c'));
  it('fewer than 3 concentrations once missing ones are skipped', () => fails({ ...ok, t: [0, 1, 2, 3], c: [null, 5, null, 3] }, 'only 2 rows have a concentration'));
  it('all-equal concentrations', () => fails({ ...ok, t: [0, 1, 2], c: [5, 5, 5] }, 'every concentration is 5'));
  it('all-zero concentrations', () => fails({ ...ok, t: [0, 1, 2], c: [0, 0, 0] }, 'every concentration is zero'));
  it('nothing above zero', () => fails({ ...ok, t: [0, 1, 2], c: [0, -1, 0] }, 'no concentration is above zero'));
  it('text among the concentrations', () => fails({ ...ok, t: [0, 1, 2, 3], c: [0, 'abc', 3, 2] }, 'row 2: the concentration "abc" (text) is not a finite number', 'c', 1));
  it('a number written as text', () => fails({ ...ok, t: [0, 1, 2, 3], c: [0, '4', 3, 2] }, 'row 2: the concentration "4" (text)'));
  it('NaN among the concentrations', () => fails({ ...ok, t: [0, 1, 2, 3], c: [0, 4, NaN, 2] }, 'row 3: the concentration NaN is not a finite number', 'c', 2));
  it('an infinite time', () => fails({ ...ok, t: [0, 1, Infinity, 3], c: [0, 4, 3, 2] }, 'row 3: the time Infinity is not a finite number', 't', 2));
  it('a missing time', () => fails({ ...ok, t: [0, null, 2, 3], c: [0, 4, 3, 2] }, 'row 2: the time missing is not a finite number', 't', 1));
  it('times going backwards', () => fails({ ...ok, t: [0, 2, 1, 3], c: [0, 4, 3, 2] }, 'row 3: the time 1 comes before the time of row 2 (2); times must increase', 't', 2));
  it('a repeated time', () => fails({ ...ok, t: [0, 1, 1, 3], c: [0, 4, 3, 2] }, 'row 3: the time 1 repeats the time of row 2', 't', 2));
  it('a time before the dose', () => fails({ ...ok, t: [-1, 1, 2, 3], c: [0, 4, 3, 2] }, 'row 1: the time -1 is before the dose', 't', 0));
  it('columns of different lengths', () => fails({ ...ok, t: [0, 1, 2, 3], c: [0, 4, 3] }, 't has 4 rows but c has 3'));
  it('a dose of zero', () => fails({ ...ok, dose: 0, t: [0, 1, 2], c: [0, 4, 3] }, 'dose must be a positive amount; it is 0', 'dose'));
  it('a negative dose', () => fails({ ...ok, dose: -5, t: [0, 1, 2], c: [0, 4, 3] }, 'dose must be a positive amount; it is -5', 'dose'));
  it('a dose given as text', () => fails({ ...ok, dose: '100 mg', t: [0, 1, 2], c: [0, 4, 3] }, 'dose must be a positive amount; it is "100 mg" (text)'));
  it('an infusion without its duration', () => fails({ ...ok, route: 'infusion', t: [0, 1, 2], c: [0, 4, 3] }, 'an infusion needs its duration', 'duration'));
  it('an infusion of zero duration', () => fails({ ...ok, route: 'infusion', duration: 0, t: [0, 1, 2], c: [0, 4, 3] }, 'an infusion needs its duration, a positive time; it is 0', 'duration'));
  it('an unknown route', () => fails({ ...ok, route: 'oral', t: [0, 1, 2], c: [0, 4, 3] }, 'route must be iv-bolus, infusion or extravascular; it is "oral"', 'route'));
  it('an unknown area rule', () => fails({ ...ok, auc: 'log', t: [0, 1, 2], c: [0, 4, 3] }, 'auc must be linear or linear-up-log-down', 'auc'));
  it('a count of 1 terminal point', () => fails({ ...ok, terminal: 1, t: [0, 1, 2], c: [0, 4, 3] }, 'terminal must be auto or a whole number of last points, at least 2; it is 1', 'terminal'));
  it('a fractional count', () => fails({ ...ok, terminal: 2.5, t: [0, 1, 2], c: [0, 4, 3] }, 'it is 2.5', 'terminal'));
  it('no input at all', () => fails(null, 'the input must be an object', 'input'));
  it('t that is not a list', () => fails({ ...ok, t: '0,1,2', c: [0, 4, 3] }, 't must be a list of times', 't'));

  it('areas too large for double precision', () => {
    // closed form: the first panel alone is 1e300·(0 + 1e300)/2 = 5e599, beyond the largest double (1.8e308)
    fails({ ...ok, t: [0, 1e300, 2e300, 3e300], c: [0, 1e300, 5e299, 2e299] }, 'AUClast overflows the range of double-precision numbers', 'c');
  });

  it('a log panel whose ends differ by nearly the whole double range still has a finite AUMC', () => {
    // closed form for a log panel (C1 > C2, k = ln(C1/C2)/h): AUMC = (t1·C1 - t2·C2)/k + (C1 - C2)/k².
    // Regression: C2·h²·(C1/C2 - 1) alone overflows here; the panel must divide before it multiplies.
    const C1 = 1.7e308;
    const r = succeeds({ ...ok, t: [0, 1, 3, 4], c: [0, C1, 2, 1] });
    const k = Math.log(C1 / 2) / 2;
    const rising = (1 * C1) / 2; // linear panel 0-1: h·(t0·C0 + t1·C1)/2
    const falling = (1 * C1 - 3 * 2) / k + (C1 - 2) / (k * k);
    const tail = (3 * 2 - 4 * 1) / Math.LN2 + 1 / (Math.LN2 * Math.LN2);
    near(r.AUMClast, rising + falling + tail, 1e-12, 'AUMClast');
  });

  it('lists every problem, first one in the message', () => {
    const r = run({ ...ok, dose: 0, t: [0, 2, 1], c: [0, NaN, 3] });
    assert.equal(r.ok, false);
    if (r.ok) return;
    assert.deepEqual(r.problems.map((p) => p.field), ['dose', 'c', 't']);
    assert.equal(r.message, r.problems[0].message);
  });

  it('caps the list of problems, and the message counts the rest', () => {
    const n = 1000;
    const r = run({ ...ok, t: Array.from({ length: n }, (_, i) => i), c: Array.from({ length: n }, () => 'x') });
    assert.equal(r.ok, false);
    if (r.ok) return;
    assert.equal(r.problems.length, 20);
    assert.ok(r.message.endsWith(`(and ${n - 1} more problems)`), r.message);
  });
});

describe('usable but awkward data gives warnings', () => {
  it('a zero in a falling stretch: that panel falls back to the linear rule', () => {
    // hand-worked: t = 0..6, C = 0, 10, 5, 0, 4, 2, 1. Panels: 0-1 rising 5; 1-2 log 5/ln2; 2-3 falls to
    // zero → linear (5 + 0)/2 = 2.5; 3-4 rising 2; 4-5 log 2/ln2; 5-6 log 1/ln2 → 9.5 + 8/ln2 = 21.0416
    const r = succeeds({ ...ok, t: [0, 1, 2, 3, 4, 5, 6], c: [0, 10, 5, 0, 4, 2, 1] });
    near(r.AUClast, 9.5 + 8 / Math.LN2, 1e-14, 'AUClast');
    assert.ok(r.warnings.some((w) => w.includes('between rows 3 and 4') && w.includes('uses the linear one')), r.warnings.join(' | '));
  });

  it('a negative value in a falling stretch: linear there, and a warning about it', () => {
    // hand-worked: as above with -1 for 0: panels 2-3 (5 - 1)/2 = 2, 3-4 (-1 + 4)/2 = 1.5 → 5 + 2 + 1.5 + 8/ln2
    const r = succeeds({ ...ok, t: [0, 1, 2, 3, 4, 5, 6], c: [0, 10, 5, -1, 4, 2, 1] });
    near(r.AUClast, 8.5 + 8 / Math.LN2, 1e-14, 'AUClast');
    assert.ok(r.warnings.some((w) => w.includes('negative concentrations (row 4)')), r.warnings.join(' | '));
    assert.ok(r.warnings.some((w) => w.includes('between rows 3 and 4')), r.warnings.join(' | '));
    assert.deepEqual(r.pointsUsed.times, [4, 5, 6], 'the fit skips the negative value');
  });

  it('with the linear rule, a zero needs no fallback and gets no warning about panels', () => {
    const r = succeeds({ ...ok, auc: 'linear', t: [0, 1, 2, 3, 4, 5, 6], c: [0, 10, 5, 0, 4, 2, 1] });
    assert.ok(!r.warnings.some((w) => w.includes('uses the linear one')), r.warnings.join(' | '));
  });

  it('a bolus whose first two samples rise: C0 is the first positive concentration, with a warning', () => {
    // common practice: no back-extrapolation through a rising pair
    const r = succeeds({ ...ok, route: 'iv-bolus', t: [1, 2, 3, 4, 5], c: [4, 6, 3, 1.5, 0.75] });
    assert.equal(r.C0, 4);
    assert.ok(r.warnings.some((w) => w.includes('C0 could not be back-extrapolated')), r.warnings.join(' | '));
  });

  it('a duration given for a route other than an infusion is ignored, with a warning', () => {
    const r = succeeds({ ...ok, duration: 2, t: [0, 1, 2, 3, 4], c: [0, 4, 3, 2, 1] });
    assert.ok(r.warnings.some((w) => w.includes('duration is ignored')), r.warnings.join(' | '));
  });
});

describe('random inputs', () => {
  const junk = fc.oneof(fc.double(), fc.constant(null), fc.string({ maxLength: 3 }), fc.constant(undefined), fc.integer({ min: -3, max: 3 }));
  const anyInput = fc.record({
    t: fc.oneof(fc.array(junk, { maxLength: 12 }), fc.array(fc.double({ min: 0, max: 100, noNaN: true }), { maxLength: 12 }).map((a) => [...a].sort((x, y) => x - y))),
    c: fc.array(junk, { maxLength: 12 }),
    dose: junk,
    route: fc.constantFrom('iv-bolus', 'infusion', 'extravascular', 'oral', ''),
    duration: junk,
    auc: fc.constantFrom('linear', 'linear-up-log-down', 'log'),
    terminal: fc.oneof(fc.constant('auto'), fc.integer({ min: -1, max: 14 }), fc.double()),
  });

  it('never throws; a failure has a message, a success has finite numbers or null', () => {
    // the API contract: failures are results, never exceptions
    fc.assert(fc.property(anyInput, (input) => {
      const r = ncaProfile(input as unknown as NcaInput);
      if (!r.ok) {
        assert.ok(typeof r.message === 'string' && r.message.length > 0);
        return;
      }
      for (const [key, v] of Object.entries(r)) {
        if (typeof v === 'number') assert.ok(Number.isFinite(v), `${key} = ${v}`);
      }
      assert.ok(r.warnings.every((w) => typeof w === 'string'));
    }), { numRuns: 2000 });
  });

  it('never throws on well-formed rows of any finite size, and reports only finite numbers', () => {
    // the API contract; values near the double range make the areas overflow, which must be a failure, not Infinity
    const rows = fc.array(fc.tuple(fc.double({ min: 1e-300, max: 1e300, noNaN: true }), fc.double({ noNaN: true, noDefaultInfinity: true })), { minLength: 3, maxLength: 10 })
      .map((rs) => {
        let t = 0;
        return { t: rs.map(([dt]) => (t += dt)), c: rs.map(([, c]) => c) };
      });
    fc.assert(fc.property(rows, fc.constantFrom('iv-bolus', 'extravascular', 'infusion'), fc.constantFrom('linear', 'linear-up-log-down'), fc.oneof(fc.constant('auto'), fc.integer({ min: 2, max: 12 })),
      ({ t, c }, route, auc, terminal) => {
        const r = ncaProfile({ t, c, dose: 1, route: route as NcaInput['route'], duration: 1, auc: auc as NcaInput['auc'], terminal });
        if (!r.ok) { assert.ok(r.message.length > 0); return; }
        for (const [key, v] of Object.entries(r)) {
          if (typeof v === 'number') assert.ok(Number.isFinite(v), `${key} = ${v}`);
        }
      }), { numRuns: 3000 });
  });

  // a falling profile: positive concentrations at increasing times
  const profile = fc.array(fc.tuple(fc.double({ min: 0.01, max: 10, noNaN: true }), fc.double({ min: 1e-3, max: 1e3, noNaN: true })), { minLength: 3, maxLength: 15 })
    .map((rows) => {
      let t = 0;
      return { t: rows.map(([dt]) => (t += dt)), c: rows.map(([, c]) => c) };
    })
    .filter(({ c }) => c.some((x) => x !== c[0]));

  it('the log-down AUC never exceeds the linear one, and AUCinf >= AUClast, Cmax >= every sample', () => {
    // closed form: the exponential through two falling points lies below their chord, so each log
    // panel is at most the linear one; rising panels are the same under both rules. (No such order
    // holds for AUMC: the trapezoid of t·C is itself below the integral of t times the chord.)
    fc.assert(fc.property(profile, fc.constantFrom('iv-bolus', 'extravascular'), ({ t, c }, route) => {
      const lin = ncaProfile({ t, c, dose: 1, route, auc: 'linear', terminal: 'auto' });
      const log = ncaProfile({ t, c, dose: 1, route, auc: 'linear-up-log-down', terminal: 'auto' });
      assert.ok(lin.ok && log.ok);
      assert.ok(log.AUClast <= lin.AUClast * (1 + 1e-12), `${log.AUClast} > ${lin.AUClast}`);
      assert.ok(c.every((x) => x <= log.Cmax));
      if (log.AUCinf !== null) assert.ok(log.AUCinf >= log.AUClast);
      if (log.lambdaZ !== null && log.lambdaZ > 0) near(log.CL as number, 1 / (log.AUCinf as number), 1e-15, 'CL = dose/AUCinf');
    }), { numRuns: 1000 });
  });
});

describe('size', () => {
  it('analyses 100 000 samples of an exponential and still finds lambda_z exactly', () => {
    // closed form: lambda_z = k for C = e^{-kt}; 'auto' considers every tail length, so this also
    // checks that the candidate fits share their sums (linear cost) rather than refitting each
    const n = 100_000;
    const k = 1e-4;
    const t = Array.from({ length: n }, (_, i) => i + 1);
    const c = t.map((x) => Math.exp(-k * x));
    const r = succeeds({ ...ok, route: 'iv-bolus', t, c });
    near(r.lambdaZ as number, k, 1e-9, 'lambda_z');
    assert.equal(r.pointsUsed.count, n - 1);
  });
});
