// The sensitivity cell against closed forms: Newton cooling's crossing time (normalized -1 for
// k, the coefficients for T0 and Ta), the trough of a linear one-compartment regimen (normalized
// 1 for the dose, by linearity), the temperature at a fixed time against k; and its refusals,
// each on its field. Invented numbers. The slopes assume runs good to about 1e-6 relative
// (src/cells/sensitivity.ts), so they are good to about 1e-4 relative: the checks allow 1e-3.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { openStudy, type ReportOf, type StudySession } from '../../src/index.ts';
import { near } from './helpers.ts';

const HOUR = 3600;

/** Newton cooling from T0 towards Ta at k, with the time to reach L and the temperature at 2 h. Invented numbers. */
function cooling(extra: object[] = []) {
  return {
    format: 'ratebook-study', version: 1, title: 'cooling',
    cells: [
      { id: 'p', kind: 'parameters', items: [
        { name: 'k', value: '0.35 / h' }, { name: 'T0', value: '74 degC' }, { name: 'Ta', value: '4 degC' },
        { name: 'L', value: '21 degC' }, { name: 'unused', value: '3 kg' }] },
      { id: 'law', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: 'T0' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '12 h',
        find: [{ name: 't_L', crossing: 'T', level: 'L', direction: 'down' }, { name: 'T_2h', valueOf: 'T', at: '2 h' }] },
      ...extra,
    ],
  };
}

function open(doc: unknown): StudySession {
  const o = openStudy(structuredClone(doc));
  assert.ok(o.ok, o.ok ? '' : o.error.message);
  return o.session;
}

function sensitivity(doc: { cells: object[] }, of: unknown, parameters: unknown): ReportOf<'sensitivity'> {
  const s = open({ ...doc, cells: [...doc.cells, { id: 's', kind: 'sensitivity', of, parameters }] });
  return s.report().cells.find((c) => c.id === 's') as ReportOf<'sensitivity'>;
}

describe('sensitivity: closed forms', () => {
  it('t = ln((T0 - Ta)/(L - Ta))/k: normalized -1 for k, and the coefficients for T0 and Ta', () => {
    const r = sensitivity(cooling(), ['t_L'], ['k', 'T0', 'Ta']);
    assert.ok(r.ok, JSON.stringify(r.error));
    const e = r.results!.t_L;
    // closed form: t ∝ 1/k, so d ln t / d ln k = -1 exactly
    near(e.k.normalized!, -1, 1e-3, 'normalized for k');
    // closed form: dt/dT0 = 1 / (k (T0 - Ta)) = 1 / (0.35 /h × 70 K) = 0.040816 h/K
    assert.equal(e.T0.coefficient!.unit, 'h / K');
    near(e.T0.coefficient!.value, 1 / (0.35 * 70), 1e-3, 'dt/dT0 (h/K)');
    // closed form: dt/dTa = (1/k) (1/(L - Ta) - 1/(T0 - Ta)) = (1/0.35)(1/17 - 1/70) h/K
    near(e.Ta.coefficient!.value, (1 / 0.35) * (1 / 17 - 1 / 70), 1e-3, 'dt/dTa (h/K)');
    // a temperature on a scale has no normalized value (its ratio depends on the scale)
    assert.equal(e.T0.normalized, null);
    assert.match(e.T0.note!, /temperature on a scale/);
    // k's coefficient: dt/dk = -t/k, in h² (h over 1/h)
    const t = Math.log(70 / 17) / 0.35;
    near(e.k.coefficient!.si, (-t * HOUR) / (0.35 / HOUR), 1e-3, 'dt/dk (SI)');
    assert.ok(r.evaluations! >= 6 && r.evaluations! <= 9, `${r.evaluations} evaluations`);
    assert.deepEqual(r.ranking![0], { of: 't_L', parameter: 'k' });
  });

  it('says how good its slopes are, and the closed forms hold it to that (within twice)', () => {
    const r = sensitivity(cooling(), ['t_L'], ['k', 'T0', 'Ta']);
    // the step rule of numerics/slopes.ts: good to about eps^(2/3) relative (Nocedal & Wright,
    // Numerical Optimization, 2nd ed., sec. 8.1), eps = the runs' 1e-6: 1e-4
    assert.equal(r.accuracyWords, 'each slope is good to about 1 part in 10,000 (the runs taken as good to 1 part in 1,000,000)');
    const e = r.results!.t_L;
    const stated = 1e-4;
    // closed forms as in the test above: d ln t / d ln k = -1; dt/dT0 = 1/(k (T0 - Ta)); dt/dTa = (1/k)(1/(L - Ta) - 1/(T0 - Ta))
    assert.ok(Math.abs(e.k.normalized! + 1) <= 2 * stated, `normalized for k off by ${e.k.normalized! + 1}`);
    assert.ok(Math.abs(e.T0.coefficient!.value * 0.35 * 70 - 1) <= 2 * stated, 'dt/dT0');
    assert.ok(Math.abs(e.Ta.coefficient!.value / ((1 / 0.35) * (1 / 17 - 1 / 70)) - 1) <= 2 * stated, 'dt/dTa');
  });

  it('the temperature at a fixed time against k: dT/dk = -t (T0 - Ta) e^(-k t)', () => {
    const r = sensitivity(cooling(), ['T_2h'], ['k']);
    assert.ok(r.ok, JSON.stringify(r.error));
    // closed form: T(t) = Ta + (T0 - Ta) e^(-k t); at t = 2 h, dT/dk = -2 h × 70 K × e^(-0.7)
    const exact = -2 * 70 * Math.exp(-0.7); // K·h
    assert.equal(r.results!.T_2h.k.coefficient!.unit, 'K * h');
    near(r.results!.T_2h.k.coefficient!.value, exact, 1e-3, 'dT/dk (K·h)');
  });

  it('the trough of a linear one-compartment regimen: normalized 1 for the dose (linearity), -1 for V', () => {
    const doc = {
      format: 'ratebook-study', version: 1, title: 'regimen',
      cells: [
        { id: 'p', kind: 'parameters', items: [{ name: 'dose', value: '1000 mg' }, { name: 'V', value: '50 L' }, { name: 'k', value: '0.1 / h' }] },
        { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
        { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '72 h',
          events: [{ at: '0 h', every: '12 h', count: 6, add: { C: 'dose / V' } }],
          find: [{ name: 'trough', valueOf: 'C', at: '71.9 h' }] },
      ],
    };
    const r = sensitivity(doc, ['trough'], ['dose', 'V', 'k']);
    assert.ok(r.ok, JSON.stringify(r.error));
    // superposition: trough = (dose / V) Σ e^(-k (71.9 h - 12 h j)): linear in dose, in 1/V
    near(r.results!.trough.dose.normalized!, 1, 1e-3, 'normalized for the dose');
    near(r.results!.trough.V.normalized!, -1, 1e-3, 'normalized for V');
    // d ln trough / d ln k = -k Σ (t - t_j) e^(-k (t - t_j)) / Σ e^(-k (t - t_j))
    let s0 = 0, s1 = 0;
    for (let j = 0; j < 6; j++) { const a = 71.9 - 12 * j; s0 += Math.exp(-0.1 * a); s1 += a * Math.exp(-0.1 * a); }
    near(r.results!.trough.k.normalized!, (-0.1 * s1) / s0, 1e-3, 'normalized for k');
  });
});

describe('sensitivity: bad input, each on its field', () => {
  it('an unknown parameter or name, with "did you mean"', () => {
    const a = sensitivity(cooling(), ['t_l'], ['k']);
    assert.equal(a.error!.path, 'cells[3].of[0]');
    assert.match(a.error!.message, /did you mean "t_L"/);
    const b = sensitivity(cooling(), ['t_L'], ['kk']);
    assert.equal(b.error!.path, 'cells[3].parameters[0]');
    assert.match(b.error!.message, /did you mean "k"/);
  });

  it('a name that does not depend on the parameter: coefficient 0, said', () => {
    const r = sensitivity(cooling(), ['t_L'], ['unused', 'k']);
    assert.ok(r.ok, JSON.stringify(r.error));
    assert.equal(r.results!.t_L.unused.coefficient!.si, 0);
    assert.equal(r.results!.t_L.unused.normalized, 0);
    assert.match(r.results!.t_L.unused.note!, /t_L does not depend on unused/);
  });

  it('a parameter computed by another cell is refused on its path', () => {
    const r = sensitivity(cooling(), ['T_2h'], ['t_L']);
    assert.equal(r.ok, false);
    assert.equal(r.error!.path, 'cells[3].parameters[0]');
    assert.match(r.error!.message, /only parameters and the initial values of states can be replaced/);
  });

  it('the document check: empty lists, a name listed twice, a name that is not one', () => {
    const first = (of: unknown, parameters: unknown) => {
      const r = sensitivity(cooling(), of, parameters);
      return `${r.error!.path}: ${r.error!.message}`;
    };
    assert.equal(first([], ['k']), 'cells[3].of: must be a list of one or more results to follow (names of answers or values)');
    assert.equal(first(['t_L'], ['k', 'k']), 'cells[3].parameters[1]: "k" is listed twice');
    assert.match(first(['t_L'], ['2x']), /^cells\[3\]\.parameters\[0\]: "2x" is not a name/);
  });
});
