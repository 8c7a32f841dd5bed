// TeX for rate laws and values (src/expression/tex.ts, src/output/sheet-tex.ts). KaTeX, a reference
// TeX parser from the package registry, must accept the TeX of every template expression.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readdirSync, readFileSync } from 'node:fs';
import katex from 'katex';
import { parseExpression, runStudy, openStudy, type ItemTex } from '../../src/index.ts';
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

  it('puts a dot between names of several letters in a product, so that their letters do not run together', () => {
    const named = symbolKinds(new Set(['ka', 'Ag', 'F', 'dose', 'k', 'C']));
    const product = (text: string) => { const p = parseExpression(text); assert.ok(p.ok, text); return toTex(p.expr, named); };
    assert.equal(product('ka * Ag'), '\\textit{ka} \\cdot \\textit{Ag}');
    assert.equal(product('F * dose * ka'), 'F \\cdot \\textit{dose} \\cdot \\textit{ka}');
    assert.equal(product('k * C'), 'k C', 'single letters stay side by side');
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

/**
 * The fractions KaTeX (the reference parser) would set smaller than text size outside an
 * exponent: a fraction inside another fraction's numerator or denominator, or in a
 * condition's rows, that does not ask for display size. KaTeX's parse tree: `genfrac` nodes
 * with `numer`, `denom` and `size` ('display' for \dfrac), `supsub` with `sup`/`sub`.
 */
function shrunkFractions(texText: string): string[] {
  const found: string[] = [];
  const walk = (node: unknown, nested: boolean): void => {
    if (Array.isArray(node)) { for (const x of node) walk(x, nested); return; }
    if (!node || typeof node !== 'object') return;
    const n = node as Record<string, unknown>;
    if (n.type === 'supsub') { walk(n.base, nested); return; } // exponents and subscripts are meant small
    if (n.type === 'genfrac') {
      if (nested && n.size !== 'display') found.push(JSON.stringify(n).slice(0, 80));
      walk(n.numer, true);
      walk(n.denom, true);
      return;
    }
    if (n.type === 'array') { walk(n.body, true); return; }
    for (const [k, v] of Object.entries(n)) if (k !== 'loc' && typeof v === 'object') walk(v, nested);
  };
  walk((katex as unknown as { __parse(s: string, o: object): unknown }).__parse(texText, { displayMode: true }), false);
  return found;
}

describe('nested fractions stay legible', () => {
  it('a fraction inside a fraction or a condition is set at display size; in an exponent it stays small', () => {
    assert.equal(tex('(k / 2) / (V / 3)'), '\\frac{\\dfrac{k}{2}}{\\dfrac{V}{3}}');
    assert.equal(tex('1 / (1 + k / V)'), '\\frac{1}{1 + \\dfrac{k}{V}}');
    assert.match(tex('t < 2 min ? k / 2 : k / 3'), /\\dfrac\{k\}\{2\}.*\\dfrac\{k\}\{3\}/);
    assert.equal(tex('k ^ (1 / 2)'), 'k^{\\frac{1}{2}}');
    assert.equal(tex('(V / (k / 2)) ^ (1 / 2)'), '\\left(\\frac{V}{\\dfrac{k}{2}}\\right)^{\\frac{1}{2}}');
    // KaTeX's own reading agrees: no fraction at subscript size outside an exponent
    for (const x of ['(k / 2) / (V / 3)', '1 / (1 + k / (V / 2))', 't < 2 min ? k / 2 : k / 3', '(V / (k / 2)) ^ (1 / 2)']) assert.deepEqual(shrunkFractions(tex(x)), [], x);
    // and the check can fail: the old plain \frac inside a \frac is caught
    assert.equal(shrunkFractions('\\frac{\\frac{k}{2}}{V}').length, 1);
  });
});

describe('TeX of a study', () => {
  it('a state h is the state in its rate law and the hour in a parameter value', () => {
    const r = runStudy({ format: 'ratebook-study', version: 1, title: 'tank', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.9 / h' }] },
      { id: 'tank', kind: 'rate', state: 'h', unit: 'm', rate: '-k * h', initial: '1 m' },
    ] });
    assert.ok(r.ok);
    if (!r.ok) return;
    const [p, tank] = r.report.cells;
    assert.equal((p.tex as Record<string, ItemTex>).k.value, '\\frac{0.9}{\\mathrm{h}}');
    assert.equal(tank.tex, '\\frac{\\mathrm{d}h}{\\mathrm{d}t} = -k h');
  });
});

describe('TeX of every template', () => {
  const dir = new URL('../../examples/', import.meta.url);
  for (const f of readdirSync(dir).filter((x) => x.endsWith('.ratebook.json'))) {
    it(`${f}: the report carries TeX for every law and value, and KaTeX accepts it`, () => {
      const doc = JSON.parse(readFileSync(new URL(f, dir), 'utf8'));
      const r = runStudy(doc);
      assert.ok(r.ok);
      const all: Array<[string, string]> = [];
      for (const [i, cell] of doc.cells.entries()) {
        const tex: unknown = r.report.cells[i].tex;
        if (cell.kind === 'rate') { assert.equal(typeof tex, 'string', cell.id); all.push([cell.id, tex as string]); }
        if (cell.kind === 'parameters') {
          const items = tex as Record<string, ItemTex>;
          for (const item of cell.items) {
            assert.equal(typeof items[item.name]?.value, 'string', `${cell.id}/${item.name}`);
            all.push([`${cell.id}/${item.name}`, `${items[item.name].name} = ${items[item.name].value}`]);
          }
        }
        if (cell.kind !== 'rate' && cell.kind !== 'parameters') assert.equal(tex, undefined, cell.id);
      }
      for (const [key, s] of all) {
        assert.doesNotThrow(() => katex.renderToString(s, { throwOnError: true, output: 'mathml' }), `${key}: ${s}`);
        assert.deepEqual(shrunkFractions(s), [], `${key}: a fraction set at subscript size in ${s}`);
      }
    });
  }
});

describe('TeX in the report', () => {
  it('sets the study\'s own names as names and the rest as units, in the law and in values', () => {
    const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.35 / h' }, { name: 'Ta', value: '20 degC' }, { name: 'bad', value: '2 +' }] },
      { id: 'cool', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '74 degC' },
    ] });
    assert.ok(r.ok);
    const [p, cool] = r.report.cells;
    // hand-worked: dT/dt = -k (T - Ta), with T the state (not tesla) and h the hour
    assert.equal(cool.tex, '\\frac{\\mathrm{d}T}{\\mathrm{d}t} = -k \\left(T - \\textit{Ta}\\right)');
    const items = p.tex as Record<string, ItemTex>;
    assert.deepEqual(items.k, { name: 'k', value: '\\frac{0.35}{\\mathrm{h}}' });
    assert.deepEqual(items.Ta, { name: '\\textit{Ta}', value: '20\\,\\text{°C}' });
    assert.deepEqual(items.bad, { name: '\\textit{bad}' }, 'a value that does not parse has no TeX');
  });

  it('follows a name that another cell stops defining, even where the reading cell does not re-run', () => {
    // found by the session property test: a data column C, then the data cell broken, so that C is the coulomb again
    const data = { id: 'd', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: [[0, 1], [1, 2]] };
    const inputs = { id: 'p', kind: 'parameters', items: [{ name: 'k', value: 'k + 2 C' }] };
    const opened = openStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [data, inputs] });
    assert.ok(opened.ok);
    assert.equal((opened.session.report().cells[1].tex as Record<string, ItemTex>).k.value, 'k + 2 C');
    const broken = opened.session.apply({ type: 'replace', cell: { ...data, columns: 'not a list' } });
    assert.ok(broken.ok);
    const fresh = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [{ ...data, columns: 'not a list' }, inputs] });
    assert.ok(fresh.ok);
    // hand-worked: with no column C, C is the coulomb, set upright
    assert.equal((broken.report.cells[1].tex as Record<string, ItemTex>).k.value, 'k + 2\\,\\mathrm{C}');
    assert.deepEqual(broken.report.cells[1].tex, fresh.report.cells[1].tex);
  });

  it('is made again when a name in another cell starts to hide a unit', () => {
    const opened = openStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.35 / h' }] },
    ] });
    assert.ok(opened.ok);
    const before = (opened.session.report().cells[0].tex as Record<string, ItemTex>).k.value;
    const after = opened.session.apply({ type: 'insert', index: 1, cell: { id: 'q', kind: 'parameters', items: [{ name: 'h', value: '2' }] } });
    assert.ok(after.ok);
    const now = (after.report.cells[0].tex as Record<string, ItemTex>).k.value;
    // hand-worked: h is a unit (upright) until the study defines h, then a name (italic)
    assert.equal(before, '\\frac{0.35}{\\mathrm{h}}');
    assert.equal(now, '\\frac{0.35}{h}');
  });
});
