// The terminal phase of an NCA profile (src/numerics/nca/lambda-z.ts through ncaProfile): which
// points the adjusted-R² rule picks, what a given count does, and the warnings about the tail.
// Plain numbers (h, mg/L, mg); each expected value names its source.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { ncaProfile, type NcaInput, type NcaSuccess } from '../../src/numerics/nca/nca.ts';
import { ADJ_R2_TOLERANCE, fitLogLinear } from '../../src/numerics/nca/lambda-z.ts';
import { near } from './helpers.ts';

function analyse(input: NcaInput): NcaSuccess {
  const r = ncaProfile(input);
  assert.ok(r.ok, r.ok ? '' : r.message);
  return r;
}

const has = (r: NcaSuccess, words: string) => r.warnings.some((w) => w.includes(words));

/** Adjusted R² of ln c on t by the textbook closed form r² = Sxy²/(Sxx·Syy), independent of the code's residual sums. */
function adjR2(t: readonly number[], c: readonly number[]): number {
  const n = t.length;
  const y = c.map(Math.log);
  const mt = t.reduce((s, x) => s + x, 0) / n;
  const my = y.reduce((s, x) => s + x, 0) / n;
  let sxx = 0; let syy = 0; let sxy = 0;
  for (let i = 0; i < n; i++) { sxx += (t[i] - mt) ** 2; syy += (y[i] - my) ** 2; sxy += (t[i] - mt) * (y[i] - my); }
  const r2 = sxy * sxy / (sxx * syy);
  return 1 - (1 - r2) * (n - 1) / (n - 2);
}

describe('the adjusted R² rule on a two-phase profile', () => {
  // C = 80·e^{-1.2t} + 20·e^{-0.15t} after an IV bolus: a fast distribution phase, then the terminal phase β = 0.15 /h
  const A = 80; const alpha = 1.2; const B = 20; const beta = 0.15;
  const t = [0.25, 0.5, 1, 1.5, 2, 3, 4, 6, 8, 10, 12, 16, 20, 24];
  const c = t.map((x) => A * Math.exp(-alpha * x) + B * Math.exp(-beta * x));
  /** Share of the fast phase in C at time x (closed form). */
  const fastShare = (x: number) => A * Math.exp(-alpha * x) / (A * Math.exp(-alpha * x) + B * Math.exp(-beta * x));
  const auto = analyse({ t, c, dose: 100, route: 'iv-bolus', auc: 'linear-up-log-down', terminal: 'auto' });

  it('starts the tail where the fast phase is under 1% of C, and takes every point after that', () => {
    // closed form: fastShare(4 h) = 6.3%, fastShare(6 h) = 0.73%: the first tail point must be
    // 6 h; from there on the tail is straight within the 1e-4 tie tolerance (common practice rule)
    const used = auto.pointsUsed.times;
    assert.ok(fastShare(used[0]) < 0.01, `tail starts at ${used[0]} h, fast share ${fastShare(used[0])}`);
    assert.ok(t.filter((x) => x < used[0]).every((x) => fastShare(x) > 0.01), 'no clean point left out before the tail');
    assert.deepEqual(used, t.filter((x) => x >= used[0]));
    assert.deepEqual(used, [6, 8, 10, 12, 16, 20, 24]);
  });

  it('gives lambda_z within the bound the fast phase allows, far closer than fitting the whole decline', () => {
    // closed form bound: ln C = ln(B e^{-βt}) + δ(t), δ = ln(1 + (A/B)e^{-(α-β)t}); the slope moves by
    // at most Σ|t_i - t̄||δ_i| / Σ(t_i - t̄)² over the points used
    const used = auto.pointsUsed.times;
    const mean = used.reduce((s, x) => s + x, 0) / used.length;
    const sxx = used.reduce((s, x) => s + (x - mean) ** 2, 0);
    const bound = used.reduce((s, x) => s + Math.abs(x - mean) * Math.log1p(A / B * Math.exp(-(alpha - beta) * x)), 0) / sxx;
    const lz = auto.lambdaZ as number;
    assert.ok(Math.abs(lz - beta) <= bound, `|lambda_z - β| = ${Math.abs(lz - beta)}, bound ${bound}`);
    assert.ok(Math.abs(lz - beta) / beta < 0.005);
    // common practice: a tail that reaches into the distribution phase overestimates lambda_z
    const all = analyse({ t, c, dose: 100, route: 'iv-bolus', auc: 'linear-up-log-down', terminal: 13 });
    assert.ok((all.lambdaZ as number) > beta * 1.1, `whole decline gives ${all.lambdaZ}`);
    assert.ok(!has(auto, 'lambda_z'), `no warning about lambda_z: ${auto.warnings}`);
  });
});

describe('the tie rule (largest n within 1e-4 of the best adjusted R²)', () => {
  // extravascular: 0 at t = 0, peak 5 at 0.5 h, then ln C = -t at 2, 3, 4 h exactly and -1 + d at 1 h
  const t = [0, 0.5, 1, 2, 3, 4];
  const profile = (d: number) => [0, 5, Math.exp(-1 + d), Math.exp(-2), Math.exp(-3), Math.exp(-4)];

  it('takes 4 points when their adjusted R² is within the tolerance of the exact 3-point line', () => {
    const c = profile(0.02);
    // closed form (premise): R²adj(last 3) = 1; R²adj(last 4) by Sxy²/(Sxx·Syy)
    const deficit = 1 - adjR2(t.slice(2), c.slice(2));
    assert.ok(deficit > 0 && deficit < ADJ_R2_TOLERANCE, `premise: deficit ${deficit}`);
    const r = analyse({ t, c, dose: 1, route: 'extravascular', auc: 'linear', terminal: 'auto' });
    assert.deepEqual(r.pointsUsed.times, [1, 2, 3, 4]);
    near(r.r2adj as number, 1 - deficit, 1e-12, 'R²adj reported');
  });

  it('takes 3 points when the 4-point line is worse by more than the tolerance', () => {
    const c = profile(0.05);
    const deficit = 1 - adjR2(t.slice(2), c.slice(2));
    assert.ok(deficit > ADJ_R2_TOLERANCE, `premise: deficit ${deficit}`);
    const r = analyse({ t, c, dose: 1, route: 'extravascular', auc: 'linear', terminal: 'auto' });
    assert.deepEqual(r.pointsUsed.times, [2, 3, 4]);
    near(r.lambdaZ as number, 1, 1e-12, 'lambda_z of ln C = -t (closed form)');
  });
});

describe('a peak reached twice', () => {
  it('reports the first time as tmax and leaves both peak samples out of the auto tail', () => {
    // common practice: tmax is the first time Cmax is observed; the terminal phase follows the peak
    // (the second peak sample, 4 at 2 h, lies on the tail's line, so only the rule keeps it out)
    const r = analyse({ t: [0, 1, 2, 3, 4, 5], c: [0, 4, 4, 2, 1, 0.5], dose: 1, route: 'extravascular', auc: 'linear', terminal: 'auto' });
    assert.equal(r.tmax, 1);
    assert.deepEqual(r.pointsUsed.times, [3, 4, 5]);
    // closed form: ln C at 3, 4, 5 h is ln2, 0, -ln2, a line of slope -ln2
    near(r.lambdaZ as number, Math.LN2, 1e-14, 'lambda_z');
  });
});

describe('a given count of terminal points', () => {
  const t = [0, 1, 2, 4, 6, 8];
  const c = [0, 4, 6, 4, 2, 1];
  const base = { t, c, dose: 100, route: 'extravascular', auc: 'linear' } as const;

  it('uses exactly the last that many points, and warns when they include Cmax', () => {
    // hand-worked: the last 4 points are (2, 6), (4, 4), (6, 2), (8, 1), Cmax = 6 at 2 h among them
    const r = analyse({ ...base, terminal: 4 });
    assert.deepEqual(r.pointsUsed, { count: 4, times: [2, 4, 6, 8] });
    assert.ok(has(r, 'include Cmax'), r.warnings.join(' | '));
    // closed form: the same line as a direct least-squares fit of those points
    near(r.lambdaZ as number, -fitLogLinear([2, 4, 6, 8], [6, 4, 2, 1], 0, 4).slope, 1e-15, 'lambda_z');
    // hand-worked: the slope of ln C over (2, ln6), (4, ln4), (6, ln2), (8, 0):
    //   t̄ = 5, Σ(t - t̄)² = 9 + 1 + 1 + 9 = 20; Σ(t - t̄)ln C = -3ln6 - ln4 + ln2 + 0 = -3ln6 - ln2
    //   slope = -(3ln6 + ln2)/20 = -(5.37528 + 0.69315)/20 = -0.303421
    near(r.lambdaZ as number, (3 * Math.log(6) + Math.LN2) / 20, 1e-14, 'lambda_z, hand-worked');
  });

  it('warns when fewer than 3 points are asked for, and leaves R²adj undefined', () => {
    // closed form: two points (6, 2), (8, 1) give the slope -ln2/2 exactly
    const r = analyse({ ...base, terminal: 2 });
    near(r.lambdaZ as number, Math.LN2 / 2, 1e-14, 'lambda_z');
    assert.equal(r.r2adj, null);
    assert.ok(has(r, 'only 2 points'), r.warnings.join(' | '));
  });

  it('uses all positive points and says so when more are asked for than there are', () => {
    const r = analyse({ ...base, terminal: 9 });
    assert.equal(r.pointsUsed.count, 5);
    assert.ok(has(r, 'fewer than the 9 asked for'), r.warnings.join(' | '));
  });
});

describe('warnings about the tail', () => {
  it('flags lambda_z as unreliable when R²adj < 0.9', () => {
    // hand-made noisy tail (invented numbers): 7, 6, 3.5, 3.8, 2.0 after a peak of 10
    const r = analyse({ t: [0, 1, 2, 3, 4, 6, 8, 10], c: [0, 8, 10, 7, 6, 3.5, 3.8, 2.0], dose: 1, route: 'extravascular', auc: 'linear-up-log-down', terminal: 'auto' });
    assert.ok((r.r2adj as number) < 0.9);
    assert.ok(has(r, 'unreliable lambda_z'), r.warnings.join(' | '));
    assert.ok(r.AUCinf !== null, 'the values are still reported');
  });

  it('flags AUCinf when more than 20% of it is extrapolated', () => {
    // closed form: C = 10·0.8^(t-1) from t = 1; lambda_z = ln 1.25; hand-worked: AUClast over 1..4 is
    // (10 - 5.12)/ln1.25 = 21.87 plus the rising panel 5, Clast/lambda_z = 5.12/0.22314 = 22.94,
    // so about 46% is extrapolated
    const r = analyse({ t: [0, 1, 2, 3, 4], c: [0, 10, 8, 6.4, 5.12], dose: 1, route: 'extravascular', auc: 'linear-up-log-down', terminal: 'auto' });
    near(r.lambdaZ as number, Math.log(1.25), 1e-12, 'lambda_z');
    near(r.AUCextrapPercent as number, 100 * (5.12 / Math.log(1.25)) / (5 + 4.88 / Math.log(1.25) + 5.12 / Math.log(1.25)), 1e-12, 'AUCextrap%');
    assert.ok(has(r, 'extrapolated beyond tlast, more than 20%'), r.warnings.join(' | '));
  });

  it('reports a rising tail as a lambda_z that is not positive, without AUCinf', () => {
    // invented numbers: after the peak the concentrations rise again
    const r = analyse({ t: [0, 1, 2, 3, 4, 5], c: [0, 10, 2, 3, 4, 5], dose: 1, route: 'extravascular', auc: 'linear', terminal: 'auto' });
    assert.ok((r.lambdaZ as number) < 0);
    assert.ok(has(r, 'not positive'), r.warnings.join(' | '));
    assert.deepEqual([r.AUCinf, r.tHalf, r.CL, r.Vz, r.MRT, r.AUCextrapPercent], [null, null, null, null, null, null]);
    assert.equal(r.AUClast, 0.5 * 10 + 6 + 2.5 + 3.5 + 4.5, 'hand-worked: AUClast is still reported');
  });

  it('reports no lambda_z when fewer than 3 positive points follow Cmax', () => {
    const r = analyse({ t: [0, 1, 2, 3], c: [0, 1, 5, 3], dose: 1, route: 'extravascular', auc: 'linear', terminal: 'auto' });
    assert.equal(r.lambdaZ, null);
    assert.equal(r.AUCinf, null);
    assert.deepEqual(r.pointsUsed, { count: 0, times: [] });
    assert.ok(has(r, 'only 1 positive concentration after Cmax'), r.warnings.join(' | '));
  });

  it('warns when an infusion\'s terminal points include samples during the infusion', () => {
    // invented numbers: a 4 h infusion whose peak comes at 1 h
    const r = analyse({ t: [0, 1, 2, 3, 4, 6], c: [0, 10, 8, 6, 5, 3], dose: 1, route: 'infusion', duration: 4, auc: 'linear', terminal: 'auto' });
    assert.ok(has(r, 'during the infusion'), r.warnings.join(' | '));
  });
});

describe('samples below the quantification limit and missing samples', () => {
  it('ends AUClast at the last positive concentration and leaves trailing zeros out of the fit', () => {
    // closed form: C = 16·2^{-t} at 1..4 h after a bolus, then zeros (below the limit) at 6 and 8 h;
    // AUClast = ∫0^4 16·2^{-t} dt = 16(1 - 2^{-4})/ln2 = 15/ln2
    const r = analyse({ t: [1, 2, 3, 4, 6, 8], c: [8, 4, 2, 1, 0, 0], dose: 1, route: 'iv-bolus', auc: 'linear-up-log-down', terminal: 'auto' });
    assert.equal(r.tlast, 4);
    assert.equal(r.Clast, 1);
    near(r.AUClast, 15 / Math.LN2, 1e-14, 'AUClast');
    near(r.lambdaZ as number, Math.LN2, 1e-14, 'lambda_z');
    assert.deepEqual(r.pointsUsed.times, [2, 3, 4]);
  });

  it('spans a missing sample with one panel, which the log rule still integrates exactly', () => {
    // closed form: the log trapezoid is exact for an exponential over any panel width; AUClast = 15/ln2 as above
    const r = analyse({ t: [1, 2, 3, 4], c: [8, 4, null, 1], dose: 1, route: 'iv-bolus', auc: 'linear-up-log-down', terminal: 2 });
    near(r.AUClast, 15 / Math.LN2, 1e-14, 'AUClast');
    assert.ok(has(r, 'missing concentrations skipped (row 3)'), r.warnings.join(' | '));
  });
});
