// TeX for rate laws and values (src/expression/tex.ts, src/output/sheet-tex.ts). KaTeX, a reference
// TeX parser from the package registry, must accept the TeX of every template expression.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readdirSync, readFileSync } from 'node:fs';
import katex from 'katex';
import { parseExpression } from '../../src/index.ts';
import { studyTex } from '../../src/output/sheet-tex.ts';
import { symbolKinds, toTex, nameTex } from '../../src/expression/tex.ts';

const kinds = symbolKinds(new Set(['t', 'k', 'T', 'Ta', 'V', 'h', 'C_feed', 'lambda']));
const tex = (text: string) => {
  const p = parseExpression(text);
  assert.ok(p.ok, text);
  return toTex(p.expr, kinds);
};

describe('TeX of expressions', () => {
  it('sets study names in italic with subscripts, units upright, and division as a fraction', () => {
    assert.equal(tex('-k * (T - Ta)'), '-k \\left(T - \\textit{Ta}\\right)');
    assert.equal(tex('0.35 / h'), '\\frac{0.35}{h}', 'h is a name of this study, not the hour');
    assert.equal(tex('74 degC'), '74\\,\\text{°C}');
    assert.equal(tex('C_feed * V'), 'C_{\\mathrm{feed}} V');
    assert.equal(tex('log(2) / lambda'), '\\frac{\\ln\\left(2\\right)}{\\lambda}');
  });

  it('keeps the grouping of the tree: parentheses only where the order needs them', () => {
    assert.equal(tex('(k - 1) - (k - 1)'), 'k - 1 - \\left(k - 1\\right)');
    assert.equal(tex('2 * 3'), '2 \\cdot 3');
    assert.equal(tex('(k + 1) ^ 2'), '\\left(k + 1\\right)^{2}');
    assert.equal(tex('-(k ^ 2)'), '-k^{2}');
  });

  it('writes conditions as cases and named constants with their usual symbols', () => {
    assert.match(tex('t < 2 min ? 25 degC : 4 degC'), /\\begin\{cases\}.*\\text\{if \} t < 2\\,\\mathrm\{min\}/);
    assert.equal(tex('stefanBoltzmann * T^4'), '\\sigma_{\\mathrm{SB}} T^{4}');
  });

  it('names: greek, long and numbered subscripts', () => {
    assert.equal(nameTex('tau'), '\\tau');
    assert.equal(nameTex('t_half'), 't_{\\mathrm{half}}');
    assert.equal(nameTex('C_0'), 'C_{0}');
    assert.equal(nameTex('dose_mg'), '\\textit{dose}_{\\mathrm{mg}}');
  });
});

describe('TeX of a study', () => {
  it('a state h is the state in its rate law and the hour in a parameter value', () => {
    const t = studyTex({ format: 'ratebook-study', version: 1, title: 'tank', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.9 / h' }] },
      { id: 'tank', kind: 'rate', state: 'h', unit: 'm', rate: '-k * h', initial: '1 m' },
    ] });
    assert.equal(t.values.get('p/k'), '\\frac{0.9}{\\mathrm{h}}');
    assert.equal(t.rates.get('tank'), '\\frac{\\mathrm{d}h}{\\mathrm{d}t} = -k h');
  });
});

describe('TeX of every template', () => {
  const dir = new URL('../../examples/', import.meta.url);
  for (const f of readdirSync(dir).filter((x) => x.endsWith('.ratebook.json'))) {
    it(`${f}: KaTeX accepts every law and value`, () => {
      const t = studyTex(JSON.parse(readFileSync(new URL(f, dir), 'utf8')));
      for (const [key, s] of [...t.rates, ...t.values]) {
        assert.doesNotThrow(() => katex.renderToString(s, { throwOnError: true, output: 'mathml' }), `${key}: ${s}`);
      }
    });
  }
});
