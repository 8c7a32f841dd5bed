/**
 * An uncertainty cell: how sure the names in `of` are, given every spread upstream of them (a
 * parameter's `spread`, a fit's estimates with their covariance). It draws or perturbs those
 * inputs with the what-if evaluator (engine/what-if.ts, `RunContext.whatIf`), so only what lies
 * between them and the names runs again and the study's own values are never touched.
 * Inputs: uncertainty-inputs.ts (and uncertainty-shadows.ts: a spread on a computed value
 * stands for the spreads upstream of it); the methods: uncertainty-methods.ts; the report and the names
 * defined downstream (`<name>_p025`, `_p975`, `_sd`, `_probability`): uncertainty-report.ts.
 */
import type { Cell, UncertaintyCell } from '../study/types.ts';
import { MAX_SAMPLES } from '../study/types.ts';
import type { GraphNode, Outcome, RunContext, Use } from '../engine/node.ts';
import { cellRef } from '../engine/node.ts';
import type { NodeOutput } from '../engine/report.ts';
import { fail, guarded, FieldError } from './fields.ts';
import { uncertainInputs, drawerOf, workingOf, inputWords } from './uncertainty-inputs.ts';
import { MonteCarloRun, linear } from './uncertainty-methods.ts';
import { runToEnd, type SlicedRun } from '../engine/sliced.ts';
import { RESULT_ENDINGS, monteCarloOutcome, linearOutcome } from './uncertainty-report.ts';
import { bandRuns, BandRun } from './uncertainty-band.ts';
import { shadowedInputs } from './uncertainty-shadows.ts';

/** Samples drawn when `samples` is not given, and the seed when `seed` is not. */
export const DEFAULT_SAMPLES = 2000;
export const DEFAULT_SEED = 1;
/** Samples per cell work budget (engine/budget.ts): about 3,000 units per sample, more than the 6-dose schedule with four questions needs (about 1,900). */
export const SAMPLES_PER_BUDGET = 1000;
/** The most cell budgets an uncertainty cell may use: past it, it is stopped with the budget's message (fewer samples, or a lighter run). */
export const MOST_BUDGETS = 10;

/**
 * How many cell budgets a cell may use (`GraphNode.workScale`): for an uncertainty cell one per
 * 1,000 samples (its default samples for the linear method), 1 to MOST_BUDGETS, as many again
 * for each run whose band it draws (`cells`: the study); 1 for another cell.
 */
export function workScaleOf(cell: unknown, cells: readonly Cell[] = []): number {
  const c = cell as Partial<UncertaintyCell> | null;
  if (c?.kind !== 'uncertainty') return 1;
  const samples = c.method !== 'linear' && Number.isInteger(c.samples) ? (c.samples as number) : DEFAULT_SAMPLES;
  const bands = c.method === 'linear' ? 0 : bandRuns(c.of, cells).length;
  return Math.min(MOST_BUDGETS, Math.max(1, samples / SAMPLES_PER_BUDGET)) * (1 + bands);
}

/**
 * What to make smaller when a Monte Carlo cell runs out of work: its samples first (the budget
 * stops growing past MOST_BUDGETS), then what each sample runs.
 */
function monteCarloAdvice(cell: UncertaintyCell, bands: number): string {
  const n = Number.isInteger(cell.samples) ? (cell.samples as number) : DEFAULT_SAMPLES;
  return `draw fewer samples than ${n.toLocaleString('en-US')} (each runs the study's values again${bands ? ', and again for each band it draws' : ''}), `
    + 'or shorten the run or loosen its tolerance';
}

/** The cell's node; `cells` (the study) says which runs show a band from its samples (`buildContext` in cells/index.ts). */
export function uncertaintyNodes(cell: UncertaintyCell, at: string, cells: readonly Cell[] = []): Array<GraphNode<NodeOutput<'uncertainty'>>> {
  const of = Array.isArray(cell.of) ? cell.of.filter((n): n is string => typeof n === 'string') : [];
  // each name is read even when it has no value now: a sample may give it one; but not when
  // an error upstream took it away, which no sample mends: the cell waits on that error
  const uses: Use[] = of.map((name, i) => ({ name, path: `${at}.of[${i}]`, optional: true, waitsOnError: true }));
  // the runs whose band it draws: their models (a run answering a name here adds no cycle)
  const bands = cell.method === 'linear' ? [] : bandRuns(of, cells);
  for (const run of bands) uses.push({ name: cellRef(run), path: `${at}.of`, optional: true });
  return [{
    key: `${cell.id}/uncertainty`,
    cell: cell.id,
    defines: of.flatMap((name, i) => RESULT_ENDINGS.map((end) => ({ name: `${name}${end}`, path: `${at}.of[${i}]` }))),
    uses,
    allowsTime: false,
    readsUpstream: true,
    workScale: workScaleOf(cell, cells),
    ...(cell.method === 'linear' ? {} : { workAdvice: monteCarloAdvice(cell, bands.length) }),
    signature: `${JSON.stringify(cell)}|bands:${bands.join(',')}`,
    problems: [],
    run: (ctx) => runToEnd(startUncertainty(cell, at, of, ctx, bands)),
    // Monte Carlo is long: the app's worker draws its samples in slices after the other cells
    ...(cell.method === 'linear' ? {} : { slices: (ctx: RunContext) => startUncertainty(cell, at, of, ctx, bands) }),
  }];
}

type Out = NodeOutput<'uncertainty'>;

/** The outcome at once (the linear method, a problem), or the Monte Carlo samples to draw. */
function startUncertainty(cell: UncertaintyCell, at: string, of: readonly string[], ctx: RunContext, bands: readonly string[]): Outcome<Out> | SlicedRun<Out> {
  try {
    return prepareUncertainty(cell, at, of, ctx, bands);
  } catch (err) {
    if (err instanceof FieldError) return { ok: false, error: err.error };
    throw err;
  }
}

function prepareUncertainty(cell: UncertaintyCell, at: string, of: readonly string[], ctx: RunContext, bands: readonly string[]): Outcome<Out> | SlicedRun<Out> {
  if (ctx.mode === 'check') return { ok: true, bindings: new Map(), output: { computed: false, message: 'checked; run the study to see how sure its results are' } };
  if (!ctx.whatIf || !ctx.peek) fail(at, 'this cell cannot vary values here (no what-if evaluation is available)', 'internal');
  const peek = ctx.peek!;
  const method = cell.method ?? 'monte-carlo';
  const samples = cell.samples ?? DEFAULT_SAMPLES;
  const seed = cell.seed ?? DEFAULT_SEED;
  if (!(Number.isInteger(samples) && samples >= 1 && samples <= MAX_SAMPLES)) fail(`${at}.samples`, `must be a whole number of samples from 1 to ${MAX_SAMPLES.toLocaleString('en-US')}`);
  if (of.length === 0) fail(`${at}.of`, 'list the names to carry the uncertainty to');

  // the values with a spread upstream of the names (a name may be one itself)
  const candidates = new Set<string>();
  for (const name of of) {
    candidates.add(name);
    for (const n of ctx.upstream(name)) candidates.add(n);
  }
  const bindingOf = (n: string) => (of.includes(n) ? ctx.binding(n) : peek(n));
  const found = uncertainInputs(candidates, bindingOf);
  // keep those that can change a name (a fit's estimates reach a run's plot without changing its
  // answers), a spread on a computed value standing for the spreads upstream of it
  const { inputs, warnings } = shadowedInputs(found, of, ctx);
  if (inputs.length === 0) {
    fail(`${at}.of`, `${of.length === 1 ? `"${of[0]}" depends` : 'none of these names depends'} on no value with a spread: give a parameter upstream a spread (beside its value), or read a fit's estimates`);
  }
  const prepared = ctx.whatIf!(of, inputs.map((x) => x.name));
  if (!prepared.ok) {
    const i = prepared.error.name !== undefined ? of.indexOf(prepared.error.name) : -1;
    fail(i >= 0 ? `${at}.of[${i}]` : `${at}.of`, prepared.error.message);
  }
  const words = inputs.map(inputWords);
  const present = (name: string) => ctx.binding(name);
  const warned = <T extends Outcome<Out>>(o: T): T => (o.ok && warnings.length ? { ...o, output: { ...o.output, warnings } } : o);
  if (method === 'linear') {
    const r = linear(prepared, workingOf(inputs));
    return warned(linearOutcome(of, r, words, present, at));
  }
  const drawer = drawerOf(inputs);
  if (typeof drawer === 'string') fail(`${at}.of`, drawer, 'numeric');
  const draw = drawer as Exclude<typeof drawer, string>;
  const mc = new MonteCarloRun(prepared, draw, inputs.length, samples, seed);
  // the bands from the same draws, after the samples, in slices too; none in a what-if (a run nested in another cell's)
  const banded = bands.length > 0 && ctx.mode === 'run';
  let outcome: Outcome<Out> | undefined;
  let band: BandRun | undefined;
  return {
    get done() { return mc.done + (band?.done ?? 0); },
    // one unit per sample and per sample of each run's band (its exact count known once it starts)
    get total() { return samples + (band ? band.total : banded ? samples * bands.length : 0); },
    unit: banded ? 'model runs' : 'samples',
    step: (until) => {
      const drawing = mc.done < samples;
      if (!mc.step(until)) return false;
      outcome ??= guarded(() => warned(monteCarloOutcome(of, mc.result(), words, present, samples, seed, at)));
      if (!banded || !outcome.ok) return true;
      try {
        band ??= new BandRun(bands, ctx, inputs, draw, samples, seed);
        // a slice that drew the last samples ends there when its time is up (the band in the next)
        return !(drawing && performance.now() > until) && band.step(until);
      } catch (err) {
        if (!(err instanceof FieldError)) throw err;
        outcome = { ok: false, error: err.error };
        return true;
      }
    },
    finish: () => {
      if (!band || !outcome!.ok) return outcome!;
      return { ...outcome!, output: { ...outcome!.output, bands: band.result() } };
    },
  };
}
