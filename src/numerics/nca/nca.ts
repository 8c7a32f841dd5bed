/**
 * Non-compartmental analysis (NCA) of one concentration–time profile after a single dose:
 * exposure (Cmax, AUC), the terminal phase (lambda_z, t_half) and what follows from the dose
 * (CL, Vz, MRT).
 *
 * Plain numbers in consistent units (SI magnitudes in practice): times in one unit,
 * concentrations in one unit, the dose in the matching amount. Results come out in the
 * corresponding derived units (AUC in concentration·time, CL in volume/time, ...); nothing
 * here converts units.
 *
 * Methods (common practice; Gabrielsson & Weiner, "Pharmacokinetic and Pharmacodynamic Data
 * Analysis", chapter on non-compartmental analysis; Rowland & Tozer, "Clinical
 * Pharmacokinetics and Pharmacodynamics"):
 * - The profile starts at the dose, t = 0. Extravascular doses and infusions start from
 *   C(0) = 0 when no sample is taken at 0. After an IV bolus, C(0) is the sample at 0 if there
 *   is one, else the log-linear back-extrapolation of the first two samples (when they fall
 *   and are both positive; otherwise the first positive concentration, with a warning).
 * - AUC and AUMC (the area under t·C) from 0 to tlast, the last positive concentration, by the
 *   linear trapezoid, or linear-up/log-down: the log trapezoid on every panel where the
 *   concentration falls and both ends are positive, the linear one elsewhere. On a panel
 *   [t1, t2] with C1 > C2 > 0 and k = ln(C1/C2)/(t2 - t1) the log rule integrates the
 *   exponential through both ends exactly: AUC = (C1 - C2)/k,
 *   AUMC = (t1·C1 - t2·C2)/k + (C1 - C2)/k².
 * - lambda_z: see `lambda-z.ts` (log-linear least squares over the last points, chosen by
 *   adjusted R² or given as a count).
 * - AUCinf = AUClast + Clast/lambda_z, AUMCinf = AUMClast + tlast·Clast/lambda_z + Clast/lambda_z²,
 *   t_half = ln 2/lambda_z, CL = dose/AUCinf, Vz = CL/lambda_z, MRT = AUMCinf/AUCinf, less
 *   half the duration after an infusion. After an extravascular dose CL and Vz are CL/F and
 *   Vz/F (F, the fraction absorbed, is unknown) and MRT includes the time to be absorbed.
 *
 * Thresholds for warnings (common practice): adjusted R² below 0.9 makes lambda_z unreliable;
 * more than 20 % of AUCinf extrapolated past tlast makes AUCinf unreliable.
 *
 * Missing concentrations (null) are skipped: the trapezoid spans the gap. Concentrations after
 * tlast (zeros below the quantification limit) do not enter AUClast. Cost: linear in the
 * number of samples. Never throws: invalid input is a result with `ok: false`.
 */
import { selectTerminalPhase, type LogLinearFit } from './lambda-z.ts';
import { checkInput as check, failure, type Sample } from './nca-input.ts';

export { MAX_PROBLEMS } from './nca-input.ts';

/** How the dose was given: all at once into the blood, at a constant rate for `duration`, or by any other way (absorbed). */
export type NcaRoute = 'iv-bolus' | 'infusion' | 'extravascular';
/** The trapezoid rule for AUC and AUMC: chords everywhere, or the log rule where the concentration falls. */
export type NcaAucRule = 'linear' | 'linear-up-log-down';

/** One profile. Rows are (t[i], c[i]); messages number them from 1. */
export interface NcaInput {
  /** Sampling times since the dose, strictly increasing, none before 0. */
  readonly t: readonly number[];
  /** Concentrations; null (or undefined) marks a missing sample, which is skipped. */
  readonly c: readonly (number | null)[];
  /** The amount dosed, > 0. */
  readonly dose: number;
  readonly route: NcaRoute;
  /** Length of the infusion; required (> 0) for 'infusion', ignored otherwise. */
  readonly duration?: number;
  readonly auc: NcaAucRule;
  /** 'auto' (adjusted-R² rule) or the count of last positive points to fit (an integer >= 2). */
  readonly terminal: 'auto' | number;
}

/** What is wrong with the input: the field, the row (0-based index into t and c) when there is one, and a message. */
export interface NcaProblem {
  readonly field: 'input' | 't' | 'c' | 'dose' | 'route' | 'duration' | 'auc' | 'terminal';
  readonly index?: number;
  readonly message: string;
}

/** The input cannot be analysed: `message` is the first problem's; `problems` lists them all (at most `MAX_PROBLEMS`). */
export interface NcaFailure {
  readonly ok: false;
  readonly message: string;
  readonly problems: readonly NcaProblem[];
}

/**
 * The analysis. Values that need lambda_z (AUCinf, AUCextrapPercent, AUMCinf, tHalf, CL, Vz,
 * MRT) are null when lambda_z could not be estimated or is not positive; a warning says why.
 */
export interface NcaSuccess {
  readonly ok: true;
  /** Highest observed concentration and the first time it is reached ('auto' fits only points after its last occurrence). */
  readonly Cmax: number;
  readonly tmax: number;
  /** The last positive concentration and its time. */
  readonly Clast: number;
  readonly tlast: number;
  /** Concentration at t = 0 used for the first panel after an IV bolus (given or back-extrapolated); null for other routes. */
  readonly C0: number | null;
  /** Area under C from 0 to tlast, and under t·C. */
  readonly AUClast: number;
  readonly AUMClast: number;
  readonly AUCinf: number | null;
  /** 100·(AUCinf - AUClast)/AUCinf. */
  readonly AUCextrapPercent: number | null;
  readonly AUMCinf: number | null;
  /** Terminal rate constant (1/time); may be zero or negative (with a warning) when the tail does not fall. Null when no fit was possible. */
  readonly lambdaZ: number | null;
  /** ln C at t = 0 on the terminal line (for drawing it); null with lambdaZ. */
  readonly lambdaZIntercept: number | null;
  readonly tHalf: number | null;
  /** dose/AUCinf; CL/F after an extravascular dose (`apparent`). */
  readonly CL: number | null;
  /** CL/lambda_z; Vz/F after an extravascular dose. */
  readonly Vz: number | null;
  /** AUMCinf/AUCinf (less duration/2 after an infusion). */
  readonly MRT: number | null;
  /** True after an extravascular dose: CL and Vz are divided by the unknown bioavailability F. */
  readonly apparent: boolean;
  /** R² and adjusted R² of the terminal fit; null when not defined (fewer than 3 points, or a flat tail). */
  readonly r2: number | null;
  readonly r2adj: number | null;
  /** The points of the terminal fit: how many and their times. */
  readonly pointsUsed: { readonly count: number; readonly times: readonly number[] };
  /** Everything a reader should know before trusting the numbers. */
  readonly warnings: readonly string[];
}

/** `ok` tells which: the analysis, or why there is none. */
export type NcaResult = NcaSuccess | NcaFailure;

/** Below this adjusted R², lambda_z is flagged unreliable (common practice). */
export const R2ADJ_WARNING = 0.9;
/** Above this share of AUCinf (percent) extrapolated past tlast, AUCinf is flagged (common practice). */
export const EXTRAP_WARNING_PERCENT = 20;

/** A number for a message: six significant digits. */
function fmt(x: number): string {
  return String(Number(x.toPrecision(6)));
}

/**
 * AUC and AUMC of one panel from (t1, c1) to (t2, c2): the linear trapezoid, or with `log` the
 * log trapezoid (the caller checks c1 > c2 > 0).
 */
function panel(t1: number, c1: number, t2: number, c2: number, log: boolean): { auc: number; aumc: number } {
  const h = t2 - t1;
  if (!log) return { auc: h * (c1 + c2) / 2, aumc: h * (t1 * c1 + t2 * c2) / 2 };
  // x = C1/C2 - 1 > 0 and u = ln(C1/C2) = log1p(x) = k·h, accurate even when C1 ≈ C2.
  const x = (c1 - c2) / c2;
  const u = Math.log1p(x);
  const auc = h * c2 * (x / u);
  // AUMC = t1·AUC + ∫0^h s·C1·e^{-ks} ds, and the integral is C2·h²·(e^u - 1 - u)/u² = C2·h²·(x - u)/u².
  // divide before multiplying: C2·h²·x alone can overflow when C1/C2 is near the double range
  return { auc, aumc: t1 * auc + c2 * h * (h * (xMinusLog1p(x) / (u * u))) };
}

/** x - ln(1 + x) for x > 0, without the cancellation of the direct difference at small x (Taylor series below 0.01). */
function xMinusLog1p(x: number): number {
  if (x >= 0.01) return x - Math.log1p(x);
  // x²/2 - x³/3 + x⁴/4 - ... ; terms beyond x⁹ are below 1e-16 relative for x < 0.01
  let term = x;
  let sum = 0;
  for (let k = 2; k <= 9; k++) {
    term *= -x;
    sum -= term / k;
  }
  return sum;
}

/** Row numbers for a message, the first ten and a count of the rest. */
function listRows(rows: readonly number[]): string {
  const shown = rows.slice(0, 10).join(', ');
  return `row${rows.length === 1 ? '' : 's'} ${shown}${rows.length > 10 ? ` and ${rows.length - 10} more` : ''}`;
}

/** Rows for a message: "rows 3 and 4", with "C0 at t = 0" for the point the analysis added. */
function rowPair(a: Sample, b: Sample): string {
  return a.row < 0 ? `t = 0 and row ${b.row + 1}` : `rows ${a.row + 1} and ${b.row + 1}`;
}

/**
 * Non-compartmental analysis of one profile; see the module comment for the methods and the
 * types above for each field. Never throws: invalid input gives `{ ok: false, message, problems }`.
 */
export function ncaProfile(input: NcaInput): NcaResult {
  const checked = check(input);
  if ('problems' in checked) return failure(checked.problems);
  const { samples } = checked;
  const { dose, route, auc, terminal } = input;
  const warnings: string[] = [];

  const missing = input.c.flatMap((v, i) => (v === null || v === undefined ? [i + 1] : []));
  if (missing.length > 0) warnings.push(`missing concentrations skipped (${listRows(missing)})`);
  const negative = samples.filter((s) => s.c < 0).map((s) => s.row + 1);
  if (negative.length > 0) warnings.push(`negative concentrations (${listRows(negative)}) are used as given`);
  if (route !== 'infusion' && input.duration !== undefined) warnings.push(`duration is ignored: it applies to infusions only, and the route is ${route}`);

  let peak = samples[0];
  for (const s of samples) if (s.c > peak.c) peak = s;
  let lastIndex = samples.length - 1;
  while (samples[lastIndex].c <= 0) lastIndex--;
  const last = samples[lastIndex];

  // The profile for the areas: from the dose at t = 0 to tlast.
  const profile = samples.slice(0, lastIndex + 1);
  let C0: number | null = null;
  if (route === 'iv-bolus') {
    if (profile[0].t === 0) {
      C0 = profile[0].c;
      if (C0 < peak.c) warnings.push(`the concentration at t = 0 (${fmt(C0)}) is below Cmax; right after an IV bolus it should be the highest`);
    } else {
      const [a, b] = profile;
      if (b !== undefined && a.c > 0 && b.c > 0 && b.c < a.c) {
        // the line through (t1, ln C1) and (t2, ln C2), at t = 0
        C0 = a.c * Math.exp(Math.log(a.c / b.c) * a.t / (b.t - a.t));
      }
      if (C0 === null || !Number.isFinite(C0)) {
        const firstPositive = profile.find((s) => s.c > 0) as Sample;
        const why = C0 === null ? 'the first two concentrations do not both fall and stay above zero' : 'the line through the first two concentrations overflows at t = 0';
        C0 = firstPositive.c;
        warnings.push(`C0 could not be back-extrapolated (${why}); C0 is taken as the first positive concentration, ${fmt(C0)} at t = ${fmt(firstPositive.t)}`);
      }
      profile.unshift({ row: -1, t: 0, c: C0 });
    }
  } else if (profile[0].t > 0) {
    profile.unshift({ row: -1, t: 0, c: 0 });
  } else if (profile[0].c !== 0) {
    warnings.push(`the concentration at t = 0 is ${fmt(profile[0].c)}, not zero: the analysis assumes a single dose into a body free of the drug`);
  }

  let AUClast = 0;
  let AUMClast = 0;
  const fellToZero: string[] = [];
  for (let i = 1; i < profile.length; i++) {
    const a = profile[i - 1];
    const b = profile[i];
    const falls = b.c < a.c;
    const log = auc === 'linear-up-log-down' && falls && b.c > 0 && a.c > 0;
    if (auc === 'linear-up-log-down' && falls && !log) fellToZero.push(rowPair(a, b));
    const p = panel(a.t, a.c, b.t, b.c, log);
    AUClast += p.auc;
    AUMClast += p.aumc;
  }
  if (fellToZero.length > 0) {
    warnings.push(`the concentration falls with an end at zero or below between ${fellToZero.slice(0, 10).join('; ')}${fellToZero.length > 10 ? ` and ${fellToZero.length - 10} more panels` : ''}: the log trapezoid cannot be used there, so ${fellToZero.length === 1 ? 'that panel uses' : 'those panels use'} the linear one`);
  }

  // Terminal phase: positive concentrations up to tlast.
  const tail = samples.slice(0, lastIndex + 1).filter((s) => s.c > 0);
  const tt = tail.map((s) => s.t);
  const tc = tail.map((s) => s.c);
  // 'auto' starts after every sample at Cmax (a peak may be reached twice; tmax is the first)
  const lastAtPeak = samples.reduce((tp, s) => (s.c === peak.c ? s.t : tp), peak.t);
  const afterPeak = tail.findIndex((s) => s.t > lastAtPeak);
  const phase = selectTerminalPhase(tt, tc, afterPeak < 0 ? tail.length : afterPeak, terminal);
  for (const note of phase.notes) warnings.push(`lambda_z: ${note}`);
  const fit: LogLinearFit | null = phase.fit;
  const times = fit ? tt.slice(phase.from) : [];
  if (fit && terminal !== 'auto') {
    if (times[0] <= lastAtPeak) warnings.push(`the ${fit.n} terminal points include Cmax (t = ${fmt(peak.t)}); the terminal phase usually starts after the peak`);
    if (fit.n < 3) warnings.push(`lambda_z rests on only ${fit.n} points (3 or more are usual) and its adjusted R² is not defined`);
  }
  if (fit && route === 'infusion' && times[0] < (input.duration as number)) {
    warnings.push(`the terminal points include samples taken during the infusion (before t = ${fmt(input.duration as number)})`);
  }

  const lambdaZ = fit ? -fit.slope : null;
  const r2adj = fit && Number.isFinite(fit.r2adj) ? fit.r2adj : null;
  const usable = lambdaZ !== null && lambdaZ > 0 && Number.isFinite(lambdaZ);
  if (lambdaZ === null) {
    warnings.push('lambda_z could not be estimated: AUCinf, t_half, CL, Vz and MRT are not reported');
  } else if (!usable) {
    warnings.push(`lambda_z is ${fmt(lambdaZ)}, not positive: the terminal points do not decline, so AUCinf, t_half, CL, Vz and MRT are not reported`);
  } else if (r2adj !== null && r2adj < R2ADJ_WARNING) {
    warnings.push(`unreliable lambda_z: the adjusted R² of the terminal fit is ${fmt(r2adj)}, below ${R2ADJ_WARNING}`);
  }

  let AUCinf: number | null = null;
  let AUMCinf: number | null = null;
  let AUCextrapPercent: number | null = null;
  let MRT: number | null = null;
  if (usable) {
    const lz = lambdaZ as number;
    AUCinf = AUClast + last.c / lz;
    AUMCinf = AUMClast + last.t * last.c / lz + last.c / (lz * lz);
    AUCextrapPercent = 100 * (AUCinf - AUClast) / AUCinf;
    MRT = AUMCinf / AUCinf - (route === 'infusion' ? (input.duration as number) / 2 : 0);
    if (AUCextrapPercent > EXTRAP_WARNING_PERCENT) {
      warnings.push(`AUCinf is unreliable: ${fmt(AUCextrapPercent)}% of it is extrapolated beyond tlast, more than ${EXTRAP_WARNING_PERCENT}%`);
    }
  }
  const CL = AUCinf !== null ? dose / AUCinf : null;
  const result: NcaSuccess = {
    ok: true,
    Cmax: peak.c, tmax: peak.t, Clast: last.c, tlast: last.t, C0,
    AUClast, AUMClast, AUCinf, AUCextrapPercent, AUMCinf,
    lambdaZ, lambdaZIntercept: fit ? fit.intercept : null,
    tHalf: usable ? Math.LN2 / (lambdaZ as number) : null,
    CL, Vz: CL !== null ? CL / (lambdaZ as number) : null, MRT,
    apparent: route === 'extravascular',
    r2: fit && Number.isFinite(fit.r2) ? fit.r2 : null, r2adj,
    pointsUsed: { count: times.length, times },
    warnings,
  };
  const overflow = Object.entries(result).find(([, v]) => typeof v === 'number' && !Number.isFinite(v));
  if (overflow) {
    return failure([{ field: 'c', message: `${overflow[0]} overflows the range of double-precision numbers: the concentrations or times are too large to integrate` }]);
  }
  return result;
}
