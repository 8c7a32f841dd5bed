/**
 * A run's exact solution in words, for the simulate cell and the printed sheet: the figures of
 * a law `a + b·state` (time constant, half-life or doubling time, the equilibrium it settles
 * toward or moves away from) and the run's largest difference from it. When an action changes
 * the law within the run, the words go stretch by stretch, each with its own figures (the
 * first `LISTED` stretches, then the spread of the rest), never one stretch's figures for all.
 */
import type { ClosedFormReport, ClosedFormStretch, LinearFigures } from '../engine/report.ts';
import type { ReportQuantity } from '../units/quantity.ts';
import { formatNumber } from '../units/quantity.ts';
import { unitAfterNumber } from '../units/units.ts';

/** Stretches described one by one; past this many, the first ones and the range of the others' figures. */
const LISTED = 4;

/** A quantity as the app shows it: 4 significant digits, or `digits`. */
function said(q: ReportQuantity, digits = 4): string {
  const v = formatNumber(q.value, digits);
  return q.unit ? `${v} ${unitAfterNumber(q.unit)}` : v;
}

/** One law's figures: `time constant 2 h, half-life 1.386 h, settling toward 24 degC`. */
function figureWords(f: LinearFigures): string {
  if (!f.timeConstant) return `rate constant ${said(f.rateConstant)} (a steady rate, no time constant)`;
  const life = f.halfLife ? `half-life ${said(f.halfLife)}` : `doubling time ${said(f.doublingTime!)}`;
  const toward = f.equilibrium ? (f.stable ? `, settling toward ${said(f.equilibrium)}` : `, moving away from ${said(f.equilibrium)}`) : '';
  return `rate constant ${said(f.rateConstant)}, time constant ${said(f.timeConstant)}, ${life}${toward}`;
}

/** The least and greatest of some quantities of one unit, in words: `0 mg / L to 0.2222 mg / L`, or the one value. */
function spanWords(qs: ReadonlyArray<ReportQuantity | undefined>): string | undefined {
  const there = qs.filter((q): q is ReportQuantity => q !== undefined);
  if (!there.length) return undefined;
  const low = there.reduce((a, b) => (b.si < a.si ? b : a));
  const high = there.reduce((a, b) => (b.si > a.si ? b : a));
  return said(low) === said(high) ? said(low) : `from ${said(low)} to ${said(high)}`;
}

/**
 * The sentence for state `state`: `Exact solution (T linear in itself): …; this run differs
 * from it by at most 0.00013 K.`, or, for a law changed within the run, `Exact solution, stretch
 * by stretch (…): from 0 h to 0.5 h, …; from 0.5 h to 8 h, …. This run differs from the exact
 * piecewise solution by at most 0.00013 K.`
 */
export function closedFormWords(state: string, e: ClosedFormReport): string {
  const error = said(e.maxError, 2);
  const stretches = e.stretches ?? [];
  if (stretches.length < 2) return `Exact solution (${state} linear in itself): ${figureWords(e)}; this run differs from it by at most ${error}.`;
  const head = `Exact solution, stretch by stretch (${state} linear in itself; the law changes at the run's actions)`;
  const tail = `This run differs from the exact piecewise solution by at most ${error}.`;
  const listed = stretches.slice(0, stretches.length > LISTED ? LISTED - 1 : LISTED);
  const rest = stretches.slice(listed.length);
  const when = (s: ClosedFormStretch) => `from ${said(s.from)} to ${said(s.to)}`;
  const more = (what: string, qs: ReadonlyArray<ReportQuantity | undefined>) => `and ${rest.length} more stretches to ${said(rest[rest.length - 1].to)} (${what} ${spanWords(qs)})`;
  // one rate constant throughout (an infusion starting and stopping): said once, then each stretch's equilibrium
  if (e.timeConstant && stretches.every((s) => s.timeConstant && said(s.rateConstant) === said(e.rateConstant) && s.equilibrium)) {
    const each = listed.map((s) => `${said(s.equilibrium!)} ${when(s)}`);
    if (rest.length) each.push(more('equilibria', rest.map((s) => s.equilibrium)));
    const { equilibrium: _e, ...common } = e;
    return `${head}: ${figureWords(common)} throughout; ${e.stable ? 'settling toward' : 'moving away from'} ${each.join(', ')}. ${tail}`;
  }
  const each = listed.map((s) => `${when(s)}, ${figureWords(s)}`);
  if (rest.length) each.push(more('rate constants', rest.map((s) => s.rateConstant)) + '; each with its own equilibrium');
  return `${head}: ${each.join('; ')}. ${tail}`;
}
