import { it } from 'node:test';
import assert from 'node:assert/strict';
import { parseExpression, compileExpression } from '../../src/index.ts';
import { derivative } from '../../src/expression/derivative.ts';
import type { Expr } from '../../src/expression/ast.ts';

const parse = (t: string): Expr => {
  const p = parseExpression(t);
  assert.ok(p.ok);
  return (p as { expr: Expr }).expr;
};
const fn = (e: Expr) => compileExpression(e, () => undefined, ['y']);

// Each case: an expression and its derivative worked by hand with the usual rules (calculus,
// common practice), compared at several points.
const cases: Array<[string, (y: number) => number]> = [
  ['y * (3 - 4 * y)', (y) => 3 - 8 * y],
  ['(y - 1)^2', (y) => 2 * (y - 1)],
  ['1 / (y - 1)', (y) => -1 / (y - 1) ** 2],
  ['exp(-2 * y) + log(y) + sqrt(y)', (y) => -2 * Math.exp(-2 * y) + 1 / y + 0.5 / Math.sqrt(y)],
  ['sin(y) * cos(y) + tanh(y)', (y) => Math.cos(2 * y) + 1 - Math.tanh(y) ** 2],
  ['2 ^ y', (y) => Math.LN2 * 2 ** y],
  ['-3 * y / (4 + y)', (y) => -12 / (4 + y) ** 2],
];

for (const [text, exact] of cases) {
  it(`differentiates ${text}`, () => {
    const d = derivative(parse(text), 'y');
    assert.ok(d);
    const f = fn(d!);
    for (const y of [0.3, 1.7, 2.5]) {
      const want = exact(y);
      assert.ok(Math.abs(f([y]) - want) <= 1e-12 * Math.max(1, Math.abs(want)), `${text} at ${y}: ${f([y])} vs ${want}`);
    }
  });
}

it('gives up on kinks instead of guessing', () => {
  assert.equal(derivative(parse('abs(y - 1)'), 'y'), undefined);
  assert.equal(derivative(parse('max(y, 2)'), 'y'), undefined);
  assert.equal(derivative(parse('y > 1 ? y : 1'), 'y'), undefined);
});
