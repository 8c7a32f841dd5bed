/**
 * The document checks of a parameter's `spread` and of the uncertainty cell (the shape only;
 * values and units are checked when the study runs, on the same paths).
 */
import { DISTRIBUTIONS, MAX_SAMPLES, NAME_PATTERN, UNCERTAINTY_METHODS } from './types.ts';
import { type Checker, isObject } from './checker.ts';
import { SPREAD_FIGURES, missingFigureWords } from './spread-rules.ts';

/** A parameters item's `spread` (at `within`, `items[j]`). */
export function checkSpread(spread: unknown, p: Checker, within: string): void {
  const path = `${within}.spread`;
  if (!isObject(spread)) return p.add(`${p.at}.${path}`, 'must be an object: { "distribution": "normal", "sd": "..." }');
  p.oneOf(spread, 'distribution', DISTRIBUTIONS, false, path);
  // the fields each distribution takes; the others are refused, so a leftover figure is never silently ignored
  const d = String(spread.distribution);
  const wanted: readonly string[] | undefined = Object.hasOwn(SPREAD_FIGURES, d) ? (SPREAD_FIGURES as Record<string, readonly string[]>)[d] : undefined;
  if (!wanted) return;
  for (const f of ['sd', 'cv', 'from', 'to']) {
    if (spread[f] !== undefined && !wanted.includes(f)) p.add(`${p.at}.${path}.${f}`, `is not a figure of a ${spread.distribution} spread (it takes ${wanted.join(' and ')})`);
  }
  for (const f of wanted) {
    if (spread[f] === undefined) p.add(`${p.at}.${path}.${f}`, missingFigureWords(d, f));
    else if (f === 'cv') p.numberOrExpr(spread, f, path, false);
    else p.expr(spread, f, path);
  }
}

/** An uncertainty cell's fields. */
export function checkUncertainty(c: Record<string, unknown>, p: Checker): void {
  const of = c.of;
  if (!Array.isArray(of) || of.length === 0 || of.some((x) => typeof x !== 'string')) {
    p.add(`${p.at}.of`, of === undefined ? 'is missing: list the names to carry the uncertainty to' : 'must be a list of one or more names');
  } else {
    of.forEach((n, i) => { if (!NAME_PATTERN.test(n as string)) p.add(`${p.at}.of[${i}]`, `"${n}" is not a valid name`); });
    const seen = new Set<string>();
    of.forEach((n, i) => { if (seen.has(n as string)) p.add(`${p.at}.of[${i}]`, `"${n}" is listed twice`); seen.add(n as string); });
  }
  p.oneOf(c, 'method', UNCERTAINTY_METHODS, true);
  if (c.samples !== undefined) {
    const n = c.samples;
    if (typeof n === 'number' && Number.isInteger(n) && n > MAX_SAMPLES) p.add(`${p.at}.samples`, `${n.toLocaleString('en-US')} samples is more than this cell draws (at most ${MAX_SAMPLES.toLocaleString('en-US')})`);
    else if (!Number.isInteger(n) || (n as number) < 1) p.add(`${p.at}.samples`, `must be a whole number of samples from 1 to ${MAX_SAMPLES.toLocaleString('en-US')}`);
  }
  if (c.seed !== undefined && !(Number.isInteger(c.seed) && (c.seed as number) >= 0 && (c.seed as number) <= 0xffffffff)) {
    p.add(`${p.at}.seed`, 'must be a whole number from 0 to 4294967295');
  }
}
