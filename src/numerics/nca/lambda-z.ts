/**
 * The terminal rate constant lambda_z of a concentration–time profile: a least-squares line
 * through ln C against t over the last points of the profile, and the rule that picks how many.
 *
 * Plain numbers in consistent units (SI magnitudes in practice); nothing here knows units.
 *
 * Method (common practice; see Gabrielsson & Weiner, "Pharmacokinetic and Pharmacodynamic
 * Data Analysis", the chapter on non-compartmental analysis, and Rowland & Tozer, "Clinical
 * Pharmacokinetics and Pharmacodynamics", on the terminal half-life):
 * - lambda_z = -slope of ln C on t, ordinary least squares, positive concentrations only.
 * - The adjusted coefficient of determination, R²adj = 1 - (1 - R²)(n - 1)/(n - 2), rewards a
 *   straight tail and charges for each extra point less than R² alone would.
 * - 'auto': every n from 3 to all the points after the peak; among the fits with lambda_z > 0,
 *   the largest n whose R²adj is within `ADJ_R2_TOLERANCE` of the best (the usual tie rule: more
 *   points for the same straightness).
 * - a count: exactly the last that many positive points, peak or not.
 *
 * Cost: 'auto' is linear in the number of points (the candidate fits share running sums,
 * updated with Welford's stable recurrences as points are added from the end); the chosen fit
 * is then recomputed in two passes, so the reported slope does not depend on the order of
 * accumulation.
 */

/** Two tails whose adjusted R² differ by no more than this are equally straight (common practice). */
export const ADJ_R2_TOLERANCE = 1e-4;
/** Fewest points 'auto' will fit: two points always lie on a line, so R²adj needs three. */
export const MIN_TERMINAL_POINTS = 3;

/** A least-squares line ln C = intercept + slope·t through `n` points. */
export interface LogLinearFit {
  /** Points in the fit. */
  readonly n: number;
  /** d(ln C)/dt, in 1/time; lambda_z is its negative. */
  readonly slope: number;
  /** The fitted ln C at t = 0. */
  readonly intercept: number;
  /** Coefficient of determination; NaN when ln C does not vary (nothing to explain). */
  readonly r2: number;
  /** Adjusted R²; NaN when n < 3 or when R² is NaN. */
  readonly r2adj: number;
}

/**
 * Least-squares line through (t[i], ln c[i]) for i in [from, to). The caller guarantees
 * to - from >= 2, distinct times, and c[i] > 0. Two passes (means, then centred sums).
 */
export function fitLogLinear(t: readonly number[], c: readonly number[], from: number, to: number): LogLinearFit {
  const n = to - from;
  let mt = 0;
  let my = 0;
  for (let i = from; i < to; i++) { mt += t[i]; my += Math.log(c[i]); }
  mt /= n;
  my /= n;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let i = from; i < to; i++) {
    const dx = t[i] - mt;
    const dy = Math.log(c[i]) - my;
    sxx += dx * dx;
    sxy += dx * dy;
    syy += dy * dy;
  }
  const slope = sxy / sxx;
  const intercept = my - slope * mt;
  let ssr = 0;
  for (let i = from; i < to; i++) {
    const r = Math.log(c[i]) - (my + slope * (t[i] - mt));
    ssr += r * r;
  }
  const r2 = syy > 0 ? Math.max(0, 1 - ssr / syy) : NaN;
  return { n, slope, intercept, r2, r2adj: adjusted(r2, n) };
}

function adjusted(r2: number, n: number): number {
  return n >= 3 ? 1 - (1 - r2) * (n - 1) / (n - 2) : NaN;
}

/** How the terminal points are chosen: the adjusted-R² rule, or a fixed count of last points. */
export type TerminalRule = 'auto' | number;

/** The terminal fit and the points behind it. */
export interface TerminalPhase {
  /** The chosen fit, or null when there were too few points to fit anything. */
  readonly fit: LogLinearFit | null;
  /** Index (into the arrays passed in) of the first point used; the fit runs to the end. */
  readonly from: number;
  /** Why there is no fit, or what the rule had to give up; empty when all went to plan. */
  readonly notes: readonly string[];
}

/**
 * Chooses the terminal points and fits them.
 *
 * `t` and `c`: the profile's positive concentrations up to and including the last one, times
 * strictly increasing. `afterPeak`: index of the first point after the peak (Cmax) — 'auto'
 * looks only at points from there on. `rule`: 'auto' or a count (an integer >= 2; the caller
 * checks). Never throws; a note says why when no fit could be made.
 */
export function selectTerminalPhase(
  t: readonly number[], c: readonly number[], afterPeak: number, rule: TerminalRule,
): TerminalPhase {
  const m = t.length;
  if (rule !== 'auto') {
    const count = Math.min(rule, m);
    const notes: string[] = [];
    if (count < rule) notes.push(`there are only ${m} positive concentrations, fewer than the ${rule} asked for`);
    if (count < 2) return { fit: null, from: m, notes: [...notes, 'lambda_z needs at least 2 positive concentrations'] };
    return { fit: fitLogLinear(t, c, m - count, m), from: m - count, notes };
  }
  const available = m - afterPeak;
  if (available < MIN_TERMINAL_POINTS) {
    return {
      fit: null, from: m,
      notes: [`only ${available} positive concentration${available === 1 ? '' : 's'} after Cmax; lambda_z needs at least ${MIN_TERMINAL_POINTS}`],
    };
  }
  // Running centred sums over the last n points, adding points from the end (Welford).
  const r2adjOf = new Float64Array(m + 1).fill(NaN);
  const slopeOf = new Float64Array(m + 1).fill(NaN);
  let n = 0;
  let mt = 0;
  let my = 0;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (let i = m - 1; i >= afterPeak; i--) {
    const y = Math.log(c[i]);
    n++;
    const dx = t[i] - mt;
    mt += dx / n;
    const dy = y - my;
    my += dy / n;
    sxx += dx * (t[i] - mt);
    syy += dy * (y - my);
    sxy += dx * (y - my);
    if (n < MIN_TERMINAL_POINTS) continue;
    const ssr = Math.max(0, syy - (sxy * sxy) / sxx);
    slopeOf[n] = sxy / sxx;
    r2adjOf[n] = syy > 0 ? adjusted(Math.max(0, 1 - ssr / syy), n) : NaN;
  }
  let best = -Infinity;
  for (let k = MIN_TERMINAL_POINTS; k <= available; k++) {
    if (slopeOf[k] < 0 && r2adjOf[k] > best) best = r2adjOf[k];
  }
  if (best === -Infinity) {
    // No tail falls: fit all the points after the peak, so the caller can report the slope.
    return { fit: fitLogLinear(t, c, afterPeak, m), from: afterPeak, notes: [] };
  }
  let chosen = MIN_TERMINAL_POINTS;
  for (let k = available; k >= MIN_TERMINAL_POINTS; k--) {
    if (slopeOf[k] < 0 && r2adjOf[k] >= best - ADJ_R2_TOLERANCE) { chosen = k; break; }
  }
  return { fit: fitLogLinear(t, c, m - chosen, m), from: m - chosen, notes: [] };
}
