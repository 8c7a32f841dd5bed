// Non-compartmental analysis (src/numerics/nca/nca.ts) against closed forms: exact exponential
// declines, the Bateman function, a constant-rate infusion, and a hand-worked profile. Data
// are in SI magnitudes (s, kg/m³, kg), the way the engine passes them; every expected value
// names its source beside it.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { ncaProfile, type NcaInput, type NcaSuccess } from '../../src/numerics/nca/nca.ts';
import { near } from './helpers.ts';

const H = 3600; // one hour in seconds

/** Runs the analysis and fails the test unless it succeeds. */
function analyse(input: NcaInput): NcaSuccess {
  const r = ncaProfile(input);
  assert.ok(r.ok, r.ok ? '' : r.message);
  return r;
}

/** Exactly present (not null) — for the values that need lambda_z. */
function num(x: number | null, what: string): number {
  assert.ok(x !== null, `${what} should be reported`);
  return x;
}

describe('ncaProfile on an exact mono-exponential decline after an IV bolus', () => {
  // C = C0·e^{-kt}: 10 mg/L, k = 0.2 /h, 500 mg; samples every hour from 1 h to 12 h (none at 0)
  const C0 = 10e-3; // kg/m³
  const k = 0.2 / H;
  const dose = 500e-6; // kg
  const h = 1 * H;
  const N = 12;
  const t = Array.from({ length: N }, (_, i) => (i + 1) * h);
  const c = t.map((x) => C0 * Math.exp(-k * x));
  const T = N * h;
  const q = Math.exp(-k * h);

  const logDown = analyse({ t, c, dose, route: 'iv-bolus', auc: 'linear-up-log-down', terminal: 'auto' });
  const linear = analyse({ t, c, dose, route: 'iv-bolus', auc: 'linear', terminal: 'auto' });

  it('back-extrapolates C0 from the first two samples', () => {
    // closed form: the line through (t1, ln C1) and (t2, ln C2) of an exact exponential meets t = 0 at ln C0
    near(num(logDown.C0, 'C0'), C0, 1e-12, 'C0');
  });

  it('gives the exact AUC and AUMC to tlast with the log-down trapezoid', () => {
    // closed form: ∫0^T C0 e^{-kt} dt = C0(1 - e^{-kT})/k
    near(logDown.AUClast, -C0 * Math.expm1(-k * T) / k, 1e-12, 'AUClast');
    // closed form: ∫0^T t C0 e^{-kt} dt = C0/k² · (1 - e^{-kT}(1 + kT))
    near(logDown.AUMClast, C0 / (k * k) * (1 - Math.exp(-k * T) * (1 + k * T)), 1e-12, 'AUMClast');
  });

  it('overestimates with the linear trapezoid by exactly the sum of the panel errors', () => {
    // closed form (derived): on a panel [ih, (i+1)h] the trapezoid is h(C_i + C_i·q)/2 with
    // q = e^{-kh}, the integral is C_i(1 - q)/k, so each panel overestimates by
    // C_i·h·(1 + q)/2 - C_i(1 - q)/k; panel 0 starts from the back-extrapolated C0.
    let excess = 0;
    for (let i = 0; i < N; i++) {
      const Ci = C0 * Math.exp(-k * i * h);
      excess += Ci * h * (1 + q) / 2 - Ci * (1 - q) / k;
    }
    const exact = -C0 * Math.expm1(-k * T) / k;
    assert.ok(excess > 0, 'a convex decline is overestimated by chords');
    near(linear.AUClast, exact + excess, 1e-12, 'linear AUClast');
    near(linear.AUClast - logDown.AUClast, excess, 1e-9, 'the difference alone');
  });

  it('finds lambda_z = k from all the points after Cmax, with R²adj = 1', () => {
    // closed form: ln C = ln C0 - kt is exactly linear; every candidate tail has R²adj = 1 to
    // rounding, so the tie rule (common practice: largest n within 1e-4 of the best) takes all 11
    near(num(logDown.lambdaZ, 'lambdaZ'), k, 1e-12, 'lambda_z');
    near(num(logDown.lambdaZIntercept, 'intercept'), Math.log(C0), 1e-12, 'intercept');
    assert.deepEqual(logDown.pointsUsed, { count: 11, times: t.slice(1) });
    near(num(logDown.r2adj, 'r2adj'), 1, 1e-12, 'R²adj');
    near(num(logDown.tHalf, 'tHalf'), Math.LN2 / k, 1e-12, 't_half');
    assert.deepEqual(logDown.warnings, []);
  });

  it('gives AUCinf = C0/k, CL = dose·k/C0, Vz = dose/C0 and MRT = 1/k', () => {
    // closed forms of the one-compartment bolus: AUCinf = C0/k, CL = dose/AUCinf, Vz = CL/k = dose/C0,
    // AUMCinf = C0/k², MRT = AUMCinf/AUCinf = 1/k
    near(num(logDown.AUCinf, 'AUCinf'), C0 / k, 1e-12, 'AUCinf');
    near(num(logDown.AUMCinf, 'AUMCinf'), C0 / (k * k), 1e-12, 'AUMCinf');
    near(num(logDown.CL, 'CL'), dose * k / C0, 1e-12, 'CL');
    near(num(logDown.Vz, 'Vz'), dose / C0, 1e-12, 'Vz');
    near(num(logDown.MRT, 'MRT'), 1 / k, 1e-12, 'MRT');
    // closed form: the part past tlast is e^{-kT} of the whole
    near(num(logDown.AUCextrapPercent, 'extrap'), 100 * Math.exp(-k * T), 1e-10, 'AUCextrap%');
    assert.equal(logDown.apparent, false);
    assert.equal(logDown.Cmax, c[0]);
    assert.equal(logDown.tmax, t[0]);
    assert.equal(logDown.Clast, c[N - 1]);
    assert.equal(logDown.tlast, T);
  });

  it('uses C at t = 0 when it is given', () => {
    // closed form: with the sample at 0 the first panel runs from C0 itself
    const r = analyse({ t: [0, ...t], c: [C0, ...c], dose, route: 'iv-bolus', auc: 'linear-up-log-down', terminal: 'auto' });
    assert.equal(r.C0, C0);
    near(r.AUClast, -C0 * Math.expm1(-k * T) / k, 1e-12, 'AUClast');
    assert.equal(r.Cmax, C0);
    assert.equal(r.tmax, 0);
  });

  it('stays exact on nearly flat panels (C1/C2 - 1 = 1e-7), where differences of logarithms lose digits', () => {
    // closed forms as above with k·h = 1e-7
    const kk = 1e-7 / h;
    const cc = t.map((x) => C0 * Math.exp(-kk * x));
    const r = analyse({ t, c: cc, dose, route: 'iv-bolus', auc: 'linear-up-log-down', terminal: 'auto' });
    const u = kk * T;
    near(r.AUClast, -C0 * Math.expm1(-u) / kk, 1e-12, 'AUClast');
    // closed form: 1 - e^{-u}(1 + u) = Σ_{n>=2} (-1)^n (n - 1) uⁿ/n! = u²/2 - u³/3 + u⁴/8 - u⁵/30 + ...,
    // summed as a series because the direct difference cancels at u = 1.2e-6
    const g = u * u / 2 - u ** 3 / 3 + u ** 4 / 8 - u ** 5 / 30;
    near(r.AUMClast, C0 / (kk * kk) * g, 1e-12, 'AUMClast');
  });
});

describe('ncaProfile on the Bateman function (first-order absorption and elimination)', () => {
  // C = F·D·ka/(V(ka - k)) · (e^{-kt} - e^{-ka·t}); F = 0.8, D = 100 mg, V = 50 L, ka = 2 /h, k = 0.1 /h
  const F = 0.8;
  const D = 100e-6;
  const V = 0.05;
  const ka = 2 / H;
  const k = 0.1 / H;
  const hours = [0.25, 0.5, 1, 1.5, 2, 3, 4, 6, 8, 12, 24, 36, 48];
  const t = hours.map((x) => x * H);
  const C = (x: number) => F * D * ka / (V * (ka - k)) * (Math.exp(-k * x) - Math.exp(-ka * x));
  const c = t.map(C);
  const logDown = analyse({ t, c, dose: D, route: 'extravascular', auc: 'linear-up-log-down', terminal: 'auto' });

  it('reports Cmax and tmax at the highest sample, which brackets the true peak', () => {
    // closed form: the true peak is at ln(ka/k)/(ka - k) = ln 20/1.9 h ≈ 1.577 h, between the 1.5 h and 2 h samples
    const tPeak = Math.log(ka / k) / (ka - k);
    assert.ok(1.5 * H < tPeak && tPeak < 2 * H);
    assert.equal(logDown.tmax, 1.5 * H);
    assert.equal(logDown.Cmax, Math.max(...c));
    assert.ok(logDown.Cmax <= C(tPeak));
  });

  it('finds lambda_z = k from a tail where the absorption term has vanished', () => {
    // closed form: at 24 h e^{-(ka-k)t} = e^{-45.6} ≈ 2e-20, so ln C over the last 3 points is linear with slope -k
    const r = analyse({ t, c, dose: D, route: 'extravascular', auc: 'linear-up-log-down', terminal: 3 });
    near(num(r.lambdaZ, 'lambdaZ'), k, 1e-10, 'lambda_z over 24-48 h');
  });

  it('with the adjusted R² rule, misses k by no more than the absorption term allows', () => {
    // closed form bound: ln C = ln(A e^{-kt}) + δ(t), δ(t) = ln(1 - e^{-(ka-k)t}); a least-squares
    // slope moves by Σ(t_i - t̄)δ_i / Σ(t_i - t̄)², at most Σ|t_i - t̄||δ_i| / Σ(t_i - t̄)²
    const used = logDown.pointsUsed.times;
    const mean = used.reduce((s, x) => s + x, 0) / used.length;
    const sxx = used.reduce((s, x) => s + (x - mean) ** 2, 0);
    const bound = used.reduce((s, x) => s + Math.abs(x - mean) * Math.abs(Math.log1p(-Math.exp(-(ka - k) * x))), 0) / sxx;
    const lz = num(logDown.lambdaZ, 'lambdaZ');
    assert.ok(Math.abs(lz - k) <= bound * (1 + 1e-9), `|lambda_z - k| = ${Math.abs(lz - k)}, bound ${bound}`);
    assert.ok(used[0] > logDown.tmax, 'Cmax is not in the auto tail');
  });

  it('gives AUCinf within 1% of F·D/(V·k), and CL/F, Vz/F consistent with it', () => {
    // closed form: AUC(0-inf) = F·D/(V·k). Tolerance 1%: the chords on the rising limb and the small
    // lambda_z bias above stay well below it on this 13-sample design (an accuracy claim for this design)
    const exact = F * D / (V * k);
    const AUCinf = num(logDown.AUCinf, 'AUCinf');
    near(AUCinf, exact, 0.01, 'AUCinf');
    assert.equal(logDown.apparent, true);
    // definitions: CL/F = dose/AUCinf, Vz/F = (CL/F)/lambda_z
    near(num(logDown.CL, 'CL'), D / AUCinf, 1e-15, 'CL/F');
    near(num(logDown.Vz, 'Vz'), D / AUCinf / num(logDown.lambdaZ, 'lambdaZ'), 1e-15, 'Vz/F');
    // closed forms CL/F = V·k/F, Vz/F = V/F, to the same 1% plus the lambda_z bias
    near(num(logDown.CL, 'CL'), V * k / F, 0.01, 'CL/F');
    near(num(logDown.Vz, 'Vz'), V / F, 0.01, 'Vz/F');
  });

  it('the linear rule gives a larger AUC than linear-up/log-down on the same samples', () => {
    // common practice: chords lie above a convex (exponential) decline, so the linear trapezoid
    // overestimates there; on a rising limb both rules use the same chords
    const lin = analyse({ t, c, dose: D, route: 'extravascular', auc: 'linear', terminal: 'auto' });
    assert.ok(lin.AUClast > logDown.AUClast);
    assert.equal(lin.lambdaZ, logDown.lambdaZ, 'the terminal fit does not depend on the area rule');
  });
});

describe('ncaProfile on a constant-rate infusion', () => {
  // one compartment, rate R = D/T for T = 1 h, k = 0.3 /h, V = 20 L, D = 100 mg
  const T = 1 * H;
  const D = 100e-6;
  const V = 0.02;
  const k = 0.3 / H;
  const R = D / T;
  const hours = [0.25, 0.5, 0.75, 1, 1.5, 2, 3, 4, 6, 8, 12, 16, 24];
  const t = hours.map((x) => x * H);
  // closed form: C = R/(kV)(1 - e^{-kt}) during the infusion, then C(T)·e^{-k(t-T)}
  const C = (x: number) => (x <= T ? R / (k * V) * -Math.expm1(-k * x) : R / (k * V) * -Math.expm1(-k * T) * Math.exp(-k * (x - T)));
  const c = t.map(C);
  const r = analyse({ t, c, dose: D, route: 'infusion', duration: T, auc: 'linear-up-log-down', terminal: 'auto' });

  it('uses chords on the rising part and the exact log rule on the decline', () => {
    // closed form: after T the profile is an exact exponential, so the log panels integrate it
    // exactly: C(T)(1 - e^{-k(24h - T)})/k; before T the linear-up rule uses chords from C(0) = 0
    const rising = [0, ...t.filter((x) => x <= T)];
    let chords = 0;
    for (let i = 1; i < rising.length; i++) chords += (rising[i] - rising[i - 1]) * (C(rising[i - 1]) + C(rising[i])) / 2;
    const decline = C(T) * -Math.expm1(-k * (24 * H - T)) / k;
    near(r.AUClast, chords + decline, 1e-12, 'AUClast');
  });

  it('finds lambda_z = k after the infusion, and AUCinf and MRT - T/2 near D/(Vk) and 1/k', () => {
    // closed forms: lambda_z = k; AUC(0-inf) = D/(V·k); the MRT of the body, AUMC/AUC - T/2 = 1/k.
    // Tolerance 0.5%: only the four chords on the rising part are not exact
    near(num(r.lambdaZ, 'lambdaZ'), k, 1e-12, 'lambda_z');
    assert.ok(r.pointsUsed.times[0] > T, 'Cmax at the end of the infusion is not in the tail');
    near(num(r.AUCinf, 'AUCinf'), D / (V * k), 0.005, 'AUCinf');
    near(num(r.MRT, 'MRT'), 1 / k, 0.005, 'MRT');
    near(num(r.Vz, 'Vz'), V, 0.005, 'Vz');
  });
});

describe('ncaProfile on a hand-worked extravascular profile', () => {
  // t = 0, 1, 2, 4, 6, 8 h; C = 0, 4, 6, 4, 2, 1 mg/L; dose 100 mg (plain numbers in h, mg/L, mg)
  const t = [0, 1, 2, 4, 6, 8];
  const c = [0, 4, 6, 4, 2, 1];
  const base = { t, c, dose: 100, route: 'extravascular', terminal: 'auto' } as const;

  it('linear trapezoid: AUClast, AUMClast, lambda_z, AUCinf, CL/F, Vz/F, MRT', () => {
    // hand-worked:
    //   AUClast = 1·(0+4)/2 + 1·(4+6)/2 + 2·(6+4)/2 + 2·(4+2)/2 + 2·(2+1)/2 = 2 + 5 + 10 + 6 + 3 = 26
    //   t·C = 0, 4, 12, 16, 12, 8 → AUMClast = 2 + 8 + 28 + 28 + 20 = 86
    //   after Cmax (6 at 2 h) only (4, 4), (6, 2), (8, 1) remain: ln C = 2ln2, ln2, 0 is a line of
    //   slope -ln2/2, so lambda_z = ln2/2 h⁻¹, t_half = 2 h, R²adj = 1, intercept ln 16
    //   AUCinf = 26 + 1/(ln2/2) = 26 + 2/ln2 = 28.8854
    //   AUMCinf = 86 + 8·1·2/ln2 + 1·(2/ln2)² = 86 + 16/ln2 + 4/ln²2 = 117.409
    //   CL/F = 100/AUCinf = 3.46196; Vz/F = CL/F/lambda_z = 9.98910; MRT = AUMCinf/AUCinf = 4.06464
    const r = analyse({ ...base, auc: 'linear' });
    const ln2 = Math.LN2;
    assert.equal(r.AUClast, 26);
    assert.equal(r.AUMClast, 86);
    near(num(r.lambdaZ, 'lambdaZ'), ln2 / 2, 1e-14, 'lambda_z');
    near(num(r.tHalf, 'tHalf'), 2, 1e-14, 't_half');
    near(num(r.lambdaZIntercept, 'intercept'), Math.log(16), 1e-14, 'intercept');
    near(num(r.r2adj, 'r2adj'), 1, 1e-14, 'R²adj');
    const AUCinf = 26 + 2 / ln2;
    const AUMCinf = 86 + 16 / ln2 + 4 / (ln2 * ln2);
    near(num(r.AUCinf, 'AUCinf'), AUCinf, 1e-14, 'AUCinf');
    near(num(r.AUCinf, 'AUCinf'), 28.8854, 1e-5, 'AUCinf, rounded by hand');
    near(num(r.AUMCinf, 'AUMCinf'), AUMCinf, 1e-14, 'AUMCinf');
    near(num(r.CL, 'CL'), 3.46196, 1e-5, 'CL/F, rounded by hand');
    near(num(r.Vz, 'Vz'), 9.98910, 1e-5, 'Vz/F, rounded by hand');
    near(num(r.MRT, 'MRT'), 4.06464, 1e-5, 'MRT, rounded by hand');
    near(num(r.AUCextrapPercent, 'extrap'), 100 * (2 / ln2) / AUCinf, 1e-13, 'AUCextrap%');
    assert.deepEqual(r.pointsUsed, { count: 3, times: [4, 6, 8] });
    assert.deepEqual([r.Cmax, r.tmax, r.Clast, r.tlast, r.C0], [6, 2, 1, 8, null]);
    assert.deepEqual(r.warnings, []);
  });

  it('linear-up/log-down: the three falling panels by the log rule', () => {
    // hand-worked: rising panels as before, 2 + 5 = 7; falling panels (C1 - C2)·Δt/ln(C1/C2):
    //   2·2/ln1.5 = 9.86521, 2·2/ln2 = 5.77078, 1·2/ln2 = 2.88539 → AUClast = 25.5214
    //   AUMC log panel: (t1C1 - t2C2)/k + (C1 - C2)/k², k = ln(C1/C2)/Δt:
    //   [2,4]: k = ln1.5/2 = 0.202733, (12 - 16)/k + 2/k² = -19.7304 + 48.6612 = 28.9308
    //   [4,6]: k = ln2/2 = 0.346574, (16 - 12)/k + 2/k² = 11.5416 + 16.6510 = 28.1925
    //   [6,8]: k = ln2/2, (12 - 8)/k + 1/k² = 11.5416 + 8.3255 = 19.8670 → AUMClast = 10 + 76.9903 = 86.9903
    const r = analyse({ ...base, auc: 'linear-up-log-down' });
    const ln2 = Math.LN2;
    const ln15 = Math.log(1.5);
    near(r.AUClast, 7 + 4 / ln15 + 4 / ln2 + 2 / ln2, 1e-14, 'AUClast');
    near(r.AUClast, 25.5214, 1e-5, 'AUClast, rounded by hand');
    const k1 = ln15 / 2;
    const k2 = ln2 / 2;
    near(r.AUMClast, 10 + (-4 / k1 + 2 / k1 ** 2) + (4 / k2 + 2 / k2 ** 2) + (4 / k2 + 1 / k2 ** 2), 1e-13, 'AUMClast');
    near(r.AUMClast, 86.9903, 1e-5, 'AUMClast, rounded by hand');
  });
});
