/**
 * Finding the zeros of f from the samples: each sign change refined by Brent's zero and told
 * apart as a zero, a pole or a jump (a gap met inside a cell is located and its sides
 * searched); each dip of |f| without a sign change examined by Brent's minimiser (a hidden
 * pair of zeros, or a touching zero polished as a zero of f'); large maxima of |f| examined as
 * poles; runs of zero samples as zero intervals or single zeros.
 */
import { brentMinimize, brentRoot } from '../brent.ts';
import { finiteEdge } from './gaps.ts';
import { parabolaMin } from './grid.ts';
import { DIFF_STEP, EPS, POLE_GROWTH, ROOT_DROP, opposite, signOf, tolAt, type Ctx, type Found } from './search.ts';
import type { FSign, Span } from './types.ts';

/** A grid minimum of |f| is not searched when the parabola through it stays above PRUNE times its depth. */
const PRUNE = 8;
/** Local maxima of |f| below this multiple of the typical |f| are not examined as poles. */
const POLE_CANDIDATE = 10;
/** Iteration cap for one Brent zero: a triple root converges only linearly and may need ~100. */
const BRENT_MAX_ITERATIONS = 200;
/** Iteration cap for one Brent minimisation (a local minimum or maximum of f). */
const MINIMIZE_MAX_ITERATIONS = 200;

/**
 * Brent on a sign-change bracket, then zero, pole or jump from how |f| behaved. Where Brent
 * meets a point at which f is not finite, the gap around it is located and each finite side
 * is searched in turn (bounded by the budget).
 */
function resolveSignChange(c: Ctx, a: number, fa: number, b: number, fb: number, found: Found[]): void {
  const cap = Math.min(BRENT_MAX_ITERATIONS, c.ev.left);
  const r = brentRoot((y) => c.ev.at(y), a, b, { xtol: c.xtol, rtol: c.rtol, maxIterations: Math.max(0, cap - 1) }, fa, fb);
  if (r.status === 'iteration-limit' && cap < BRENT_MAX_ITERATIONS) c.exhausted = true;
  if (r.status === 'non-finite') { hiddenGap(c, a, fa, b, fb, r.root, found); return; }
  if (r.status === 'exact-zero') { found.push({ kind: 'root', y: r.root, converged: true }); return; }
  const end = Math.min(Math.abs(r.fBracket[0]), Math.abs(r.fBracket[1]));
  if (end <= c.zeroAt(r.root) || end <= ROOT_DROP * Math.min(Math.abs(fa), Math.abs(fb))) {
    found.push({ kind: 'root', y: r.root, converged: r.converged });
  } else if (end >= POLE_GROWTH * Math.max(Math.abs(fa), Math.abs(fb))) {
    found.push({ kind: 'pole', y: 0.5 * (r.bracket[0] + r.bracket[1]) });
  } else if (r.converged) {
    found.push({ kind: 'jump', y: 0.5 * (r.bracket[0] + r.bracket[1]) });
  } else {
    found.push({ kind: 'root', y: r.root, converged: false });
    c.warnings.push(`the sign change between ${a} and ${b} was not resolved to tolerance`);
  }
}

/** A gap found inside a cell at x: its ends by bisection, then the finite sides searched. */
function hiddenGap(c: Ctx, a: number, fa: number, b: number, fb: number, x: number, found: Found[]): void {
  const left = finiteEdge(c, a, fa, x), right = finiteEdge(c, b, fb, x);
  c.gaps.push({ from: left.y, to: right.y });
  for (const [y0, f0, e] of [[a, fa, left], [b, fb, right]] as const) {
    if (Math.abs(e.f) <= c.zeroAt(e.y)) found.push({ kind: 'root', y: e.y, converged: true });
    else if (e.y !== y0 && Math.sign(e.f) !== Math.sign(f0)) {
      if (y0 < e.y) resolveSignChange(c, y0, f0, e.y, e.f, found);
      else resolveSignChange(c, e.y, e.f, y0, f0, found);
    }
  }
}

/** The derivative for polishing: the caller's, or a central difference. */
function slopeFn(c: Ctx, y0: number): (y: number) => number {
  if (c.derivative) { const d = c.derivative; return (y) => { try { return d(y); } catch { return NaN; } }; }
  const h = DIFF_STEP * Math.max(Math.abs(y0), c.width);
  return (y) => (c.ev.at(y + h) - c.ev.at(y - h)) / (2 * h);
}

/**
 * A local minimum of s·f on [L, R] (s the sign of f on the grid there): a dip below zero by
 * more than the zero tolerance splits into two sign changes; a minimum within the tolerance
 * of zero (either side: rounding in f can make a double zero dip slightly) is a touching
 * zero, polished as a zero of f'.
 */
function examineMinimum(c: Ctx, L: number, fL: number, R: number, fR: number, s: number, found: Found[]): void {
  const cap = Math.min(MINIMIZE_MAX_ITERATIONS, c.ev.left);
  const m = brentMinimize((y) => s * c.ev.at(y), L, R, {
    xtol: c.xtol, maxIterations: Math.max(0, cap - 2), stop: (x, v) => v < -c.zeroAt(x),
  });
  if (m.status === 'iteration-limit' && cap < MINIMIZE_MAX_ITERATIONS) c.exhausted = true;
  if (m.status === 'stopped') {
    const fc = s * m.fx;
    resolveSignChange(c, L, fL, m.x, fc, found);
    resolveSignChange(c, m.x, fc, R, fR, found);
    return;
  }
  if (!(m.fx <= c.zeroAt(m.x))) return;
  let y = m.x, fy = s * m.fx;
  // polish: the zero of f' near the minimum (f is flat there, f' is not)
  const w = Math.min(64 * Math.sqrt(EPS) * Math.max(Math.abs(y), c.width), 0.5 * (R - L));
  const lo = Math.max(L, y - w), hi = Math.min(R, y + w);
  if (hi > lo) {
    const g = slopeFn(c, y);
    const glo = g(lo), ghi = g(hi);
    if (Number.isFinite(glo) && Number.isFinite(ghi) && Math.sign(glo) !== Math.sign(ghi)) {
      const budget = Math.floor(Math.min(60, c.ev.left) / (c.derivative ? 1 : 2));
      const r = brentRoot(g, lo, hi, { xtol: c.xtol, rtol: c.rtol, maxIterations: Math.max(0, budget - 2) }, glo, ghi);
      if (r.converged) {
        const fp = c.ev.at(r.root);
        if (Math.abs(fp) <= Math.max(Math.abs(fy), c.zeroAt(y))) { y = r.root; fy = fp; }
      }
    }
  }
  found.push({ kind: 'root', y, converged: m.converged });
}

/** A large local maximum of |f|: a pole when |f| grows without bound toward a point. */
function examineMaximum(c: Ctx, L: number, R: number, s: number, peak: number, found: Found[]): void {
  const cap = Math.min(MINIMIZE_MAX_ITERATIONS, c.ev.left);
  const m = brentMinimize((y) => -s * c.ev.at(y), L, R, {
    xtol: c.xtol, maxIterations: Math.max(0, cap - 2), stop: (_, v) => !Number.isFinite(v),
  });
  if (m.status === 'stopped' || Math.abs(m.fx) >= POLE_GROWTH * Math.abs(peak)) found.push({ kind: 'pole', y: m.x });
}

/**
 * The scan of each run of finite samples: zero samples (points or intervals), sign changes,
 * and the local minima and large maxima of |f| where the sign does not change.
 */
export function scanRuns(c: Ctx, Y: number[], F: number[], found: Found[], zeroIntervals: Span[]): void {
  const classes = F.map((v, k) => (Number.isFinite(v) ? signOf(c, v, c.zeroAt(Y[k]))! : 'x' as const));
  const cls = (k: number): FSign | 'x' => classes[k];
  const n = Y.length;
  let s = 0;
  while (s < n) {
    if (cls(s) === 'x') { s++; continue; }
    let e = s;
    while (e + 1 < n && cls(e + 1) !== 'x') e++;
    scanRun(c, Y, F, s, e, cls, found, zeroIntervals);
    s = e + 1;
  }
}

/** One run of finite samples from s to e (see `scanRuns`). */
function scanRun(
  c: Ctx, Y: number[], F: number[], s: number, e: number, cls: (k: number) => FSign | 'x',
  found: Found[], zeroIntervals: Span[],
): void {
  const isZero = (y: number) => { const v = c.ev.at(y); return Number.isFinite(v) && Math.abs(v) <= c.zeroAt(y); };
  const zeroEdge = (yNon: number, yZero: number): number => { // bisection on "f is zero"
    let a = yNon, b = yZero;
    while (Math.abs(b - a) > tolAt(c, b)) {
      const m = 0.5 * (a + b);
      if (m === a || m === b) break;
      if (isZero(m)) b = m; else a = m;
    }
    return b;
  };
  // zero samples
  for (let i = s; i <= e; i++) {
    if (cls(i) !== '0') continue;
    let j = i;
    while (j + 1 <= e && cls(j + 1) === '0') j++;
    let interval = j > i;
    if (interval) { // check between the zero samples (at most 8 places)
      const stride = Math.max(1, Math.ceil((j - i) / 8));
      for (let k = i; k < j && interval; k += stride) interval = isZero(0.5 * (Y[k] + Y[k + 1]));
    }
    if (interval) {
      zeroIntervals.push({ from: i > s ? zeroEdge(Y[i - 1], Y[i]) : Y[i], to: j < e ? zeroEdge(Y[j + 1], Y[j]) : Y[j] });
    } else {
      for (let k = i; k <= j; k++) zeroPoint(c, Y, F, k, s, e, found);
    }
    i = j;
  }
  // sign changes between neighbours
  for (let k = s; k < e; k++) {
    const a = cls(k), b = cls(k + 1);
    if ((a === '+' && b === '-') || (a === '-' && b === '+')) resolveSignChange(c, Y[k], F[k], Y[k + 1], F[k + 1], found);
  }
  // stretches of one sign: local minima (touching zeros, hidden pairs) and large maxima (poles)
  for (let u = s; u <= e; u++) {
    const sg = cls(u);
    if (sg !== '+' && sg !== '-') continue;
    let v = u;
    while (v + 1 <= e && cls(v + 1) === sg) v++;
    const sgn = sg === '+' ? 1 : -1;
    const A = (k: number) => Math.abs(F[k]);
    for (let k = u + 1; k < v; k++) {
      if (A(k) < A(k - 1) && A(k) <= A(k + 1)) {
        const q = parabolaMin(Y[k - 1], A(k - 1), Y[k], A(k), Y[k + 1], A(k + 1));
        const depth = Math.max(A(k - 1), A(k + 1)) - A(k);
        if (!(q > PRUNE * depth)) examineMinimum(c, Y[k - 1], F[k - 1], Y[k + 1], F[k + 1], sgn, found);
      } else if (A(k) > A(k - 1) && A(k) >= A(k + 1) && A(k) >= POLE_CANDIDATE * c.fScale) {
        examineMaximum(c, Y[k - 1], Y[k + 1], sgn, F[k], found);
      }
    }
    // ends of the run (the range's edge or a gap's edge), not ends next to a zero or a sign change
    if (u === s && v > u && A(u) < A(u + 1)) {
      const q = v >= u + 2 ? parabolaMin(Y[u], A(u), Y[u + 1], A(u + 1), Y[u + 2], A(u + 2)) : NaN;
      if (v < u + 2 || (q === q && !(q > PRUNE * (A(u + 1) - A(u))))) examineMinimum(c, Y[u], F[u], Y[u + 1], F[u + 1], sgn, found);
    }
    if (v === e && v > u && A(v) < A(v - 1)) {
      const q = v >= u + 2 ? parabolaMin(Y[v - 2], A(v - 2), Y[v - 1], A(v - 1), Y[v], A(v)) : NaN;
      if (v < u + 2 || (q === q && !(q > PRUNE * (A(v - 1) - A(v))))) examineMinimum(c, Y[v - 1], F[v - 1], Y[v], F[v], sgn, found);
    }
    u = v;
  }
}

/** A single sample where |f| is within the zero tolerance: exact, polished by Brent, or touching. */
function zeroPoint(c: Ctx, Y: number[], F: number[], k: number, s: number, e: number, found: Found[]): void {
  if (F[k] === 0) {
    found.push({ kind: 'root', y: Y[k], converged: true });
    // the same sign on both sides: a double zero, or a simple one with a second zero in a
    // neighbouring cell, which the dip between them reveals
    if (k > s && k < e && opposite(F[k - 1], -F[k + 1])) examineMinimum(c, Y[k - 1], F[k - 1], Y[k + 1], F[k + 1], Math.sign(F[k + 1]), found);
    return;
  }
  if (k > s && opposite(F[k - 1], F[k])) { resolveSignChange(c, Y[k - 1], F[k - 1], Y[k], F[k], found); return; }
  if (k < e && opposite(F[k + 1], F[k])) { resolveSignChange(c, Y[k], F[k], Y[k + 1], F[k + 1], found); return; }
  const sgn = Math.sign(F[k]);
  const L = k > s ? k - 1 : k, R = k < e ? k + 1 : k;
  const before = found.length;
  if (R > L) examineMinimum(c, Y[L], F[L], Y[R], F[R], sgn, found);
  if (found.length === before) found.push({ kind: 'root', y: Y[k], converged: true });
}
