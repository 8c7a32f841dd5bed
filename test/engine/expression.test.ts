import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { parseExpression, compileExpression, reportQuantity } from '../../src/index.ts';
import { setGeneratedCode } from '../../src/expression/compile.ts';
import { evaluateExpression } from '../../src/expression/evaluate.ts';
import { near, quantity, failure, value } from './helpers.ts';

const rep = (text: string) => reportQuantity(quantity(text));

describe('quantities keep the units the user wrote', () => {
  it('shows 0.35 / h as a rate per hour, not as micro-hertz', () => {
    // hand-worked: 0.35 / 3600 s = 9.7222e-5 / s
    const r = rep('0.35 / h');
    assert.equal(r.unit, '1 / h');
    assert.equal(r.value, 0.35);
    near(r.si, 0.35 / 3600);
  });

  it('shows a mass over a volume as mg / L', () => {
    // hand-worked: 1000 mg / 42 L = 23.8095 mg/L = 0.0238095 kg/m^3
    const r = rep('1000 mg / (42 L)');
    assert.equal(r.unit, 'mg / L');
    near(r.value, 1000 / 42);
    near(r.si, 1e-3 / 0.042);
  });

  it('adds mixed time units in the first unit written', () => {
    // hand-worked: 2 h + 30 min = 2.5 h = 9000 s
    const r = rep('2 h + 30 min');
    assert.deepEqual([r.value, r.unit, r.si], [2.5, 'h', 9000]);
  });

  it('converts trade units by their legal definitions', () => {
    // US gallon = 231 in^3 = 3.785411784 L exactly (NIST Handbook 44, Appendix C)
    near(rep('1 gal / min').si, 3.785411784e-3 / 60);
    // international foot = 0.3048 m exactly (1959 international yard and pound agreement)
    assert.equal(rep('1 ft').si, 0.3048);
    near(rep('12 inch').si, 0.3048);
    // International Table BTU = 1055.05585262 J (ISO 31-4 / NIST SP 811); per hour: 0.29307107 W
    near(rep('1 BTU / h').si, 1055.05585262 / 3600);
    // 5 ug/mL = 5 mg/L (hand-worked: 5e-9 kg / 1e-6 m^3 = 5e-3 kg/m^3)
    near(rep('5 ug / mL').si, 5e-3);
    // kJ, W: SI definitions
    assert.equal(rep('2 kJ').si, 2000);
    // day = 86400 s (SI Brochure, 9th ed., table 8)
    assert.equal(rep('2 d').si, 172800);
  });

  it('cancels units of one kind into a plain number', () => {
    // hand-worked: 30 min * 2 / h = 1
    const r = rep('30 min * (2 / h)');
    assert.equal(r.unit, '');
    near(r.value, 1);
  });

  it('derives a half-life in hours from a rate per hour', () => {
    // t1/2 = ln 2 / k (first-order kinetics, common practice); ln 2 / 0.35 = 1.980420516 h
    const r = reportQuantity(quantity('log(2) / k', { k: quantity('0.35 / h') }));
    assert.equal(r.unit, 'h');
    near(r.value, Math.LN2 / 0.35);
  });
});

describe('temperatures: points and differences on any scale', () => {
  it('reads degC and degF as points on their scales', () => {
    // Celsius: T/K = t/degC + 273.15 (SI Brochure, 9th ed., 2.3.1)
    assert.equal(quantity('74 degC').si, 347.15);
    // Fahrenheit: T/K = (t/degF + 459.67) * 5/9 (NIST SP 811, B.9); 98.6 degF = 37 degC
    near(quantity('98.6 degF').si, 310.15);
    // -40 is the same reading on both scales (hand-worked from the two formulas above)
    near(quantity('-40 degF').si, quantity('-40 degC').si);
    // Rankine: absolute, degF-sized; 491.67 degR = 273.15 K
    near(quantity('491.67 degR').si, 273.15);
  });

  it('gives the difference of two temperatures on different scales', () => {
    // study-format contract: 80 degF - 20 degC is a difference of 6.67 K
    // hand-worked: (80 + 459.67) * 5/9 = 299.8167 K; minus 293.15 K = 6.6667 K
    const q = quantity('80 degF - 20 degC');
    near(q.si, 20 / 3, 1e-12);
    assert.equal(q.temp, 'delta');
    // shown in the difference unit of the first scale: 6.6667 K = 12 degF-sized degrees
    const r = reportQuantity(q);
    assert.equal(r.unit, 'degR');
    near(r.value, 12);
  });

  it('gives the same physical result whatever the scale of the inputs', () => {
    const names = (hot: string, cold: string) => ({ T: quantity(hot), Ta: quantity(cold), k: quantity('0.35 / h') });
    const celsius = quantity('-k * (T - Ta)', names('74 degC', '4 degC'));
    const mixed = quantity('-k * (T - Ta)', names('165.2 degF', '277.15 K'));
    near(mixed.si, celsius.si, 1e-12);
  });

  it('treats a temperature in a compound unit as a difference', () => {
    // 3 degC per hour is a rate of 3 K per hour, not 276.15 K per hour
    near(quantity('3 degC / h').si, 3 / 3600);
    near(quantity('2 degF / min').si, (2 * 5) / 9 / 60);
  });

  it('adds a difference to a temperature and refuses to add two temperatures', () => {
    near(quantity('20 degC + 5 K').si, 298.15);
    assert.equal(reportQuantity(quantity('20 degC + 5 K')).unit, 'degC');
    assert.match(failure('20 degC + 5 degC'), /ambiguous/);
    assert.match(failure('-T', { T: quantity('20 degC') }), /cannot negate a temperature/);
  });

  it('uses the absolute temperature in products and powers', () => {
    // Stefan–Boltzmann radiation needs T in kelvin: (300 K)^4 = 8.1e9 K^4; 26.85 degC is 300 K
    near(quantity('(26.85 degC)^4').si, 8.1e9, 1e-12);
    // ideal gas: p = n R T / V; 1 mol at 0 degC in 22.41396954 L is 101325 Pa (CODATA 2018 molar volume)
    near(quantity('1 mol * gasConstant * 0 degC / (22.41396954 L)').si, 101325, 1e-8);
  });
});

describe('dimension checks', () => {
  it('refuses to add different kinds of quantity, saying what they are', () => {
    assert.match(failure('1 h + 1 m'), /cannot add time .* and length/);
    assert.match(failure('exp(2 h)'), /exp needs a plain number; it got time/);
    assert.match(failure('floor(90 min)'), /divide by a unit first/);
    assert.match(failure('(2 m) ^ k', { k: quantity('2') }), /fixed exponent/);
  });

  it('takes square roots of units', () => {
    const r = rep('sqrt(16 m^2)');
    assert.deepEqual([r.value, r.unit], [4, 'm']);
  });

  it('requires both branches of a choice to be of one kind', () => {
    const t = quantity('1 h');
    const v = value('t < 2 h ? 25 degC : 4 degC', { t });
    assert.equal((v as { si: number }).si, 298.15);
    assert.match(failure('t < 2 h ? 25 degC : 4 h', { t }), /different kinds/);
    assert.match(failure('1 h ? 1 : 2'), /condition must be a comparison/);
  });
});

describe('the restricted syntax', () => {
  const refused: Array<[string, RegExp]> = [
    ['createUnit("furlong")', /may not call "createUnit"/],
    ['evaluate("1+1")', /may not call "evaluate"/],
    ['parse("1")', /may not call "parse"/],
    ['import({x: 1})', /may not call "import"/],
    ['x = 3', /may not assign/],
    ['f(x) = x^2', /may not define functions/],
    ['a.b', /property access/],
    ['a[1]', /indexing/],
    ['[1, 2]', /lists or matrices/],
    ['{a: 1}', /objects/],
    ['"text"', /text strings/],
    ['5 h to min', /may not convert units/],
    ['7 mod 2', /operator "mod"/],
    ['3!', /operator "!"/],
    ['1:3', /ranges/],
    ['1; 2', /single expression/],
    ['', /is empty/],
    ['(1 + 2', /syntax error/],
  ];
  for (const [text, message] of refused) {
    it(`refuses ${JSON.stringify(text)}`, () => {
      const r = parseExpression(text);
      assert.equal(r.ok, false);
      if (!r.ok) assert.match(r.error.message, message);
    });
  }

  // mathjs reads a symbol before parentheses as a function call, never as a product
  // (mathjs documentation, "Expression syntax", implicit multiplication): the message says
  // how to write the product a law such as dT/dt = -k (T - T_a) means
  it('says how to multiply when a name stands before brackets', () => {
    const r = parseExpression('-k (T - T_a)');
    assert.ok(!r.ok);
    if (!r.ok) {
      assert.match(r.error.message, /may not call "k": a name before brackets is read as a call; to multiply, write "k \* \(T - T_a\)"/);
      assert.deepEqual(r.error.span, [1, 2], 'the name is underlined');
    }
    const fixed = parseExpression('-k * (T - T_a)');
    assert.ok(fixed.ok, 'the product it suggests parses');
    const text = parseExpression('createUnit("furlong")');
    assert.ok(!text.ok && !/to multiply/.test(text.error.message), 'no product suggested for a call with text');
  });

  it('points at the refused part of the text', () => {
    const r = parseExpression('2 * createUnit("x")');
    assert.ok(!r.ok && r.error.span);
    if (!r.ok) assert.deepEqual(r.error.span, [4, 14]);
  });

  it('refuses deep nesting instead of overflowing the stack', () => {
    const deep = '('.repeat(3000) + '1' + ')'.repeat(3000);
    assert.equal(parseExpression(deep).ok, false);
  });

  it('refuses a value that is not text', () => {
    const r = parseExpression(0.35);
    assert.ok(!r.ok);
    if (!r.ok) assert.match(r.error.message, /write it as "0.35"/);
  });
});

describe('compiled expressions agree with the checker', () => {
  const cases = [
    '-k * (T - Ta)',
    'Vmax * C / (Km + C)',
    't < 2 h ? 25 degC : 4 degC',
    'max(T, Ta) - min(T, 30 degC) + abs(Ta - T)',
    'exp(-k * t) * sqrt(C * C) / (1 mg / L)',
    'round(2.5) + floor(-1.5) + sign(-3) + log(8, 2) + log10(1000)',
    'not (t > 1 h) and T > Ta or false ? 1 : 0',
    'x degC',
    '5%',
  ];
  const names = {
    k: quantity('0.35 / h'), T: quantity('74 degC'), Ta: quantity('40 degF'), t: quantity('90 min'),
    C: quantity('12 mg / L'), Vmax: quantity('2 mg / (L * h)'), Km: quantity('4 mg / L'), x: quantity('21'),
  };
  const lookup = (n: string) => (names as Record<string, ReturnType<typeof quantity>>)[n];
  for (const text of cases) {
    for (const generated of [true, false]) {
      it(`${text} (${generated ? 'generated code' : 'closures'})`, () => {
        const p = parseExpression(text);
        assert.ok(p.ok);
        if (!p.ok) return;
        const checked = evaluateExpression(p.expr, lookup);
        assert.ok(checked.ok);
        if (!checked.ok) return;
        const expected = typeof checked.value === 'boolean' ? Number(checked.value) : checked.value.si;
        setGeneratedCode(generated ? undefined : false);
        try {
          const inputs = Object.keys(names);
          const fn = compileExpression(p.expr, lookup, inputs);
          const x = inputs.map((n) => lookup(n).si);
          assert.equal(fn(x), expected);
          const folded = compileExpression(p.expr, lookup, []);
          assert.equal(folded([]), expected);
        } finally {
          setGeneratedCode(undefined);
        }
      });
    }
  }

  it('reads inputs by position, so a solver can vary them', () => {
    const p = parseExpression('-k * (T - Ta)');
    assert.ok(p.ok);
    if (!p.ok) return;
    const fn = compileExpression(p.expr, lookup, ['T']);
    // hand-worked: -(0.35/3600) * (300 - Ta_K)
    const TaK = (40 + 459.67) * 5 / 9;
    near(fn([300]), -(0.35 / 3600) * (300 - TaK));
  });
});
