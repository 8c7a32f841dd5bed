/**
 * What changing the parameter of a fit's estimate keeps. Its result name and its guess are
 * the user's once they are typed; while they are still what the previous parameter gave them
 * (a new fit's `T0_fit` and `74 degC` for the state T; an added estimate's `est2` and `1`),
 * they follow the new parameter, so that `k` is not estimated as `T0_fit` from a temperature.
 */
import type { Cell, FitEstimate } from './types.ts';

type Doc = { readonly cells: readonly Cell[] };

/** The state's rate cell, or the parameters item, that defines `name` (undefined for neither). */
function definer(doc: Doc, name: string): { state: true; initial: string } | { state: false; value: string } | undefined {
  for (const c of doc.cells) {
    if (c.kind === 'rate' && c.state === name) return { state: true, initial: c.initial };
    if (c.kind === 'parameters' && Array.isArray(c.items)) {
      const item = c.items.find((i) => i?.name === name);
      if (item) return { state: false, value: item.value };
    }
  }
  return undefined;
}

/** The result name a fit gives an estimate of `name` by default: `T0_fit` for a state (its starting value), `k_fit` for a parameter. */
export function defaultEstimateName(doc: Doc, name: string): string {
  return definer(doc, name)?.state ? `${name}0_fit` : `${name}_fit`;
}

/** The guess a fit gives an estimate of `name` by default: a state's starting value, a parameter's value, as written. */
export function defaultGuess(doc: Doc, name: string): string | undefined {
  const d = definer(doc, name);
  return d ? (d.state ? d.initial : d.value) : undefined;
}

/** An added estimate's result name, `est<n>`, and guess, `1`. */
const ADDED_NAME = /^est\d+$/;
const ADDED_GUESS = '1';

/**
 * `estimate` with its parameter set to `parameter`; its `as` and `guess` follow when they
 * were the defaults of the parameter before (or blank), and stay as typed otherwise. A guess
 * follows only to a name the study defines. Cost: one pass over the study's cells.
 */
export function withEstimateParameter(doc: Doc, estimate: FitEstimate, parameter: string): FitEstimate {
  const before = estimate.parameter ?? '';
  const next: FitEstimate = { ...estimate, parameter };
  const name = parameter.trim();
  if (!name) return next;
  const as = estimate.as ?? '';
  if (as === '' || ADDED_NAME.test(as) || as === defaultEstimateName(doc, before)) next.as = defaultEstimateName(doc, name);
  const guess = (estimate.guess ?? '').trim();
  const fresh = defaultGuess(doc, name);
  if (fresh !== undefined && (guess === '' || guess === ADDED_GUESS || guess === defaultGuess(doc, before)?.trim())) next.guess = fresh;
  return next;
}
