// Brent's zero and Brent's local minimiser (src/numerics/brent.ts) against closed forms and
// reference constants. Errors are measured in tolerance units, |x - x_exact| / (xtol +
// rtol·|x_exact|), which must be at most 1; evaluation counts are budgets, so a slower
// method fails like a wrong one.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { brentMinimize, brentRoot, BRENT_MESSAGES } from '../../src/numerics/brent.ts';

const EPS = Number.EPSILON;
const inTolUnits = (x: number, exact: number, xtol: number, rtol = 4 * EPS) => Math.abs(x - exact) / (xtol + rtol * Math.abs(exact));

/** f with a call counter, to check the reported `evaluations`. */
function counted(f: (x: number) => number): { f: (x: number) => number; calls: () => number } {
  let n = 0;
  return { f: (x) => { n++; return f(x); }, calls: () => n };
}

describe('brentRoot', () => {
  it('finds sqrt 2 as the zero of x² - 2 within one tolerance unit in at most 10 evaluations', () => {
    // closed form: x = sqrt(2)
    const c = counted((x) => x * x - 2);
    const r = brentRoot(c.f, 0, 2, { xtol: 1e-12 });
    assert.equal(r.converged, true);
    assert.equal(r.status, 'converged');
    assert.ok(inTolUnits(r.root, Math.SQRT2, 1e-12) <= 1, `error ${inTolUnits(r.root, Math.SQRT2, 1e-12)} tolerance units`);
    assert.equal(r.evaluations, c.calls());
    assert.ok(r.evaluations <= 10, `${r.evaluations} evaluations`);
  });

  it('finds the fixed point of cos (the Dottie number) to 1e-14', () => {
    // reference constant: 0.739085133215160641655312087673873... (OEIS A003957)
    const r = brentRoot((x) => Math.cos(x) - x, 0, 1, { xtol: 1e-14 });
    assert.equal(r.converged, true);
    assert.ok(inTolUnits(r.root, 0.7390851332151607, 1e-14) <= 1);
    assert.ok(r.evaluations <= 10, `${r.evaluations} evaluations`);
  });

  it('keeps the zero inside a bracket no wider than the tolerance, with a sign change across it', () => {
    // Brent 1973, ch. 4: the result is the end of a bracket [b, c] with f(b)·f(c) <= 0
    const r = brentRoot((x) => Math.exp(x) - 3, -5, 5, { xtol: 1e-10 });
    const [lo, hi] = r.bracket;
    assert.ok(lo <= Math.log(3) && Math.log(3) <= hi, `log 3 outside [${lo}, ${hi}]`);
    assert.ok(hi - lo <= 1e-10 + 4 * EPS * Math.log(3) + 1e-15);
    assert.ok(r.fBracket[0] <= 0 && r.fBracket[1] >= 0);
  });

  it('converges on a triple zero, (x - 1)³, where interpolation is only linear, within 200 evaluations', () => {
    // closed form: x = 1. Brent's safeguards keep the bracket shrinking; the count is a budget
    const r = brentRoot((x) => (x - 1) ** 3, 0, 3, { xtol: 1e-12, maxIterations: 200 });
    assert.equal(r.converged, true);
    assert.ok(inTolUnits(r.root, 1, 1e-12) <= 1);
    assert.ok(r.evaluations <= 200, `${r.evaluations} evaluations`);
  });

  it('uses supplied end values instead of evaluating them', () => {
    const c = counted((x) => x - 0.25);
    const r = brentRoot(c.f, 0, 1, { xtol: 1e-12 }, -0.25, 0.75);
    assert.equal(r.evaluations, c.calls());
    assert.ok(inTolUnits(r.root, 0.25, 1e-12) <= 1);
    assert.ok(r.evaluations <= 3, 'a linear f is solved by the first secant step');
  });

  it('returns an exact zero at an end without iterating', () => {
    const r = brentRoot((x) => x * (x - 2), 0, 1);
    assert.equal(r.status, 'exact-zero');
    assert.equal(r.root, 0);
    assert.equal(r.iterations, 0);
  });

  it('reports an unbracketed interval as a failed result, not an exception', () => {
    const r = brentRoot((x) => x * x + 1, -1, 2);
    assert.equal(r.converged, false);
    assert.equal(r.status, 'not-bracketed');
    assert.equal(r.evaluations, 2);
    assert.equal(r.root, -1, 'the end with the smaller |f|');
    assert.match(BRENT_MESSAGES[r.status], /same sign/);
  });

  it('stops with status non-finite when f is NaN inside the bracket', () => {
    const r = brentRoot((x) => (x > 0.4 && x < 0.6 ? NaN : x - 0.5), 0, 1);
    assert.equal(r.converged, false);
    assert.equal(r.status, 'non-finite');
  });

  it('stops at the iteration cap with converged false', () => {
    const r = brentRoot((x) => (x - 1) ** 3, 0, 3, { maxIterations: 3 });
    assert.equal(r.converged, false);
    assert.equal(r.status, 'iteration-limit');
    assert.equal(r.iterations, 3);
    assert.equal(r.evaluations, 5);
  });

  it('closes in on a pole, where |f| grows at the bracket ends instead of falling', () => {
    // 1/(x - 1) changes sign at x = 1 without a zero; Brent still returns the sign change
    const r = brentRoot((x) => 1 / (x - 1), 0, 3, { xtol: 1e-12 });
    assert.ok(Math.abs(r.root - 1) <= 1e-11);
    assert.ok(Math.min(Math.abs(r.fBracket[0]), Math.abs(r.fBracket[1])) > 1e10);
  });

  it('refuses invalid input with a RangeError that names it', () => {
    const f = (x: number) => x;
    assert.throws(() => brentRoot(f, NaN, 1), /a must be a finite number/);
    assert.throws(() => brentRoot(f, 0, Infinity), /b must be a finite number/);
    assert.throws(() => brentRoot(f, -1, 1, { xtol: -1 }), /xtol/);
    assert.throws(() => brentRoot(f, -1, 1, { rtol: NaN }), /rtol/);
    assert.throws(() => brentRoot(f, -1, 1, { maxIterations: 2.5 }), /maxIterations/);
  });
});

describe('brentMinimize', () => {
  it('finds the minimum of (x - 2)² + 1 at x = 2 in at most 10 evaluations', () => {
    // closed form: minimum at x = 2, value 1
    const r = brentMinimize((x) => (x - 2) ** 2 + 1, 0, 5);
    assert.equal(r.converged, true);
    assert.ok(Math.abs(r.x - 2) <= 2 * Math.sqrt(EPS) * 2);
    assert.ok(Math.abs(r.fx - 1) <= 4 * EPS);
    assert.ok(r.evaluations <= 10, `${r.evaluations} evaluations`);
  });

  it('finds the minimum of -x·e^(-x) at x = 1 to about sqrt(machine epsilon)', () => {
    // closed form: d/dx(-x e^-x) = (x - 1) e^-x = 0 at x = 1; Brent 1973 ch. 5: the location of a
    // smooth minimum is only determined to about sqrt(eps) relative, f being flat there
    const r = brentMinimize((x) => -x * Math.exp(-x), 0, 4);
    assert.equal(r.converged, true);
    assert.ok(Math.abs(r.x - 1) <= 3 * Math.sqrt(EPS), `x = ${r.x}`);
    assert.ok(r.evaluations <= 20, `${r.evaluations} evaluations`);
  });

  it('falls back on golden section where f has a corner, |x - 1.3|', () => {
    // closed form: minimum at 1.3; parabolic steps fail at a corner, golden section converges
    const r = brentMinimize((x) => Math.abs(x - 1.3), 0, 4, { xtol: 1e-10 });
    assert.equal(r.converged, true);
    assert.ok(Math.abs(r.x - 1.3) <= 1e-10 + Math.sqrt(EPS) * 1.3);
    assert.ok(r.evaluations <= 60, `${r.evaluations} evaluations`);
  });

  it('treats NaN as +Infinity, so it stays where f is defined', () => {
    const r = brentMinimize((x) => (x < 1 ? NaN : (x - 2) ** 2), 0, 5);
    assert.ok(Math.abs(r.x - 2) <= 1e-7);
  });

  it('ends early at the first point the stop condition accepts', () => {
    const seen: number[] = [];
    const r = brentMinimize((x) => { seen.push(x); return (x - 3) ** 2 - 1; }, 0, 5, { stop: (_, v) => v < 0 });
    assert.equal(r.status, 'stopped');
    assert.ok(r.fx < 0);
    assert.equal(r.x, seen[seen.length - 1]);
    assert.equal(r.evaluations, seen.length);
  });

  it('stops at the iteration cap with converged false', () => {
    const r = brentMinimize((x) => Math.abs(x - 1.3), 0, 4, { maxIterations: 4 });
    assert.equal(r.converged, false);
    assert.equal(r.status, 'iteration-limit');
    assert.equal(r.evaluations, 5);
  });
});
