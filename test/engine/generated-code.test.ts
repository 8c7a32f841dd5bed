/**
 * Compiled expressions with and without generated code. Under a strict content security
 * policy `new Function` throws an EvalError; the compiler then builds closures, which must
 * give the same numbers bit for bit. Node's `--disallow-code-generation-from-strings` refuses
 * `new Function` the same way a browser's policy does.
 */
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import fc from 'fast-check';
import { parseExpression, evaluateExpression, compileExpression, openStudy } from '../../src/index.ts';
import { generatedCodeInUse, setGeneratedCode } from '../../src/expression/compile.ts';
import { quantity } from './helpers.ts';

const root = fileURLToPath(new URL('../..', import.meta.url));

/** One compartment, 500 mg IV every 8 h six times into 30 L, k = 0.1 / h (invented numbers). */
const DOSES: Record<string, unknown> = {
  format: 'ratebook-study', version: 1, title: 'six doses',
  cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'dose', value: '500 mg' }, { name: 'V', value: '30 L' }, { name: 'k', value: '0.1 / h' }] },
    { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
    { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '48 h',
      events: [{ at: '0 h', every: '8 h', count: 6, add: { C: 'dose / V' } }],
      find: [{ name: 'Cmax', maximum: 'C' }, { name: 'C_end', valueOf: 'C', at: '48 h' }] },
  ],
};

/** Closed form of repeated IV bolus (superposition, standard pharmacokinetics, from memory): the peak after dose n is (D/V)(1 - r^n)/(1 - r), r = e^(-k tau). */
const R = Math.exp(-0.1 * 8);
const CMAX = (500 / 30) * (1 - R ** 6) / (1 - R); // mg/L
const C_END = CMAX * R; // 8 h after the sixth dose, mg/L

const RUN_AND_PRINT = `
const { openStudy } = await import('./src/index.ts');
const { generatedCodeInUse } = await import('./src/expression/compile.ts');
const opened = openStudy(${JSON.stringify(DOSES)});
const run = opened.session.report().cells.find((c) => c.id === 'run');
console.log(JSON.stringify({ generated: generatedCodeInUse(), results: run.results, steps: run.steps }));
`;

function runIn(flags: string[]): { generated: boolean; results: Record<string, { value: number; si: number }>; steps: number } {
  const r = spawnSync(process.execPath, [...flags, '--import', 'tsx', '--input-type=module', '-e', RUN_AND_PRINT], { cwd: root, encoding: 'utf8' });
  assert.equal(r.status, 0, r.stderr);
  return JSON.parse(r.stdout);
}

describe('compiled expressions where generated code is refused', () => {
  it('a run falls back to closures when new Function throws, and gives the same numbers', () => {
    const refused = runIn(['--disallow-code-generation-from-strings']);
    assert.equal(refused.generated, false, 'closures are used when new Function is refused');
    const opened = openStudy(DOSES);
    assert.ok(opened.ok);
    const run = opened.session.report().cells.find((c) => c.id === 'run') as unknown as typeof refused;
    assert.equal(generatedCodeInUse(), true, 'generated code is used where it is allowed');
    assert.deepEqual(refused.results, JSON.parse(JSON.stringify(run.results)), 'the same answers, bit for bit');
    assert.equal(refused.steps, run.steps);
    // closed form of repeated IV bolus (see CMAX above), to the run's tolerance
    assert.ok(Math.abs(refused.results.Cmax.value - CMAX) <= 1e-4 * CMAX, `Cmax ${refused.results.Cmax.value}, closed form ${CMAX}`);
    assert.ok(Math.abs(refused.results.C_end.value - C_END) <= 1e-4 * C_END, `C(48 h) ${refused.results.C_end.value}, closed form ${C_END}`);
  });

  it('a session in this process gives the same report with closures as with generated code', () => {
    const report = () => {
      const opened = openStudy(DOSES);
      assert.ok(opened.ok);
      return JSON.stringify(opened.session.report().cells.find((c) => c.id === 'run'));
    };
    const generated = report();
    setGeneratedCode(false);
    try {
      assert.equal(report(), generated);
      assert.equal(generatedCodeInUse(), false);
    } finally {
      setGeneratedCode(undefined);
    }
  });
});

// ---------------------------------------------------------------------------------------
// Random expressions: closures and generated code agree bit for bit

const INPUTS = ['x', 'y', 'z'] as const;
const names = new Map<string, ReturnType<typeof quantity>>(INPUTS.map((n) => [n, quantity('1')]));
const leaf = fc.oneof(
  fc.constantFrom(...INPUTS),
  fc.integer({ min: 0, max: 30 }).map(String),
  fc.double({ min: 0, max: 1e3, noNaN: true }).map((v) => String(v)),
  fc.constantFrom('pi', 'e', '(20 degC / (1 degC))', '(3 h / (1 min))'),
);
const { expr } = fc.letrec<{ expr: string; cond: string }>((tie) => ({
  expr: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    leaf,
    fc.tuple(tie('expr'), fc.constantFrom('+', '-', '*', '/', '^'), tie('expr')).map(([a, op, b]) => `(${a} ${op} ${b})`),
    tie('expr').map((a) => `(-${a})`),
    fc.tuple(fc.constantFrom('exp', 'log', 'log10', 'sqrt', 'cbrt', 'abs', 'sign', 'sin', 'cos', 'tanh', 'floor', 'ceil', 'round'), tie('expr')).map(([f, a]) => `${f}(${a})`),
    fc.tuple(fc.constantFrom('min', 'max', 'pow'), tie('expr'), tie('expr')).map(([f, a, b]) => `${f}(${a}, ${b})`),
    fc.tuple(tie('cond'), tie('expr'), tie('expr')).map(([c, a, b]) => `(${c} ? ${a} : ${b})`),
  ),
  cond: fc.oneof(
    { depthSize: 'small' },
    fc.tuple(tie('expr'), fc.constantFrom('<', '<=', '>', '>=', '==', '!='), tie('expr')).map(([a, op, b]) => `(${a} ${op} ${b})`),
    fc.tuple(tie('expr'), tie('expr'), tie('expr')).map(([a, b, c]) => `(${a} < ${b} < ${c})`),
    fc.tuple(tie('cond'), fc.constantFrom('and', 'or'), tie('cond')).map(([a, op, b]) => `(${a} ${op} ${b})`),
    tie('cond').map((a) => `(not ${a})`),
  ),
}));
const value = fc.oneof(fc.double({ noNaN: false }), fc.double({ min: -10, max: 10, noNaN: true }), fc.constantFrom(0, -0, 1, -1, Infinity));

describe('closures and generated code agree', () => {
  it('on random expressions over random inputs, bit for bit (Object.is)', () => {
    let compared = 0;
    fc.assert(fc.property(fc.oneof(expr, fc.tuple(expr).map(([e]) => `(${e} > 1)`)), fc.tuple(value, value, value), (text, xs) => {
      const parsed = parseExpression(text);
      assert.ok(parsed.ok, `${text} did not parse: ${!parsed.ok && parsed.error.message}`);
      if (!parsed.ok) return;
      const lookup = (n: string) => names.get(n);
      if (!evaluateExpression(parsed.expr, lookup).ok) return;
      const compile = (generated: boolean) => {
        setGeneratedCode(generated ? undefined : false);
        try {
          return compileExpression(parsed.expr, lookup, INPUTS);
        } finally {
          setGeneratedCode(undefined);
        }
      };
      const code = compile(true);
      const closures = compile(false);
      const a = code(xs), b = closures(xs);
      assert.ok(Object.is(a, b), `${text} at (${xs.join(', ')}): generated code ${a}, closures ${b}`);
      compared++;
    }), { numRuns: 3000 });
    // the check must reach the compiler often, or it proves little
    assert.ok(compared > 1500, `only ${compared} of 3000 expressions got through the checker`);
  });
});
