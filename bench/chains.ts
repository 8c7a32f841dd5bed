/**
 * Chains of parameters for the scaling figures (`bench/run.ts`, "Studies of many cells") and
 * the scaling test (`test/engine/scaling.test.ts`): n parameters cells, each reading the one
 * before (`a1 = a0 * 1.001`), so every cell waits on all before it. With `wrongFirst` the first
 * value has a unit error, and every other cell waits on it. `factor` changes every text, so
 * that a chain is parsed afresh.
 */
export function parameterChain(n: number, options: { wrongFirst?: boolean; factor?: number } = {}): string {
  const factor = options.factor ?? 1.001;
  const cells = [];
  for (let i = 0; i < n; i++) {
    const value = i > 0 ? `a${i - 1} * ${factor}` : options.wrongFirst ? '0.35 / h + 1 m' : '0.35 / h';
    cells.push({ id: `p${i}`, kind: 'parameters', items: [{ name: `a${i}`, value }] });
  }
  return JSON.stringify({ format: 'ratebook-study', version: 1, title: `A chain of ${n} parameters (generated)`, cells });
}
