/**
 * The uncertain inputs of an uncertainty cell: every value with a spread (a parameter's
 * `spread`, a fit's estimates with their covariance) upstream of the names it carries the
 * uncertainty to, and how to draw them together. Draws are in SI, in the inputs' order:
 * a normal as value + sd·z, a log-normal as median·exp(σ·z), a uniform as from + (to − from)·u,
 * a fit's estimates jointly as center + L z on their working scale (log P for an estimate with
 * a prior), L the Cholesky factor of the part of the fit's covariance they span.
 */
import type { Binding, InputSpread, JointNormal, RunContext } from '../engine/node.ts';
import type { UncertainInput } from '../engine/report.ts';
import type { Quantity } from '../units/quantity.ts';
import { describe, deltaUnit } from '../units/quantity.ts';
import { formatNumber } from '../units/quantity.ts';
import type { Random } from '../numerics/sampling/random.ts';
import { cholesky, correlated } from '../numerics/sampling/cholesky.ts';

/** One uncertain input. */
export interface Input {
  readonly name: string;
  readonly q: Quantity;
  readonly spread: InputSpread;
  /** For a fit's estimate: the fit's cell. */
  readonly cell?: string;
}

/** The uncertain inputs among `names` (each with its binding), sorted by name; a fit's estimates keep their order within the fit. */
export function uncertainInputs(names: Iterable<string>, bindingOf: (name: string) => Binding | undefined): Input[] {
  const out: Input[] = [];
  for (const name of names) {
    if (name.startsWith('#')) continue;
    const b = bindingOf(name);
    if (b?.kind !== 'value' || !b.spread) continue;
    out.push({ name, q: b.q, spread: b.spread, ...(b.spread.kind === 'joint' ? { cell: b.spread.joint.cell } : {}) });
  }
  return out.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
}

/** An input's spread in words, for the report. */
export function inputWords(input: Input): UncertainInput {
  const { q, spread: s } = input;
  const diff = (si: number): Quantity => ({ si, dim: q.dim, unit: deltaUnit(q.unit), ...(q.temp ? { temp: 'delta' as const } : {}) });
  let text: string;
  switch (s.kind) {
    case 'normal': text = `${describe(q)} ± ${describe(diff(s.sd))} (normal, SD)`; break;
    case 'lognormal': text = `${describe(q)} ± ${formatNumber(Math.sqrt(Math.expm1(s.sigma ** 2)) * 100, 3)}% (log-normal, median and CV)`; break;
    case 'uniform': text = `${describe({ ...q, si: s.from })} to ${describe({ ...q, si: s.to })} (uniform)`; break;
    case 'joint': {
      const k = s.index;
      const sd = Math.sqrt(s.joint.covariance[k * s.joint.names.length + k]);
      text = s.joint.logScale[k]
        ? `${describe(q)}, SD of its log ${formatNumber(sd)} (fit "${s.joint.cell}", joint normal with its other estimates)`
        : `${describe(q)} ± ${describe(diff(sd))} (fit "${s.joint.cell}", standard error; joint normal with its other estimates)`;
    }
  }
  return { name: input.name, ...(input.cell ? { cell: input.cell } : {}), text };
}

/** Draws all inputs at once into `out` (SI). */
export type Drawer = (rng: Random, out: Float64Array) => void;

/** Working coordinates for the linear method: each input as a function of a coordinate w with its covariance. */
export interface Working {
  /** w at the present values. */
  readonly w0: Float64Array;
  /** Covariance of w (n×n, row-major). */
  readonly covariance: Float64Array;
  /** The SI values at w. */
  toValues(w: ArrayLike<number>, out: Float64Array): void;
}

interface Group { readonly joint: JointNormal; readonly at: number[]; readonly index: number[]; readonly l: Float64Array; readonly center: Float64Array }

/** The fit groups of the inputs, with the Cholesky factor of each group's covariance; a message when one is not a covariance. */
function groups(inputs: readonly Input[]): Group[] | string {
  const byCell = new Map<JointNormal, { at: number[]; index: number[] }>();
  inputs.forEach((x, i) => {
    if (x.spread.kind !== 'joint') return;
    const g = byCell.get(x.spread.joint) ?? { at: [], index: [] };
    g.at.push(i);
    g.index.push(x.spread.index);
    byCell.set(x.spread.joint, g);
  });
  const out: Group[] = [];
  for (const [joint, g] of byCell) {
    const l = cholesky(subCovariance(joint, g.index), g.index.length);
    if (!l) return `the covariance of fit "${joint.cell}" is not positive semi-definite, so its estimates cannot be drawn jointly`;
    out.push({ joint, ...g, l, center: Float64Array.from(g.index, (k) => joint.center[k]) });
  }
  return out;
}

function subCovariance(joint: JointNormal, index: readonly number[]): Float64Array {
  const n = joint.names.length, m = index.length;
  return Float64Array.from({ length: m * m }, (_, ij) => joint.covariance[index[Math.floor(ij / m)] * n + index[ij % m]]);
}

/** How to draw the inputs together; a message when a fit's covariance cannot be factored. */
export function drawerOf(inputs: readonly Input[]): Drawer | string {
  const gs = groups(inputs);
  if (typeof gs === 'string') return gs;
  const z = new Float64Array(inputs.length), w = new Float64Array(inputs.length);
  return (rng, out) => {
    for (let i = 0; i < inputs.length; i++) {
      const x = inputs[i], s = x.spread;
      if (s.kind === 'normal') out[i] = x.q.si + s.sd * rng.normal();
      else if (s.kind === 'lognormal') out[i] = x.q.si * Math.exp(s.sigma * rng.normal());
      else if (s.kind === 'uniform') out[i] = s.from + (s.to - s.from) * rng.uniform();
    }
    for (const g of gs) {
      const m = g.at.length;
      for (let k = 0; k < m; k++) z[k] = rng.normal();
      correlated(g.center, g.l, z.subarray(0, m), w.subarray(0, m));
      for (let k = 0; k < m; k++) out[g.at[k]] = g.joint.logScale[g.index[k]] ? Math.exp(w[k]) : w[k];
    }
  };
}

/**
 * The working coordinates of the linear method: a normal's value, a log-normal's log relative
 * to its median (0 at the present value), a uniform's value (variance (to − from)²/12, the
 * rectangular distribution of JCGM 100:2008 4.3.7), a fit's estimates on the fit's working
 * scale (log P relative to the estimate where the fit works on log P) with its covariance.
 */
export function workingOf(inputs: readonly Input[]): Working {
  const n = inputs.length;
  const w0 = new Float64Array(n);
  const cov = new Float64Array(n * n);
  const log = inputs.map((x) => x.spread.kind === 'lognormal' || (x.spread.kind === 'joint' && x.spread.joint.logScale[x.spread.index]));
  inputs.forEach((x, i) => {
    const s = x.spread;
    w0[i] = log[i] ? 0 : x.q.si;
    if (s.kind === 'normal') cov[i * n + i] = s.sd ** 2;
    else if (s.kind === 'lognormal') cov[i * n + i] = s.sigma ** 2;
    else if (s.kind === 'uniform') cov[i * n + i] = (s.to - s.from) ** 2 / 12;
    else {
      inputs.forEach((y, j) => {
        if (y.spread.kind === 'joint' && y.spread.joint === s.joint) cov[i * n + j] = s.joint.covariance[s.index * s.joint.names.length + y.spread.index];
      });
    }
  });
  const at = inputs.map((x) => x.q.si);
  return { w0, covariance: cov, toValues: (w, out) => { for (let i = 0; i < n; i++) out[i] = log[i] ? at[i] * Math.exp(w[i]) : w[i]; } };
}
