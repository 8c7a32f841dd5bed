/**
 * Benchmark rows: a rate law run with the law compiled to generated code (`new Function`)
 * against the closures the compiler falls back to where a content security policy forbids
 * generated code. Two runs through the what-if evaluator (the numeric core only, as a solve
 * or a fit would repeat it), each with the rate constant replaced on every call: the 6-dose
 * schedule of `simulate.ts`, and Newton cooling of a pot through a change of ambient (invented
 * numbers). The two forms are timed alternately on the same values; their answers must be
 * equal bit for bit. No goal: the figures decide where generated code may run (README).
 */
import { openStudy } from '../src/index.ts';
import { setGeneratedCode } from '../src/expression/compile.ts';
import { SIX_DOSES } from './simulate.ts';

export interface ClosureRow { readonly name: string; readonly generatedMs: number; readonly closuresMs: number }

const HOUR = 3600;

/** A pot of stock at 74 degC cooling in 20 degC air, then from 2 h in a 3 degC walk-in (invented numbers). */
const COOLING = {
  format: 'ratebook-study', version: 1, title: 'bench: cooling',
  cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.55 / h' }, { name: 'Ta', value: '20 degC' }, { name: 'T0', value: '74 degC' }] },
    { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: 'T0' },
    { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '12 h',
      events: [{ at: '2 h', set: { Ta: '3 degC' } }],
      find: [{ name: 't_21', crossing: 'T', level: '21 degC' }, { name: 't_5', crossing: 'T', level: '5 degC' }] },
  ],
};

/** Saturable elimination under a constant infusion, at a tight tolerance: more of the run is the law itself (invented numbers). */
const SATURABLE = {
  format: 'ratebook-study', version: 1, title: 'bench: saturable',
  cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'Vmax', value: '12 mg / (L * h)' }, { name: 'Km', value: '4 mg / L' }, { name: 'R', value: '200 mg / h' }, { name: 'V', value: '40 L' }, { name: 'k', value: '0.02 / h' }] },
    { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-Vmax * C / (Km + C) - k * C + R / V', initial: '0 mg / L' },
    { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '72 h', tolerance: { relative: 1e-10 },
      find: [{ name: 'Cmax', maximum: 'C' }, { name: 'auc', integralOf: 'C' }] },
  ],
};

const CASES = [
  { name: '6-dose IV bolus schedule, 4 questions (`-k * C`)', study: SIX_DOSES, wanted: ['Cmax', 'trough', 'auc', 'above'], k: (i: number) => (0.05 + 0.2 * (i % 500) / 499) / HOUR },
  { name: 'saturable elimination under an infusion at rtol 1e-10 (`-Vmax * C / (Km + C) - k * C + R / V`)', study: SATURABLE, wanted: ['Cmax', 'auc'], k: (i: number) => (0.01 + 0.02 * (i % 500) / 499) / HOUR },
  { name: 'cooling through a change of ambient, 2 crossings (`-k * (T - Ta)`)', study: COOLING, wanted: ['t_21', 't_5'], k: (i: number) => (0.4 + 0.4 * (i % 500) / 499) / HOUR },
];

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

/** One call in the given form: the form is set for the call only, as the worker or the page would have it throughout. */
function inForm<T>(generated: boolean, f: () => T): T {
  setGeneratedCode(generated ? undefined : false);
  try {
    return f();
  } finally {
    setGeneratedCode(undefined);
  }
}

export function closureBenchmarks(runs = 1500): ClosureRow[] {
  return CASES.map((c) => {
    const opened = openStudy(c.study);
    if (!opened.ok) throw new Error(opened.error.message);
    const w = opened.session.whatIf(c.wanted, [{ name: 'k', dimension: '1 / h' }]);
    if (!w.ok) throw new Error(w.error.message);
    const gen: number[] = [];
    const clo: number[] = [];
    for (let i = 0; i < runs + 300; i++) {
      const k = c.k(i);
      let t0 = performance.now();
      const a = inForm(true, () => w.evaluate([k]));
      const tg = performance.now() - t0;
      t0 = performance.now();
      const b = inForm(false, () => w.evaluate([k]));
      const tc = performance.now() - t0;
      if (!a.ok || !b.ok || a.values.some((v, j) => !Object.is(v, b.values[j]))) throw new Error(`${c.name}: generated code and closures disagree at k = ${k * HOUR} / h`);
      if (i >= 300) { gen.push(tg); clo.push(tc); }
    }
    return { name: c.name, generatedMs: median(gen), closuresMs: median(clo) };
  });
}
