/**
 * Rules for a parameter's `spread` as a document: the figures each distribution takes, and
 * what choosing another distribution keeps. An SD is not a CV and neither is a range, so the
 * figures typed for one distribution are never carried into or converted to another's: they
 * are set aside, said in words beside the spread, and given back when that distribution is
 * chosen again. Pure: inputs are never changed. The parameters cell only calls these.
 */
import type { Distribution, ParameterSpread } from './types.ts';

/** The figures each distribution takes, in the order they are shown. */
export const SPREAD_FIGURES: Readonly<Record<Distribution, readonly ('sd' | 'cv' | 'from' | 'to')[]>> = {
  normal: ['sd'], lognormal: ['cv'], uniform: ['from', 'to'],
};

/** What a missing figure of a spread is said with, on that figure's field: `is missing: a normal spread needs an SD`. */
export function missingFigureWords(distribution: string, figure: string): string {
  return `is missing: a ${distribution} spread needs ${figure === 'sd' ? 'an SD' : figure === 'cv' ? 'a CV' : `"${figure}"`}`;
}

type Figures = Readonly<Partial<Record<'sd' | 'cv' | 'from' | 'to', string | number>>>;

/** Figures set aside, by the distribution they were typed for (one parameter's). */
export type SpreadSetAside = Readonly<Partial<Record<Distribution, Figures>>>;

const isDistribution = (d: unknown): d is Distribution => typeof d === 'string' && Object.hasOwn(SPREAD_FIGURES, d);

/** The figures of `spread` that hold something (a blank text is nothing typed). */
function typedFigures(spread: ParameterSpread): Figures {
  if (!isDistribution(spread.distribution)) return {};
  const out: Partial<Record<'sd' | 'cv' | 'from' | 'to', string | number>> = {};
  for (const f of SPREAD_FIGURES[spread.distribution]) {
    const v = spread[f];
    if (typeof v === 'number' || (typeof v === 'string' && v.trim() !== '')) out[f] = v;
  }
  return out;
}

/**
 * The spread after the user chose distribution `to` ('' for none: the spread removed), and
 * what is set aside then. The old distribution's typed figures go aside (replacing any set
 * aside for it before); the new one starts with the figures set aside for it, else blank.
 * Choosing the distribution it already has changes nothing. A distribution this version does
 * not know (from a file) is replaced like any other, its figures not kept: it has none the
 * cell could show.
 */
export function switchSpread(spread: ParameterSpread | undefined, to: string, aside: SpreadSetAside):
  { spread: ParameterSpread | undefined; aside: SpreadSetAside } {
  if ((spread?.distribution ?? '') === to) return { spread, aside };
  const next: Partial<Record<Distribution, Figures>> = { ...aside };
  if (spread && isDistribution(spread.distribution)) {
    const typed = typedFigures(spread);
    if (Object.keys(typed).length) next[spread.distribution] = typed;
  }
  if (!isDistribution(to)) return { spread: undefined, aside: next };
  const back = next[to] ?? {};
  delete next[to];
  const made: ParameterSpread = { distribution: to };
  for (const f of SPREAD_FIGURES[to]) made[f] = (back[f] ?? '') as string;
  return { spread: made, aside: next };
}

const LABELS: Readonly<Record<Distribution, string>> = { normal: 'normal', lognormal: 'log-normal', uniform: 'uniform' };

/** One distribution's figures in words: `SD 0.1 / h`, `CV 15%`, `from 0.4 / h to 0.6 / h`. */
function figureWords(d: Distribution, f: Figures): string {
  if (d === 'uniform') return [f.from !== undefined ? `from ${f.from}` : '', f.to !== undefined ? `to ${f.to}` : ''].filter(Boolean).join(' ');
  return d === 'normal' ? `SD ${f.sd}` : `CV ${f.cv}`;
}

/**
 * What is set aside, in words for the cell, or '' when nothing is: each distribution's
 * figures but the `current` one's (after an undo the document may hold them again), and how
 * to have them back.
 */
export function setAsideWords(aside: SpreadSetAside, current: string | undefined): string {
  const parts = (Object.keys(SPREAD_FIGURES) as Distribution[])
    .filter((d) => d !== current && aside[d] && Object.keys(aside[d]!).length)
    .map((d) => `${LABELS[d]}, ${figureWords(d, aside[d]!)}`);
  if (!parts.length) return '';
  return `Set aside, not used (choose ${parts.length === 1 ? 'it' : 'one'} again to have its figures back): ${parts.join('; ')}.`;
}
