/**
 * One result at a glance in words, the same in the study view, on the printed sheet and in the
 * command line's text report: its value at the point values (4 significant figures, or yes/no),
 * and where an uncertainty cell follows it, how sure (the engine's `sure`: a verdict's
 * probability of yes with its Monte Carlo error, a quantity's 95% interval, as that cell shows
 * them), never a point verdict alone. While the uncertainty cell is still computing its figures
 * are not said: "how sure: still computing". Pure; cost linear in the cells waited on.
 */
import type { Progress } from '../engine/sliced.ts';
import { formatNumber } from '../units/quantity.ts';
import { unitAfterNumber } from '../units/units.ts';
import { cellWords, type CellNames } from './field-words.ts';
import type { GlanceEntry, GlanceSure } from './glance.ts';

/** The cells still computing, and the progress of the one computing (the app's controller's); the command line has none. */
export interface GlanceWork {
  readonly pending: readonly string[];
  readonly progress?: Progress;
}

/** Nothing computing: a report evaluated to its end, as the command line's. */
export const GLANCE_DONE: GlanceWork = { pending: [] };

/** What the how-sure line says: its figures (a verdict's probability, or an interval), still computing, or why there are none. */
export type GlanceSureState = 'probability' | 'figures' | 'still' | 'none';

/** An entry's value in words: the point line and, where an uncertainty cell follows it, the how-sure line. */
export interface GlanceWords {
  /** "12.4 mg / L at the point values", "at the point values: yes", or the value alone when no cell follows it. */
  readonly point: string;
  /** How sure, in words; absent when no uncertainty cell follows the result. */
  readonly sure?: string;
  readonly sureState?: GlanceSureState;
  /** A verdict's probability is said before its point verdict; a quantity's interval after its point value. */
  readonly sureFirst: boolean;
}

/** A quantity as the glance shows it: 4 significant figures and its unit. */
type Shown = { readonly value: number; readonly unit: string; readonly truth?: boolean };
const GLANCE_DIGITS = 4;

/** A quantity in words: 4 significant figures and its unit. */
export function glanceQuantity(q: Shown): string {
  const v = formatNumber(q.value, GLANCE_DIGITS);
  return q.unit ? `${v} ${unitAfterNumber(q.unit)}` : v;
}

const count = (p: Progress) => `${p.done.toLocaleString('en-US')} of ${p.total.toLocaleString('en-US')} ${p.unit}`;

/** Why there is no value: the wait in words, else the engine's reason. */
function missing(study: CellNames, own: string, reason: string, waitsOn: readonly string[] | undefined): string {
  return waitsOn?.length ? `not computed: ${waitsOn.filter((id) => id !== own).map((id) => `waits on ${cellWords(study, id)}`).join('; ') || 'waits'}` : reason;
}

/** How sure, in words: the figures, still computing, or why there are none. */
function sureText(s: GlanceSure, study: CellNames, work: GlanceWork): string {
  if (work.pending.includes(s.cell)) {
    const p = work.progress?.cell === s.cell ? ` (${count(work.progress)})` : '';
    return `how sure: still computing${p}`;
  }
  if (s.words) return s.words;
  return `how sure: ${missing(study, s.cell, s.unavailable ?? 'not computed', s.waitsOn)}`;
}

/** The point value or verdict of an entry, or why it has none. */
function pointText(g: GlanceEntry, study: CellNames): string {
  if (g.waitsOn?.length || g.unavailable !== undefined) return missing(study, g.cell, g.unavailable ?? 'not computed', g.waitsOn);
  if (g.notReachedBy) return `not reached by ${glanceQuantity(g.notReachedBy)}`;
  if (g.kind === 'verdict') return !g.value ? '' : typeof g.value.truth === 'boolean' ? (g.value.truth ? 'yes' : 'no') : glanceQuantity(g.value);
  return `${g.value ? glanceQuantity(g.value) : ''}${g.standardError ? ` ± ${glanceQuantity(g.standardError)} (SE)` : ''}`;
}

/**
 * The words of one entry: without an uncertainty cell, the value as it is; with one, a verdict
 * reads "yes in 54% of 2,000 samples (± 1.1 points, Monte Carlo)" over "at the point values: yes",
 * a quantity "12.4 mg / L at the point values" over its 95% interval and method.
 */
export function glanceWords(g: GlanceEntry, study: CellNames, work: GlanceWork = GLANCE_DONE): GlanceWords {
  const point = pointText(g, study);
  const s = g.sure;
  if (!s) return { point, sureFirst: false };
  const sureState: GlanceSureState = work.pending.includes(s.cell) ? 'still' : s.probability !== undefined ? 'probability' : s.words ? 'figures' : 'none';
  const sure = sureText(s, study, work);
  return g.kind === 'verdict'
    ? { point: `at the point values: ${point}`, sure, sureState, sureFirst: true }
    : { point: `${point}${g.value ? ' at the point values' : ''}`, sure, sureState, sureFirst: false };
}
