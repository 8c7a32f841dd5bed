/**
 * Compiled rate laws, cached per checked law and input order: a law is re-checked (a new Law
 * object) only when its text or a value it reads changes, so re-running a simulation after
 * a change elsewhere (a dose, an event time) reuses the compiled function. A re-checked law
 * whose inputs only changed value (a what-if run, a slider) finds its function by its parsed
 * expression too: the code depends on the inputs' dimensions, not on their values.
 */
import type { Law } from '../engine/node.ts';
import type { Expr } from '../expression/ast.ts';
import { compileExpression, generatedCodeInUse, type Compiled } from '../expression/compile.ts';

/** Compiled variants kept per parsed expression (different inputs, or folded values). */
const PER_EXPR = 32;

const byLaw = new WeakMap<Law, Map<string, Compiled>>();
const byExpr = new WeakMap<Expr, Map<string, Compiled>>();

/** The law (or `expr`, an expression derived from it) compiled over `inputs`, folding the rest of its scope. */
export function compileLaw(law: Law, inputs: readonly string[], expr: Expr = law.expr): Compiled {
  if (expr !== law.expr) return compileExpression(expr, (n) => law.scope.get(n), inputs);
  let forLaw = byLaw.get(law);
  if (!forLaw) {
    forLaw = new Map();
    byLaw.set(law, forLaw);
  }
  // the form (generated code or closures) is part of the key: a benchmark compares the two
  const key = `${inputs.join(',')}${generatedCodeInUse() === false ? '|closures' : ''}`;
  const hit = forLaw.get(key);
  if (hit) return hit;
  let forExpr = byExpr.get(expr);
  if (!forExpr) {
    forExpr = new Map();
    byExpr.set(expr, forExpr);
  }
  const full = `${key}|${scopeKey(law, inputs)}`;
  let fn = forExpr.get(full);
  if (!fn) {
    fn = compileExpression(expr, (n) => law.scope.get(n), inputs);
    if (forExpr.size >= PER_EXPR) forExpr.delete(forExpr.keys().next().value!);
    forExpr.set(full, fn);
  }
  forLaw.set(key, fn);
  return fn;
}

/** What the generated code depends on: the dimension and kind of each name read, and the value of each folded one. */
function scopeKey(law: Law, inputs: readonly string[]): string {
  let out = '';
  for (const [name, q] of law.scope) {
    out += `;${name}:${q.dim.join(',')}:${q.temp ?? ''}`;
    if (!inputs.includes(name)) out += `=${Object.is(q.si, -0) ? '-0' : q.si}`;
  }
  return out;
}
