/**
 * Property tests: random and mutated expressions and study documents through the public API.
 *
 * What must hold for every input, however broken:
 * - parse, check, compile, openStudy, apply and runStudy return a value or a reported
 *   error; nothing throws out of them and nothing takes long;
 * - forbidden constructs (assignment, property access, indexing, lists, objects, strings,
 *   conversions, ranges, calls outside the allow-list, comments) are always refused;
 * - a compiled expression gives exactly the checker's SI value;
 * - a session after any sequence of edits reports what a fresh run of its document reports.
 *
 * Fixed seeds: a failure reproduces. Run counts add up to more than 10,000 inputs.
 */
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import {
  parseExpression, evaluateExpression, compileExpression, openStudy, runStudy, FUNCTION_NAMES,
  type Edit, type Lookup, type Quantity, type Report,
} from '../../src/index.ts';
import { setGeneratedCode } from '../../src/expression/compile.ts';

/** Fixed, so that a failure reproduces; set RATEBOOK_PROPERTY_SEED to explore other inputs. */
const SEED = Number(process.env.RATEBOOK_PROPERTY_SEED ?? 20261202);

/** fast-check settings: a fixed seed per property, and the failing assertion in the report. */
const runs = (offset: number, numRuns: number) => ({ seed: SEED + offset, numRuns, includeErrorInReport: true });

/**
 * Longest one call may take before it counts as hanging. A hang detector, not a speed goal
 * (those live in `npm run bench`): the slowest honest call seen is a few milliseconds, so
 * this bound is a thousand times that, for shared and loaded CI machines.
 */
const HANG_MS = 5000;

function timed<T>(what: string, f: () => T): T {
  const t0 = performance.now();
  const r = f();
  const ms = performance.now() - t0;
  assert.ok(ms < HANG_MS, `${what} took ${ms.toFixed(0)} ms`);
  return r;
}

// ---------------------------------------------------------------------------------------
// Expressions

/** The names an expression may read, with values in a spread of units and kinds. */
const SCOPE_TEXT: Record<string, string> = {
  k: '0.35 / h', T: '74 degC', Ta: '20 degC', Tf: '40 degF', Tk: '300 K', dT: '5 K',
  x: '2', n: '0', neg: '-3', V: '42 L', C: '1000 mg / (42 L)', tm: '90 min',
  big: '1e300', tiny: '1e-300', Km: '2 mg / L', Vmax: '0.5 mg / L / h', R: '10 mg / h',
};

const SCOPE = new Map<string, Quantity>(Object.entries(SCOPE_TEXT).map(([name, text]) => {
  const p = parseExpression(text);
  assert.ok(p.ok, text);
  const v = evaluateExpression(p.expr, () => undefined);
  assert.ok(v.ok && typeof v.value !== 'boolean', text);
  return [name, v.value as Quantity];
}));

const lookup: Lookup = (name) => SCOPE.get(name);

/** Names: defined ones, constants, and a few that are defined nowhere. */
const NAMES = [...SCOPE.keys(), 'pi', 'e', 'gravity', 'q', 'Tb', 't'];
const UNITS = ['h', 'min', 's', 'd', 'mg', 'g', 'kg', 'L', 'mL', 'm', 'mol', 'degC', 'degF', 'K', 'degR'];
const CALLABLE = [...FUNCTION_NAMES, 'pow'];

const numberText = fc.oneof(
  fc.nat({ max: 1000 }).map(String),
  fc.double({ min: 0, max: 1e6, noNaN: true }).map(String),
  fc.constantFrom('0', '0.5', '.5', '2.', '1e-7', '2.5e3', '1e308', '1e400', '5e-324', '0x1F'),
);
const unitText = fc.constantFrom(...UNITS);
const nameText = fc.constantFrom(...NAMES);

const leafText = fc.oneof(
  numberText,
  nameText,
  nameText,
  unitText,
  fc.tuple(numberText, unitText).map(([v, u]) => `${v} ${u}`),
  fc.tuple(numberText, unitText, unitText).map(([v, a, b]) => `${v} ${a} / ${b}`),
  fc.tuple(nameText, unitText).map(([n, u]) => `${n} ${u}`),
  fc.constantFrom('true', 'false'),
);

/** Expressions from the grammar of the contract: valid syntax, not always valid meaning. */
const { expr: grammarText } = fc.letrec<{ expr: string }>((tie) => ({
  expr: fc.oneof(
    { maxDepth: 6, depthSize: 'small' },
    leafText,
    fc.tuple(tie('expr'), fc.constantFrom('+', '-', '*', '/', '^'), tie('expr')).map(([a, op, b]) => `${a} ${op} ${b}`),
    fc.tuple(tie('expr'), fc.constantFrom('+', '-', '*', '/'), tie('expr')).map(([a, op, b]) => `(${a}) ${op} (${b})`),
    tie('expr').map((a) => `-${a}`),
    tie('expr').map((a) => `(${a})`),
    fc.tuple(tie('expr'), fc.constantFrom('<', '>', '<=', '>=', '==', '!='), tie('expr')).map(([a, op, b]) => `${a} ${op} ${b}`),
    fc.tuple(tie('expr'), tie('expr'), tie('expr')).map(([c, a, b]) => `${c} ? ${a} : ${b}`),
    fc.tuple(tie('expr'), fc.constantFrom('and', 'or'), tie('expr')).map(([a, op, b]) => `${a} ${op} ${b}`),
    tie('expr').map((a) => `not ${a}`),
    fc.tuple(fc.constantFrom(...CALLABLE), fc.array(tie('expr'), { maxLength: 3 })).map(([f, args]) => `${f}(${args.join(', ')})`),
    fc.tuple(tie('expr'), unitText).map(([a, u]) => `(${a}) ${u}`),
    fc.tuple(tie('expr'), fc.constantFrom('2', '-1', '0.5', '3')).map(([a, p]) => `(${a}) ^ ${p}`),
  ),
}));

/** Expressions built to type-check more often: rate laws and derived values over SCOPE. */
const lawText = fc.oneof(
  fc.constantFrom(
    '-k * (T - Ta)', '-k * (T - Tf)', '-Vmax * C / (Km + C) + R / V', 'log(2) / k', 'T - 5 K',
    '80 degF - 20 degC', 'x degC', 'Tk - T', 'min(T, Ta)', 'abs(neg) * dT', 'round(x * 3.7, 1)',
    'T > Ta ? k * (T - Ta) : 0 K / h', 'sqrt(V * V)', 'k * tm', 'exp(-k * tm)', '1000 mg / (42 L)',
    'pow(x, 3)', 'floor(tm / (1 min))', 'x < 3 and not (n > 1)', '1 < x < 3', 'C * V / (10 mg)',
  ),
  fc.tuple(fc.constantFrom('k', 'x', '1 / h', 'n', 'neg'), fc.constantFrom('T', 'Ta', 'Tf', 'Tk'), fc.constantFrom('T', 'Ta', 'Tf', 'Tk', '4 degC', '39 degF')).map(([a, b, c]) => `-${a} * (${b} - ${c})`),
);

type Mutation =
  | { kind: 'delete'; at: number; len: number }
  | { kind: 'insert'; at: number; text: string }
  | { kind: 'swap'; at: number }
  | { kind: 'duplicate'; at: number; len: number };

const INSERTABLE = [...'()+-*/^<>=!?:,.;[]{}"\'`#$%&|~@\\ \n\t0123456789eEhkxTCdgL_', 'degC', ' and ', ' or ', 'not ', ' to ', ' in ', ' mod ', 'µ', '°', '\u0000', '\u2212'];

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ kind: fc.constant('delete' as const), at: fc.nat(), len: fc.integer({ min: 1, max: 3 }) }),
  fc.record({ kind: fc.constant('insert' as const), at: fc.nat(), text: fc.oneof(fc.constantFrom(...INSERTABLE), fc.string({ maxLength: 3 }), fc.string({ unit: 'binary', maxLength: 2 })) }),
  fc.record({ kind: fc.constant('swap' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('duplicate' as const), at: fc.nat(), len: fc.integer({ min: 1, max: 8 }) }),
);

function mutate(text: string, m: Mutation): string {
  const at = m.at % (text.length + 1);
  switch (m.kind) {
    case 'delete': return text.slice(0, at) + text.slice(at + m.len);
    case 'insert': return text.slice(0, at) + m.text + text.slice(at);
    case 'swap': return at + 1 < text.length ? text.slice(0, at) + text[at + 1] + text[at] + text.slice(at + 2) : text;
    case 'duplicate': return text.slice(0, at) + text.slice(at, at + m.len) + text.slice(at);
  }
}

/** Constructs the contract forbids, written as a study author (or an attacker) might. */
const FORBIDDEN = [
  '=', 'a = 1', 'a.b', 'x.constructor', 'a[1]', '[1,2]', '{a:1}', '"str"', "'s'", 'createUnit("x")',
  'evaluate("1")', 'import({})', 'parse("1")', 'compile("1")', 'simplify(x)', 'f(x)=x', 'x to h',
  'x in h', '1:3', ';', '\n', 'x?.y', 'x ?? 1', '2 mod 3', '5 % 2', '3!', "x'", 'x | 1', 'x & 1',
  '~x', 'x xor 1', 'x >> 1', '# note', 'cos.constructor', 'import', 'matrix([1])', 'x(2)',
];

/**
 * A conservative oracle: a reason the text can never be an allowed expression, or
 * undefined when it cannot tell. Each rule follows from the contract's allow-list (common
 * practice for a restricted expression language: anything not listed is refused).
 */
function forbiddenReason(text: string): string | undefined {
  const callable = new Set([...CALLABLE, 'and', 'or', 'not']);
  if (text.length > 4000) return 'longer than the limit';
  if (/createUnit\s*\(|evaluate\s*\(|import\s*\(|parse\s*\(/.test(text)) return 'calls a mathjs function';
  if (/[;\n\r]/.test(text)) return 'more than one expression';
  if (/["'`]/.test(text)) return 'a string or transpose';
  if (/[[\]{}]/.test(text)) return 'a list, index or object';
  if (/#/.test(text)) return 'a comment';
  if (/(^|[^=<>!])=(?!=)/.test(text)) return 'an assignment';
  // a name or ")" then "." then a letter (a number such as 0xa.b1 or 2.e3 is not a name)
  if (/((?<![A-Za-z0-9_$.])[A-Za-z_$][A-Za-z0-9_$]*|\))\s*\.\s*[A-Za-z_$]/.test(text)) return 'property access';
  // `to`, `mod` and `xor` are operators after an operand (`x to h`), names elsewhere (`2 * mod`)
  for (const m of text.matchAll(/(?<![A-Za-z0-9_$.])([A-Za-z0-9_$.]+|\))\s+(to|mod|xor)(?![A-Za-z0-9_$])/g)) {
    if (!['not', 'and', 'or', 'to', 'mod', 'xor', 'in'].includes(m[1])) return `the operator ${m[2]}`;
  }
  if (/!(?!=)/.test(text)) return 'a factorial';
  if (/[&|~\\]/.test(text)) return 'a bitwise operator';
  if ((text.match(/:/g) ?? []).length !== (text.match(/\?/g) ?? []).length) return 'a range, an object or optional chaining';
  // a call: a name right before "(" (true, false, NaN and Infinity are values, not names)
  for (const m of text.matchAll(/(?<![A-Za-z0-9_.$])([A-Za-z_][A-Za-z0-9_]*)\s*\(/g)) {
    if (!callable.has(m[1]) && !['true', 'false', 'NaN', 'Infinity'].includes(m[1])) return `a call of ${m[1]}`;
  }
  // with no strings, every parenthesis is a token: an accepted text has them balanced (a
  // parser that stops early and drops the rest of the text would break this)
  let depth = 0;
  for (const ch of text) {
    depth += ch === '(' ? 1 : ch === ')' ? -1 : 0;
    if (depth < 0) return 'a ")" without its "("';
  }
  if (depth !== 0) return 'a "(" without its ")"';
  return undefined;
}

const EXPR_KINDS = new Set(['num', 'bool', 'sym', 'bin', 'neg', 'cmp', 'logic', 'not', 'if', 'call']);

/** Every node of a parsed tree is of an allowed kind and every call is to an allowed function. */
function assertAllowListed(e: any, text: string): void {
  assert.ok(EXPR_KINDS.has(e?.k), `${JSON.stringify(text)} parsed to a node of kind ${e?.k}`);
  if (e.k === 'call') assert.ok(FUNCTION_NAMES.includes(e.fn), `${JSON.stringify(text)} calls ${e.fn}`);
  for (const key of ['a', 'b', 'c']) if (e[key]) assertAllowListed(e[key], text);
  for (const arg of e.args ?? []) assertAllowListed(arg, text);
}

function assertProblem(error: unknown, text: string, where: string): void {
  const e = error as { message?: unknown; span?: unknown };
  assert.equal(typeof e?.message, 'string', `${where} of ${JSON.stringify(text)}: no message`);
  assert.ok((e.message as string).length > 0, `${where} of ${JSON.stringify(text)}: empty message`);
  if (e.span !== undefined) {
    const [a, b] = e.span as [number, number];
    assert.ok(Number.isInteger(a) && Number.isInteger(b) && a >= 0 && a <= b && b <= text.length,
      `${where} of ${JSON.stringify(text)}: span ${JSON.stringify(e.span)} outside the text`);
  }
}

function sameNumber(a: number, b: number): boolean {
  return a === b || Object.is(a, b);
}

/** How far the expression pipeline got, to prove the properties were not vacuous. */
interface Tally { parsed: number; checked: number; compiled: number; refused: number; total: number }
const tally = (): Tally => ({ parsed: 0, checked: 0, compiled: 0, refused: 0, total: 0 });

/**
 * Parse, check and compile one text, asserting the contract at each step. The compiled
 * function must give the checker's SI value exactly, through generated code and through the
 * closure fallback, with every name folded in or with the names it reads passed as inputs.
 */
function throughPipeline(text: string, t: Tally): void {
  t.total++;
  const parsed = timed(`parse ${JSON.stringify(text.slice(0, 80))}`, () => parseExpression(text));
  assert.equal(typeof parsed.ok, 'boolean');
  const reason = forbiddenReason(text);
  if (!parsed.ok) {
    t.refused++;
    assertProblem(parsed.error, text, 'parse');
    return;
  }
  assert.equal(reason, undefined, `${JSON.stringify(text)} contains ${reason}, yet it parsed`);
  t.parsed++;
  assertAllowListed(parsed.expr, text);
  const checked = timed(`check ${JSON.stringify(text.slice(0, 80))}`, () => evaluateExpression(parsed.expr, lookup));
  if (!checked.ok) {
    assertProblem(checked.error, text, 'check');
    return;
  }
  t.checked++;
  const v = checked.value;
  const expected = typeof v === 'boolean' ? (v ? 1 : 0) : v.si;
  if (typeof v !== 'boolean') {
    assert.ok(Array.isArray(v.dim) || ArrayBuffer.isView(v.dim), 'a quantity has a dimension');
  }
  const inputs = [...SCOPE.keys()].filter((n) => new RegExp(`(?<![A-Za-z0-9_$])${n}(?![A-Za-z0-9_$])`).test(text));
  const args = inputs.map((n) => SCOPE.get(n)!.si);
  for (const generated of [true, false]) {
    setGeneratedCode(generated ? undefined : false);
    try {
      const folded = compileExpression(parsed.expr, lookup, [])([]);
      assert.ok(sameNumber(folded, expected),
        `${JSON.stringify(text)}: compiled (${generated ? 'code' : 'closures'}) gives ${folded}, the checker ${expected}`);
      const withInputs = compileExpression(parsed.expr, lookup, inputs)(args);
      assert.ok(sameNumber(withInputs, expected),
        `${JSON.stringify(text)} with inputs ${inputs.join(', ')}: compiled (${generated ? 'code' : 'closures'}) gives ${withInputs}, the checker ${expected}`);
    } finally {
      setGeneratedCode(undefined);
    }
  }
  t.compiled++;
}

describe('expressions: anything in, a value or a message out', () => {
  it('takes expressions from the grammar through parse, check and compile', (ctx) => {
    const t = tally();
    fc.assert(fc.property(fc.oneof(grammarText, lawText), (text) => throughPipeline(text, t)), runs(0, 3000));
    // the run must reach the checker and the compiler often, or it proves little
    assert.ok(t.parsed > t.total * 0.5, `only ${t.parsed} of ${t.total} parsed`);
    assert.ok(t.compiled > t.total * 0.1, `only ${t.compiled} of ${t.total} got through the checker`);
    ctx.diagnostic(JSON.stringify(t));
  });

  it('takes mutated expressions (characters deleted, inserted, swapped, repeated)', (ctx) => {
    const t = tally();
    fc.assert(fc.property(fc.oneof(grammarText, lawText), fc.array(mutation, { minLength: 1, maxLength: 4 }), (text, ms) => {
      throughPipeline(ms.reduce(mutate, text), t);
    }), runs(1, 3000));
    assert.ok(t.refused > t.total * 0.1 && t.parsed > t.total * 0.1, JSON.stringify(t));
    ctx.diagnostic(JSON.stringify(t));
  });

  it('refuses every forbidden construct, wherever it is put', () => {
    const t = tally();
    let flagged = 0;
    const placed = fc.tuple(fc.oneof(grammarText, lawText), fc.constantFrom(...FORBIDDEN), fc.nat(), fc.nat(3)).map(([text, bad, at, how]) => {
      switch (how) {
        case 0: return bad;
        case 1: return `${text} + ${bad}`;
        case 2: return `${bad} * (${text})`;
        default: { const i = at % (text.length + 1); return text.slice(0, i) + bad + text.slice(i); }
      }
    });
    fc.assert(fc.property(placed, (text) => {
      if (forbiddenReason(text)) flagged++;
      throughPipeline(text, t);
    }), runs(2, 1500));
    assert.ok(flagged > t.total * 0.8, `the oracle recognised only ${flagged} of ${t.total}`);
  });

  it('refuses the contract\'s forbidden constructs in their plain forms', () => {
    // the cases named in the contract, one by one, so that a regression names itself
    for (const text of ['k = 2', 'a.b', 'a[1]', '[1, 2]', '{a: 1}', '"str"', 'createUnit("x")', 'evaluate("1")',
      'import({})', 'parse("1")', 'f(x) = x', 'x to h', '1:3', 'x; y', '2 # createUnit("x")']) {
      const r = parseExpression(text);
      assert.equal(r.ok, false, `${text} must be refused`);
    }
  });

  it('answers quickly for very deep nesting and very long text', () => {
    const t = tally();
    const deep = fc.tuple(fc.oneof(lawText, grammarText), fc.integer({ min: 50, max: 3000 }), fc.constantFrom('()', '-', 'abs(', 'not ', '[', '(', '1 + ', '2 ^ ', 'x ? 1 : ')).map(([text, n, wrap]) => {
      if (wrap === '()') return '('.repeat(n) + text + ')'.repeat(n);
      if (wrap === 'abs(') return 'abs('.repeat(n) + text + ')'.repeat(n);
      return wrap.repeat(n) + text;
    });
    fc.assert(fc.property(deep, (text) => throughPipeline(text, t)), runs(3, 200));
    for (const text of ['('.repeat(200) + 'x' + ')'.repeat(200), '-'.repeat(3999) + 'x', 'x'.repeat(100000), `${'1 + '.repeat(999)}1`]) {
      throughPipeline(text, t);
    }
  });

  it('reports a message for anything that is not text', () => {
    fc.assert(fc.property(fc.jsonValue(), (v) => {
      if (typeof v === 'string') return;
      const r = parseExpression(v);
      assert.equal(r.ok, false);
      if (!r.ok) assertProblem(r.error, '', 'parse');
    }), runs(4, 300));
  });
});

// ---------------------------------------------------------------------------------------
// Documents

const PARAM_NAMES = ['k', 'Ta', 'T0', 'V', 'dose', 'C0', 't_half', 'Vmax', 'Km', 'h', 'e', 'x'];
const STATES = ['T', 'C', 'A'];
const IDS = ['inputs', 'more', 'cooling', 'drug', 'gut', 'settle', 'run', 'logger', 'fit-k', 'nca', 'n1'];

const DOC_VALUES = [
  '0.35 / h', '74 degC', '20 degC', '165 degF', '42 L', '500 mg', '1000 mg / (42 L)', '2', '0.5 mg / L / h',
  '2 mg / L', 'log(2) / k', 'k * 2', 'dose / V', 'T0 - 5 K', 'Vmax / Km', '80 degF - 20 degC', 'x + 1',
  'h * 2', 'e', 'Ta', 'T0', 'C0 * V', 't_half * k', 'k > 0.1 / h ? Ta : T0', 'Ta + (T0 - Ta) * exp(-k * 1 h)',
  // broken ones
  '', ' ', '1 +', 'k = 2', 'createUnit("x")', 'q + 1', 'T', 't', '2 degC + 3 degC', '1 / 0', 'sqrt(-1)',
  '[1]', 'k to h', 'V + k', 'a.b', 'log(0)', '-(74 degC)', '1e400', '2 # hidden',
];

const docExpr = fc.oneof(
  { weight: 4, arbitrary: fc.constantFrom(...DOC_VALUES) },
  { weight: 1, arbitrary: grammarText },
);
const RATE_LAWS = ['-k * (T - Ta)', '-k * C', '-Vmax * C / (Km + C)', 'k * A - k * C', '-k * A', 'dose / V / h - k * C', '-k * (T - Ta) + 0 K / h', 't > 1 h ? -k * C : 0 mg / L / h', 'T', '-k * (T - 20 degC)'];
const STATE_UNITS = ['degC', 'degF', 'K', 'mg / L', 'mg', 'h', '1', 'mg L', 'degC / h'];

const anyJson = fc.jsonValue({ maxDepth: 2 });
/** Usually a value of the right kind, sometimes anything at all. */
const orJunk = <T>(a: fc.Arbitrary<T>) => fc.oneof({ weight: 12, arbitrary: a }, { weight: 1, arbitrary: anyJson });

const idArb = fc.oneof({ weight: 20, arbitrary: fc.constantFrom(...IDS) }, { weight: 1, arbitrary: fc.constantFrom('Bad', '1x', '', 'a b') });

const itemArb = fc.record({
  name: orJunk(fc.constantFrom(...PARAM_NAMES, ...STATES)),
  value: orJunk(docExpr),
  range: fc.option(fc.tuple(docExpr, docExpr), { nil: undefined }),
  note: fc.option(fc.string({ maxLength: 8 }), { nil: undefined }),
}, { requiredKeys: ['name', 'value'] });

const cellArbs = {
  parameters: fc.record({ id: idArb, kind: fc.constant('parameters'), items: orJunk(fc.array(itemArb, { minLength: 1, maxLength: 4 })) }),
  rate: fc.record({
    id: idArb, kind: fc.constant('rate'), state: orJunk(fc.constantFrom(...STATES)), unit: orJunk(fc.constantFrom(...STATE_UNITS)),
    rate: orJunk(fc.oneof(fc.constantFrom(...RATE_LAWS), docExpr)), initial: orJunk(docExpr),
  }),
  phase: fc.record({
    id: idArb, kind: fc.constant('phase'), rate: orJunk(fc.constantFrom(...IDS)), from: docExpr, to: docExpr,
    sweep: fc.option(fc.record({ name: fc.constantFrom(...PARAM_NAMES), from: docExpr, to: docExpr, steps: orJunk(fc.integer({ min: 0, max: 100 })) }), { nil: undefined }),
  }, { requiredKeys: ['id', 'kind', 'rate', 'from', 'to'] }),
  simulate: fc.record({
    id: idArb, kind: fc.constant('simulate'), rates: orJunk(fc.array(fc.constantFrom(...IDS), { maxLength: 3 })),
    from: fc.constantFrom('0 h', '0 min', 't'), to: orJunk(fc.constantFrom('8 h', '72 h', '1 d', '2 degC')),
    method: orJunk(fc.constantFrom('auto', 'dopri5', 'stiff', 'rk4', 'heun', 'euler', 'magic')),
    step: fc.constantFrom('1 min', '0.1 h', '0 h'),
    events: fc.array(fc.oneof(
      fc.record({ at: docExpr, every: fc.constantFrom('12 h', '8 h'), count: fc.integer({ min: 0, max: 6 }), add: fc.dictionary(fc.constantFrom(...STATES), docExpr, { maxKeys: 2 }) }),
      fc.record({ at: docExpr, set: fc.dictionary(fc.constantFrom(...PARAM_NAMES), docExpr, { maxKeys: 2 }) }),
      fc.record({ at: docExpr, for: docExpr, infuse: fc.dictionary(fc.constantFrom(...STATES), docExpr, { maxKeys: 1 }) }),
      anyJson,
    ), { maxLength: 2 }),
    find: fc.array(fc.oneof(
      fc.record({ name: fc.constantFrom('t_21', 'Cmax', 'k', 'T'), crossing: fc.constantFrom(...STATES), level: docExpr, direction: fc.constantFrom('up', 'down', 'either', 'sideways') }),
      fc.record({ name: fc.constantFrom('Cmax', 'tmax', 'valueOf'), maximum: fc.constantFrom(...STATES) }),
      fc.record({ name: fc.constantFrom('T6', 'auc'), valueOf: fc.constantFrom(...STATES), at: docExpr }),
      anyJson,
    ), { maxLength: 2 }),
  }, { requiredKeys: ['id', 'kind', 'rates', 'from', 'to'] }),
  data: fc.record({
    id: idArb, kind: fc.constant('data'),
    columns: orJunk(fc.constantFrom([{ name: 't', unit: 'min' }, { name: 'T', unit: 'degF' }], [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], [{ name: 't', unit: 'h' }, { name: 't', unit: 'h' }])),
    rows: orJunk(fc.constantFrom([[0, 165], [30, 132.5], [60, 110]], [[0, 1], [2, null]], [[1, 2], [0, 3]], [[0, 'x']], [[0]])),
  }),
  fit: fc.record({
    id: idArb, kind: fc.constant('fit'), rates: fc.array(fc.constantFrom(...IDS), { maxLength: 2 }), data: fc.constantFrom(...IDS), time: fc.constant('t'),
    observe: orJunk(fc.constantFrom({ T: 'T' }, { C: 'C' }, {})),
    estimate: orJunk(fc.array(fc.record({ parameter: fc.constantFrom(...PARAM_NAMES), as: fc.constantFrom('k_hat', 'V_hat', 'k'), guess: docExpr }), { maxLength: 2 })),
    weighting: fc.constantFrom('none', 'relative', 'proportional', 'heavy'),
  }),
  nca: fc.record({
    id: idArb, kind: fc.constant('nca'), data: fc.constantFrom(...IDS), time: fc.constant('t'), concentration: fc.constant('C'), dose: docExpr,
    route: fc.constantFrom('iv-bolus', 'infusion', 'extravascular', 'oral'), auc: fc.constantFrom('linear', 'linear-up-log-down'),
    terminal: orJunk(fc.constantFrom('auto', 3, 2)), prefix: orJunk(fc.constantFrom('', 'p_', 'bad prefix')),
  }, { requiredKeys: ['id', 'kind', 'data', 'time', 'concentration', 'dose', 'route'] }),
  note: fc.record({ id: idArb, kind: fc.constant('note'), text: orJunk(fc.string({ maxLength: 20 })) }),
};

const cellArb: fc.Arbitrary<Record<string, unknown>> = fc.oneof(
  { weight: 6, arbitrary: cellArbs.parameters },
  { weight: 4, arbitrary: cellArbs.rate },
  { weight: 1, arbitrary: cellArbs.phase },
  { weight: 2, arbitrary: cellArbs.simulate },
  { weight: 1, arbitrary: cellArbs.data },
  { weight: 1, arbitrary: cellArbs.fit },
  { weight: 1, arbitrary: cellArbs.nca },
  { weight: 1, arbitrary: cellArbs.note },
) as fc.Arbitrary<Record<string, unknown>>;

/** Drops cells whose id repeats an earlier one: a study that the reader accepts. */
function uniqueIds(cells: Array<Record<string, unknown>>): Array<Record<string, unknown>> {
  const seen = new Set<unknown>();
  return cells.filter((c) => !seen.has(c.id) && (seen.add(c.id), true));
}

const docArb = fc.record({
  title: fc.string({ maxLength: 10 }),
  cells: fc.array(cellArb, { maxLength: 8 }).map(uniqueIds),
}).map(({ title, cells }) => ({ format: 'ratebook-study', version: 1, title, cells }));

/** Values that define every parameter name without error, each reading only earlier ones. */
const SOUND_VALUES: Array<[string, string]> = [
  ['k', '0.35 / h'], ['Ta', '20 degC'], ['T0', '165 degF'], ['V', '42 L'], ['dose', '500 mg'],
  ['C0', 'dose / V'], ['t_half', 'log(2) / k'], ['Vmax', '0.5 mg / L / h'], ['Km', '2 mg / L'], ['x', '2'],
];
const SOUND_RATES = [
  { id: 'cooling', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: 'T0' },
  { id: 'drug', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-Vmax * C / (Km + C) + k * A / V', initial: 'C0' },
  { id: 'gut', kind: 'rate', state: 'A', unit: 'mg', rate: '-k * A', initial: 'dose' },
];

/**
 * A study as a user builds it: the parameters spread over one to three cells (some values
 * swapped for others from the pool), rate laws that use them, a run, a note, in any order.
 */
const soundDocArb = fc.record({
  split: fc.array(fc.nat(2), { minLength: SOUND_VALUES.length, maxLength: SOUND_VALUES.length }),
  swaps: fc.array(fc.tuple(fc.nat(SOUND_VALUES.length - 1), docExpr), { maxLength: 2 }),
  rates: fc.subarray(SOUND_RATES),
  extra: fc.subarray([
    { id: 'run', kind: 'simulate', rates: ['cooling'], from: '0 h', to: '8 h' },
    { id: 'n1', kind: 'note', text: 'notes' },
    { id: 'settle', kind: 'phase', rate: 'cooling', from: '-20 degC', to: '100 degC' },
  ]),
  order: fc.array(fc.nat(), { maxLength: 8 }),
}).map(({ split, swaps, rates, extra, order }) => {
  const values = SOUND_VALUES.map(([name, value]) => ({ name, value }));
  for (const [i, value] of swaps) values[i] = { ...values[i], value };
  const groups = [0, 1, 2].map((g) => values.filter((_, i) => split[i] === g)).filter((items) => items.length);
  const cells: Array<Record<string, unknown>> = [
    ...groups.map((items, g) => ({ id: ['inputs', 'more', 'fit-k'][g], kind: 'parameters', items })),
    ...rates, ...extra,
  ];
  // a few swaps of position: definitions need not come before their uses
  for (const [i, o] of order.entries()) {
    const a = i % cells.length, b = o % cells.length;
    [cells[a], cells[b]] = [cells[b], cells[a]];
  }
  return { format: 'ratebook-study', version: 1, title: 'sound', cells: structuredClone(cells) };
});

/** A handful of parameters that read each other in a circle, and their users. */
const cycleDocArb = fc.tuple(fc.shuffledSubarray(PARAM_NAMES, { minLength: 1, maxLength: 4 }), fc.boolean()).map(([names, split]) => {
  const items = names.map((name, i) => ({ name, value: `${names[(i + 1) % names.length]} * 2` }));
  const cells = split
    ? items.map((item, i) => ({ id: ['inputs', 'more', 'gut', 'settle'][i], kind: 'parameters', items: [item] }))
    : [{ id: 'inputs', kind: 'parameters', items: items }];
  return {
    format: 'ratebook-study', version: 1, title: 'cycle',
    cells: [...cells, { id: 'n1', kind: 'note', text: 'x' }, { id: 'cooling', kind: 'rate', state: 'T', unit: 'degC', rate: `-${names[0]} * (T - 20 degC)`, initial: '74 degC' }],
  };
});

/** A path into a JSON value, chosen by a number; the paths are listed depth first. */
function pathsOf(v: unknown, prefix: Array<string | number> = [], out: Array<Array<string | number>> = []): Array<Array<string | number>> {
  out.push(prefix);
  if (Array.isArray(v)) v.forEach((x, i) => pathsOf(x, [...prefix, i], out));
  else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) pathsOf(x, [...prefix, k], out);
  return out;
}

type DocMutation = { pick: number; action: 'set' | 'delete' | 'kind' | 'duplicate'; value: unknown };

function mutateDoc(doc: unknown, m: DocMutation): unknown {
  const copy = structuredClone(doc) as any;
  const paths = pathsOf(copy).filter((p) => p.length > 0);
  if (paths.length === 0) return m.value;
  const path = paths[m.pick % paths.length];
  const parent = path.slice(0, -1).reduce((o: any, k) => o[k], copy);
  const key = path[path.length - 1];
  switch (m.action) {
    case 'set': parent[key] = m.value; break;
    case 'delete': if (Array.isArray(parent)) parent.splice(key as number, 1); else delete parent[key]; break;
    case 'kind': {
      const cell = Array.isArray(copy.cells) && copy.cells.length ? copy.cells[m.pick % copy.cells.length] : undefined;
      if (cell && typeof cell === 'object') cell.kind = String(m.value);
      break;
    }
    case 'duplicate': if (Array.isArray(copy.cells) && copy.cells.length) copy.cells.push(structuredClone(copy.cells[m.pick % copy.cells.length])); break;
  }
  return copy;
}

const docMutation: fc.Arbitrary<DocMutation> = fc.record({
  pick: fc.nat(),
  action: fc.constantFrom('set', 'set', 'delete', 'kind', 'duplicate'),
  value: fc.oneof(anyJson, fc.constantFrom('ratebook-study', 2, 0, '1', 1.5, null, 'rate', 'Parameters', 'widget', [], {})),
}) as fc.Arbitrary<DocMutation>;

/**
 * An edit as generated. `edit` is sent as it is; the others act on the cells as they stand
 * when the edit is applied, picked by position: `tweak` gives one field of a cell a new value
 * (the usual edit in the app: a parameter's value), `remove` and `move` name an existing cell.
 */
type EditSpec =
  | { edit: unknown }
  | { tweak: number; item: number; value: unknown }
  | { remove: number }
  | { move: number; to: number };

const editSpec: fc.Arbitrary<EditSpec> = fc.oneof(
  { weight: 8, arbitrary: fc.record({ tweak: fc.nat(), item: fc.nat(5), value: orJunk(docExpr) }) },
  { weight: 2, arbitrary: cellArb.map((cell) => ({ edit: { type: 'replace', cell } })) },
  { weight: 2, arbitrary: fc.tuple(fc.integer({ min: -2, max: 10 }), cellArb).map(([index, cell]) => ({ edit: { type: 'insert', index, cell } })) },
  { weight: 2, arbitrary: fc.nat().map((remove) => ({ remove })) },
  { weight: 2, arbitrary: fc.record({ move: fc.nat(), to: fc.integer({ min: -2, max: 10 }) }) },
  { weight: 1, arbitrary: fc.tuple(fc.constantFrom(...IDS), fc.oneof(fc.integer({ min: -2, max: 10 }), fc.constantFrom(NaN, Infinity, 1.5))).map(([id, to]) => ({ edit: { type: 'move', id, to } })) },
  { weight: 1, arbitrary: fc.constantFrom(...IDS).map((id) => ({ edit: { type: 'remove', id } })) },
  { weight: 1, arbitrary: fc.oneof(fc.string({ maxLength: 5 }), anyJson).map((title) => ({ edit: { type: 'retitle', title } })) },
  { weight: 1, arbitrary: fc.oneof(anyJson, fc.record({ type: fc.constantFrom('replace', 'insert', 'remove', 'move', 'retitle', 'undo'), cell: anyJson, id: anyJson, index: anyJson, to: anyJson })).map((edit) => ({ edit })) },
);

/** The concrete edit a spec stands for, given the document as it now stands. */
function editFrom(spec: EditSpec, doc: { cells: Array<Record<string, any>> }): unknown {
  if ('edit' in spec) return spec.edit;
  const n = doc.cells.length;
  if (n === 0) return { type: 'retitle', title: 'empty' };
  if ('remove' in spec) return { type: 'remove', id: doc.cells[spec.remove % n].id };
  if ('move' in spec) return { type: 'move', id: doc.cells[spec.move % n].id, to: spec.to };
  const c = structuredClone(doc.cells[spec.tweak % n]);
  if (Array.isArray(c.items) && c.items.length) {
    const item = c.items[spec.item % c.items.length];
    // only on an object: a property set on a list would not survive JSON
    if (item && typeof item === 'object' && !Array.isArray(item)) item.value = spec.value;
  } else {
    const fields = Object.keys(c).filter((k) => k !== 'id' && k !== 'kind');
    if (fields.length) c[fields[spec.item % fields.length]] = spec.value;
  }
  return { type: 'replace', cell: c };
}

/** The report's shape, as the contract fixes it, and its agreement with the document. */
function assertReport(report: Report, doc?: { cells?: unknown }): void {
  assert.equal(typeof report.title, 'string');
  assert.ok(Array.isArray(report.warnings) && report.warnings.every((w) => typeof w === 'string'));
  assert.ok(Array.isArray(report.cells));
  for (const c of report.cells) {
    assert.equal(typeof c.id, 'string');
    assert.equal(typeof c.kind, 'string');
    assert.equal(typeof c.ok, 'boolean', `cell ${c.id}: ok must be true or false`);
    if (!c.ok) {
      assert.equal(typeof c.error?.message, 'string', `cell ${c.id}: no error message`);
      assert.ok(c.error!.message.length > 0, `cell ${c.id}: empty error message`);
      assert.equal(typeof c.error?.path, 'string', `cell ${c.id}: no error path`);
      assert.ok(!c.error!.path.startsWith('@'), `cell ${c.id}: error path ${c.error!.path} was not written out`);
    }
  }
  assert.equal(report.ok, report.cells.every((c) => c.ok));
  if (doc && Array.isArray(doc.cells)) {
    assert.deepEqual(report.cells.map((c) => c.id), doc.cells.map((c: any) => c.id), 'one report per cell, in document order');
  }
  // the report is what `ratebook run --json` prints: it must survive JSON
  assert.doesNotThrow(() => JSON.stringify(report));
}

function assertRunResult(result: ReturnType<typeof runStudy>, doc: unknown): void {
  assert.equal(typeof result.ok, 'boolean');
  if (!result.ok) {
    assert.equal(typeof result.error.message, 'string');
    assert.ok(result.error.message.length > 0);
    assert.equal(typeof result.error.path, 'string');
    return;
  }
  assertReport(result.report, doc as { cells?: unknown });
}

/** Runs a document fresh, which must succeed: the reference for an edited session. */
function freshReport(doc: unknown): Report {
  const r = runStudy(doc);
  assert.ok(r.ok, `the session's own document is refused: ${r.ok ? '' : `${r.error.path}: ${r.error.message}`}`);
  return r.report;
}

/**
 * Applies the edits one at a time. After each: apply did not throw and answered in the
 * contract's form; a refused edit changed nothing; every cell whose result changed is listed
 * as changed; and the session's report equals a fresh run of the session's document.
 */
const sessions = { edits: 0, accepted: 0, cells: 0, cellsOk: 0 };

function checkSession(doc: unknown, specs: EditSpec[]): void {
  const opened = timed('openStudy', () => openStudy(doc));
  const run = runStudy(doc);
  assert.equal(opened.ok, run.ok);
  if (!opened.ok) {
    assertRunResult(run, doc);
    return;
  }
  const session = opened.session;
  assertReport(session.report(), doc as { cells?: unknown });
  assert.deepEqual(session.report(), freshReport(session.document()), 'opening agrees with a fresh run');
  const applied: unknown[] = [];
  for (const spec of specs) {
    const before = session.document();
    const previous = session.report();
    const edit = editFrom(spec, before as any);
    applied.push(edit);
    const result = timed(`apply ${JSON.stringify(edit).slice(0, 120)}`, () => session.apply(edit as Edit));
    sessions.edits++;
    const context = () => `\ndocument: ${JSON.stringify(doc)}\nedits: ${JSON.stringify(applied)}`;
    assert.equal(typeof result.ok, 'boolean');
    if (!result.ok) {
      assert.equal(typeof result.error.message, 'string');
      assert.ok(result.error.message.length > 0);
      assert.equal(typeof result.error.path, 'string');
      assert.deepEqual(session.document(), before, `a refused edit changed the document${context()}`);
      assert.deepEqual(session.report(), previous, `a refused edit changed the report${context()}`);
      continue;
    }
    sessions.accepted++;
    sessions.cells += result.report.cells.length;
    sessions.cellsOk += result.report.cells.filter((c) => c.ok).length;
    assert.deepEqual(result.report, session.report());
    const now = session.document();
    assertReport(result.report, now);
    const ids = new Set(now.cells.map((c) => c.id));
    assert.ok(result.rerun.every((id) => ids.has(id)) && result.changed.every((id) => ids.has(id)), `rerun or changed names a cell not in the study${context()}`);
    const old = new Map(previous.cells.map((c) => [c.id, JSON.stringify(c)]));
    for (const c of result.report.cells) {
      if (old.get(c.id) !== JSON.stringify(c)) {
        assert.ok(result.changed.includes(c.id), `cell ${c.id} changed but is not listed as changed${context()}`);
      }
    }
    assert.deepEqual(result.report, freshReport(now), `the edited session disagrees with a fresh run${context()}`);
  }
}

describe('documents: anything in, a report or a refusal out', () => {
  it('runs generated studies and sequences of edits, agreeing with fresh runs', (ctx) => {
    fc.assert(fc.property(fc.oneof(soundDocArb, docArb), fc.array(editSpec, { maxLength: 6 }), (doc, specs) => {
      checkSession(doc, specs);
    }), runs(10, 1500));
    // most edits must be accepted and many cells must compute, or the agreement proves little
    assert.ok(sessions.accepted > sessions.edits * 0.5, JSON.stringify(sessions));
    assert.ok(sessions.cellsOk > sessions.cells * 0.2, JSON.stringify(sessions));
    ctx.diagnostic(JSON.stringify(sessions));
  });

  it('runs studies with circular definitions and edits that make and break the circle', () => {
    fc.assert(fc.property(cycleDocArb, fc.array(editSpec, { maxLength: 5 }), (doc, specs) => {
      const r = runStudy(doc);
      assert.ok(r.ok);
      assert.ok(r.report.cells.some((c) => !c.ok && /circular/.test(c.error!.message)), 'a circle is reported');
      checkSession(doc, specs);
    }), runs(11, 200));
  });

  it('refuses or reports mutated studies (wrong types, missing fields, unknown kinds, duplicate ids)', () => {
    let refused = 0, total = 0;
    fc.assert(fc.property(docArb, fc.array(docMutation, { minLength: 1, maxLength: 3 }), fc.array(editSpec, { maxLength: 3 }), (doc, ms, specs) => {
      const bad = ms.reduce(mutateDoc, doc as unknown);
      const result = timed('runStudy', () => runStudy(bad));
      assertRunResult(result, bad);
      assertRunResult(runStudy(bad, 'check'), bad);
      total++;
      if (!result.ok) refused++;
      checkSession(bad, specs);
    }), runs(12, 1000));
    assert.ok(refused > total * 0.05 && refused < total * 0.95, `refused ${refused} of ${total}`);
  });

  it('refuses any JSON value or text that is not a study, with a message and a path', () => {
    fc.assert(fc.property(fc.oneof(fc.jsonValue(), fc.string(), docArb.map((d) => JSON.stringify(d).slice(0, -1)), docArb.chain((d) => {
      const text = JSON.stringify(d);
      return fc.tuple(fc.array(mutation, { minLength: 1, maxLength: 3 })).map(([ms]) => ms.reduce(mutate, text));
    })), (input) => {
      assertRunResult(timed('runStudy', () => runStudy(input)), typeof input === 'string' ? safeParse(input) : input);
    }), runs(13, 500));
  });

  it('reads a study from its JSON text as from the parsed value', () => {
    fc.assert(fc.property(docArb, (doc) => {
      const value = JSON.parse(JSON.stringify(doc));
      assert.deepEqual(runStudy(JSON.stringify(doc)), runStudy(value));
    }), runs(14, 200));
  });
});

function safeParse(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}
