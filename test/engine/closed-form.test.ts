// The affine coefficients behind a run's exact-solution line (src/simulate/closed-form.ts),
// checked against the laws' own closed forms: y' = a + b y settles at y* = -a / b (first-order
// kinetics, common practice).
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { linearCoefficients } from '../../src/simulate/closed-form.ts';

test('a law with no constant term has a = 0 exactly, so it settles at 0 and not at a rounding residue', () => {
  // elimination C' = -k C in SI (kg/m³ per s), after a dose: the case that read "settles toward 4.765e-15 mg / L"
  const k = 0.08 / 3600;
  for (const c0 of [0.02, 0.0324, 1e-9, 7.3e5]) {
    const law = linearCoefficients((c) => -k * c, c0, c0 * 1.7);
    assert.ok(law);
    assert.equal(law.a, 0);
    assert.ok(Math.abs(law.b / -k - 1) < 1e-12, `b ${law.b}`);
  }
});

test('a real source term is kept: cooling toward 21 degC and an infusion toward R / (k V)', () => {
  // Newton cooling T' = -k (T - Ta): y* = Ta
  const k = 0.7 / 3600, ta = 294.15;
  const cooling = linearCoefficients((t) => -k * (t - ta), 347.15, 347.15);
  assert.ok(cooling);
  assert.ok(Math.abs(-cooling.a / cooling.b - ta) < 1e-9);
  // constant infusion C' = R / V - k C, with a small rate against elimination at the state's size: y* = R / (k V)
  const r = 1e-9, v = 0.05, ke = 0.1 / 3600;
  const infusion = linearCoefficients((c) => r / v - ke * c, 0.02, 0.03);
  assert.ok(infusion);
  const star = r / (ke * v);
  assert.ok(Math.abs(-infusion.a / infusion.b / star - 1) < 1e-6, `y* ${-infusion.a / infusion.b} against ${star}`);
});
