/**
 * Compiled rate laws, cached per checked law and input order: a law is re-checked (a new Law
 * object) only when its text or a value it reads changes, so re-running a simulation after
 * a change elsewhere (a dose, an event time) reuses the compiled function.
 */
import type { Law } from '../engine/node.ts';
import type { Expr } from '../expression/ast.ts';
import { compileExpression, type Compiled } from '../expression/compile.ts';

const cache = new WeakMap<Law, Map<string, Compiled>>();

/** The law (or `expr`, an expression derived from it) compiled over `inputs`, folding the rest of its scope. */
export function compileLaw(law: Law, inputs: readonly string[], expr: Expr = law.expr): Compiled {
  let byInputs = cache.get(law);
  if (!byInputs) {
    byInputs = new Map();
    cache.set(law, byInputs);
  }
  const key = expr === law.expr ? inputs.join(',') : undefined;
  const hit = key === undefined ? undefined : byInputs.get(key);
  if (hit) return hit;
  const fn = compileExpression(expr, (n) => law.scope.get(n), inputs);
  if (key !== undefined) byInputs.set(key, fn);
  return fn;
}
