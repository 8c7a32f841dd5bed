// Butcher's rooted trees and the order conditions of Runge–Kutta and Rosenbrock methods, for
// the coefficient tests (Hairer, Nørsett & Wanner, Solving ODEs I, sec. II.2, Theorem 2.13:
// a method has order p when Σ b_i Φ_i(t) = 1/γ(t) for every rooted tree t with at most p
// vertices; Hairer & Wanner, Solving ODEs II, sec. IV.7 for the Rosenbrock term).
import type { ButcherTableau } from '../../src/numerics/ode/explicit-rk.ts';

/** A rooted tree as the list of its root's subtrees. */
export type Tree = Tree[];

const key = (t: Tree): string => '[' + t.map(key).sort().join('') + ']';
export const size = (t: Tree): number => 1 + t.reduce((s, c) => s + size(c), 0);
/** γ(t) = |t| · Π γ(children): the exact solution's weight is 1/γ(t). */
export const density = (t: Tree): number => size(t) * t.reduce((p, c) => p * density(c), 1);

/** Every tree obtained by hanging one new leaf on some vertex of t. */
function grow(t: Tree): Tree[] {
  const out: Tree[] = [[...t, []]];
  t.forEach((child, i) => {
    for (const g of grow(child)) {
      const copy = t.slice();
      copy[i] = g;
      out.push(copy);
    }
  });
  return out;
}

/** All distinct rooted trees, grouped by number of vertices 1..p. */
export function treesUpTo(p: number): Tree[][] {
  const levels: Tree[][] = [[[]]];
  for (let n = 2; n <= p; n++) {
    const seen = new Map<string, Tree>();
    for (const t of levels[n - 2]) for (const g of grow(t)) seen.set(key(g), g);
    levels.push([...seen.values()]);
  }
  return levels;
}
/** The rooted trees with 1 … 8 vertices, by size (enough for the order conditions of dp853). */
export const TREES = treesUpTo(8);

/**
 * Stage weights κ_i(t) of the B-series of stage i (derivative stages, step h = 1):
 * κ_i(t) = Π_children (Σ_j α_ij κ_j(child)), plus, for a Rosenbrock method and t = [u],
 * Σ_{j≤i} γ_ij κ_j(u) (the term J·Σ γ_ij k_j with the exact Jacobian J).
 */
export function stageWeights(t: Tree, alpha: number[][], gamma: number[][] | null): number[] {
  const s = alpha.length;
  const children = t.map((c) => stageWeights(c, alpha, gamma));
  const k = new Array<number>(s).fill(0);
  for (let i = 0; i < s; i++) {
    let p = 1;
    for (const kc of children) {
      let acc = 0;
      for (let j = 0; j < i; j++) acc += alpha[i][j] * kc[j];
      p *= acc;
    }
    k[i] = p;
  }
  if (gamma && t.length === 1) {
    for (let i = 0; i < s; i++) {
      let acc = 0;
      for (let j = 0; j <= i; j++) acc += gamma[i][j] * children[0][j];
      k[i] += acc;
    }
  }
  return k;
}

export const dot = (a: readonly number[], b: readonly number[]) => a.reduce((s, v, i) => s + v * b[i], 0);

/** Largest |Σ w_i κ_i(t) - θ^|t|/γ(t)| over the trees with exactly `order` vertices. */
export function defect(order: number, w: readonly number[], alpha: number[][], gamma: number[][] | null, theta = 1): number {
  let worst = 0;
  for (const t of TREES[order - 1]) {
    const exact = theta ** size(t) / density(t);
    worst = Math.max(worst, Math.abs(dot(w, stageWeights(t, alpha, gamma)) - exact));
  }
  return worst;
}

export function square(tab: ButcherTableau): number[][] {
  const s = tab.c.length;
  return tab.a.map((row) => Array.from({ length: s }, (_, j) => row[j] ?? 0));
}
