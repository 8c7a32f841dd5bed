/**
 * An uncertainty cell's report and the names it defines downstream, from what its method gave:
 * per name the mean, SD, median and 2.5 / 97.5 percentiles (quantities in the name's unit, the
 * SD a difference) and a histogram, or for a yes/no verdict the probability of yes; and
 * `<name>_p025`, `<name>_p975`, `<name>_sd`, `<name>_probability` (those that do not apply
 * left undefined with the reason).
 */
import type { Binding, Outcome } from '../engine/node.ts';
import type { NodeOutput, UncertainInput, UncertaintyResult } from '../engine/report.ts';
import { type Quantity, report, describe, deltaUnit, shownUnit, valueIn, plain } from '../units/quantity.ts';
import { formatUnit } from '../units/units.ts';
import { quantitySig } from './signatures.ts';
import { summarize, histogram } from '../numerics/sampling/summary.ts';
import type { LinearName, MonteCarlo } from './uncertainty-methods.ts';
import { sharePrecision, meanPrecision } from './uncertainty-precision.ts';
import { percentileFields } from './uncertainty-percentiles.ts';
import { shownFigures } from './uncertainty-digits.ts';
import { meanSE, uncertaintyText } from '../numerics/sampling/mc-precision.ts';

/** The endings of the names defined per name in `of`. */
export const RESULT_ENDINGS = ['_p025', '_p975', '_sd', '_probability'] as const;

/** The 97.5% point of the standard normal (the linear method's interval), to 16 figures. */
export const Z975 = 1.959963984540054;

export const QUANTILE_NOTE = 'Median and percentiles of the samples by Hyndman and Fan\'s definition 7 (linear between order statistics; R\'s and NumPy\'s default); SD with n - 1.';
export const VERDICT_NOTE = 'A verdict\'s probability is the share of yes among the samples in which it had a value; its Monte Carlo standard error is sqrt(p(1 - p)/n), its 95% interval the Wilson score interval (Wilson 1927), which keeps a width at 0% and 100%. A mean\'s Monte Carlo standard error is SD/sqrt(n). Whether the samples were enough for a figure\'s digits follows JCGM 101:2008 7.9: twice its standard error within half a unit of its last digit.';
export const DIGITS_NOTE = 'Digits: the mean, the SD, each percentile and each probability are shown to the place of the first significant digit of their own Monte Carlo standard error (a percentile\'s standard uncertainty; a probability near 0% or 100% a quarter of its Wilson interval), so a figure\'s last digit may move by about one with another seed. Each standard error is written with two significant digits when its first three are 100 to 354, one from 355 to 949, and rounded up to two (1.0) from 950 to 999 (the Particle Data Group\'s rounding rule). Only what is shown is rounded: the report\'s numbers and the names defined downstream (_p025, _p975, _sd, _probability) keep their full values.';
export const PERCENTILE_NOTE = 'Each percentile\'s Monte Carlo 95% interval is distribution-free: between two order statistics of the samples whose ranks the binomial distribution gives (Conover 1999, sec. 3.2); its standard uncertainty is the interval\'s width / 3.92, and the percentile is shown to the place of that uncertainty\'s first digit. The SD\'s standard error is SD·sqrt((κ - 1)/(4n)) for large n, κ the samples\' kurtosis.';
export const LINEAR_NOTE = 'First order (the law of propagation of uncertainty, JCGM 100:2008): the mean is the value at the present inputs, the SD is sqrt(J Σ Jᵀ) with derivatives by central differences, and the 2.5 and 97.5 percentiles are mean ∓ 1.96 SD (a normal approximation).';

type Present = (name: string) => Binding | undefined;

const sized = (t: Quantity, si: number): Quantity => ({ ...t, si });
const difference = (t: Quantity, si: number): Quantity => ({ si, dim: t.dim, unit: deltaUnit(shownUnit(t)), ...(t.temp ? { temp: 'delta' as const } : {}) });
const value = (q: Quantity): Binding => ({ kind: 'value', q, sig: quantitySig(q) });
const templateOf = (present: Present, name: string, fallback?: Quantity): Quantity | undefined => {
  const b = present(name);
  if (b?.kind === 'state' || (b?.kind === 'value' && b.truth === undefined)) return b.q;
  return fallback;
};

/** Defines the figures of a quantity, and says why `_probability` is not. */
function quantityNames(name: string, t: Quantity, p025: number, p975: number, sd: number, bindings: Map<string, Binding>, reasons: Map<string, string>): void {
  bindings.set(`${name}_p025`, value(sized(t, p025)));
  bindings.set(`${name}_p975`, value(sized(t, p975)));
  bindings.set(`${name}_sd`, value(difference(t, sd)));
  reasons.set(`${name}_probability`, `"${name}_probability" is not defined: ${name} is a quantity, not a yes/no verdict (its figures are ${name}_p025, ${name}_p975 and ${name}_sd)`);
}

function verdictReasons(name: string, reasons: Map<string, string>, why: string): void {
  for (const end of RESULT_ENDINGS.slice(0, 3)) reasons.set(`${name}${end}`, `"${name}${end}" is not defined: ${why}`);
}

function noValue(name: string, reasons: Map<string, string>, why: string): void {
  for (const end of RESULT_ENDINGS) reasons.set(`${name}${end}`, `"${name}${end}" is not defined: ${why}`);
}

/** The report and bindings of a Monte Carlo run. */
export function monteCarloOutcome(of: readonly string[], mc: MonteCarlo, inputs: UncertainInput[], present: Present, samples: number, seed: number, _at: string): Outcome<NodeOutput<'uncertainty'>> {
  const bindings = new Map<string, Binding>();
  const reasons = new Map<string, string>();
  const results: Record<string, UncertaintyResult> = {};
  const said: string[] = [];
  of.forEach((name, i) => {
    const ns = mc.names[i];
    const failed = { failed: ns.failed, ...(ns.reason !== undefined ? { reason: ns.reason } : {}) };
    if (ns.values.length === 0) {
      results[name] = failed;
      noValue(name, reasons, `${name} had no value in any of the ${samples.toLocaleString('en-US')} samples (${ns.reason ?? 'no reason given'})`);
      said.push(`${name}: no value in any sample`);
      return;
    }
    if (ns.verdict) {
      const yes = ns.values.reduce((a, b) => a + b, 0);
      const p = yes / ns.values.length;
      const precise = sharePrecision(yes, ns.values.length);
      results[name] = { probability: p, ...precise, ...failed };
      bindings.set(`${name}_probability`, value(plain(p)));
      verdictReasons(name, reasons, `${name} is a yes/no verdict; its result is ${name}_probability`);
      said.push(`${name}: yes in ${precise.shown} of samples (± ${uncertaintyText(100 * precise.probabilitySE)} points)`);
      return;
    }
    const t = templateOf(present, name, ns.template)!;
    const s = summarize(ns.values);
    const unit = shownUnit(t);
    const h = histogram(ns.values.map((v) => valueIn(sized(t, v), unit)));
    // every figure's digits in the unit it is shown in (a minute is not a power of ten of seconds)
    const mean = report(sized(t, s.mean)), sd = report(difference(t, s.sd));
    const se = report(difference(t, meanSE(s.sd, ns.values.length)));
    const pf = percentileFields(s, { at: (v) => report(sized(t, v)), diff: (v) => report(difference(t, v)) });
    results[name] = {
      mean, sd, median: report(sized(t, s.median)),
      p025: report(sized(t, s.p025)), p975: report(sized(t, s.p975)),
      meanSE: se, precision: meanPrecision(mean, se, ns.values.length), ...pf,
      shownFigures: shownFigures(mean, se, sd, pf.sdSE),
      histogram: { unit: formatUnit(unit), edges: h.edges, counts: h.counts }, ...failed,
    };
    quantityNames(name, t, s.p025, s.p975, s.sd, bindings, reasons);
    const { p025, median, p975 } = pf.percentiles;
    said.push(`${name}: median ${median.shown}, 95% of samples between ${p025.shown} and ${p975.shown}`);
  });
  const failNote = mc.failed ? `; ${mc.failed.toLocaleString('en-US')} samples left a name undefined (${mc.reason})` : '';
  return {
    ok: true, bindings, reasons,
    output: {
      method: 'monte-carlo', results, inputs, samples, seed, failed: mc.failed, ...(mc.reason !== undefined ? { failedReason: mc.reason } : {}),
      evaluations: mc.evaluations, notes: [QUANTILE_NOTE, VERDICT_NOTE, PERCENTILE_NOTE, DIGITS_NOTE],
      summary: `${samples.toLocaleString('en-US')} samples (seed ${seed}) over ${inputs.length} uncertain input${inputs.length === 1 ? '' : 's'}: ${said.join('; ')}${failNote}.`,
    },
  };
}

/** The report and bindings of the linear method. */
export function linearOutcome(of: readonly string[], r: { names: LinearName[]; evaluations: number }, inputs: UncertainInput[], present: Present, _at: string): Outcome<NodeOutput<'uncertainty'>> {
  const bindings = new Map<string, Binding>();
  const reasons = new Map<string, string>();
  const results: Record<string, UncertaintyResult> = {};
  const said: string[] = [];
  of.forEach((name, i) => {
    const x = r.names[i];
    if (!x.ok) {
      results[name] = { failed: 1, reason: x.reason };
      noValue(name, reasons, x.reason);
      said.push(`${name}: ${x.reason}`);
      return;
    }
    if (x.truth !== undefined) {
      results[name] = { truth: x.truth, failed: 0 };
      verdictReasons(name, reasons, `${name} is a yes/no verdict`);
      reasons.set(`${name}_probability`, `"${name}_probability" is not defined: the linear method has no derivative of a yes/no verdict; use the Monte Carlo method for its probability`);
      said.push(`${name}: ${x.truth ? 'yes' : 'no'} at the present values (no probability by the linear method)`);
      return;
    }
    const t = templateOf(present, name, x.template)!;
    const lo = x.mean - Z975 * x.sd, hi = x.mean + Z975 * x.sd;
    results[name] = {
      mean: report(sized(t, x.mean)), sd: report(difference(t, x.sd)), median: report(sized(t, x.mean)),
      p025: report(sized(t, lo)), p975: report(sized(t, hi)), failed: 0,
    };
    quantityNames(name, t, lo, hi, x.sd, bindings, reasons);
    said.push(`${name}: ${describe(sized(t, x.mean))} ± ${describe(difference(t, x.sd))} (SD), 95% interval ${describe(sized(t, lo))} to ${describe(sized(t, hi))}`);
  });
  return {
    ok: true, bindings, reasons,
    output: {
      method: 'linear', results, inputs, failed: 0, evaluations: r.evaluations, notes: [LINEAR_NOTE],
      summary: `First-order propagation over ${inputs.length} uncertain input${inputs.length === 1 ? '' : 's'}: ${said.join('; ')}.`,
    },
  };
}
