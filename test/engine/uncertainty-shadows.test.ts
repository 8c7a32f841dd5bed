// A spread on a computed value stands for all of its uncertainty: the spreads upstream of it
// are not carried through it, and the uncertainty cell says which it hid.
//
// The model (invented numbers): CL and V log-normal, k = CL / V, half-life t_half = ln 2 / k.
// Log-normal closed forms: ln t_half = ln ln 2 − ln k, so with k's own log-normal spread (CV c,
// σ = sqrt(ln(1 + c²))) t_half is log-normal with that σ; through CL and V instead,
// ln t_half = ln ln 2 + ln V − ln CL has σ² = σ_CL² + σ_V². The 97.5th percentile over the
// median is exp(1.96·σ); a sample quantile's SD is sqrt(p(1 − p)/n)/f(x_p) (Serfling 1980,
// 2.3.3), about 0.07·σ at p = 0.975 and 2,000 samples on the log scale; allowed 4 of those.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { cell, reportOf } from './helpers.ts';
import type { ReportOf } from '../../src/index.ts';
import { normalQuantile } from '../../src/numerics/fit/student-t.ts';

const sigma = (cv: number) => Math.sqrt(Math.log(1 + cv * cv));

function how(kSpread: boolean, extra: { of?: string[]; method?: 'linear' } = {}): ReportOf<'uncertainty'> {
  return cell(reportOf({
    format: 'ratebook-study', version: 1, title: 'half-life (invented numbers)',
    cells: [
      { id: 'pk', kind: 'parameters', items: [
        { name: 'CL', value: '5 L / h', spread: { distribution: 'lognormal', cv: 0.3 } },
        { name: 'V', value: '50 L', spread: { distribution: 'lognormal', cv: 0.2 } },
        { name: 'dose', value: '1000 mg' },
        { name: 'k', value: 'CL / V', ...(kSpread ? { spread: { distribution: 'lognormal', cv: 0.1 } } : {}) },
        { name: 't_half', value: 'log(2) / k' },
        { name: 'C0', value: 'dose / V' },
      ] },
      { id: 'how', kind: 'uncertainty', of: extra.of ?? ['t_half'], samples: 2000, seed: 5, ...(extra.method ? { method: extra.method } : {}) },
    ],
  }), 'how') as ReportOf<'uncertainty'>;
}

/** ln(p975 / median) of t_half, against 1.96·σ within 4 sampling SDs. */
function spreadIs(r: ReportOf<'uncertainty'>, s: number) {
  const t = r.results!.t_half;
  const got = Math.log(t.p975!.si / t.median!.si);
  // the p-quantile of a normal of SD s from n samples: SD sqrt(p(1 − p)/n)/φ(z_p)·s
  const z = normalQuantile(0.975);
  const sd = Math.sqrt(0.975 * 0.025 / 2000) / (Math.exp(-z * z / 2) / Math.sqrt(2 * Math.PI)) * s;
  assert.ok(Math.abs(got - z * s) < 4 * sd, `ln(p975/median) ${got}, expected ${z * s} ± ${4 * sd}`);
}

describe('a spread on a computed value (k = CL / V with a spread of its own)', () => {
  it('draws k alone: CL and V reach t_half only through k, so they are not drawn, and the warning names them', () => {
    const r = how(true);
    assert.ok(r.ok, JSON.stringify(r.error));
    assert.deepEqual(r.inputs!.map((i) => i.name), ['k']);
    spreadIs(r, sigma(0.1));
    assert.equal(r.warnings?.length, 1);
    const w = r.warnings![0];
    assert.match(w, /^k has a spread of its own, which stands for all of its uncertainty: the spreads of CL and V upstream of it are not carried through k\./);
    assert.match(w, /CL and V reach t_half only through k, so their spreads are not drawn at all\./);
    assert.match(w, /remove k's spread/);
  });

  it('without k\'s spread, CL and V are drawn and t_half has their combined log-normal spread; no warning', () => {
    const r = how(false);
    assert.deepEqual(r.inputs!.map((i) => i.name), ['CL', 'V']);
    spreadIs(r, Math.hypot(sigma(0.3), sigma(0.2)));
    assert.equal(r.warnings, undefined);
  });

  it('V read directly elsewhere (C0 = dose / V) is still drawn there; CL, reaching only through k, is not', () => {
    const r = how(true, { of: ['t_half', 'C0'] });
    assert.deepEqual(r.inputs!.map((i) => i.name), ['V', 'k']);
    spreadIs(r, sigma(0.1));
    // C0 = dose / V carries V's spread: ln C0 has σ_V
    const c = r.results!.C0;
    assert.ok(Math.abs(Math.log(c.p975!.si / c.median!.si) - normalQuantile(0.975) * sigma(0.2)) < 0.03, 'C0 carries V\'s spread');
    const w = r.warnings![0];
    assert.match(w, /CL reaches t_half and C0 only through k, so its spread is not drawn at all\./);
    assert.match(w, /V is still drawn where read other than through k\./);
  });

  it('the linear method follows the same rule and gives the same warning', () => {
    const r = how(true, { method: 'linear' });
    assert.deepEqual(r.inputs!.map((i) => i.name), ['k']);
    // first order: u(ln t_half) = σ_k, so SD/mean = σ_k (JCGM 100:2008 5.1.2, the relative form for a product of powers)
    assert.ok(Math.abs(r.results!.t_half.sd!.si / r.results!.t_half.mean!.si - sigma(0.1)) < 1e-4);
    assert.deepEqual(r.warnings, how(true).warnings);
  });

  it('k itself listed: drawn from its own spread, CL and V hidden from it', () => {
    const r = how(true, { of: ['k'] });
    assert.deepEqual(r.inputs!.map((i) => i.name), ['k']);
    assert.match(r.warnings![0], /the spreads of CL and V upstream of it are not carried through k\. CL and V: their spreads are not drawn at all\./);
  });

  it('the parameters cell says it too, on k\'s spread, naming the spreads k reads', () => {
    const report = reportOf({
      format: 'ratebook-study', version: 1, title: 'half-life (invented numbers)',
      cells: [{ id: 'pk', kind: 'parameters', items: [
        { name: 'CL', value: '5 L / h', spread: { distribution: 'lognormal', cv: 0.3 } },
        { name: 'V', value: '50 L', spread: { distribution: 'lognormal', cv: 0.2 } },
        { name: 'k', value: 'CL / V', spread: { distribution: 'lognormal', cv: 0.1 } },
        { name: 'k2', value: 'CL / (50 L)' },
      ] }],
    });
    const values = (cell(report, 'pk') as ReportOf<'parameters'>).values!;
    assert.equal(values.k.spread!.note, "k is computed from CL and V, which have spreads of their own: an uncertainty cell draws k from this spread alone, without carrying the spreads of CL and V through it. Remove this spread to carry theirs instead.");
    assert.equal(values.CL.spread!.note, undefined);
    assert.equal(values.k2.spread, undefined);
  });
});
