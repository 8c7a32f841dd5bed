/**
 * Ratebook's benchmark: speed figures beside their goals. Not a test: nothing here fails a
 * build; a goal not met is printed as "not met" (the exit status is 1 only when a section
 * could not run at all).
 *
 * Run with `npm run bench`; `npm run bench -- edit` runs only the sections whose title
 * contains "edit". Add a section by adding an entry to SECTIONS: a title and a function that
 * returns rows.
 */
import { compile as mathjsCompile } from 'mathjs';
import {
  parseExpression, evaluateExpression, compileExpression, openStudy,
  type Compiled, type Lookup, type Quantity, type StudySession,
} from '../src/index.ts';
import { setGeneratedCode } from '../src/expression/compile.ts';
import { phaseBenchmarks } from './phase.ts';
import { odeBench, stiffBench } from './ode.ts';
import { REFERENCE_VERSION, workPrecisionBench } from './work-precision.ts';
import { stepCostRows } from './adams-step.ts';
import { simulateBenchmarks, fitCellBenchmarks } from './simulate.ts';
import { browserBenchmarks } from './browser.ts';
import { openLargeStudyBenchmarks } from './browser-open.ts';
import { whatIfBenchmarks } from './what-if.ts';
import { uncertaintyBenchmarks } from './uncertainty.ts';
import { bandRows } from './uncertainty-band.ts';
import { scenarioBenchmarks } from './scenarios.ts';
import { closureBenchmarks } from './closures.ts';
import { solveBenchmarks } from './solve.ts';
import { fitBenchmarks } from './fit.ts';
import { mapFitBenchmarks, mapFitRunBenchmarks } from './fit-map.ts';
import { fitRunBenchmarks } from './fit-run.ts';
import { fitEvaluationBenchmarks, DIGITS_COST_GOAL } from './fit-evaluations.ts';
import { ncaBenchmarks } from './nca.ts';
import { scalingBenchmarks } from './scaling.ts';
import { csvBenchmarks } from './csv.ts';
import { type LoopStats, loopRows, ms, quantile, timeLoop } from './loop-stats.ts';

/** One line of a section's table. `met` is undefined for a figure with no goal. */
interface Row {
  readonly measure: string;
  readonly result: string;
  readonly goal?: string;
  readonly met?: boolean;
}

interface Section {
  readonly title: string;
  readonly run: () => Row[] | Promise<Row[]>;
}

// ---------------------------------------------------------------------------------------
// Timing helpers

/** Untimed running before any measurement, so that the optimising compiler has finished. */
const WARMUP_MS = 300;
/** Length of one timed sample of a tight loop. */
const SAMPLE_MS = 100;
/** Samples of a tight loop; the median is reported. */
const SAMPLES = 5;

function median(xs: readonly number[]): number {
  return quantile([...xs].sort((a, b) => a - b), 0.5);
}

/** Keeps results alive (a module-level store), so that the loops cannot be optimised away. */
let sink = 0;

type Law = (x: Float64Array) => number;
type Loop = (f: Law, x: Float64Array, n: number, base: number) => number;

/**
 * A fresh loop for each candidate: a loop shared by all would see several functions at one
 * call site, and the slowdown of that polymorphic call would fall on whichever ran last.
 * The state moves a little on every call so that nothing is constant-folded.
 */
function freshLoop(): Loop {
  return new Function('f', 'x', 'n', 'base', `
    let s = 0;
    for (let i = 0; i < n; i++) { x[0] = base + (i & 1023) * 1e-3; s += f(x); }
    return s;`) as Loop;
}

/** Calls of f per second: calibrated to SAMPLE_MS per sample, median of SAMPLES samples. */
function callsPerSecond(f: Law, base: number): number {
  const loop = freshLoop();
  const x = new Float64Array(1);
  let n = 1000;
  const start = performance.now();
  while (performance.now() - start < WARMUP_MS) sink += loop(f, x, n, base);
  for (;;) {
    const t0 = performance.now();
    sink += loop(f, x, n, base);
    if (performance.now() - t0 >= SAMPLE_MS / 4) break;
    n *= 2;
  }
  n = Math.ceil(n * 4);
  const rates: number[] = [];
  for (let s = 0; s < SAMPLES; s++) {
    const t0 = performance.now();
    sink += loop(f, x, n, base);
    rates.push(n / ((performance.now() - t0) / 1000));
  }
  return median(rates);
}

function perSecond(x: number): string {
  return x >= 1e6 ? `${(x / 1e6).toFixed(1)} M/s` : `${(x / 1e3).toFixed(0)} k/s`;
}


// ---------------------------------------------------------------------------------------
// Compiled rate laws

/** Study values of the rate laws below, as a study would write them. */
const PARAMETERS: Record<string, string> = {
  k: '0.35 / h', Ta: '20 degC', T: '74 degC',
  Vmax: '0.5 mg / L / h', Km: '2 mg / L', R: '10 mg / h', V: '42 L', C: '12 mg / L',
};

function quantityOf(text: string): Quantity {
  const p = parseExpression(text);
  if (!p.ok) throw new Error(`${text}: ${p.error.message}`);
  const v = evaluateExpression(p.expr, () => undefined);
  if (!v.ok || typeof v.value === 'boolean') throw new Error(`${text}: not a quantity`);
  return v.value;
}

const SCOPE = new Map(Object.entries(PARAMETERS).map(([n, t]) => [n, quantityOf(t)]));
const lookup: Lookup = (n) => SCOPE.get(n);
const si = (n: string) => SCOPE.get(n)!.si;

interface LawCase {
  readonly name: string;
  readonly text: string;
  /** The state: read at run time; every other name is folded in. */
  readonly state: string;
  /** The same law written by hand over the same SI values. */
  readonly hand: () => Law;
}

const LAWS: readonly LawCase[] = [
  {
    name: 'Newton cooling', text: '-k * (T - Ta)', state: 'T',
    hand: () => { const k = si('k'), Ta = si('Ta'); return (x) => -k * (x[0] - Ta); },
  },
  {
    name: 'Michaelis-Menten with an infusion', text: '-Vmax * C / (Km + C) + R / V', state: 'C',
    hand: () => { const Vmax = si('Vmax'), Km = si('Km'), R = si('R'), V = si('V'); return (x) => -Vmax * x[0] / (Km + x[0]) + R / V; },
  },
];

/** The ratio of compiled to hand-written time that compiled code should stay within. */
const COMPILED_GOAL = 3;

function compiledLaw(c: LawCase, generated: boolean): Compiled {
  const p = parseExpression(c.text);
  if (!p.ok) throw new Error(p.error.message);
  const checked = evaluateExpression(p.expr, lookup);
  if (!checked.ok) throw new Error(checked.error.message);
  setGeneratedCode(generated ? undefined : false);
  try {
    return compileExpression(p.expr, lookup, [c.state]);
  } finally {
    setGeneratedCode(undefined);
  }
}

function rateLawRows(): Row[] {
  const rows: Row[] = [];
  for (const c of LAWS) {
    const hand = c.hand();
    const code = compiledLaw(c, true);
    const closures = compiledLaw(c, false);
    const expr = mathjsCompile(c.text);
    const scope: Record<string, number> = Object.fromEntries([...SCOPE].map(([n, q]) => [n, q.si]));
    const viaMathjs: Law = (x) => { scope[c.state] = x[0]; return expr.evaluate(scope) as number; };
    const base = si(c.state);
    // the same law on the same SI input must give the same number, or the race is unfair
    const probe = new Float64Array([base]);
    for (const [who, f] of [['compiled', code], ['closures', closures], ['mathjs', viaMathjs]] as const) {
      const a = f(probe), b = hand(probe);
      if (!(Math.abs(a - b) <= 1e-12 * Math.abs(b))) throw new Error(`${c.name}: ${who} gives ${a}, hand-written ${b}`);
    }
    const rHand = callsPerSecond(hand, base);
    const rCode = callsPerSecond(code, base);
    const rClosures = callsPerSecond(closures, base);
    const rMathjs = callsPerSecond(viaMathjs, base);
    const ratio = rHand / rCode;
    rows.push(
      { measure: `${c.name} \`${c.text}\`: hand-written JavaScript`, result: perSecond(rHand) },
      { measure: `  compiled (generated code)`, result: perSecond(rCode) },
      { measure: `  compiled time / hand-written time`, result: `${ratio.toFixed(2)}x`, goal: `<= ${COMPILED_GOAL}x`, met: ratio <= COMPILED_GOAL },
      { measure: `  compiled (closures, as under a strict content security policy)`, result: `${perSecond(rClosures)} (${(rHand / rClosures).toFixed(1)}x)` },
      { measure: `  mathjs compile().evaluate(scope) on numbers`, result: `${perSecond(rMathjs)} (${(rHand / rMathjs).toFixed(1)}x)` },
    );
  }
  return rows;
}

// ---------------------------------------------------------------------------------------
// Incremental editing

/** Cells in the edited study: CHAIN parameters cells, each reading the one before, then rate cells. */
const CHAIN = 45;
const RATES = 5;
const EDIT_RUNS = 2000;
const OPEN_RUNS = 100;
/** Longest an edit may take: the app re-evaluates on every keystroke. */
const EDIT_GOAL_MS = 1;

/**
 * A 50-cell study: `a0` is a rate, each `a<i>` is 1.01 times the one before, and each rate
 * cell cools a state at the last rate. `pad` is appended to every value, so that texts can
 * be made new (and parsed afresh) without changing what they mean.
 */
function chainStudy(pad = ''): { format: string; version: number; title: string; cells: unknown[] } {
  const cells: unknown[] = [];
  for (let i = 0; i < CHAIN; i++) {
    cells.push({ id: `p${i}`, kind: 'parameters', items: [{ name: `a${i}`, value: (i === 0 ? '0.35 / h' : `a${i - 1} * 1.01`) + pad }] });
  }
  for (let j = 0; j < RATES; j++) {
    cells.push({ id: `r${j}`, kind: 'rate', state: `S${j}`, unit: 'degC', rate: `-a${CHAIN - 1} * (S${j} - ${15 + j} degC)` + pad, initial: `${70 + j} degC` + pad });
  }
  return { format: 'ratebook-study', version: 1, title: 'chain', cells };
}

function openChain(pad = ''): StudySession {
  const opened = openStudy(chainStudy(pad));
  if (!opened.ok) throw new Error(opened.error.message);
  if (!opened.session.report().ok) throw new Error('the benchmark study has an error');
  return opened.session;
}

/** Untimed edits before the timed ones: at least this many, and at least this long (ms). */
const EDIT_WARMUP_RUNS = 500;
const EDIT_WARMUP_MS = 1000;

/** Times `runs` edits, each alternating between two values of one parameter. */
async function timeEdits(session: StudySession, index: number, runs: number): Promise<{ stats: LoopStats; rerun: number }> {
  const name = `a${index}`;
  const values = index === 0 ? ['0.35 / h', '0.36 / h'] : [`a${index - 1} * 1.01`, `a${index - 1} * 1.02`];
  const edit = (i: number) => ({ type: 'replace' as const, cell: { id: `p${index}`, kind: 'parameters', items: [{ name, value: values[(i + 1) % 2] }] } });
  let rerun = 0;
  const stats = await timeLoop((i) => {
    const r = session.apply(edit(i));
    if (!r.ok) throw new Error(r.error.message);
    rerun = r.rerun.length;
  }, { warmupRuns: EDIT_WARMUP_RUNS, warmupMs: EDIT_WARMUP_MS, runs });
  return { stats, rerun };
}

async function editRows(): Promise<Row[]> {
  const rows: Row[] = [];
  const cells = CHAIN + RATES;
  for (const [where, index] of [['near the top (a1: every cell below re-runs)', 1], ['at the end of the chain (a44: it and the rate cells re-run)', CHAIN - 1]] as const) {
    const { stats, rerun } = await timeEdits(openChain(), index, EDIT_RUNS);
    rows.push(...loopRows(`edit one parameter ${where}, ${cells} cells: ${rerun} cells re-run`, stats, EDIT_GOAL_MS));
  }
  for (let i = 0; i < 20; i++) openChain();
  const warm: number[] = [];
  for (let i = 0; i < OPEN_RUNS; i++) {
    const t0 = performance.now();
    openChain();
    warm.push(performance.now() - t0);
  }
  // every value's text new, so that nothing comes from the parse cache
  const cold: number[] = [];
  for (let i = 0; i < OPEN_RUNS; i++) {
    const pad = ' '.repeat(i + 1);
    const t0 = performance.now();
    openChain(pad);
    cold.push(performance.now() - t0);
  }
  rows.push(
    { measure: `open the ${cells}-cell study (texts already parsed once); median`, result: ms(median(warm)) },
    { measure: `open the ${cells}-cell study (every text new, parsed); median`, result: ms(median(cold)) },
  );
  return rows;
}

// ---------------------------------------------------------------------------------------
// Sections written elsewhere

function phaseRows(): Row[] {
  return phaseBenchmarks().map((r) => ({
    measure: `${r.name} (${r.evaluations} evaluations); median of ${r.runs}`,
    result: ms(r.ms), goal: `< ${r.goalMs} ms`, met: r.ok,
  }));
}

function odeRows(): Row[] {
  return odeBench().map((r) => ({
    measure: r.name,
    result: r.unit === 'ms' ? ms(r.value) : String(r.value),
    goal: `<= ${r.unit === 'ms' ? ms(r.goal) : r.goal} (odex)`,
    met: r.met,
  }));
}

function stiffRows(): Row[] {
  return stiffBench().map((r) => {
    const ratio = r.evaluations / r.lsoda;
    return {
      measure: `${r.method} (${r.formula}) rtol ${r.rtol.toExponential(0)}: ${r.evaluations} evaluations, ${r.jacobians} Jacobians, ` +
        `${r.units.toFixed(2)} units at the steps`,
      result: `${ratio.toFixed(2)}x LSODA`, goal: `<= 1.25x (LSODA ${r.lsoda})`, met: ratio <= 1.25,
    };
  });
}

function workPrecisionRows(): Row[] {
  const e = (x: number) => (Number.isFinite(x) ? x.toExponential(1) : 'failed');
  return workPrecisionBench().map((r) => {
    const { auto, dopri5, dp853, stiff } = r.runs;
    const others = ([['dopri5', dopri5], ['dp853', dp853], ['stiff', stiff]] as const).map(([m, x]) => `${m} ${x.evaluations}/${e(x.error)}`).join(', ');
    const best = Number.isFinite(r.best.evaluations) ? `${r.best.method} ${Math.round(r.best.evaluations)}${r.best.how === 'loosest' ? ' (its loosest run)' : ''}` : 'no SciPy run that accurate';
    return {
      measure: `${r.problem}, rtol ${r.rtol.toExponential(0)}: auto (${auto.method}) ${auto.evaluations} evaluations, error ${e(auto.error)}, ` +
        `${auto.units.toFixed(2)} units; ${others}`,
      result: Number.isNaN(r.ratio) ? best : `${r.ratio.toFixed(2)}x ${best}`,
      goal: `<= 1.25x the best SciPy ${REFERENCE_VERSION}, <= 1 unit`,
      met: r.ratio <= 1.25 && auto.units <= 1,
    };
  });
}

function simulateRows(): Promise<Row[]> {
  return simulateBenchmarks();
}

function whatIfRows(): Row[] {
  return whatIfBenchmarks().map((r) => ({
    measure: r.name,
    result: r.unit === 'ms' ? ms(r.value) : `${r.value.toFixed(2)}x`,
    ...(Number.isNaN(r.goal) ? {} : { goal: r.unit === 'ms' ? `< ${ms(r.goal)}` : `<= ${r.goal}x`, met: r.value <= r.goal }),
  }));
}

function uncertaintyRows(): Row[] {
  return uncertaintyBenchmarks().map((r) => ({
    measure: `${r.name} (${r.evaluations} what-if runs)`, result: ms(r.ms), goal: `< ${r.goalMs} ms`, met: r.ms < r.goalMs,
  }));
}

function closureRows(): Row[] {
  return closureBenchmarks().flatMap((r) => [
    { measure: `${r.name}: generated code, median`, result: ms(r.generatedMs) },
    { measure: '  closures (as under a policy without unsafe-eval), median', result: ms(r.closuresMs) },
    { measure: '  closures / generated code', result: `${(r.closuresMs / r.generatedMs).toFixed(2)}x` },
  ]);
}

function solveRows(): Row[] {
  return solveBenchmarks().map((r) => ({
    measure: `${r.name} (${r.evaluations} what-if runs)`, result: ms(r.ms), goal: `< ${r.goalMs} ms`, met: r.ms < r.goalMs,
  }));
}

function scenarioRows(): Promise<Row[]> {
  return scenarioBenchmarks();
}

function fitRows(): Row[] {
  return [
    ...fitBenchmarks().map((r) => ({ measure: r.name, result: ms(r.ms), goal: `< ${r.goalMs} ms`, met: r.ok })),
    ...fitCellBenchmarks().map((r) => ({ measure: r.name, result: ms(r.ms), goal: `< ${r.goalMs} ms`, met: r.ms < r.goalMs })),
    ...mapFitBenchmarks().map((r) => ({ measure: r.name, result: ms(r.ms), goal: `< ${r.goalMs} ms`, met: r.ms < r.goalMs })),
    ...mapFitRunBenchmarks().map((r) => ({ measure: r.name, result: ms(r.ms), goal: `< ${r.goalMs} ms`, met: r.ms < r.goalMs })),
    ...fitRunBenchmarks().map((r) => ({ measure: r.name, result: ms(r.ms), goal: `< ${r.goalMs} ms`, met: r.ms < r.goalMs })),
    ...fitEvaluationBenchmarks().map((r) => ({
      measure: `${r.name}, digits ${r.digits.join(', ')}: with digits / forward differences alone`,
      result: `${(r.withDigits / r.forward).toFixed(2)}x`, goal: `<= ${DIGITS_COST_GOAL}x`, met: r.withDigits <= DIGITS_COST_GOAL * r.forward,
    })),
    ...ncaBenchmarks().map((r) => ({ measure: r.name, result: ms(r.ms), goal: `< ${r.goalMs} ms`, met: r.ok })),
  ];
}

async function browserRows(): Promise<Row[]> {
  return (await browserBenchmarks()).map((r) => ({ measure: r.name, result: r.value, goal: r.goal, met: r.met }));
}

async function openRows(): Promise<Row[]> {
  return (await openLargeStudyBenchmarks()).map((r) => ({ measure: r.name, result: r.value, goal: r.goal, met: r.met }));
}

const SECTIONS: readonly Section[] = [
  { title: 'Compiled rate laws: evaluations per second', run: rateLawRows },
  { title: 'Incremental editing of a study', run: editRows },
  { title: 'Equilibria and parameter sweeps', run: phaseRows },
  { title: 'ODE integration against odex at equal accuracy', run: odeRows },
  { title: 'Stiff method on y\' = -1e4 (y - cos t) against LSODA', run: stiffRows },
  { title: 'ODE work-precision: auto against SciPy solve_ivp at equal accuracy', run: workPrecisionRows },
  { title: 'ODE step cost: adams against dopri5, alternating', run: stepCostRows },
  { title: 'Simulating a dosing schedule', run: simulateRows },
  { title: 'What-if runs of a dosing schedule', run: whatIfRows },
  { title: 'Rate law runs: generated code against closures', run: closureRows },
  { title: 'Solving for a dose', run: solveRows },
  { title: 'How sure: Monte Carlo and linear uncertainty', run: uncertaintyRows },
  { title: 'How sure: the band around a run, on and off', run: bandRows },
  { title: 'Sensitivity and scenarios side by side', run: scenarioRows },
  { title: 'Fitting and profile summaries', run: fitRows },
  { title: 'Studies of many cells: opening a chain of parameters', run: scalingBenchmarks },
  { title: 'Large CSV logs read into a table', run: csvBenchmarks },
  { title: 'In the browser: dragging a slider, and the bundle', run: browserRows },
  { title: 'In the browser: opening a 200-cell study', run: openRows },
];

// ---------------------------------------------------------------------------------------
// The table

function printSection(title: string, rows: readonly Row[], seconds: number): void {
  const status = (r: Row) => (r.met === undefined ? '' : r.met ? 'met' : 'not met');
  const width = (f: (r: Row) => string, head: string) => Math.max(head.length, ...rows.map((r) => f(r).length));
  const w = [width((r) => r.measure, 'measure'), width((r) => r.result, 'result'), width((r) => r.goal ?? '', 'goal'), width(status, 'status')];
  const line = (cells: string[]) => cells.map((c, i) => (i === 1 ? c.padStart(w[i]) : c.padEnd(w[i]))).join('  ').trimEnd();
  console.log(`\n${title} (${seconds.toFixed(1)} s)`);
  console.log(line(['measure', 'result', 'goal', 'status']));
  console.log(line(w.map((n) => '-'.repeat(n))));
  for (const r of rows) console.log(line([r.measure, r.result, r.goal ?? '', status(r)]));
}

async function main(): Promise<void> {
  const filter = process.argv.slice(2).join(' ').toLowerCase();
  const chosen = SECTIONS.filter((s) => s.title.toLowerCase().includes(filter));
  console.log(`Ratebook benchmark, Node ${process.version}, ${new Date().toISOString()}`);
  let met = 0, notMet = 0;
  for (const s of chosen) {
    const t0 = performance.now();
    try {
      const rows = await s.run();
      printSection(s.title, rows, (performance.now() - t0) / 1000);
      met += rows.filter((r) => r.met === true).length;
      notMet += rows.filter((r) => r.met === false).length;
    } catch (err) {
      console.log(`\n${s.title}: could not run: ${(err as Error)?.stack ?? String(err)}`);
      process.exitCode = 1;
    }
  }
  console.log(`\nGoals met: ${met} of ${met + notMet}.`);
}

await main();
