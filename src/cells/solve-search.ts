/**
 * The searches of a solve cell (cells/solve.ts) over the target as a function of the varied
 * value, and the outcome they give: over [min, max] every solution (a grid, then Brent's
 * method, numerics/roots-in-range.ts), the one defined, its rounded value and the target at
 * each; over `choices` the target at every choice and the one nearest the wanted value. A
 * search that finds nothing fails on the field it concerns, with the target's range.
 */
import type { Binding, ProblemKind } from '../engine/node.ts';
import type { NodeOutput, SolveChoice } from '../engine/report.ts';
import { type Quantity, describe, report, valueIn, fromUnit } from '../units/quantity.ts';
import { unitFactor } from '../units/units.ts';
import { rootsInRange } from '../numerics/roots-in-range.ts';
import { quantitySig } from './signatures.ts';
import { answerError, slopeAt, supportedDigits } from './solve-digits.ts';
import { solutionText, SHOWN_DIGITS } from '../study/use-solution.ts';

/** The target at an SI value of the varied name: its quantity, or why it has none there. */
export type TargetAt = (si: number) => { ok: true; q: Quantity } | { ok: false; reason: string };

/** A problem the search ends with, on a field of the cell (`min`, `roundTo`, `choices`…, `value`, `equals`). */
export interface SolveProblem {
  readonly field: string;
  readonly message: string;
  readonly kind?: ProblemKind;
  /** What the search found before it failed (the target's range, the runs made), for the report. */
  readonly output?: NodeOutput<'solve'>;
}

interface Common {
  readonly parameter: string;
  readonly as: string;
  /** The varied name's value now (its unit and kind are a solution's). */
  readonly present: Quantity;
  readonly wanted: Quantity;
  readonly targetText: string;
  readonly targetAt: TargetAt;
  readonly problem: (p: SolveProblem) => never;
  /** What-if runs made so far. */
  readonly count: () => number;
}

type Out = { ok: true; bindings: Map<string, Binding>; output: NodeOutput<'solve'> };

/** Grid intervals over [min, max]: 24, each checked for a sign change and for a dip of |target - wanted|. */
const INTERVALS = 24;

export function searchRange(a: Common & { min: Quantity; max: Quantity; step?: number; guess?: Quantity; accuracy: number; reason: () => string | undefined }): Out {
  const { parameter, present, wanted, min, max } = a;
  // every value of the target seen, for its slope at the answer (solve-digits.ts)
  const seen: Array<[number, number]> = [];
  const targetAt: TargetAt = (si) => {
    const r = a.targetAt(si);
    if (r.ok) seen.push([si, r.q.si]);
    return r;
  };
  const vary = (si: number): Quantity => ({ ...present, si, unit: min.unit });
  const goal = (si: number): Quantity => ({ ...wanted, si });
  const found = rootsInRange((x) => {
    const r = targetAt(x);
    return r.ok ? r.q.si - wanted.si : NaN;
  }, min.si, max.si, { intervals: INTERVALS });
  const span = `from ${describe(min)} to ${describe(max)}`;
  const gaps = found.undefinedIn.map(([from, to]) => ({ from: report(vary(from)), to: report(vary(to)), reason: a.reason() ?? 'no value' }));
  const gapWords = found.undefinedIn.length
    ? `; it has no value for ${parameter} ${found.undefinedIn.map(([from, to]) => `from ${describe(vary(from))} to ${describe(vary(to))}`).join(' and ')} (${a.reason() ?? 'no value'})`
    : '';
  if (Number.isNaN(found.low)) {
    a.problem({ field: 'value', kind: 'numeric', message: `the target ${a.targetText} has no value for any ${parameter} ${span}: ${a.reason() ?? 'it was not computed'}`, output: { evaluations: a.count() } });
  }
  const range = { low: report(goal(found.low + wanted.si)), high: report(goal(found.high + wanted.si)) };
  if (found.roots.length === 0) {
    a.problem({
      field: 'equals',
      output: { targetRange: range, ...(gaps.length ? { undefinedIn: gaps } : {}), evaluations: a.count() },
      message: `no ${parameter} ${span} gives ${a.targetText} = ${describe(wanted)}: over that range ${a.targetText} runs from ${describe(goal(found.low + wanted.si))} (at ${describe(vary(found.lowAt))}) to ${describe(goal(found.high + wanted.si))} (at ${describe(vary(found.highAt))})${gapWords}`,
    });
  }
  const roots = found.roots;
  const pick = a.guess ? roots.reduce((best, x) => (Math.abs(x - a.guess!.si) < Math.abs(best - a.guess!.si) ? x : best), roots[0]) : roots[0];
  const solution = vary(pick);
  const at = targetAt(pick);
  const achieved = at.ok ? shownLike(at.q, wanted) : goal(wanted.si);
  let rounded: Quantity | undefined;
  let achievedRounded: Quantity | undefined;
  let roundWords = '';
  if (a.step !== undefined) {
    rounded = roundedTo(solution, a.step);
    const r = targetAt(rounded.si);
    if (r.ok) achievedRounded = shownLike(r.q, wanted);
    roundWords = r.ok
      ? `; rounded to ${describe(rounded)} it gives ${describe(achievedRounded!)}`
      : `; rounded to ${describe(rounded)} the target has no value (${r.reason})`;
  }
  const defined = rounded ?? solution;
  // the digits the answer is good to, in the unit it is shown in (solve-digits.ts)
  const shown = report(solution);
  const width = max.si - min.si;
  const scale = wanted.si !== 0 ? wanted.si : Math.max(Math.abs(found.low + wanted.si), Math.abs(found.high + wanted.si));
  const error = answerError(a.accuracy, scale, slopeAt(seen, pick, achieved.si, width), width);
  const digits = supportedDigits(shown.value, error / unitFactor(solution.unit));
  const several = roots.length > 1
    ? `; ${roots.length} values ${span} meet the target (${roots.map((x) => describe(vary(x))).join(', ')}): the ${a.guess ? `one nearest the guess (${describe(a.guess)})` : 'smallest'} is used`
    : '';
  return {
    ok: true,
    bindings: new Map([[a.as, { kind: 'value', q: defined, sig: quantitySig(defined) }]]),
    output: {
      solution: shown,
      ...(digits !== undefined ? { digits } : {}),
      achieved: report(achieved),
      ...(rounded ? { rounded: report(rounded) } : {}),
      ...(achievedRounded ? { achievedRounded: report(achievedRounded) } : {}),
      solutions: roots.map((x) => report(vary(x))),
      targetRange: range,
      ...(gaps.length ? { undefinedIn: gaps } : {}),
      evaluations: a.count(),
      message: `${parameter} = ${solutionText(shown, digits ?? SHOWN_DIGITS)} gives ${a.targetText} = ${describe(achieved)}${roundWords}${several}${gapWords}`,
    },
  };
}

export function searchChoices(a: Common & { choices: Quantity[] }): Out {
  const { parameter, wanted, targetAt } = a;
  const tried = a.choices.map((c) => ({ c, r: targetAt(c.si) }));
  let best = -1;
  tried.forEach(({ r }, i) => {
    if (!r.ok) return;
    const b = tried[best]?.r;
    if (best < 0 || (b?.ok && Math.abs(r.q.si - wanted.si) < Math.abs(b.q.si - wanted.si))) best = i;
  });
  if (best < 0) {
    const first = tried[0].r;
    a.problem({ field: 'value', kind: 'numeric', message: `the target ${a.targetText} has no value at any of the choices: ${first.ok ? '' : first.reason}` });
  }
  const table: SolveChoice[] = tried.map(({ c, r }, i) => ({
    value: report(c),
    ...(r.ok ? { achieved: report(shownLike(r.q, wanted)) } : { reason: r.reason }),
    ...(i === best ? { chosen: true as const } : {}),
  }));
  const chosen = tried[best];
  const achieved = shownLike((chosen.r as { q: Quantity }).q, wanted);
  const missing = tried.filter(({ r }) => !r.ok).length;
  return {
    ok: true,
    bindings: new Map([[a.as, { kind: 'value', q: chosen.c, sig: quantitySig(chosen.c) }]]),
    output: {
      solution: report(chosen.c),
      achieved: report(achieved),
      choices: table,
      evaluations: a.count(),
      message: `of the ${tried.length} choices, ${parameter} = ${describe(chosen.c)} gives the target nearest ${describe(wanted)}: ${a.targetText} = ${describe(achieved)}${missing ? `; ${missing} of them give no value` : ''}`,
    },
  };
}

/** q shown in the unit of `like` (same dimension), keeping its own kind of temperature. */
function shownLike(q: Quantity, like: Quantity): Quantity {
  return { ...q, unit: like.unit };
}

/** q rounded to a multiple of `step` (SI size) as read in q's own unit: 1,333 mg to 1,250 mg with a step of 250 mg; 4.3 degC to 4.5 degC with 0.5 K. */
export function roundedTo(q: Quantity, step: number): Quantity {
  const size = step / unitFactor(q.unit);
  const v = valueIn(q, q.unit);
  const r = Math.round(v / size) * size;
  // the multiple written to the digits of the step, so that 3 × 0.1 is 0.3
  const digits = Math.max(0, Math.min(15, -Math.floor(Math.log10(size)) + 2));
  const rq = fromUnit(Number(r.toFixed(digits)), q.unit);
  return { ...rq, ...(q.temp && rq.temp !== q.temp && q.temp !== 'point' ? { temp: q.temp } : {}) };
}
